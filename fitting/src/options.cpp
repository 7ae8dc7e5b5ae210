// FitOptions: names and validation.
#include <cmath>
#include <string>

#include "photolot/fitting/fit.h"

namespace photolot::fitting {

std::string_view to_string(Loss loss) {
  switch (loss) {
    case Loss::huber:
      return "huber";
    case Loss::cauchy:
      return "cauchy";
    case Loss::none:
      return "none";
  }
  return "?";
}

std::string FitOptions::validate() const {
  auto num = [](double v) { return std::to_string(v); };
  if (!(meter_accuracy_pct > 0) || !std::isfinite(meter_accuracy_pct))
    return "meter_accuracy_pct = " + num(meter_accuracy_pct) + " must be a positive number";
  if (!(outlier_threshold > 0))
    return "outlier_threshold = " + num(outlier_threshold) + " must be positive";
  if (min_levels < 2)
    return "min_levels = " + std::to_string(min_levels) + " must be at least 2 (a line needs two)";
  if (!(min_span_decades >= 0))
    return "min_span_decades = " + num(min_span_decades) + " must not be negative";
  if (!(confidence > 0 && confidence < 1))
    return "confidence = " + num(confidence) + " must lie strictly between 0 and 1";
  if (threads < 0) return "threads = " + std::to_string(threads) + " must be 0 (all cores) or more";
  return {};
}

}  // namespace photolot::fitting
