// Beyond the straight line: the dark-conductance model and the choice between it and the power
// law (AICc), over-range readings as one-sided terms, meter-uncertainty weights from a bench
// profile, and the temperature coefficient (per unit and jointly across the lot). Formulas,
// rules and their reasons are in docs/models.md. No Ceres or Eigen type here.
#pragma once

#include <cstdint>
#include <optional>
#include <stop_token>
#include <string>
#include <string_view>

#include "photolot/bench_profile.h"
#include "photolot/fit_result.h"
#include "photolot/fitting/fit.h"
#include "photolot/lot.h"
#include "photolot/progress.h"

namespace photolot::fitting {

// Which curve to fit. `choose` fits both and keeps the one with the lower AICc.
enum class ModelChoice : std::uint8_t { power_law, dark_conductance, choose };
std::string_view to_string(ModelChoice choice);  // "power_law", "dark_conductance", "choose"

// What to do about the bench temperature.
//   fit:   fit the coefficient where the readings identify it (rule in docs/models.md); where
//          they do not, apply spec_tc10_pct_per_c when it is given, else nothing.
//   apply: apply spec_tc10_pct_per_c (and its slope) without fitting.
//   off:   ignore temperature; curves describe R at the bench's temperature.
enum class TemperatureMode : std::uint8_t { fit, apply, off };
std::string_view to_string(TemperatureMode mode);  // "fit", "apply", "off"

struct ExtendedFitOptions {
  ModelChoice model = ModelChoice::choose;
  // Over-range readings enter as one-sided terms (the curve must not fall below the bound).
  // Off: they are left out of the fit (and counted), as a plain fit would.
  bool censored_terms = true;
  // Dark readings (0 lx) inform the dark conductance: a reading is ln R_dark = -ln G_dark, an
  // over-range one a one-sided bound.
  bool use_dark_readings = true;

  TemperatureMode temperature = TemperatureMode::fit;
  double spec_tc10_pct_per_c = kNaN;  // the spec's coefficient at 10 lx, %/degC
  double spec_tc_slope_pct_per_c_per_decade = 0;
  bool fit_tc_slope = true;  // fit the change per decade of illuminance too
  // Identifiability: the readings must span at least min_temp_span_c, and the fitted
  // coefficient's standard error must be at most max_tc_sd_pct_per_c.
  double min_temp_span_c = 5.0;
  double max_tc_sd_pct_per_c = 0.05;

  // Meter accuracies. Without one, every reading has sd ln(1 + meter_accuracy_pct / 100) in
  // ln R (FitOptions).
  std::optional<BenchProfile> bench;
  // Passes of the effective-variance weights (the lux meter's error enters through gamma).
  int weight_passes = 2;

  std::string validate() const;  // empty when valid; names the field, its value and the rule
};

// One unit. Temperature: in `fit` mode the unit's own coefficient is fitted where its own
// readings identify it (UnitFit::temp_coeff_pct_per_c); otherwise the spec coefficient is
// applied as the options say.
UnitFit fit_unit_extended(const Unit& unit, const FitOptions& options = {},
                          const ExtendedFitOptions& extended = {});

// The lot: per-unit fits in parallel (deterministic whatever the thread count), then, in `fit`
// mode, one joint problem with a block per unit and a shared temperature block. On stop, units
// not reached keep status solver_failed with message "stopped".
LotFit fit_lot_extended(const Lot& lot, const FitOptions& options = {},
                        const ExtendedFitOptions& extended = {}, const ProgressFn& progress = {},
                        std::stop_token stop = {});

// True when a unit has readings the fast power-law fit cannot use as they are (over-range
// readings under light): fit_unit hands such units to fit_unit_extended so none is dropped.
bool needs_extended_fit(const Unit& unit);
// The options fit_unit uses for such units: the power law, over-range readings as one-sided
// terms, no temperature term, no bench profile.
ExtendedFitOptions power_law_with_bounds();

}  // namespace photolot::fitting
