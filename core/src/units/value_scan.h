// Internal to core: the value scanners behind parse_number / parse_resistance, with the extra
// facts the importer needs (the rounding step of the value as written, and whether the text
// carried its own multiplier or unit). Not a public header.
#pragma once

#include <array>
#include <cstdint>
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

// 10^0 .. 10^22: every one exactly representable in a double.
inline constexpr std::array<double, 23> kExactPowersOfTen = [] {
  std::array<double, 23> t{};
  double v = 1;
  for (std::size_t i = 0; i < t.size(); ++i, v *= 10) t[i] = v;
  return t;
}();

// The common case of every scanner below, inline: text that is exactly a plain number
// [+-]digits[<decimal>digits][e[+-]digits] with at least one digit before and after the mark,
// at most 19 digits and a rounding step within 10^+-22. Gives the value and half step the full
// scanners give (the same single correctly rounded operation), self_scaled false; false for
// anything else, which the full scanners then read.
[[gnu::always_inline]] inline bool scan_plain(std::string_view t, char decimal, ScannedValue& out) {
  const char* p = t.data();
  const char* const end = p + t.size();
  bool negative = false;
  if (p < end && (*p == '-' || *p == '+')) negative = *p++ == '-';
  const char* const digits_start = p;
  std::uint64_t mantissa = 0;
  unsigned d;
  while (p < end && (d = static_cast<unsigned char>(*p) - '0') <= 9) {
    mantissa = mantissa * 10 + d;
    ++p;
  }
  const std::ptrdiff_t int_digits = p - digits_start;
  if (int_digits == 0) return false;
  std::ptrdiff_t frac_digits = 0;
  if (p < end && *p == decimal) {
    const char* const frac_start = ++p;
    while (p < end && (d = static_cast<unsigned char>(*p) - '0') <= 9) {
      mantissa = mantissa * 10 + d;
      ++p;
    }
    frac_digits = p - frac_start;
    if (frac_digits == 0) return false;
  }
  if (int_digits + frac_digits > 19) return false;
  int exponent = 0;
  if (p < end) {
    if (*p != 'e' && *p != 'E') return false;
    ++p;
    bool exp_negative = false;
    if (p < end && (*p == '-' || *p == '+')) exp_negative = *p++ == '-';
    const char* const exp_start = p;
    while (p < end && (d = static_cast<unsigned char>(*p) - '0') <= 9 && p - exp_start < 4) {
      exponent = exponent * 10 + static_cast<int>(d);
      ++p;
    }
    if (p == exp_start || p != end) return false;
    if (exp_negative) exponent = -exponent;
  }
  const int step = exponent - static_cast<int>(frac_digits);
  if (mantissa > (std::uint64_t{1} << 53) || step < -22 || step > 22) return false;
  const double m = static_cast<double>(mantissa);
  const double value = step >= 0 ? m * kExactPowersOfTen[static_cast<std::size_t>(step)]
                                 : m / kExactPowersOfTen[static_cast<std::size_t>(-step)];
  out.value = negative ? -value : value;
  out.half_step = 0.5 * (step >= 0 ? kExactPowersOfTen[static_cast<std::size_t>(step)]
                                   : 1.0 / kExactPowersOfTen[static_cast<std::size_t>(-step)]);
  out.self_scaled = false;
  return true;
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
