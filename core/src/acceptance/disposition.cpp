// The lot's disposition from the per-unit verdicts. Rules (docs/statistics.md, "Acceptance"):
//   sampling: ISO 2859-1 single sampling, normal inspection. Reject as soon as the
//     nonconforming count reaches Re (more units cannot undo it); otherwise decide only when the
//     plan's sample has been measured, accepting when the count is at most Ac. Units measured
//     beyond the sample size are counted too (a stricter reading of the plan, said so).
//   100 %: the lot is sorted; conforming units are accepted and nonconforming ones are rejected
//     one by one; undecided until every unit of the lot (when its size is known) is measured.
// The disposition is a recommendation: the decision and signature are the inspector's.
#include <fmt/format.h>

#include "photolot/acceptance.h"

namespace photolot {

std::string_view to_string(Disposition d) {
  switch (d) {
    case Disposition::accept:
      return "accept";
    case Disposition::reject:
      return "reject";
    case Disposition::undecided:
      return "undecided";
  }
  return "?";
}

namespace {

std::string units(std::size_t n) { return fmt::format("{} unit{}", n, n == 1 ? "" : "s"); }

}  // namespace

Acceptance decide(const Spec& spec, const std::vector<UnitVerdict>& verdicts,
                  std::optional<std::size_t> lot_size) {
  Acceptance a;
  a.mode = spec.inspection.mode;
  a.lot_size = lot_size ? lot_size : spec.inspection.lot_size;
  a.measured = verdicts.size();
  for (const auto& v : verdicts) {
    if (v.verdict == Verdict::nonconforming) {
      ++a.nonconforming;
      a.rejected_units.push_back(v.id);
    }
  }
  const std::size_t d = a.nonconforming;
  const std::size_t conforming = a.measured - d;

  if (a.lot_size && a.measured > *a.lot_size) {
    a.disposition = Disposition::undecided;
    a.reason = fmt::format("{} measured but the lot size is {}", units(a.measured), *a.lot_size);
    a.rule =
        "The lot size must be at least the number of units measured: correct the lot size "
        "or the logs before a disposition can be given.";
    return a;
  }

  if (a.mode == InspectionMode::full) {
    if (a.lot_size && a.measured < *a.lot_size) {
      a.disposition = Disposition::undecided;
      a.reason = fmt::format("100 % inspection: {} of {} measured", a.measured, units(*a.lot_size));
      a.rule = fmt::format(
          "With 100 % inspection every unit of the lot is judged; {} not "
          "measured yet.",
          units(*a.lot_size - a.measured));
      return a;
    }
    a.disposition = Disposition::accept;
    a.reason = d == 0 ? fmt::format("100 % inspection: all {} conform", units(a.measured))
                      : fmt::format(
                            "100 % inspection: {} conforming accepted, {} nonconforming "
                            "rejected individually",
                            units(conforming), units(d));
    a.rule =
        "With 100 % inspection the lot is sorted: each conforming unit is accepted and each "
        "nonconforming unit is rejected on its own.";
    return a;
  }

  if (!a.lot_size) {
    a.disposition = Disposition::undecided;
    a.reason = "lot size unknown";
    a.rule =
        "An ISO 2859-1 sampling plan is chosen by lot size: give the lot size "
        "(inspection.lot_size in the spec, or --lot-size) to decide.";
    return a;
  }

  a.plan = single_sampling_plan(*a.lot_size, spec.inspection.level, spec.inspection.aql_pct);
  const SamplingPlan& p = *a.plan;
  const std::size_t needed = p.full_inspection ? p.lot_size : p.sample_size;
  const auto ac = static_cast<std::size_t>(p.accept_number);
  const auto re = static_cast<std::size_t>(p.reject_number);
  const std::string plan_words = fmt::format(
      "ISO 2859-1 single sampling, normal inspection, level {}, AQL {} %, code letter "
      "{}{}",
      to_string(p.level), p.aql_pct, p.code_letter ? p.code_letter : '-',
      p.plan_letter != p.code_letter && p.plan_letter
          ? fmt::format(" (plan of letter {})", p.plan_letter)
          : std::string());
  const std::string sample_words =
      p.full_inspection ? fmt::format(
                              "all {} of the lot (the plan's sample size {} is at or above "
                              "the lot size)",
                              units(p.lot_size), p.sample_size)
                        : fmt::format("the sample of {}", units(p.sample_size));
  a.rule = fmt::format(
      "Accept when the nonconforming units among {} number at most Ac = {}; "
      "reject when they number Re = {} or more ({}).",
      sample_words, ac, re, plan_words);

  if (d >= re) {
    a.disposition = Disposition::reject;
    a.reason = fmt::format("{} nonconforming >= Re {}", d, re);
    if (a.measured < needed)
      a.reason += fmt::format(" (already with {} of {} measured)", a.measured, needed);
    return a;
  }
  if (a.measured < needed) {
    a.disposition = Disposition::undecided;
    a.reason =
        fmt::format("{} of {} measured: the plan needs {}", a.measured, needed, units(needed));
    return a;
  }
  a.disposition = Disposition::accept;
  a.reason = fmt::format("{} nonconforming <= Ac {}", d, ac);
  if (a.measured > needed)
    a.reason += fmt::format(
        " (all {} measured counted against the plan for {}, which is "
        "stricter than the plan)",
        units(a.measured), needed);
  return a;
}

}  // namespace photolot
