// Per-unit and whole-lot fits of the resistance-illuminance curve (Ceres Solver inside).
// The model, the robust loss and the intervals are explained in docs/fitting.md.
#pragma once

#include <stop_token>
#include <string>

#include "photolot/fit_result.h"
#include "photolot/lot.h"
#include "photolot/progress.h"

namespace photolot::fitting {

enum class Loss : std::uint8_t { huber, cauchy, none };
std::string_view to_string(Loss loss);

struct FitOptions {
  Loss loss = Loss::huber;
  // The resistance meter's accuracy in percent of reading; the robust loss's scale is
  // ln(1 + meter_accuracy_pct / 100) in ln R.
  double meter_accuracy_pct = 1.0;
  // A point is flagged as an outlier when |residual| > outlier_threshold x the loss scale
  // and its robust weight is below 1.
  double outlier_threshold = 3.0;
  int min_levels = 3;             // distinct illuminance levels needed
  double min_span_decades = 1.0;  // log10(E_max / E_min) needed
  double confidence = 0.95;       // for the reported intervals (Student t, n - p dof)
  int threads = 0;                // 0: all cores. Results do not depend on it.
  // Over-range readings under light: false leaves them out of the curve (counted and flagged);
  // true hands such units to the extended fit (fitting/models.h: power law, the readings as
  // one-sided terms), so that none is dropped.
  bool over_range_bounds = false;

  std::string validate() const;  // empty when valid
};

UnitFit fit_unit(const Unit& unit, const FitOptions& options = {});

// Fits every unit, in parallel. Deterministic whatever the thread count. On stop, units not
// reached keep status solver_failed with message "stopped".
LotFit fit_lot(const Lot& lot, const FitOptions& options = {}, const ProgressFn& progress = {},
               std::stop_token stop = {});

// The closed-form (ordinary least squares, non-robust) power-law fit in log space; the solver's
// starting point and the benchmark's baseline.
UnitFit fit_unit_closed_form(const Unit& unit, const FitOptions& options = {});

// A one-line description of the fit the options ask for (model, loss, scale, interval
// method), as stored in LotFit::method.
std::string describe(const FitOptions& options);

// The fitted resistance at an illuminance with its confidence interval (Student t on the
// unit's dof, from the curve's covariance): an interval for the curve itself, not for a new
// reading. All NaN for a unit that was not fitted; lo and hi NaN when the unit has no dof.
struct OhmInterval {
  double ohm = kNaN;
  double lo_ohm = kNaN;
  double hi_ohm = kNaN;
};
OhmInterval interval_at(const UnitFit& unit_fit, double lux, double confidence = 0.95);

}  // namespace photolot::fitting
