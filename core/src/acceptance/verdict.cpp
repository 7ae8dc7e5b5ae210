// Per-unit verdicts: a unit conforms when it breaks no limit of the spec. Every limit broken is
// a reason with the measured value, the limit and by how much; limits that could not be judged
// (no dark reading, a dark reading over the meter's range below the limit) are notes.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "photolot/acceptance.h"
#include "photolot/number_format.h"

namespace photolot {

std::string_view to_string(Verdict verdict) {
  switch (verdict) {
    case Verdict::conforming:
      return "conforming";
    case Verdict::nonconforming:
      return "nonconforming";
  }
  return "?";
}

namespace {

// "24.1 kΩ", "23 kΩ": three significant figures with an SI prefix, trailing zeros dropped.
std::string ohm_text(double ohm) {
  return photolot::format_ohm(ohm, {.keep_trailing_zeros = false, .missing = "? \u03a9"});
}

double excess_pct(double measured, double limit) {
  return std::abs(measured - limit) / std::abs(limit) * 100;
}

void check_window(UnitVerdict& v, Characteristic c, const std::string& label, double measured,
                  const Limits& limits, bool ohm) {
  auto show = [&](double x) { return ohm ? ohm_text(x) : fmt::format("{:.3g}", x); };
  auto add = [&](std::string_view side, double limit, std::string_view word) {
    Reason r;
    r.characteristic = c;
    r.limit = std::string(side);
    r.measured = measured;
    r.limit_value = limit;
    r.excess_pct = excess_pct(measured, limit);
    r.text = fmt::format("{} {} {} {} {} by {:.2g} %", label, show(measured), word, side,
                         show(limit), r.excess_pct);
    if (!ohm)  // for gamma and the residual, say the absolute difference too
      r.text = fmt::format("{} {} {} {} {} by {:.2g} ({:.2g} %)", label, show(measured), word, side,
                           show(limit), std::abs(measured - limit), r.excess_pct);
    v.reasons.push_back(std::move(r));
  };
  if (limits.has_min() && measured < limits.min) add("min", limits.min, "below");
  if (limits.has_max() && measured > limits.max) add("max", limits.max, "above");
}

void check_dark(UnitVerdict& v, const UnitFit& unit, double limit_ohm) {
  const std::size_t n = unit.dark_ohm.size();
  if (n == 0) {
    v.notes.push_back(
        fmt::format("no dark reading: not judged on the dark limit (min {})", ohm_text(limit_ohm)));
    return;
  }
  // The worst (lowest) plain reading decides; a censored reading is a lower bound and proves
  // conformance only when the bound is at or above the limit.
  double lowest = kNaN;
  bool inconclusive = false;
  double inconclusive_bound = kNaN;
  for (std::size_t i = 0; i < n; ++i) {
    const bool censored = i < unit.dark_censored.size() && unit.dark_censored[i];
    const double r = unit.dark_ohm[i];
    if (censored) {
      if (!(r >= limit_ohm)) {
        inconclusive = true;
        inconclusive_bound = r;
      }
    } else if (std::isfinite(r) && !(r >= lowest)) {
      lowest = r;
    }
  }
  if (std::isfinite(lowest) && lowest < limit_ohm) {
    Reason r;
    r.characteristic = Characteristic::dark;
    r.limit = "min";
    r.measured = lowest;
    r.limit_value = limit_ohm;
    r.excess_pct = excess_pct(lowest, limit_ohm);
    r.text = fmt::format("dark resistance {} below min {} by {:.2g} %", ohm_text(lowest),
                         ohm_text(limit_ohm), r.excess_pct);
    v.reasons.push_back(std::move(r));
  } else if (inconclusive && !std::isfinite(lowest)) {
    v.notes.push_back(
        std::isfinite(inconclusive_bound)
            ? fmt::format("dark reading over the meter's range (above {}) cannot show the min {}: "
                          "not judged on the dark limit",
                          ohm_text(inconclusive_bound), ohm_text(limit_ohm))
            : fmt::format("dark reading over the meter's range with no bound: not judged on the "
                          "dark limit (min {})",
                          ohm_text(limit_ohm)));
  }
}

}  // namespace

UnitVerdict judge_unit(const UnitFit& unit, const Spec& spec) {
  UnitVerdict v;
  v.id = unit.id;
  if (!unit.ok() || !(unit.r10_ohm > 0) || !std::isfinite(unit.gamma)) {
    Reason r;
    r.characteristic = Characteristic::fit;
    r.limit = "fit";
    r.text = unit.ok() ? std::string("not fitted: the fit gave no finite R10 and gamma")
                       : fmt::format("not fitted ({}){}{}", to_string(unit.status),
                                     unit.message.empty() ? "" : ": ", unit.message);
    v.reasons.push_back(std::move(r));
  } else {
    // The resistance window applies at the spec's reference illuminance: R10 itself at 10 lx,
    // otherwise the fitted curve read at that level.
    const double ref_lux = spec.conditions.reference_lux;
    if (std::abs(ref_lux - kReferenceLux) < 1e-9 || unit.curve.params.empty()) {
      check_window(v, Characteristic::r10, "R10", unit.r10_ohm, spec.r10_ohm, true);
    } else {
      check_window(v, Characteristic::r10, fmt::format("R at {:g} lx", ref_lux),
                   unit.curve.ohm(ref_lux), spec.r10_ohm, true);
    }
    check_window(v, Characteristic::gamma, "gamma", unit.gamma, spec.gamma, false);
    if (!std::isnan(spec.max_rms_log_residual) && std::isfinite(unit.rms_log_residual))
      check_window(v, Characteristic::rms_log_residual, "RMS log residual", unit.rms_log_residual,
                   Limits{kNaN, spec.max_rms_log_residual}, false);
  }
  // The dark reading is judged whether or not the curve could be fitted.
  if (!std::isnan(spec.dark_min_ohm)) check_dark(v, unit, spec.dark_min_ohm);
  v.verdict = v.reasons.empty() ? Verdict::conforming : Verdict::nonconforming;
  return v;
}

std::vector<UnitVerdict> judge(const LotFit& fit, const Spec& spec) {
  std::vector<UnitVerdict> out;
  out.reserve(fit.units.size());
  for (const auto& u : fit.units) out.push_back(judge_unit(u, spec));
  return out;
}

}  // namespace photolot
