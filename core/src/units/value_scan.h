// Internal to core: the value scanners behind parse_number / parse_resistance, with the extra
// facts the importer needs (the rounding step of the value as written, and whether the text
// carried its own multiplier or unit). Not a public header.
#pragma once

#include <array>
#include <bit>
#include <cstdint>
#include <cstring>
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

// Half the place value of the last digit for 1 .. 22 decimals: 0.5 * (1.0 / 10^k), the same
// correctly rounded operations the scanners do, computed once.
inline constexpr std::array<double, 23> kHalfStepsBelowOne = [] {
  std::array<double, 23> t{};
  for (std::size_t i = 0; i < t.size(); ++i) t[i] = 0.5 * (1.0 / kExactPowersOfTen[i]);
  return t;
}();

// One 64-bit word read as eight characters (byte 0 first): the mantissa of a short plain
// number, digits[<decimal>digits], that ends inside the word (at most 7 characters) and at or
// before `avail` characters. Returns how many characters it took (0: not such a number; the
// caller then reads digit by digit) and sets the digit counts. SWAR: all eight bytes are tested
// and converted at once.
[[gnu::always_inline]] inline std::size_t scan_digits_word(const char* p, std::size_t avail,
                                                           char decimal, std::uint64_t& mantissa,
                                                           std::ptrdiff_t& int_digits,
                                                           std::ptrdiff_t& frac_digits) {
  if constexpr (std::endian::native != std::endian::little) return 0;
  std::uint64_t word;
  std::memcpy(&word, p, 8);
  // A byte is a digit when its high nibble is 3 and adding 6 keeps it so. A carry out of a
  // byte of 0xFA or more spills only into later bytes, past a byte that ends the number.
  std::uint64_t bad = ((word & 0xF0F0F0F0F0F0F0F0) ^ 0x3030303030303030) |
                      (((word + 0x0606060606060606) & 0xF0F0F0F0F0F0F0F0) ^ 0x3030303030303030);
  bad |= bad >> 4;  // per byte: low nibble non-zero when the byte is not a digit
  const std::uint64_t non_digit = ((bad & 0x0F0F0F0F0F0F0F0F) + 0x7F7F7F7F7F7F7F7F) &
                                  0x8080808080808080;  // bit 7 of each non-digit byte
  if (non_digit == 0) return 0;
  const std::size_t first = static_cast<std::size_t>(__builtin_ctzll(non_digit)) / 8;
  if (first == 0 || first > avail) return 0;
  std::uint64_t merged = word;
  std::size_t taken = first, digits = first;
  if (first < avail && p[first] == decimal) {
    if (first >= 6) return 0;
    const std::uint64_t rest = non_digit & (~std::uint64_t{0} << (8 * first + 8));
    if (rest == 0) return 0;
    taken = static_cast<std::size_t>(__builtin_ctzll(rest)) / 8;
    if (taken > avail || taken == first + 1) return 0;
    digits = taken - 1;
    const std::uint64_t low = (std::uint64_t{1} << (8 * first)) - 1;
    merged = (word & low) | ((word >> 8) & ~low);  // the decimal mark taken out
  }
  // The digits to the top bytes (the zeros above them are leading zeros), then pairs, fours,
  // eight: the well-known multiply-and-shift reduction of eight digits.
  std::uint64_t v = (merged - 0x3030303030303030) << (8 * (8 - digits));
  v = v * 10 + (v >> 8);
  v = (((v & 0x000000FF000000FF) * (100 + (1000000ULL << 32))) +
       (((v >> 16) & 0x000000FF000000FF) * (1 + (10000ULL << 32)))) >>
      32;
  mantissa = v & 0xFFFFFFFF;
  int_digits = static_cast<std::ptrdiff_t>(first);
  frac_digits = static_cast<std::ptrdiff_t>(digits - first);
  return taken;
}

// The common case of every scanner below, inline: text that is exactly a plain number
// [+-]digits[<decimal>digits][e[+-]digits] with at least one digit before and after the mark,
// at most 19 digits and a rounding step within 10^+-22. Gives the value and half step the full
// scanners give (the same single correctly rounded operation), self_scaled false; false for
// anything else, which the full scanners then read. readable_end (null: the text's end) is
// how far past the text bytes may be read: with eight bytes readable, a short mantissa is read
// in one word.
[[gnu::always_inline]] inline bool scan_plain(std::string_view t, char decimal, ScannedValue& out,
                                              const char* readable_end = nullptr) {
  const char* p = t.data();
  const char* const end = p + t.size();
  if (readable_end == nullptr || readable_end < end) readable_end = end;
  bool negative = false;
  if (p < end && (*p == '-' || *p == '+')) negative = *p++ == '-';
  std::uint64_t mantissa = 0;
  unsigned d;
  std::ptrdiff_t int_digits = 0, frac_digits = 0;
  if (std::size_t taken; readable_end - p >= 8 &&
                         (taken = scan_digits_word(p, static_cast<std::size_t>(end - p), decimal,
                                                   mantissa, int_digits, frac_digits)) != 0) {
    p += taken;
  } else {
    const char* const digits_start = p;
    while (p < end && (d = static_cast<unsigned char>(*p) - '0') <= 9) {
      mantissa = mantissa * 10 + d;
      ++p;
    }
    int_digits = p - digits_start;
    if (int_digits == 0) return false;
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
  }
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
  out.half_step = step >= 0 ? 0.5 * kExactPowersOfTen[static_cast<std::size_t>(step)]
                            : kHalfStepsBelowOne[static_cast<std::size_t>(-step)];
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
