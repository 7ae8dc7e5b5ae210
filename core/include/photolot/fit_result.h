// Fit results as plain data. fitting/ fills them; statistics, acceptance, pairing, the results
// document and the workbench read them. They live in core/ so nothing downstream depends on
// the solver.
#pragma once

#include <array>
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "photolot/curve.h"
#include "photolot/lot.h"

namespace photolot {

// How a unit's fit ended. Anything but `fitted` leaves the numbers NaN and says why in
// UnitFit::message: a poor or impossible fit is a status, not an error.
enum class FitStatus : std::uint8_t {
  fitted,
  no_valid_points,   // no normal reading with lux > 0 and a finite resistance
  too_few_levels,    // fewer than FitOptions::min_levels distinct illuminance levels
  span_too_small,    // the levels span less than FitOptions::min_span_decades
  solver_failed,     // the solver did not converge (message says how)
};
std::string_view to_string(FitStatus status);  // "fitted", "too_few_levels", ...

// One normal reading as the fit saw it.
struct PointFit {
  std::size_t reading_index = 0;  // into Unit::readings
  double lux = 0;
  double ohm = 0;
  double residual_ln = 0;  // ln R_measured - ln R_fitted
  double weight = 1;       // robust weight at the optimum (1 inside the loss threshold)
  bool outlier = false;
};

struct UnitFit {
  std::string id;
  FitStatus status = FitStatus::no_valid_points;
  std::string message;  // one line: how it ended, or why it was not fitted

  Curve curve;  // the chosen model; valid when status == fitted

  // Read from the chosen curve, at 25 degC when temperature is handled.
  double r10_ohm = kNaN;
  double gamma = kNaN;          // the model's exponent
  double gamma_10_100 = kNaN;   // datasheet two-point gamma log10(R10 / R100)
  std::array<double, 2> r10_ci95_ohm{kNaN, kNaN};
  std::array<double, 2> gamma_ci95{kNaN, kNaN};
  double ln_r10_sd = kNaN;      // standard error of ln R10
  double gamma_sd = kNaN;       // standard error of gamma
  double rms_log_residual = kNaN;  // sqrt(mean residual_ln^2) over the non-outlier points

  int points = 0;           // normal readings used
  int levels = 0;           // distinct illuminance levels among them
  int outlier_points = 0;
  int censored_points = 0;
  int dark_readings = 0;
  int dof = 0;              // points - parameters

  double cost = kNaN;       // final robust cost
  int iterations = 0;

  // Model choice (issue "beyond the straight line"); NaN where a candidate was not tried.
  double aicc_power_law = kNaN;
  double aicc_dark_conductance = kNaN;
  double dark_conductance_s = kNaN;
  double temp_coeff_pct_per_c = kNaN;  // the unit's own coefficient at 10 lx, where fitted

  // Dark readings of the unit (ohm; censored ones are lower bounds), for the dark limit.
  std::vector<double> dark_ohm;
  std::vector<bool> dark_censored;

  std::vector<PointFit> residuals;
  std::vector<std::string> flags;  // short words, e.g. "outlier-points", "censored"

  bool ok() const { return status == FitStatus::fitted; }
};

// What became of the lot's temperature coefficient in a run.
enum class TemperatureOutcome {
  not_stated,        // the fit did not handle temperature (the plain power-law fit)
  fitted,            // sought and identifiable: fitted jointly over the lot's readings
  not_identifiable,  // sought, but these readings cannot show it (`reason` says why)
  not_sought,        // the run did not look for it: handling off, or a given coefficient
};

std::string_view to_string(TemperatureOutcome outcome);  // "fitted", "not_identifiable", ...

// The lot-level temperature handling (filled by the temperature-aware fit).
struct LotTemperature {
  TemperatureOutcome outcome = TemperatureOutcome::not_stated;
  std::string reason;  // why not identifiable, or why not sought, in a few words (else empty)
  bool identifiable = false;
  double span_c = 0;                       // max - min temperature over the lot's readings
  double coefficient_pct_per_c = kNaN;     // at 10 lx
  double slope_pct_per_c_per_decade = kNaN;
  std::string source;                      // "fitted", "spec", "none"
  std::string message;
};

struct LotFit {
  std::vector<UnitFit> units;  // in the order of Lot::units
  LotTemperature temperature;
  std::string method;          // one line: model, loss, scale, interval method

  std::size_t fitted_count() const;
};

}  // namespace photolot
