// Per-unit verdicts against a spec, and the lot's disposition under ISO 2859-1 single sampling
// (normal inspection) or 100 % inspection. The disposition is the tool's recommendation; the
// decision and the signature are the inspector's. Rules and sources: docs/statistics.md.
#pragma once

#include <cstddef>
#include <nlohmann/json_fwd.hpp>
#include <optional>
#include <string>
#include <vector>

#include "photolot/fit_result.h"
#include "photolot/spec.h"
#include "photolot/statistics.h"

namespace photolot {

// --- per-unit verdicts ---

enum class Verdict : std::uint8_t { conforming, nonconforming };
std::string_view to_string(Verdict verdict);  // "conforming", "nonconforming"

// One limit a unit breaks (or, for Characteristic::fit, why it could not be judged).
struct Reason {
  Characteristic characteristic = Characteristic::r10;
  std::string limit;       // "min", "max", or "fit" for an unfitted unit
  double measured = kNaN;  // in the characteristic's unit (ohm for R10 and dark)
  double limit_value = kNaN;
  double excess_pct = kNaN;  // |measured - limit| / limit x 100
  std::string text;          // "R10 24.1 kΩ above max 23 kΩ by 4.8 %"
};

struct UnitVerdict {
  std::string id;
  Verdict verdict = Verdict::conforming;
  std::vector<Reason> reasons;     // empty when conforming
  std::vector<std::string> notes;  // limits not judged and why (e.g. no dark reading)
};

UnitVerdict judge_unit(const UnitFit& unit, const Spec& spec);
std::vector<UnitVerdict> judge(const LotFit& fit, const Spec& spec);  // in unit order

// --- ISO 2859-1 single sampling, normal inspection ---

// Table I sample-size code letter for a lot of lot_size units (>= 2); nullopt for 0 or 1.
std::optional<char> code_letter(std::size_t lot_size, InspectionLevel level);
// Sample size for a code letter (A 2 ... R 2000); 0 for a letter not in the table.
std::size_t sample_size_for_letter(char letter);
// AQLs (percent nonconforming) of Table II-A this tool knows.
const std::vector<double>& tabulated_aqls();
bool is_tabulated_aql(double aql_pct);

struct SamplingPlan {
  std::size_t lot_size = 0;
  InspectionLevel level = InspectionLevel::level_ii;
  double aql_pct = 0;
  char code_letter = 0;          // from Table I
  char plan_letter = 0;          // after following Table II-A's arrows
  std::size_t sample_size = 0;   // of the plan letter
  int accept_number = 0;         // Ac
  int reject_number = 1;         // Re = Ac + 1
  bool full_inspection = false;  // sample_size >= lot_size: inspect every unit
  std::string description;       // one sentence: how the plan was arrived at
};

// The plan for a lot; preconditions: lot_size >= 1, is_tabulated_aql(aql_pct). A lot of one
// unit is inspected in full with Ac 0.
SamplingPlan single_sampling_plan(std::size_t lot_size, InspectionLevel level, double aql_pct);

enum class Disposition : std::uint8_t { accept, reject, undecided };
std::string_view to_string(Disposition d);  // "accept", "reject", "undecided"

struct Acceptance {
  InspectionMode mode = InspectionMode::sampling;
  std::optional<std::size_t> lot_size;
  std::optional<SamplingPlan> plan;  // absent when the lot size is unknown
  std::size_t measured = 0;          // units with a verdict
  std::size_t nonconforming = 0;
  Disposition disposition = Disposition::undecided;
  std::string reason;  // short: why this disposition ("2 nonconforming <= Ac 2")
  std::string rule;    // the rule that decided it, as a sentence
  std::vector<std::string> rejected_units;  // ids of the nonconforming units
};

// The disposition for the verdicts under the spec's inspection. lot_size overrides the spec's
// when given (the command line's --lot-size).
Acceptance decide(const Spec& spec, const std::vector<UnitVerdict>& verdicts,
                  std::optional<std::size_t> lot_size = std::nullopt);

// --- JSON sections of the results document ---
nlohmann::json acceptance_json(const Acceptance& acceptance);
nlohmann::json verdict_json(const UnitVerdict& verdict);  // {"verdict", "reasons", "notes"}

}  // namespace photolot
