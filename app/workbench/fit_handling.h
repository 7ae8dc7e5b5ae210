// How the lot was fitted, beyond the per-unit numbers: the curve model (and how many units
// took each), over-range readings, the bench profile that weighted the readings and the
// temperature handling (identifiable or not, the coefficient, the span, what was applied).
// Also the model options' JSON for the workspace file.
#pragma once

#include <QString>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>

#include "photolot/fit_result.h"
#include "photolot/fitting/models.h"

namespace photolot::workbench {

// The model options a new session starts with: photolot-cli analyze's defaults (the power
// law, over-range readings as bounds, temperature fitted where the readings identify it).
fitting::ExtendedFitOptions default_model_options();

// The options the fit ran with and the name of the bench profile file (empty: none).
struct FitHandling {
  fitting::ExtendedFitOptions model = default_model_options();
  std::string bench_profile_name;
};

// Plain-words lines (HTML, one per <br>): model, over-range readings, bench profile,
// temperature. Empty when there is no fit.
QString describe_fit_handling(const LotFit* fit, const FitHandling& handling);
// One line for the status bar: temperature and bench profile in brief.
QString brief_fit_handling(const LotFit& fit, const FitHandling& handling);

// {"model": "power_law", "over_range_bounds": true, "use_dark_readings": true,
//  "temperature": "fit", "bench_profile": "bench-2.toml" | null,
//  "bench": {"lux_pct": 3, "ohm_ranges": [{max_ohm, pct, digits, resolution_ohm}]} | null}
nlohmann::json to_json(const FitHandling& handling);
// Fields not present keep their defaults; a wrong type or value is an error naming the field.
std::optional<std::string> from_json(const nlohmann::json& j, FitHandling& handling);

}  // namespace photolot::workbench
