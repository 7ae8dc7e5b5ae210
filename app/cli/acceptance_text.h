// photolot-cli's lines for the lot statistics, the spec's verdicts and the disposition.
#pragma once

#include <string>
#include <vector>

#include "photolot/acceptance.h"
#include "photolot/pairing.h"
#include "photolot/statistics.h"
#include "table.h"

namespace photolot::cli {

// The lot's spread: geometric mean and spread factor of R10, gamma, tolerance intervals,
// outliers.
std::string statistics_lines(const LotStatistics& stats, const TextStyle& style);

// The spec's verdict counts, each nonconforming unit with its reasons (at most max_units of
// them; 0: all), and the disposition with the rule that decided it.
std::string acceptance_lines(const Spec& spec, const std::vector<UnitVerdict>& verdicts,
                             const Acceptance& acceptance, std::size_t max_units,
                             const TextStyle& style);

// The pairs in short: how many, among how many eligible units, the worst error and whether the
// pairing is proved optimal (the pairs themselves are in the results document and pick list).
std::string pairing_lines(const Pairing& pairing, const TextStyle& style);

}  // namespace photolot::cli
