// Text output of photolot-cli: the per-unit table, the lot's counts and the input messages.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "photolot/fit_result.h"
#include "photolot/lot.h"
#include "photolot/number_format.h"

namespace photolot::cli {

struct TextStyle {
  bool unicode = true;  // "Ω" and "–"; false: "ohm" and "-" (plain ASCII)
};

// True when the environment's character type (LC_ALL, LC_CTYPE, LANG) says UTF-8.
bool environment_is_utf8();

// The shared formatter (photolot/number_format.h) in the table's style: "18.7 kΩ", "2.10 MΩ",
// "470 Ω" (ASCII: "18.7 kohm"); "-" when not finite.
OhmFormat ohm_format(const TextStyle& style);
std::string format_ohm(double ohm, const TextStyle& style);
// An interval in the prefix of `reference`: "18.5–18.9 kΩ".
std::string format_ohm_range(double lo, double hi, double reference, const TextStyle& style);

// The aligned table, one row per unit, with a header row.
std::string unit_table(const std::vector<UnitFit>& units, const TextStyle& style);

// The lot's counts: units, fitted, not fitted by reason, readings, censored, dark, rows skipped.
std::string lot_summary(const Lot& lot, const LotFit& fit);

// One "file:line:column: severity: message" line per diagnostic, at most `max_shown` of them
// (0: all), then a line saying how many more there are and where they all are (`all_in`, e.g.
// the results document's path; empty: how to show them all).
std::string diagnostic_lines(const std::vector<Diagnostic>& diagnostics, std::size_t max_shown,
                             const std::string& all_in);
std::string diagnostic_line(const std::string& file, std::uint32_t line, std::uint32_t column,
                            std::string_view severity, const std::string& message);

}  // namespace photolot::cli
