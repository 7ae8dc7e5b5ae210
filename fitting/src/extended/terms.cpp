// Collecting a unit's readings into fit terms, their uncertainties, options and names.
#include "terms.h"

#include <fmt/format.h>

#include <algorithm>
#include <boost/math/distributions/students_t.hpp>
#include <cmath>

#include "photolot/fitting/models.h"

namespace photolot::fitting {

std::string_view to_string(ModelChoice choice) {
  switch (choice) {
    case ModelChoice::power_law:
      return "power_law";
    case ModelChoice::dark_conductance:
      return "dark_conductance";
    case ModelChoice::choose:
      return "choose";
  }
  return "?";
}

std::string_view to_string(TemperatureMode mode) {
  switch (mode) {
    case TemperatureMode::fit:
      return "fit";
    case TemperatureMode::apply:
      return "apply";
    case TemperatureMode::off:
      return "off";
  }
  return "?";
}

std::string ExtendedFitOptions::validate() const {
  if (temperature == TemperatureMode::apply && !std::isfinite(spec_tc10_pct_per_c))
    return fmt::format("spec_tc10_pct_per_c = {} must be a number when temperature = apply",
                       spec_tc10_pct_per_c);
  if (!std::isfinite(spec_tc_slope_pct_per_c_per_decade))
    return fmt::format("spec_tc_slope_pct_per_c_per_decade = {} must be a number",
                       spec_tc_slope_pct_per_c_per_decade);
  if (std::isfinite(spec_tc10_pct_per_c) && std::abs(spec_tc10_pct_per_c) >= 10)
    return fmt::format("spec_tc10_pct_per_c = {} must lie within +-10 %/degC", spec_tc10_pct_per_c);
  if (!(min_temp_span_c > 0))
    return fmt::format("min_temp_span_c = {} must be positive", min_temp_span_c);
  if (!(max_tc_sd_pct_per_c > 0))
    return fmt::format("max_tc_sd_pct_per_c = {} must be positive", max_tc_sd_pct_per_c);
  if (weight_passes < 1 || weight_passes > 10)
    return fmt::format("weight_passes = {} must be between 1 and 10", weight_passes);
  if (bench) {
    if (std::string why = bench->validate(); !why.empty()) return "bench: " + why;
    if (bench->ohm_ranges.empty()) return "bench: the profile has no ohm_range";
  }
  return {};
}

bool needs_extended_fit(const Unit& unit) {
  return std::any_of(unit.readings.begin(), unit.readings.end(),
                     [](const Reading& r) { return r.kind == ReadingKind::censored && r.lux > 0; });
}

ExtendedFitOptions power_law_with_bounds() {
  ExtendedFitOptions e;
  e.model = ModelChoice::power_law;
  e.temperature = TemperatureMode::off;
  return e;
}

}  // namespace photolot::fitting

namespace photolot::fitting::extended {

double UnitData::temp_span_c() const {
  return std::isfinite(temp_min_c) ? temp_max_c - temp_min_c : 0.0;
}

int UnitData::lit_terms() const {
  return static_cast<int>(
      std::count_if(terms.begin(), terms.end(), [](const Term& t) { return !t.dark; }));
}

UnitData collect(const Unit& unit, const ExtendedFitOptions& ext) {
  UnitData d;
  std::vector<Term> bounds, darks;
  std::vector<double> lux;
  auto note_temp = [&](double t) {
    if (!std::isfinite(t)) return;
    d.temp_min_c = std::isfinite(d.temp_min_c) ? std::min(d.temp_min_c, t) : t;
    d.temp_max_c = std::isfinite(d.temp_max_c) ? std::max(d.temp_max_c, t) : t;
  };
  for (std::size_t i = 0; i < unit.readings.size(); ++i) {
    const Reading& r = unit.readings[i];
    Term t;
    t.reading_index = i;
    t.lux = r.lux;
    t.temp_c = r.temp_c;
    t.ohm = r.ohm;
    const bool usable_ohm = r.ohm > 0 && std::isfinite(r.ohm);
    if (r.lux == 0.0 || r.kind == ReadingKind::dark) {
      ++d.dark;
      d.dark_ohm.push_back(r.ohm);
      d.dark_censored.push_back(r.kind == ReadingKind::censored);
      if (ext.use_dark_readings && usable_ohm) {
        t.dark = true;
        t.bound = r.kind == ReadingKind::censored;
        t.y = std::log(r.ohm);
        darks.push_back(t);
      }
      continue;
    }
    if (!(r.lux > 0) || !std::isfinite(r.lux)) {
      ++d.skipped;
      continue;
    }
    t.x = std::log(r.lux / kReferenceLux);
    t.log10_e = std::log10(r.lux / kReferenceLux);
    if (r.kind == ReadingKind::censored) {
      ++d.censored;
      if (!usable_ohm) {
        ++d.censored_unbounded;
        continue;
      }
      if (!ext.censored_terms) continue;
      t.bound = true;
      t.y = std::log(r.ohm);
      note_temp(r.temp_c);
      bounds.push_back(t);
      continue;
    }
    if (!usable_ohm) {
      ++d.skipped;
      continue;
    }
    t.y = std::log(r.ohm);
    note_temp(r.temp_c);
    lux.push_back(r.lux);
    d.terms.push_back(t);
  }
  d.points = static_cast<int>(d.terms.size());
  if (!lux.empty()) {
    std::sort(lux.begin(), lux.end());
    d.levels = 1;
    for (std::size_t i = 1; i < lux.size(); ++i)
      if (lux[i] > lux[i - 1] * (1 + 1e-6)) ++d.levels;  // one part in a million: same setting
    d.lux_min = lux.front();
    d.lux_max = lux.back();
  }
  d.terms.insert(d.terms.end(), bounds.begin(), bounds.end());
  d.terms.insert(d.terms.end(), darks.begin(), darks.end());
  return d;
}

void set_uncertainties(UnitData& data, const FitOptions& options, const ExtendedFitOptions& ext,
                       const std::vector<double>& local_gamma) {
  const double plain = std::log1p(options.meter_accuracy_pct / 100.0);
  for (std::size_t i = 0; i < data.terms.size(); ++i) {
    Term& t = data.terms[i];
    if (!ext.bench) {
      t.sd = plain * data.sd_scale;
      continue;
    }
    // Dark readings have no illuminance error; the others carry it through the local slope.
    const double g = t.dark || i >= local_gamma.size() ? 0.0 : local_gamma[i];
    t.sd = ext.bench->ln_ohm_sd(t.ohm, g) * data.sd_scale;
  }
}

double t_quantile(double confidence, int dof) {
  if (dof < 1) return kNaN;
  boost::math::students_t dist(static_cast<double>(dof));
  return boost::math::quantile(dist, 1.0 - (1.0 - confidence) / 2.0);
}

}  // namespace photolot::fitting::extended
