// Internal to core: the value scanners behind parse_number / parse_resistance, with the extra
// facts the importer needs (the rounding step of the value as written, and whether the text
// carried its own multiplier or unit). Not a public header.
#pragma once

#include <optional>
#include <string_view>

#include "photolot/units.h"

namespace photolot::detail {

struct ScannedValue {
  double value = 0;          // for resistance: ohm when self_scaled, else in the column's unit
  double half_step = 0;      // half the place value of the last digit written, same unit as value
  bool self_scaled = false;  // the text had a prefix, letter code or unit of its own
};

// Trims ASCII spaces and tabs.
inline std::string_view trim(std::string_view text) {
  std::size_t b = 0, e = text.size();
  while (b < e && (text[b] == ' ' || text[b] == '\t')) ++b;
  while (e > b && (text[e - 1] == ' ' || text[e - 1] == '\t')) --e;
  return text.substr(b, e - b);
}

// A resistance: plain number (column unit applies), SI prefix or IEC 60062 letter code with an
// optional tolerance letter, optional trailing "ohm"/"Ω" (self-scaled, in ohm).
std::optional<ScannedValue> scan_resistance(std::string_view text, char decimal);

// An illuminance or temperature: plain number, or a number with a unit of that quantity
// ("10 fc", "25 °C"; self-scaled, in base units). For illuminance an SI prefix ("1.2k")
// multiplies the column's unit and is not self-scaled.
std::optional<ScannedValue> scan_quantity(std::string_view text, char decimal, Quantity quantity);

// A plain number with an optional SI prefix (allow_prefix).
std::optional<ScannedValue> scan_number(std::string_view text, char decimal, bool allow_prefix);

// Whether the text names a non-finite value ("nan", "inf", "-inf", "infinity"), any case.
bool is_non_finite_word(std::string_view text);

}  // namespace photolot::detail
