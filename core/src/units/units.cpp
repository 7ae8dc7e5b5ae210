// Units and value syntax of the bench logs (see photolot/units.h and value_scan.h).
//
// Value syntax, in order of trial (IEC 60062 for the letter code; SI Brochure for prefixes):
//   plain number   [+-]digits[<decimal>digits][e[+-]digits]        "4700", "4,7e3"
//   SI prefix      number [spaces] p n u µ m k K M G T              "12.3k", "1.5 M"
//   letter code    digits L|R|K|k|M|G|T|m digits, or the letter first "4k7", "1M0", "R47", "6L8"
//   tolerance      one of B C D F G J K M N after a multiplier       "27KK", "4K7J"
//   unit           "ohm", "ohms", "Ω" (U+03A9) or "Ω" (U+2126)      "4.7 kΩ", "220 ohm"
// Numbers go through std::from_chars, never the C locale.
#include "photolot/units.h"

#include <array>
#include <charconv>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <limits>
#include <string>

#include "value_scan.h"

namespace photolot {

std::string_view to_string(Quantity quantity) {
  switch (quantity) {
    case Quantity::illuminance:
      return "illuminance";
    case Quantity::resistance:
      return "resistance";
    case Quantity::temperature:
      return "temperature";
  }
  return "?";
}

namespace {

constexpr std::string_view kOmega = "\xCE\xA9";        // U+03A9 GREEK CAPITAL LETTER OMEGA
constexpr std::string_view kOhmSign = "\xE2\x84\xA6";  // U+2126 OHM SIGN
constexpr std::string_view kMicro = "\xC2\xB5";        // U+00B5 MICRO SIGN
constexpr std::string_view kMu = "\xCE\xBC";           // U+03BC GREEK SMALL LETTER MU

using detail::kExactPowersOfTen;

// 10^e for the rounding step of a value as written (not needed exact).
double pow10i(int e) {
  if (e >= 0 && e <= 22) return kExactPowersOfTen[static_cast<std::size_t>(e)];
  if (e < 0 && e >= -22) return 1.0 / kExactPowersOfTen[static_cast<std::size_t>(-e)];
  return std::pow(10.0, e);
}

bool is_digit(char c) { return c >= '0' && c <= '9'; }

char ascii_lower(char c) { return (c >= 'A' && c <= 'Z') ? static_cast<char>(c - 'A' + 'a') : c; }

bool iequals(std::string_view a, std::string_view b) {
  if (a.size() != b.size()) return false;
  for (std::size_t i = 0; i < a.size(); ++i)
    if (ascii_lower(a[i]) != ascii_lower(b[i])) return false;
  return true;
}

struct Decimal {
  double value = 0;
  int step_exp = 0;  // place value of the last digit written: 10^step_exp
  std::size_t length = 0;
  bool point_or_exponent = false;
};

// The slow path: std::from_chars on the digits (with '.' for the decimal mark).
[[gnu::noinline]] std::optional<double> digits_to_double(std::string_view body, char decimal) {
  std::string copy(body);
  if (decimal != '.')
    for (char& c : copy)
      if (c == decimal) c = '.';
  double value = 0;
  auto [end, ec] =
      std::from_chars(copy.data(), copy.data() + copy.size(), value, std::chars_format::general);
  if (ec == std::errc::result_out_of_range) return std::numeric_limits<double>::infinity();
  if (ec != std::errc() || end != copy.data() + copy.size()) return std::nullopt;
  return value;
}

// A decimal number at the start of s; nullopt when s does not start with one.
// Fast path (Clinger, "How to read floating point numbers accurately", 1990): with at most
// 2^53 as the digits' integer and |exponent| <= 22, both are exact doubles and one IEEE
// multiplication or division rounds correctly, so the result equals std::from_chars'.
std::optional<Decimal> scan_decimal(std::string_view s, char decimal) {
  const std::size_t n = s.size();
  std::size_t pos = 0;
  bool negative = false;
  if (pos < n && (s[pos] == '+' || s[pos] == '-')) negative = s[pos++] == '-';
  const std::size_t digits_start = pos;
  // Every digit goes into mantissa (leading zeros too); past 19 digits it may wrap, and then
  // from_chars decides.
  std::uint64_t mantissa = 0;
  while (pos < n && is_digit(s[pos]))
    mantissa = mantissa * 10 + static_cast<std::uint64_t>(s[pos++] - '0');
  const std::size_t int_digits = pos - digits_start;
  std::size_t frac_digits = 0;
  bool point = false;
  if (pos < n && s[pos] == decimal) {
    std::size_t p = pos + 1;
    while (p < n && is_digit(s[p]))
      mantissa = mantissa * 10 + static_cast<std::uint64_t>(s[p++] - '0');
    frac_digits = p - pos - 1;
    if (int_digits + frac_digits > 0) {
      point = true;
      pos = p;
    }
  }
  if (int_digits + frac_digits == 0) return std::nullopt;
  const bool overflow = int_digits + frac_digits > 19;
  int exponent = 0;
  bool has_exponent = false;
  if (pos < n && (s[pos] == 'e' || s[pos] == 'E')) {
    std::size_t p = pos + 1;
    bool exp_negative = false;
    if (p < n && (s[p] == '+' || s[p] == '-')) exp_negative = s[p++] == '-';
    if (p < n && is_digit(s[p])) {
      int e = 0;
      while (p < n && is_digit(s[p])) {
        if (e < 10000) e = e * 10 + (s[p] - '0');
        ++p;
      }
      exponent = exp_negative ? -e : e;
      has_exponent = true;
      pos = p;
    }
  }
  Decimal d;
  d.step_exp = exponent - static_cast<int>(frac_digits);
  d.length = pos;
  d.point_or_exponent = point || has_exponent;
  double value;
  if (!overflow && mantissa <= (std::uint64_t{1} << 53) && d.step_exp >= -22 && d.step_exp <= 22) {
    const double m = static_cast<double>(mantissa);
    value = d.step_exp >= 0 ? m * kExactPowersOfTen[static_cast<std::size_t>(d.step_exp)]
                            : m / kExactPowersOfTen[static_cast<std::size_t>(-d.step_exp)];
  } else {
    const auto slow = digits_to_double(s.substr(digits_start, pos - digits_start), decimal);
    if (!slow) return std::nullopt;
    value = *slow;
  }
  d.value = negative ? -value : value;
  return d;
}

// The digits after an IEC 60062 multiplier letter: s[from...] are the fraction's digits, the
// integer part is already read. 4K7 = (4 * 10 + 7) * 1e3 / 10: one rounding where it can.
struct LetterCode {
  double value = 0;
  double half_step = 0;
  std::size_t end = 0;
};

LetterCode letter_code(std::uint64_t integer, std::string_view s, std::size_t from, double mult) {
  std::uint64_t digits = integer;
  std::size_t p = from;
  int places = 0;
  while (p < s.size() && is_digit(s[p]) && places < 15) {
    digits = digits * 10 + static_cast<std::uint64_t>(s[p] - '0');
    ++places;
    ++p;
  }
  while (p < s.size() && is_digit(s[p])) ++p;  // beyond double precision anyway
  const double scale = kExactPowersOfTen[static_cast<std::size_t>(places)];
  LetterCode code;
  code.value = static_cast<double>(digits) * mult / scale;
  code.half_step = 0.5 * mult / scale;
  code.end = p;
  return code;
}

// An SI prefix at the start of s: its multiplier and byte length.
std::optional<std::pair<double, std::size_t>> scan_si_prefix(std::string_view s) {
  if (s.empty()) return std::nullopt;
  if (s.starts_with(kMicro) || s.starts_with(kMu)) return std::pair{1e-6, std::size_t{2}};
  switch (s[0]) {
    case 'p':
      return std::pair{1e-12, std::size_t{1}};
    case 'n':
      return std::pair{1e-9, std::size_t{1}};
    case 'u':
      return std::pair{1e-6, std::size_t{1}};
    case 'm':
      return std::pair{1e-3, std::size_t{1}};
    case 'k':
    case 'K':
      return std::pair{1e3, std::size_t{1}};
    case 'M':
      return std::pair{1e6, std::size_t{1}};
    case 'G':
      return std::pair{1e9, std::size_t{1}};
    case 'T':
      return std::pair{1e12, std::size_t{1}};
    default:
      return std::nullopt;
  }
}

// An IEC 60062 multiplier letter (lower-case k, r and l accepted; m is milli as in SI).
std::optional<double> letter_multiplier(char c) {
  switch (c) {
    case 'L':
    case 'l':
    case 'm':
      return 1e-3;
    case 'R':
    case 'r':
      return 1.0;
    case 'K':
    case 'k':
      return 1e3;
    case 'M':
      return 1e6;
    case 'G':
      return 1e9;
    case 'T':
      return 1e12;
    default:
      return std::nullopt;
  }
}

// IEC 60062 tolerance letters.
bool is_tolerance_letter(char c) {
  return std::string_view("BCDFGJKMN").find(c) != std::string_view::npos;
}

// "ohm", "ohms", "Ω", "Ω" at the start of s: byte length, or 0.
std::size_t ohm_unit_length(std::string_view s) {
  if (s.starts_with(kOmega)) return kOmega.size();
  if (s.starts_with(kOhmSign)) return kOhmSign.size();
  if (s.size() >= 4 && iequals(s.substr(0, 4), "ohms")) return 4;
  if (s.size() >= 3 && iequals(s.substr(0, 3), "ohm")) return 3;
  return 0;
}

std::string_view skip_spaces(std::string_view s) {
  std::size_t i = 0;
  while (i < s.size() && (s[i] == ' ' || s[i] == '\t')) ++i;
  return s.substr(i);
}

}  // namespace

namespace detail {

bool is_non_finite_word(std::string_view text) {
  text = trim(text);
  if (!text.empty() && (text[0] == '+' || text[0] == '-')) text.remove_prefix(1);
  return iequals(text, "nan") || iequals(text, "inf") || iequals(text, "infinity");
}

std::optional<ScannedValue> scan_number(std::string_view text, char decimal, bool allow_prefix) {
  const std::string_view t = trim(text);
  const auto d = scan_decimal(t, decimal);
  if (!d) return std::nullopt;
  std::string_view rest = t.substr(d->length);
  ScannedValue v{d->value, 0.5 * pow10i(d->step_exp), false};
  if (rest.empty()) return v;
  if (!allow_prefix) return std::nullopt;
  rest = skip_spaces(rest);
  const auto prefix = scan_si_prefix(rest);
  if (!prefix || prefix->second != rest.size()) return std::nullopt;
  v.value *= prefix->first;
  v.half_step *= prefix->first;
  return v;
}

std::optional<ScannedValue> scan_resistance(std::string_view text, char decimal) {
  std::string_view t = trim(text);
  if (t.empty()) return std::nullopt;
  ScannedValue v;
  std::string_view rest;
  bool multiplier_seen = false;

  if (const auto mult = letter_multiplier(t[0]); mult && t.size() > 1 && is_digit(t[1])) {
    // Letter first: "R47" = 0.47 ohm, "K47" = 470 ohm.
    const LetterCode code = letter_code(0, t, 1, *mult);
    v.value = code.value;
    v.half_step = code.half_step;
    rest = t.substr(code.end);
    multiplier_seen = true;
  } else {
    const auto d = scan_decimal(t, decimal);
    if (!d) return std::nullopt;
    rest = t.substr(d->length);
    v.value = d->value;
    v.half_step = 0.5 * pow10i(d->step_exp);
    if (rest.empty()) return v;  // plain number: the column's unit applies
    const auto letter = letter_multiplier(rest[0]);
    // An integer part of 2^53 or more is no RKM code (and would not fit the integer below).
    if (!d->point_or_exponent && letter && rest.size() > 1 && is_digit(rest[1]) &&
        std::abs(d->value) < 9007199254740992.0) {
      // Letter as the decimal point: "4K7", "1M0", "6L8", "47K3".
      const LetterCode code =
          letter_code(static_cast<std::uint64_t>(std::abs(d->value)), rest, 1, *letter);
      v.value = std::signbit(d->value) ? -code.value : code.value;
      v.half_step = code.half_step;
      rest = rest.substr(code.end);
      multiplier_seen = true;
    } else {
      rest = skip_spaces(rest);
      if (const auto prefix = scan_si_prefix(rest);
          prefix &&
          (rest.size() == prefix->second || ohm_unit_length(rest.substr(prefix->second)) ||
           rest[prefix->second] == ' ' || is_tolerance_letter(rest[prefix->second]))) {
        v.value *= prefix->first;
        v.half_step *= prefix->first;
        rest = rest.substr(prefix->second);
        multiplier_seen = true;
      } else if (!rest.empty() && (rest[0] == 'R' || rest[0] == 'r' || rest[0] == 'L') &&
                 (rest.size() == 1 || is_tolerance_letter(rest[1]))) {
        // "470R": the letter code's unit multiplier with nothing after it.
        const double m = rest[0] == 'L' ? 1e-3 : 1.0;
        v.value *= m;
        v.half_step *= m;
        rest = rest.substr(1);
        multiplier_seen = true;
      }
    }
  }
  if (multiplier_seen && !rest.empty() && is_tolerance_letter(rest[0]) &&
      (rest.size() == 1 || rest[1] == ' ' || ohm_unit_length(rest.substr(1)))) {
    rest = rest.substr(1);  // "27KK": K multiplier, K (10 %) tolerance
  }
  rest = skip_spaces(rest);
  if (const std::size_t n = ohm_unit_length(rest)) {
    rest = rest.substr(n);
    multiplier_seen = true;
  }
  if (!rest.empty()) return std::nullopt;
  v.self_scaled = multiplier_seen;
  return v;
}

std::optional<ScannedValue> scan_quantity(std::string_view text, char decimal, Quantity quantity) {
  if (quantity == Quantity::resistance) return scan_resistance(text, decimal);
  const std::string_view t = trim(text);
  const auto d = scan_decimal(t, decimal);
  if (!d) return std::nullopt;
  ScannedValue v{d->value, 0.5 * pow10i(d->step_exp), false};
  const std::string_view rest = skip_spaces(t.substr(d->length));
  if (rest.empty()) return v;
  if (quantity == Quantity::illuminance) {
    if (const auto prefix = scan_si_prefix(rest); prefix && prefix->second == rest.size()) {
      v.value *= prefix->first;
      v.half_step *= prefix->first;
      return v;
    }
  }
  const auto unit = find_unit(rest);
  if (!unit || unit->quantity != quantity) return std::nullopt;
  v.value = v.value * unit->scale + unit->offset;
  v.half_step *= unit->scale;
  v.self_scaled = true;
  return v;
}

}  // namespace detail

std::optional<UnitInfo> find_unit(std::string_view symbol) {
  // Drop spaces (and no-break spaces) inside: "k Ω", "deg C".
  char buf[40];
  std::size_t n = 0;
  for (std::size_t i = 0; i < symbol.size(); ++i) {
    if (symbol[i] == ' ' || symbol[i] == '\t') continue;
    if (symbol.substr(i).starts_with("\xC2\xA0")) {
      ++i;
      continue;
    }
    if (n == sizeof buf) return std::nullopt;
    buf[n++] = symbol[i];
  }
  const std::string_view s(buf, n);
  if (s.empty()) return std::nullopt;

  const UnitInfo lx{"lx", Quantity::illuminance, 1, 0};
  const UnitInfo klx{"klx", Quantity::illuminance, 1e3, 0};
  const UnitInfo fc{"fc", Quantity::illuminance, kLuxPerFootcandle, 0};
  const UnitInfo ohm{"ohm", Quantity::resistance, 1, 0};
  const UnitInfo kohm{"kohm", Quantity::resistance, 1e3, 0};
  const UnitInfo mohm{"Mohm", Quantity::resistance, 1e6, 0};
  const UnitInfo degc{"degC", Quantity::temperature, 1, 0};
  const UnitInfo kelvin{"K", Quantity::temperature, 1, -273.15};
  const UnitInfo degf{"degF", Quantity::temperature, 5.0 / 9.0, -32.0 * 5.0 / 9.0};

  // Symbols with Ω keep their case: the prefix letter decides.
  for (std::string_view omega : {kOmega, kOhmSign}) {
    if (s.ends_with(omega)) {
      const std::string_view prefix = s.substr(0, s.size() - omega.size());
      if (prefix.empty()) return ohm;
      if (prefix == "k" || prefix == "K") return kohm;
      if (prefix == "M") return mohm;
      return std::nullopt;
    }
  }
  if (s == "K") return kelvin;
  for (std::string_view deg : {std::string_view("\xC2\xB0"), std::string_view("\xC2\xBA")}) {
    // "°C" (U+00B0 DEGREE SIGN) and the look-alike "ºC" (U+00BA) often typed for it.
    if (s.starts_with(deg)) {
      const std::string_view rest = s.substr(deg.size());
      if (iequals(rest, "C")) return degc;
      if (iequals(rest, "F")) return degf;
      return std::nullopt;
    }
  }
  if (s == "\xE2\x84\x83") return degc;  // U+2103 DEGREE CELSIUS
  if (s == "\xE2\x84\x89") return degf;  // U+2109 DEGREE FAHRENHEIT

  struct Word {
    std::string_view word;
    const UnitInfo* unit;
  };
  const Word words[] = {
      {"lx", &lx},          {"lux", &lx},         {"klx", &klx},         {"klux", &klx},
      {"kilolux", &klx},    {"fc", &fc},          {"ftc", &fc},          {"footcandle", &fc},
      {"footcandles", &fc}, {"foot-candle", &fc}, {"foot-candles", &fc}, {"ohm", &ohm},
      {"ohms", &ohm},       {"kohm", &kohm},      {"kohms", &kohm},      {"kiloohm", &kohm},
      {"kiloohms", &kohm},  {"kilohm", &kohm},    {"kilohms", &kohm},    {"mohm", &mohm},
      {"mohms", &mohm},     {"megohm", &mohm},    {"megohms", &mohm},    {"megaohm", &mohm},
      {"megaohms", &mohm},  {"c", &degc},         {"degc", &degc},       {"deg.c", &degc},
      {"celsius", &degc},   {"k", &kelvin},       {"kelvin", &kelvin},   {"f", &degf},
      {"degf", &degf},      {"deg.f", &degf},     {"fahrenheit", &degf},
  };
  for (const auto& w : words)
    if (iequals(s, w.word)) return *w.unit;
  return std::nullopt;
}

std::optional<double> parse_resistance(std::string_view text, char decimal) {
  const auto v = detail::scan_resistance(text, decimal);
  if (!v) return std::nullopt;
  return v->value;
}

std::optional<double> parse_number(std::string_view text, char decimal, bool allow_prefix) {
  const auto v = detail::scan_number(text, decimal, allow_prefix);
  if (!v) return std::nullopt;
  return v->value;
}

}  // namespace photolot
