// The results document's `acceptance` section and per-unit `verdict` fields. Layout:
// docs/statistics.md ("JSON").
#include <cmath>
#include <nlohmann/json.hpp>

#include "photolot/acceptance.h"

namespace photolot {

namespace {

nlohmann::json number_or_null(double v) {
  return std::isfinite(v) ? nlohmann::json(v) : nlohmann::json();
}

}  // namespace

nlohmann::json acceptance_json(const Acceptance& a) {
  nlohmann::json j;
  j["mode"] = to_string(a.mode);
  j["lot_size"] = a.lot_size ? nlohmann::json(*a.lot_size) : nlohmann::json();
  if (a.plan) {
    const SamplingPlan& p = *a.plan;
    j["inspection_level"] = to_string(p.level);
    j["aql"] = p.aql_pct;
    j["code_letter"] =
        p.code_letter ? nlohmann::json(std::string(1, p.code_letter)) : nlohmann::json();
    j["plan_letter"] =
        p.plan_letter ? nlohmann::json(std::string(1, p.plan_letter)) : nlohmann::json();
    j["sample_size"] = p.sample_size;
    j["accept_number"] = p.accept_number;
    j["reject_number"] = p.reject_number;
    j["full_inspection"] = p.full_inspection;
    j["plan"] = p.description;
  } else {
    for (const char* key : {"inspection_level", "aql", "code_letter", "plan_letter", "sample_size",
                            "accept_number", "reject_number", "plan"})
      j[key] = nullptr;
    j["full_inspection"] = a.mode == InspectionMode::full;
  }
  j["measured"] = a.measured;
  j["nonconforming"] = a.nonconforming;
  j["disposition"] = to_string(a.disposition);
  j["reason"] = a.reason;
  j["rule"] = a.rule;
  j["rejected_units"] = a.rejected_units;
  j["note"] =
      "The disposition is the tool's recommendation; the decision and the signature are "
      "the inspector's.";
  return j;
}

nlohmann::json verdict_json(const UnitVerdict& v) {
  nlohmann::json reasons = nlohmann::json::array();
  for (const auto& r : v.reasons) {
    reasons.push_back({{"characteristic", to_string(r.characteristic)},
                       {"limit", r.limit},
                       {"measured", number_or_null(r.measured)},
                       {"limit_value", number_or_null(r.limit_value)},
                       {"excess_pct", number_or_null(r.excess_pct)},
                       {"text", r.text}});
  }
  return {
      {"id", v.id}, {"verdict", to_string(v.verdict)}, {"reasons", reasons}, {"notes", v.notes}};
}

}  // namespace photolot
