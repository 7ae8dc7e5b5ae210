// Sorting a unit's readings and the can-it-be-fitted checks (statuses in fit_result.h).
#include "unit_points.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

namespace photolot::fitting::detail {

UnitPoints collect_points(const Unit& unit) {
  UnitPoints p;
  const std::size_t n = unit.readings.size();
  p.reading_index.reserve(n);
  p.lux.reserve(n);
  p.ohm.reserve(n);
  p.x.reserve(n);
  p.y.reserve(n);
  for (std::size_t i = 0; i < n; ++i) {
    const Reading& r = unit.readings[i];
    if (r.lux == 0.0 || r.kind == ReadingKind::dark) {
      ++p.dark;
      p.dark_ohm.push_back(r.ohm);
      p.dark_censored.push_back(r.kind == ReadingKind::censored);
      continue;
    }
    if (r.kind == ReadingKind::censored) {
      ++p.censored;
      continue;
    }
    if (!(r.lux > 0) || !std::isfinite(r.lux) || !(r.ohm > 0) || !std::isfinite(r.ohm)) {
      ++p.skipped;
      continue;
    }
    p.reading_index.push_back(i);
    p.lux.push_back(r.lux);
    p.ohm.push_back(r.ohm);
    p.x.push_back(std::log(r.lux / kReferenceLux));
    p.y.push_back(std::log(r.ohm));
  }
  if (!p.lux.empty()) {
    std::vector<double> sorted = p.lux;
    std::sort(sorted.begin(), sorted.end());
    // Levels closer than one part in a million are the same setting read twice.
    p.levels = 1;
    for (std::size_t i = 1; i < sorted.size(); ++i)
      if (sorted[i] > sorted[i - 1] * (1 + 1e-6)) ++p.levels;
    p.lux_min = sorted.front();
    p.lux_max = sorted.back();
    p.span_decades = std::log10(p.lux_max / p.lux_min);
  }
  return p;
}

UnitFit start_unit_fit(const Unit& unit, const UnitPoints& points, const FitOptions& options,
                       int parameters) {
  UnitFit f;
  f.id = unit.id;
  f.points = static_cast<int>(points.size());
  f.levels = points.levels;
  f.censored_points = points.censored;
  f.dark_readings = points.dark;
  f.dark_ohm = points.dark_ohm;
  f.dark_censored = points.dark_censored;
  f.dof = std::max(0, f.points - parameters);
  if (points.censored > 0) f.flags.emplace_back("censored");
  if (points.dark > 0) f.flags.emplace_back("dark");
  if (points.skipped > 0) f.flags.emplace_back("skipped-points");

  if (points.size() == 0) {
    f.status = FitStatus::no_valid_points;
    f.message = fmt::format(
        "not fitted: none of its {} readings is a normal reading with lux > 0 and a finite "
        "resistance above 0 ({} over range, {} dark, {} unusable)",
        unit.readings.size(), points.censored, points.dark, points.skipped);
  } else if (points.levels < std::max(options.min_levels, parameters)) {
    f.status = FitStatus::too_few_levels;
    f.message =
        fmt::format("not fitted: {} distinct illuminance level{}, {} needed", points.levels,
                    points.levels == 1 ? "" : "s", std::max(options.min_levels, parameters));
  } else if (points.span_decades < options.min_span_decades) {
    f.status = FitStatus::span_too_small;
    f.message =
        fmt::format("not fitted: the levels span {:.2f} decades ({:g} to {:g} lx), {:g} needed",
                    points.span_decades, points.lux_min, points.lux_max, options.min_span_decades);
  } else {
    f.status = FitStatus::fitted;
  }
  return f;
}

UnitFit invalid_options_fit(const Unit& unit, const std::string& why) {
  UnitFit f;
  f.id = unit.id;
  f.status = FitStatus::solver_failed;
  f.message = "not fitted: invalid fit options: " + why;
  return f;
}

}  // namespace photolot::fitting::detail
