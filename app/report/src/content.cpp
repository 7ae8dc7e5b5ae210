#include "content.h"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <cmath>
#include <filesystem>
#include <map>
#include <set>

#include "photolot/number_format.h"

namespace photolot::report {
namespace {

constexpr const char* kDash = "\u2014";

std::string num(double v, int digits = 3) {
  if (!std::isfinite(v)) return kDash;
  return fmt::format("{:.{}g}", v, digits);
}

std::string fixed(double v, int decimals) {
  if (!std::isfinite(v)) return kDash;
  return fmt::format("{:.{}f}", v, decimals);
}

std::string base_name(const std::string& path) {
  return std::filesystem::path(path).filename().string();
}

std::string window_text(const Limits& limits, auto&& format) {
  if (limits.has_min() && limits.has_max())
    return fmt::format("{} to {}", format(limits.min), format(limits.max));
  if (limits.has_min()) return fmt::format("at least {}", format(limits.min));
  if (limits.has_max()) return fmt::format("at most {}", format(limits.max));
  return "not limited";
}

// The disposition in capitals, as it is stamped on the page.
std::string disposition_word(Disposition d) {
  std::string word(to_string(d));
  for (char& ch : word) ch = static_cast<char>(std::toupper(static_cast<unsigned char>(ch)));
  return word;
}

// A reason's own sentence when it has one; otherwise one made from its numbers.
std::string reason_text(const Reason& r) {
  if (!r.text.empty()) return r.text;
  const bool ohm =
      r.characteristic == Characteristic::r10 || r.characteristic == Characteristic::dark;
  const auto value = [&](double v) { return ohm ? format_ohm(v) : num(v, 3); };
  if (r.limit == "min" || r.limit == "max")
    return fmt::format("{} {} {} {} {}", to_string(r.characteristic), value(r.measured),
                       r.limit == "min" ? "below min" : "above max", value(r.limit_value),
                       std::isfinite(r.excess_pct) ? fmt::format("by {:.1f} %", r.excess_pct) : "");
  return fmt::format("{}: {}", to_string(r.characteristic), r.limit);
}

void add_spec(Content& c, const Spec& spec) {
  const auto ohm = [](double v) { return format_ohm(v); };
  const auto g = [](double v) { return fixed(v, 2); };
  if (!spec.part_number.empty() || !spec.description.empty()) {
    std::string part = spec.part_number;
    if (!spec.description.empty()) part += (part.empty() ? "" : " \u2014 ") + spec.description;
    c.spec.push_back({"Part", part});
  }
  c.spec.push_back({fmt::format("R10 at {} lx", num(spec.conditions.reference_lux)),
                    window_text(spec.r10_ohm, ohm)});
  c.spec.push_back({"gamma (fitted exponent)", window_text(spec.gamma, g)});
  c.spec.push_back(
      {"Dark resistance", std::isfinite(spec.dark_min_ohm)
                              ? fmt::format("at least {}", format_ohm(spec.dark_min_ohm))
                              : "not limited"});
  if (std::isfinite(spec.max_rms_log_residual))
    c.spec.push_back({"Fit residual (RMS of ln R)",
                      fmt::format("at most {}", num(spec.max_rms_log_residual, 3))});
  const Inspection& in = spec.inspection;
  if (in.mode == InspectionMode::full)
    c.spec.push_back({"Inspection", fmt::format("every unit (100 %), AQL {} %", num(in.aql_pct))});
  else
    c.spec.push_back(
        {"Inspection", fmt::format("ISO 2859-1 single sampling, normal inspection, level {}, "
                                   "AQL {} %",
                                   to_string(in.level), num(in.aql_pct))});
  c.spec.push_back({"Tolerance intervals", fmt::format("{} % of units with {} % confidence",
                                                       num(spec.tolerance_coverage * 100),
                                                       num(spec.tolerance_confidence * 100))});
  if (std::isfinite(spec.temp_coeff_pct_per_c))
    c.spec.push_back(
        {"Temperature coefficient",
         fmt::format("{} %/\u00b0C at {} lx, applied where the readings do not "
                     "identify the lot's own",
                     num(spec.temp_coeff_pct_per_c), num(spec.conditions.reference_lux))});
  if (!spec.source_file.empty()) c.spec.push_back({"Spec file", base_name(spec.source_file)});

  c.conditions.push_back(
      {"Reference illuminance", fmt::format("{} lx", num(spec.conditions.reference_lux))});
  c.conditions.push_back(
      {"Bench temperature", fmt::format("{} \u00b0C", num(spec.conditions.temp_c))});
  c.conditions.push_back({"Dark reading", fmt::format("{} s after the light is removed",
                                                      num(spec.conditions.dark_dwell_s))});
  c.r10_window_ohm = spec.r10_ohm;
  c.gamma_window = spec.gamma;
  c.reference_lux = spec.conditions.reference_lux;
}

// The lowest and highest bench temperature logged (NaN, NaN when none was).
std::pair<double, double> temperature_range(const Lot& lot) {
  double t_min = INFINITY, t_max = -INFINITY;
  for (const Unit& u : lot.units)
    for (const Reading& r : u.readings)
      if (std::isfinite(r.temp_c)) {
        t_min = std::min(t_min, r.temp_c);
        t_max = std::max(t_max, r.temp_c);
      }
  if (!std::isfinite(t_min)) return {kNaN, kNaN};
  return {t_min, t_max};
}

void add_measured_conditions(Content& c, const Lot& lot, const LotFit& fit) {
  std::set<double> levels;
  std::size_t readings = 0;
  for (const Unit& u : lot.units) {
    for (const Reading& r : u.readings) {
      ++readings;
      if (r.kind != ReadingKind::dark && r.lux > 0) levels.insert(r.lux);
    }
  }
  std::string text;
  if (levels.empty()) {
    text = "none";
  } else if (levels.size() <= 14) {
    for (double l : levels) text += (text.empty() ? "" : ", ") + num(l, 4);
    text += " lx";
  } else {
    text = fmt::format("{} levels from {} to {} lx", levels.size(), num(*levels.begin(), 4),
                       num(*levels.rbegin(), 4));
  }
  c.conditions.push_back({"Illuminance levels logged", text});
  c.conditions.push_back(
      {"Readings", fmt::format("{} in {} units ({} dark, {} over range)", readings,
                               lot.units.size(), lot.counts.dark, lot.counts.censored)});
  std::size_t warnings = 0, errors = 0;
  for (const Diagnostic& d : lot.diagnostics) {
    if (d.severity == Severity::error) ++errors;
    if (d.severity == Severity::warning) ++warnings;
  }
  c.conditions.push_back(
      {"Import", fmt::format("{} rows skipped, {} duplicates dropped, {} conflicts; "
                             "{} warnings, {} errors",
                             lot.counts.rows_skipped, lot.counts.duplicates_dropped,
                             lot.counts.conflicts, warnings, errors)});
  std::string files;
  for (const std::string& f : lot.source_files) files += (files.empty() ? "" : ", ") + base_name(f);
  c.conditions.push_back({"Bench logs", files.empty() ? kDash : files});
  c.conditions.push_back(
      {"Light source", "________________________________ (as recorded at the bench)"});
  c.conditions.push_back(
      {"Light adaptation", "________________________________ (illuminance, duration)"});

  // Method
  std::size_t outlier_points = 0, censored_points = 0, not_fitted = 0;
  for (const UnitFit& u : fit.units) {
    outlier_points += static_cast<std::size_t>(std::max(u.outlier_points, 0));
    censored_points += static_cast<std::size_t>(std::max(u.censored_points, 0));
    if (!u.ok()) ++not_fitted;
  }
  bool any_dark = false;
  for (const UnitFit& u : fit.units)
    any_dark |= u.ok() && u.curve.model == ModelKind::dark_conductance;
  c.method.push_back(
      {"Curve", any_dark
                    ? "power law R(E) = R10 \u00b7 (E / 10 lx)^(\u2212gamma), or with a dark "
                      "conductance in parallel, 1/R = G_dark + G10 \u00b7 (E / 10 lx)^gamma; "
                      "R10 and gamma are read from each unit's own curve"
                    : "R(E) = R10 \u00b7 (E / 10 lx)^(\u2212gamma), fitted to ln R of each unit"});
  c.method.push_back({"Fit", fit.method.empty() ? "not stated" : fit.method});
  c.method.push_back({"Units fitted", fmt::format("{} of {} ({} not fitted)", fit.fitted_count(),
                                                  fit.units.size(), not_fitted)});
  c.method.push_back({"Points set aside", fmt::format("{} outlier points, {} over-range points "
                                                      "kept as bounds",
                                                      outlier_points, censored_points)});
}

// The curve model as the page names it.
std::string_view model_words(ModelKind kind) {
  return kind == ModelKind::dark_conductance ? "dark conductance" : "power law";
}

// A temperature coefficient in percent per degree C, signed.
std::string pct_per_c(double v) {
  return std::isfinite(v) ? fmt::format("{:.3f} %/\u00b0C", v) : std::string(kDash);
}

// The fitting step's message with its ASCII degree unit written as a degree sign.
std::string degrees_in(std::string text) {
  for (std::size_t at = 0; (at = text.find("degC", at)) != std::string::npos;)
    text.replace(at, 4, "\u00b0C");
  return text;
}

void add_model_choice(Content& c, const LotFit& fit) {
  std::size_t power = 0, dark = 0, not_fitted = 0, both = 0;
  for (const UnitFit& u : fit.units) {
    if (!u.ok()) {
      ++not_fitted;
      continue;
    }
    ++(u.curve.model == ModelKind::dark_conductance ? dark : power);
    both += std::isfinite(u.aicc_power_law) && std::isfinite(u.aicc_dark_conductance);
  }
  std::string text = fmt::format("{} power law, {} dark conductance", power, dark);
  if (not_fitted) text += fmt::format(", {} not fitted", not_fitted);
  text += both
              ? fmt::format("; chosen per unit by the lower AICc ({} units fitted both ways)", both)
              : std::string("; one model was fitted, as set for the run");
  c.models.push_back({"Curve model per unit", text});
}

void add_temperature(Content& c, const Lot& lot, const LotFit& fit) {
  const LotTemperature& t = fit.temperature;
  std::string effect;
  switch (t.outcome) {
    case TemperatureOutcome::not_stated:
      effect = "not stated by the fit";
      break;
    case TemperatureOutcome::fitted:
      effect = "identifiable: fitted jointly over the lot's readings";
      break;
    case TemperatureOutcome::not_sought:
      effect = "not sought";
      if (!t.reason.empty()) effect += ": " + t.reason;
      break;
    case TemperatureOutcome::not_identifiable:
      effect = "not identifiable from these readings";
      if (!t.reason.empty()) effect += " (" + degrees_in(t.reason) + ")";
      break;
  }
  c.models.push_back({"Temperature effect", effect});

  const auto [t_min, t_max] = temperature_range(lot);
  const double span = t.source.empty() && std::isfinite(t_min) ? t_max - t_min : t.span_c;
  std::string range = "not logged";
  if (std::isfinite(t_min))
    range = fixed(t_min, 1) == fixed(t_max, 1)
                ? fmt::format("{} \u00b0C throughout", fixed(t_min, 1))
                : fmt::format("{} to {} \u00b0C", fixed(t_min, 1), fixed(t_max, 1));
  c.models.push_back(
      {"Bench temperatures", fmt::format("{}, a span of {} \u00b0C", range, fixed(span, 1))});
  c.models.push_back({"Coefficient at 10 lx", pct_per_c(t.coefficient_pct_per_c)});
  c.models.push_back(
      {"Change per decade of lux", std::isfinite(t.slope_pct_per_c_per_decade)
                                       ? fmt::format("{:+.3f} %/\u00b0C per decade of illuminance",
                                                     t.slope_pct_per_c_per_decade)
                                       : std::string(kDash)});
  std::string applied;
  if (t.source == "fitted")
    applied = fmt::format("fitted: the lot's own coefficient, {} at 10 lx",
                          pct_per_c(t.coefficient_pct_per_c));
  else if (t.source == "spec")
    applied =
        fmt::format("the spec's coefficient, {} at 10 lx", pct_per_c(t.coefficient_pct_per_c));
  else if (t.source == "none")
    applied = "none";
  else
    applied = "not stated";
  c.models.push_back({"Coefficient applied", applied});
  const bool corrected = t.source == "fitted" || t.source == "spec";
  c.models.push_back({"R10 and gamma stated at",
                      corrected ? "25 \u00b0C (each reading corrected by the coefficient applied)"
                                : "the bench temperature (no correction)"});

  double own_min = INFINITY, own_max = -INFINITY;
  std::size_t own = 0;
  for (const UnitFit& u : fit.units)
    if (u.ok() && std::isfinite(u.temp_coeff_pct_per_c)) {
      ++own;
      own_min = std::min(own_min, u.temp_coeff_pct_per_c);
      own_max = std::max(own_max, u.temp_coeff_pct_per_c);
    }
  if (own)
    c.models.push_back(
        {"Units' own coefficients",
         fmt::format("{} units, from {} to {}", own, pct_per_c(own_min), pct_per_c(own_max))});
}

void add_bench(Content& c, const SummaryInput& in) {
  if (!in.bench) {
    // The fit's method line names the profile when one weighted the readings.
    const bool used = in.fit->method.find("bench profile") != std::string::npos;
    c.models.push_back(
        {"Bench profile",
         used ? "used by the fit; its meter accuracies were not passed to this summary"
              : "none: every reading weighted alike (see Fitting method)"});
    return;
  }
  const BenchProfile& b = *in.bench;
  c.models.push_back(
      {"Bench profile",
       fmt::format("{}: each reading weighted by the meters' stated accuracy",
                   in.bench_profile_file.empty() ? std::string("given")
                                                 : base_name(in.bench_profile_file))});
  std::vector<MeterRange> ranges = b.ohm_ranges;
  std::sort(ranges.begin(), ranges.end(),
            [](const MeterRange& x, const MeterRange& y) { return x.max_ohm < y.max_ohm; });
  std::string ohm;
  for (const MeterRange& r : ranges)
    ohm += fmt::format("{}range {}: {} % of reading + {} digits of {}", ohm.empty() ? "" : "; ",
                       format_ohm(r.max_ohm), num(r.pct, 4), num(r.digits, 4),
                       format_ohm(r.resolution_ohm));
  c.models.push_back({"Resistance meter", ohm.empty() ? std::string("no ranges given") : ohm});
  c.models.push_back({"Lux meter", fmt::format("{} % of reading", num(b.lux_pct, 4))});
}

void add_statistics(Content& c, const LotStatistics& s) {
  c.statistics.headers = {"", "R10", "gamma"};
  c.statistics.widths = {2.2, 1.6, 1.2};
  c.statistics.right_aligned = {false, true, true};
  const auto ohm = [](double ln) { return std::isfinite(ln) ? format_ohm(std::exp(ln)) : kDash; };
  const auto g = [](double v) { return fixed(v, 3); };
  auto& rows = c.statistics.rows;
  const Summary& r = s.ln_r10;
  const Summary& y = s.gamma;
  rows.push_back({"Units fitted", fmt::format("{} of {}", r.n, s.units_total),
                  fmt::format("{} of {}", y.n, s.units_total)});
  rows.push_back({"Centre (R10: geometric mean)", ohm(r.mean), g(y.mean)});
  rows.push_back({"Median", ohm(r.median), g(y.median)});
  rows.push_back({"Spread (R10: sd of ln R10 as %)",
                  std::isfinite(r.sd) ? fmt::format("{:.1f} %", 100 * std::expm1(r.sd)) : kDash,
                  g(y.sd)});
  rows.push_back({"Spread of the parts (fit noise removed)",
                  std::isfinite(r.sd_without_fit_noise)
                      ? fmt::format("{:.1f} %", 100 * std::expm1(r.sd_without_fit_noise))
                      : kDash,
                  g(y.sd_without_fit_noise)});
  rows.push_back({"Lowest / highest", fmt::format("{} / {}", ohm(r.min), ohm(r.max)),
                  fmt::format("{} / {}", g(y.min), g(y.max))});
  rows.push_back({"1st / 99th percentile",
                  fmt::format("{} / {}", ohm(r.percentiles[0]), ohm(r.percentiles[4])),
                  fmt::format("{} / {}", g(y.percentiles[0]), g(y.percentiles[4]))});
  rows.push_back({"5th / 95th percentile",
                  fmt::format("{} / {}", ohm(r.percentiles[1]), ohm(r.percentiles[3])),
                  fmt::format("{} / {}", g(y.percentiles[1]), g(y.percentiles[3]))});
  rows.push_back(
      {fmt::format("Tolerance interval ({} % / {} %, k2 {})", num(s.coverage * 100),
                   num(s.confidence * 100), fixed(r.tolerance_factor, 3)),
       fmt::format("{} to {}", ohm(r.tolerance_interval[0]), ohm(r.tolerance_interval[1])),
       fmt::format("{} to {}", g(y.tolerance_interval[0]), g(y.tolerance_interval[1]))});
  // One row of process performance: `pick` formats a Capability, for R10 and for gamma.
  const auto capability_row = [&](std::string label, auto&& pick) {
    const auto cell = [&](const std::optional<Capability>& cp) {
      return cp ? std::string(pick(*cp)) : std::string("no limits");
    };
    rows.push_back({std::move(label), cell(s.r10_capability), cell(s.gamma_capability)});
  };
  const auto pair_of = [](double a, double b) {
    return fmt::format("{} / {}", fixed(a, 2), fixed(b, 2));
  };
  capability_row("Pp / Ppk (observed spread)",
                 [&](const Capability& k) { return pair_of(k.pp, k.ppk); });
  capability_row("Cp / Cpk (spread of the parts)",
                 [&](const Capability& k) { return pair_of(k.cp, k.cpk); });
  capability_row("Expected outside limits (normal model)", [](const Capability& k) {
    return std::isfinite(k.ppm_total) ? fmt::format("{:.0f} ppm", k.ppm_total) : std::string(kDash);
  });
  std::size_t out_r10 = 0, out_gamma = 0;
  for (const Outlier& o : s.outliers) {
    if (o.characteristic == Characteristic::r10) ++out_r10;
    if (o.characteristic == Characteristic::gamma) ++out_gamma;
  }
  rows.push_back({"Outlying units (|modified z| > 3.5)", fmt::format("{}", out_r10),
                  fmt::format("{}", out_gamma)});
  c.statistics_note = fmt::format(
      "Correlation of ln R10 and gamma: {}. Tolerance factors by {}'s method. R10 is summarised "
      "on the log scale: its spread is the sd of ln R10, shown as a percentage of the centre.",
      fixed(s.correlation_ln_r10_gamma, 2),
      s.tolerance_method.empty() ? "Howe" : s.tolerance_method);
  if (std::isfinite(r.mean) && std::isfinite(r.sd) && std::isfinite(y.sd) &&
      std::isfinite(s.correlation_ln_r10_gamma) && r.sd > 0 && y.sd > 0)
    c.ln_r10_gamma = Bivariate{r.mean, y.mean, r.sd, y.sd, s.correlation_ln_r10_gamma};
}

void add_nonconforming(Content& c, const SummaryInput& in) {
  c.nonconforming.headers = {"No.", "Unit", "Curve model", "Reasons"};
  c.nonconforming.widths = {0.5, 1.2, 1.5, 5.0};
  c.nonconforming.right_aligned = {true, false, false, false};
  std::map<std::string_view, const UnitFit*> fits;
  for (const UnitFit& u : in.fit->units) fits.emplace(u.id, &u);
  const auto model_of = [&](const std::string& id) {
    const auto it = fits.find(id);
    return it != fits.end() && it->second->ok() ? std::string(model_words(it->second->curve.model))
                                                : std::string("not fitted");
  };
  int no = 0;
  if (in.verdicts) {
    for (const UnitVerdict& v : *in.verdicts) {
      if (v.verdict != Verdict::nonconforming) continue;
      std::string reasons;
      for (const Reason& r : v.reasons) reasons += (reasons.empty() ? "" : "; ") + reason_text(r);
      for (const std::string& n : v.notes)
        reasons += (reasons.empty() ? "" : "; ") + ("note: " + n);
      c.nonconforming.rows.push_back({fmt::format("{}", ++no), v.id, model_of(v.id), reasons});
    }
    c.nonconforming_note = no == 0 ? "No unit broke a limit of the spec."
                                   : fmt::format("{} of {} units judged broke at least one limit.",
                                                 no, in.verdicts->size());
  } else {
    for (const UnitFit& u : in.fit->units) {
      if (u.ok()) continue;
      c.nonconforming.rows.push_back(
          {fmt::format("{}", ++no), u.id, "not fitted",
           fmt::format("not fitted: {}", u.message.empty() ? "no reason given" : u.message)});
    }
    c.nonconforming_note =
        "No spec was given, so no unit was judged; units that could not be "
        "fitted are listed.";
  }
}

void add_pairs(Content& c, const PairsSection& p) {
  std::vector<double> errors;
  for (const PairRow& r : p.rows)
    if (std::isfinite(r.error_pct)) errors.push_back(r.error_pct);
  std::sort(errors.begin(), errors.end());
  c.pairs_summary.push_back({"Method", p.method.empty() ? "not stated" : p.method});
  c.pairs_summary.push_back({"Pairs", fmt::format("{} ({} units), {} fitted units unpaired",
                                                  p.rows.size(), 2 * p.rows.size(), p.unpaired)});
  if (std::isfinite(p.tolerance_pct))
    c.pairs_summary.push_back({"Pairing limit", fmt::format("{} %", num(p.tolerance_pct))});
  if (!errors.empty()) {
    const auto at = [&](double q) {
      return errors[static_cast<std::size_t>(q * static_cast<double>(errors.size() - 1) + 0.5)];
    };
    c.pairs_summary.push_back(
        {"Tracking error",
         fmt::format("best {} %, median {} %, 90 % of pairs within {} %, worst {} %",
                     fixed(errors.front(), 2), fixed(at(0.5), 2), fixed(at(0.9), 2),
                     fixed(errors.back(), 2))});
  }
  c.pairs_table.headers = {"Pair", "Unit A", "Unit B", "Error %", "± sd %", "Picked"};
  c.pairs_table.widths = {0.7, 1.6, 1.6, 1.0, 1.0, 1.0};
  c.pairs_table.width_fraction = 0.7;
  c.pairs_table.right_aligned = {true, false, false, true, true, false};
  for (const PairRow& r : p.rows)
    c.pairs_table.rows.push_back({fmt::format("{}", r.pair_no), r.id_a, r.id_b,
                                  fixed(r.error_pct, 2),
                                  std::isfinite(r.sigma_pct) ? fixed(r.sigma_pct, 2) : "", ""});
  c.pairs = p;
}

}  // namespace

Content build_content(const SummaryInput& in) {
  Content c;
  c.header = in.header;
  if (c.header.part.empty() && in.spec) c.header.part = in.spec->part_number;
  c.lot_name = in.lot->name;
  c.units_logged = in.lot->units.size();

  if (in.acceptance) {
    const Acceptance& a = *in.acceptance;
    c.disposition = disposition_word(a.disposition);
    c.disposition_reason = a.reason;
    if (!a.rule.empty()) c.disposition_rule.push_back(a.rule);
    if (a.plan) {
      const SamplingPlan& p = *a.plan;
      c.disposition_rule.push_back(
          p.description.empty()
              ? fmt::format("Lot of {}, level {}, AQL {} %: code letter {}, plan {}: sample {}, "
                            "Ac {} / Re {}{}.",
                            p.lot_size, to_string(p.level), num(p.aql_pct), p.code_letter,
                            p.plan_letter, p.sample_size, p.accept_number, p.reject_number,
                            p.full_inspection ? " (every unit inspected)" : "")
              : p.description);
    } else if (a.mode == InspectionMode::sampling) {
      c.disposition_rule.push_back("Lot size not given: no sampling plan could be chosen.");
    }
    c.disposition_rule.push_back(
        fmt::format("{} units judged, {} nonconforming.", a.measured, a.nonconforming));
  } else {
    c.disposition = "NOT JUDGED";
    c.disposition_reason = in.spec ? "no disposition was computed" : "no purchase spec was given";
    c.disposition_rule.push_back(
        "The lot was characterised only; judge it against a spec to get a "
        "disposition.");
  }
  c.disposition_rule.push_back(
      "The disposition is the tool's recommendation; the decision and the "
      "signature below are the inspector's.");

  if (in.spec) add_spec(c, *in.spec);
  add_measured_conditions(c, *in.lot, *in.fit);
  add_model_choice(c, *in.fit);
  add_temperature(c, *in.lot, *in.fit);
  add_bench(c, in);
  if (in.stats) {
    add_statistics(c, *in.stats);
  } else {
    c.statistics_note = "Lot statistics were not computed for this summary.";
  }
  const std::string& source = in.fit->temperature.source;
  c.statistics_note.insert(0, source == "fitted" || source == "spec"
                                  ? "R10 and gamma are stated at 25 \u00b0C. "
                                  : "R10 and gamma are at the bench temperature (no temperature "
                                    "correction). ");
  add_nonconforming(c, in);

  std::set<std::string> bad;
  if (in.verdicts)
    for (const UnitVerdict& v : *in.verdicts)
      if (v.verdict == Verdict::nonconforming) bad.insert(v.id);
  std::vector<double> ln_r10, gam;
  for (std::size_t i = 0; i < in.fit->units.size(); ++i) {
    const UnitFit& u = in.fit->units[i];
    if (!u.ok()) continue;
    PlotUnit p{u.id, u.curve, u.r10_ohm, u.gamma, kNaN, kNaN, bad.contains(u.id)};
    for (const PointFit& pt : u.residuals) {
      if (!(pt.lux > 0)) continue;
      p.lux_min = std::isfinite(p.lux_min) ? std::min(p.lux_min, pt.lux) : pt.lux;
      p.lux_max = std::isfinite(p.lux_max) ? std::max(p.lux_max, pt.lux) : pt.lux;
    }
    if (!std::isfinite(p.lux_min) && i < in.lot->units.size()) {
      for (const Reading& r : in.lot->units[i].readings) {
        if (r.kind != ReadingKind::normal || !(r.lux > 0)) continue;
        p.lux_min = std::isfinite(p.lux_min) ? std::min(p.lux_min, r.lux) : r.lux;
        p.lux_max = std::isfinite(p.lux_max) ? std::max(p.lux_max, r.lux) : r.lux;
      }
    }
    c.units.push_back(std::move(p));
    if (u.r10_ohm > 0 && std::isfinite(u.gamma)) {
      ln_r10.push_back(std::log(u.r10_ohm));
      gam.push_back(u.gamma);
    }
  }
  if (!c.ln_r10_gamma) c.ln_r10_gamma = sample_bivariate(ln_r10, gam);

  if (in.pairs) add_pairs(c, *in.pairs);

  c.cautions = {
      "Cadmium. CdS cells contain cadmium, restricted in many places (in the EU by RoHS, "
      "Directive 2011/65/EU, unless an exemption applies: check its current status). Cadmium "
      "sulfide may cause cancer and harms kidneys, bones and lungs with repeated exposure (ILO "
      "International Chemical Safety Card 0404). Do not cut, grind, crush or burn cells; wash "
      "hands after handling broken ones; dispose of rejected and broken parts as hazardous "
      "electronic waste (WEEE, Directive 2012/19/EU) per local regulations.",
      "Mains voltage. Light-operated switches are often wired to the mains without isolation: "
      "never measure cells fitted in a mains-connected control. Bench fixtures run at extra-low "
      "voltage (IEC 61140). Follow local codes and licensed practice."};

  const std::string lot_label = !c.header.lot_id.empty() ? c.header.lot_id : c.lot_name;
  c.footer = fmt::format("Lot acceptance summary \u00b7 part {} \u00b7 lot {} \u00b7 photolot {}",
                         c.header.part.empty() ? "____" : c.header.part,
                         lot_label.empty() ? "____" : lot_label,
                         in.software_version.empty() ? PHOTOLOT_VERSION : in.software_version);
  return c;
}

}  // namespace photolot::report
