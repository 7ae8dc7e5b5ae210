// The extended fit of a unit and of a lot: temperature handling around the per-unit fits, the
// lot's joint temperature problem, and the parallel runner. Rules in docs/models.md.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <vector>

#include "../lot_runner.h"
#include "../unit_points.h"
#include "photolot/fitting/models.h"
#include "terms.h"

namespace photolot::fitting {
namespace {

using extended::Candidate;
using extended::TempSetting;
using extended::UnitData;

std::string fmt_tc(double tc10, double slope) {
  return slope == 0 ? fmt::format("{:.4g} %/degC at 10 lx", tc10)
                    : fmt::format("{:.4g} %/degC at 10 lx, {:+.4g} %/degC per decade", tc10, slope);
}

// The setting that applies a known coefficient, or none.
TempSetting fixed_setting(double tc10, double slope) {
  TempSetting t;
  if (!std::isfinite(tc10)) return t;
  t.used = true;
  t.tc10_pct_per_c = tc10;
  t.slope_pct_per_c_per_decade = slope;
  return t;
}

// fit_unit_extended with a label for the coefficient applied where the unit's own is not
// identifiable ("spec" or "lot").
UnitFit fit_unit_labelled(const Unit& unit, const FitOptions& options,
                          const ExtendedFitOptions& ext, std::string_view label) {
  std::string invalid = options.validate();
  if (invalid.empty()) invalid = ext.validate();
  if (!invalid.empty()) return detail::invalid_options_fit(unit, invalid);
  UnitData data = extended::collect(unit, ext);
  const TempSetting fallback =
      fixed_setting(ext.spec_tc10_pct_per_c, ext.spec_tc_slope_pct_per_c_per_decade);
  auto applied = [&](std::string why) {
    UnitFit f = extended::fit_unit_with(unit, data, fallback, options, ext);
    if (!f.ok()) return f;
    if (fallback.used)
      f.message +=
          fmt::format("; temperature: {}{} coefficient {} applied", why, label,
                      fmt_tc(fallback.tc10_pct_per_c, fallback.slope_pct_per_c_per_decade));
    else if (data.temp_span_c() > 0)
      f.message += fmt::format(
          "; temperature: {}no coefficient applied (readings span {:.2f} "
          "degC)",
          why, data.temp_span_c());
    return f;
  };
  switch (ext.temperature) {
    case TemperatureMode::off: {
      UnitFit f = extended::fit_unit_with(unit, data, TempSetting{}, options, ext);
      if (f.ok() && data.temp_span_c() > 0) f.message += "; temperature: off";
      return f;
    }
    case TemperatureMode::apply:
      return applied("");
    case TemperatureMode::fit:
      break;
  }
  const double span = data.temp_span_c();
  if (span < ext.min_temp_span_c)
    return applied(span > 0 ? fmt::format("own span {:.2f} degC too small to fit; ", span) : "");

  TempSetting own = fallback;
  own.used = true;
  own.free_tc10 = true;  // the unit's own: tc10 only; the slope stays as given (or 0)
  if (!std::isfinite(own.tc10_pct_per_c)) own.tc10_pct_per_c = 0;
  Candidate chosen;
  UnitData own_data = data;
  UnitFit f = extended::fit_unit_with(unit, own_data, own, options, ext, &chosen);
  if (!f.ok()) return f;
  const std::size_t i = chosen.theta.size(), nf = static_cast<std::size_t>(chosen.free_parameters);
  const double sd =
      chosen.covariance.size() == nf * nf
          ? std::sqrt(std::max(0.0, chosen.covariance[i * nf + i] * chosen.variance_factor))
          : kNaN;
  if (std::isfinite(sd) && sd <= ext.max_tc_sd_pct_per_c) {
    f.temp_coeff_pct_per_c = chosen.tc[0];
    f.message += fmt::format(
        "; temperature: own coefficient {:.4g} +- {:.2g} %/degC at 10 lx "
        "(readings span {:.2f} degC)",
        chosen.tc[0], sd, span);
    return f;
  }
  return applied(
      fmt::format("own coefficient not identifiable (standard error {:.2g} > {:.2g} "
                  "%/degC); ",
                  sd, ext.max_tc_sd_pct_per_c));
}

double lot_temp_span(const Lot& lot) {
  double lo = kNaN, hi = kNaN;
  for (const Unit& u : lot.units)
    for (const Reading& r : u.readings) {
      if (!std::isfinite(r.temp_c)) continue;
      lo = std::isfinite(lo) ? std::min(lo, r.temp_c) : r.temp_c;
      hi = std::isfinite(hi) ? std::max(hi, r.temp_c) : r.temp_c;
    }
  return std::isfinite(lo) ? hi - lo : 0.0;
}

}  // namespace

UnitFit fit_unit_extended(const Unit& unit, const FitOptions& options,
                          const ExtendedFitOptions& extended) {
  return fit_unit_labelled(unit, options, extended, "spec");
}

LotFit fit_lot_extended(const Lot& lot, const FitOptions& options, const ExtendedFitOptions& ext,
                        const ProgressFn& progress, std::stop_token stop) {
  LotFit out = detail::start_lot_fit(lot);
  const std::size_t n = lot.units.size();
  std::string invalid = options.validate();
  if (invalid.empty()) invalid = ext.validate();
  if (!invalid.empty()) {
    for (UnitFit& f : out.units) f.message = "not fitted: invalid options: " + invalid;
    out.method = "not run: invalid options: " + invalid;
    return out;
  }
  out.method = fmt::format(
      "extended fit: model {}, loss {} at 1 sd, over-range readings {}, weights {}, "
      "temperature {}; intervals Student t at {:g} %",
      to_string(ext.model), to_string(options.loss),
      ext.censored_terms ? "as one-sided terms" : "left out",
      ext.bench ? "from the bench profile"
                : fmt::format("{:g} % of reading", options.meter_accuracy_pct),
      to_string(ext.temperature), options.confidence * 100);

  LotTemperature& lt = out.temperature;
  lt.span_c = lot_temp_span(lot);
  const bool have_spec = std::isfinite(ext.spec_tc10_pct_per_c);
  auto spec_or_none = [&] {
    if (have_spec) {
      lt.source = "spec";
      lt.coefficient_pct_per_c = ext.spec_tc10_pct_per_c;
      lt.slope_pct_per_c_per_decade = ext.spec_tc_slope_pct_per_c_per_decade;
      return fmt::format("the spec coefficient {} applied",
                         fmt_tc(ext.spec_tc10_pct_per_c, ext.spec_tc_slope_pct_per_c_per_decade));
    }
    lt.source = "none";
    return std::string("no coefficient applied: results are at the bench temperature");
  };
  // A plain power law with no meter profile and no temperature coefficient to apply is the
  // fast per-unit fit (fit.h); only units with over-range readings need the extended problem,
  // and fit_unit hands those over itself (docs/fitting.md has its loss rule): ~5x less time.
  FitOptions plain_options = options;
  plain_options.over_range_bounds = ext.censored_terms;
  auto run_all = [&](const ExtendedFitOptions& e, std::string_view label, std::size_t done0,
                     std::size_t total) {
    const bool plain = e.model == ModelChoice::power_law && !e.bench && lt.source == "none";
    if (plain) out.method += "; units without over-range readings by the fast power-law fit";
    detail::for_each_index(
        n, options.threads, progress, stop,
        [&](std::size_t i) {
          out.units[i] = plain ? fit_unit(lot.units[i], plain_options)
                               : fit_unit_labelled(lot.units[i], options, e, label);
        },
        done0, total);
  };

  if (ext.temperature == TemperatureMode::off) {
    lt.source = "none";
    lt.outcome = TemperatureOutcome::not_sought;
    lt.reason = "temperature handling was off for this run";
    lt.message = "temperature handling off: results are at the bench temperature";
    run_all(ext, "spec", 0, n);
    return out;
  }
  if (ext.temperature == TemperatureMode::apply) {
    lt.outcome = TemperatureOutcome::not_sought;
    lt.reason = "the run applies a given coefficient instead of fitting one";
    lt.message = spec_or_none();
    run_all(ext, "spec", 0, n);
    return out;
  }
  if (lt.span_c < ext.min_temp_span_c) {
    lt.outcome = TemperatureOutcome::not_identifiable;
    lt.reason = fmt::format("the readings span {:.2f} degC, at least {:g} needed", lt.span_c,
                            ext.min_temp_span_c);
    lt.message = fmt::format("not identifiable: {}; {}", lt.reason, spec_or_none());
    run_all(ext, "spec", 0, n);
    return out;
  }

  // Joint problem: first each unit without temperature (model choice, weights, start), then
  // one problem with every fitted unit's block and the shared coefficient block.
  std::vector<UnitData> data(n);
  std::vector<Candidate> first(n);
  std::vector<char> fitted(n, 0);
  detail::for_each_index(
      n, options.threads, progress, stop,
      [&](std::size_t i) {
        data[i] = extended::collect(lot.units[i], ext);
        fitted[i] =
            extended::fit_unit_with(lot.units[i], data[i], TempSetting{}, options, ext, &first[i],
                                    /*check_scatter=*/false)
                .ok();
      },
      0, 2 * n);
  if (stop.stop_requested()) return out;
  std::vector<const UnitData*> jd;
  std::vector<const Candidate*> jc;
  for (std::size_t i = 0; i < n; ++i)
    if (fitted[i]) {
      jd.push_back(&data[i]);
      jc.push_back(&first[i]);
    }
  TempSetting joint;
  joint.used = true;
  joint.free_tc10 = true;
  joint.free_slope = ext.fit_tc_slope;
  joint.tc10_pct_per_c = have_spec ? ext.spec_tc10_pct_per_c : 0.0;
  joint.slope_pct_per_c_per_decade =
      ext.fit_tc_slope ? 0.0 : ext.spec_tc_slope_pct_per_c_per_decade;
  extended::JointResult jr;
  if (!jd.empty()) jr = extended::fit_joint_temperature(jd, jc, joint, options, ext);
  lt.identifiable = !jd.empty() && jr.converged && std::isfinite(jr.tc_sd[0]) &&
                    jr.tc_sd[0] <= ext.max_tc_sd_pct_per_c;
  if (lt.identifiable) {
    lt.outcome = TemperatureOutcome::fitted;
    lt.source = "fitted";
    lt.coefficient_pct_per_c = jr.tc[0];
    lt.slope_pct_per_c_per_decade = jr.tc[1];
    lt.message = fmt::format("fitted jointly over {} units: {:.4g} +- {:.2g} %/degC at 10 lx",
                             jd.size(), jr.tc[0], jr.tc_sd[0]);
    if (joint.free_slope)
      lt.message +=
          fmt::format(", slope {:+.4g} +- {:.2g} %/degC per decade", jr.tc[1], jr.tc_sd[1]);
    lt.message +=
        fmt::format("; readings span {:.2f} degC; R10 and gamma stated at 25 degC", lt.span_c);
    ExtendedFitOptions e = ext;
    e.spec_tc10_pct_per_c = jr.tc[0];
    e.spec_tc_slope_pct_per_c_per_decade = jr.tc[1];
    run_all(e, "lot", n, 2 * n);
  } else {
    lt.outcome = TemperatureOutcome::not_identifiable;
    lt.reason = jd.empty() ? std::string("no unit could be fitted")
                           : fmt::format(
                                 "the joint coefficient's standard error {:.2g} %/degC "
                                 "exceeds {:.2g}",
                                 jr.tc_sd[0], ext.max_tc_sd_pct_per_c);
    lt.message = "not identifiable: " + lt.reason + "; " + spec_or_none();
    run_all(ext, "spec", n, 2 * n);
  }
  return out;
}

}  // namespace photolot::fitting
