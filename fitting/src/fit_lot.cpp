// The whole-lot fit: every unit on its own, spread over worker threads. Each unit's result
// depends only on that unit and the options, so the lot is identical whatever the thread count.
#include <fmt/format.h>

#include <cmath>

#include "lot_runner.h"
#include "photolot/fitting/fit.h"

namespace photolot::fitting {

std::string describe(const FitOptions& o) {
  const double meter = std::log1p(o.meter_accuracy_pct / 100.0);
  std::string loss;
  switch (o.loss) {
    case Loss::huber:
    case Loss::cauchy:
      loss = fmt::format(
          "{} loss with its corner at max(ln(1 + {:g} %) = {:.4g}, 3 x the unit's scatter) in "
          "ln R, outliers beyond {:g} x max(meter, scatter); covariance: Huber's H1 estimate",
          to_string(o.loss), o.meter_accuracy_pct, meter, o.outlier_threshold);
      break;
    case Loss::none:
      loss = "ordinary least squares (no robust loss); covariance: s^2 (X'X)^-1";
      break;
  }
  return fmt::format(
      "power law ln R = ln R10 - gamma ln(E / 10 lx) per unit; {}; {:g} % intervals from "
      "Student t on n - 2 dof{}",
      loss, 100.0 * o.confidence,
      o.over_range_bounds ? "; units with over-range readings: extended fit, the readings as "
                            "one-sided terms (docs/models.md)"
                          : "");
}

LotFit fit_lot(const Lot& lot, const FitOptions& options, const ProgressFn& progress,
               std::stop_token stop) {
  LotFit out = detail::start_lot_fit(lot);
  out.method = describe(options);
  detail::for_each_index(lot.units.size(), options.threads, progress, stop,
                         [&](std::size_t i) { out.units[i] = fit_unit(lot.units[i], options); });
  return out;
}

}  // namespace photolot::fitting
