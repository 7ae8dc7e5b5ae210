// ISO 2859-1 single sampling plans for normal inspection (the same tables as ANSI/ASQ Z1.4).
//
// Table I gives the sample-size code letter from the lot size and the general inspection level;
// Table II-A gives, for the letter's sample size and the AQL, the acceptance number Ac and the
// rejection number Re = Ac + 1, or an arrow: "down" means use the first plan below it, "up" the
// first plan above it, and the plan arrived at brings its own sample size. When that sample size
// is at or above the lot size, every unit is inspected (ISO 2859-1, 10.1).
#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cassert>
#include <cmath>

#include "photolot/acceptance.h"

namespace photolot {

namespace {

constexpr std::array<char, 16> kLetters = {'A', 'B', 'C', 'D', 'E', 'F', 'G', 'H',
                                           'J', 'K', 'L', 'M', 'N', 'P', 'Q', 'R'};
constexpr std::array<std::size_t, 16> kSampleSizes = {2,  3,   5,   8,   13,  20,  32,   50,
                                                      80, 125, 200, 315, 500, 800, 1250, 2000};

// Table I: upper bound of each lot-size band and the letters for levels I, II, III.
struct Band {
  std::size_t max_lot;
  char level[3];
};
constexpr std::array<Band, 15> kTableI = {{
    {8, {'A', 'A', 'B'}},
    {15, {'A', 'B', 'C'}},
    {25, {'B', 'C', 'D'}},
    {50, {'C', 'D', 'E'}},
    {90, {'C', 'E', 'F'}},
    {150, {'D', 'F', 'G'}},
    {280, {'E', 'G', 'H'}},
    {500, {'F', 'H', 'J'}},
    {1200, {'G', 'J', 'K'}},
    {3200, {'H', 'K', 'L'}},
    {10000, {'J', 'L', 'M'}},
    {35000, {'K', 'M', 'N'}},
    {150000, {'L', 'N', 'P'}},
    {500000, {'M', 'P', 'Q'}},
    {static_cast<std::size_t>(-1), {'N', 'Q', 'R'}},
}};

constexpr int kDown = -1;  // "use the first plan below"
constexpr int kUp = -2;    // "use the first plan above"
constexpr int D = kDown;
constexpr int U = kUp;

// Table II-A, normal inspection, Ac by letter for AQL 0.65, 1.0, 1.5, 2.5, 4.0, 6.5 (percent).
constexpr std::array<double, 6> kTableAqls = {0.65, 1.0, 1.5, 2.5, 4.0, 6.5};
constexpr int kTableIIA[16][6] = {
    {D, D, D, D, D, 0},     // A
    {D, D, D, D, 0, U},     // B
    {D, D, D, 0, U, D},     // C
    {D, D, 0, U, D, 1},     // D
    {D, 0, U, D, 1, 2},     // E
    {0, U, D, 1, 2, 3},     // F
    {U, D, 1, 2, 3, 5},     // G
    {D, 1, 2, 3, 5, 7},     // H
    {1, 2, 3, 5, 7, 10},    // J
    {2, 3, 5, 7, 10, 14},   // K
    {3, 5, 7, 10, 14, 21},  // L
    {5, 7, 10, 14, 21, U},  // M
    {7, 10, 14, 21, U, U},  // N
    {10, 14, 21, U, U, U},  // P
    {14, 21, U, U, U, U},   // Q
    {21, U, U, U, U, U},    // R
};

// Smaller AQLs (0.40, 0.25, 0.15, 0.10), from memory of the table's structure: in Table II-A
// each AQL column is the next larger one moved down by one code letter, with down arrows
// filling the rows moved in at the top. So entry(letter i, AQL column c - s) equals
// entry(letter i - s, column c), and rows above the shifted start read "down".
constexpr std::array<double, 4> kShiftedAqls = {0.40, 0.25, 0.15, 0.10};  // shift 1, 2, 3, 4

// Ac or an arrow for letter index i and AQL; nullopt when the AQL is not known here.
std::optional<int> table_entry(std::size_t i, double aql_pct) {
  for (std::size_t c = 0; c < kTableAqls.size(); ++c)
    if (std::abs(kTableAqls[c] - aql_pct) < 1e-9) return kTableIIA[i][c];
  for (std::size_t s = 0; s < kShiftedAqls.size(); ++s) {
    if (std::abs(kShiftedAqls[s] - aql_pct) < 1e-9) {
      const std::size_t shift = s + 1;
      return i >= shift ? kTableIIA[i - shift][0] : kDown;
    }
  }
  return std::nullopt;
}

std::size_t letter_index(char letter) {
  const auto it = std::find(kLetters.begin(), kLetters.end(), letter);
  return static_cast<std::size_t>(it - kLetters.begin());
}

}  // namespace

std::optional<char> code_letter(std::size_t lot_size, InspectionLevel level) {
  if (lot_size < 2) return std::nullopt;
  for (const auto& band : kTableI)
    if (lot_size <= band.max_lot) return band.level[static_cast<int>(level)];
  return std::nullopt;  // unreachable: the last band is open-ended
}

std::size_t sample_size_for_letter(char letter) {
  const std::size_t i = letter_index(letter);
  return i < kSampleSizes.size() ? kSampleSizes[i] : 0;
}

const std::vector<double>& tabulated_aqls() {
  static const std::vector<double> aqls = [] {
    std::vector<double> v(kShiftedAqls.rbegin(), kShiftedAqls.rend());
    v.insert(v.end(), kTableAqls.begin(), kTableAqls.end());
    return v;
  }();
  return aqls;
}

bool is_tabulated_aql(double aql_pct) { return table_entry(0, aql_pct).has_value(); }

SamplingPlan single_sampling_plan(std::size_t lot_size, InspectionLevel level, double aql_pct) {
  assert(lot_size >= 1 && is_tabulated_aql(aql_pct));
  SamplingPlan plan;
  plan.lot_size = lot_size;
  plan.level = level;
  plan.aql_pct = aql_pct;
  const auto letter = code_letter(lot_size, level);
  if (!letter) {
    plan.sample_size = lot_size;
    plan.accept_number = 0;
    plan.reject_number = 1;
    plan.full_inspection = true;
    plan.description = "A lot of one unit is inspected in full and accepted only if it conforms.";
    return plan;
  }
  plan.code_letter = *letter;
  std::size_t i = letter_index(*letter);
  int entry = *table_entry(i, aql_pct);
  std::string path;
  while (entry < 0) {
    const bool down = entry == kDown;
    i = down ? i + 1 : i - 1;
    assert(i < kLetters.size());
    entry = *table_entry(i, aql_pct);
    if (path.empty()) path = down ? "follows the arrow down" : "follows the arrow up";
  }
  plan.plan_letter = kLetters[i];
  plan.sample_size = kSampleSizes[i];
  plan.accept_number = entry;
  plan.reject_number = entry + 1;
  plan.full_inspection = plan.sample_size >= lot_size;

  plan.description = fmt::format(
      "Lot of {} units, general inspection level {}: code letter {} (ISO 2859-1 Table I)", lot_size,
      to_string(level), plan.code_letter);
  if (!path.empty())
    plan.description +=
        fmt::format("; at AQL {} % Table II-A {} to letter {}", aql_pct, path, plan.plan_letter);
  plan.description += fmt::format(": sample size {}, Ac {}, Re {}", plan.sample_size,
                                  plan.accept_number, plan.reject_number);
  if (plan.full_inspection)
    plan.description += fmt::format(
        "; the sample size is at or above the lot size, so all {} "
        "units are inspected",
        lot_size);
  plan.description += ".";
  return plan;
}

}  // namespace photolot
