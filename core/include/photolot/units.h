// Units and number syntax of the bench logs.
//   - illuminance: lx = lm/m^2; 1 fc = 1 lm/ft^2 = 1 / 0.3048^2 lx (NIST SP 811, App. B.8)
//   - values with SI prefixes ("12.3k", "1.5M") and IEC 60062 letter codes ("4k7", "1M0", "R47")
#pragma once

#include <optional>
#include <string_view>

namespace photolot {

inline constexpr double kLuxPerFootcandle = 1.0 / (0.3048 * 0.3048);  // 10.763 910 416 709 722

// A resistance written as a plain number, with an SI prefix, or in IEC 60062 letter code, with
// an optional trailing unit ("ohm", "Ω") and, for letter codes, an optional tolerance letter.
// `decimal` is '.' or ','. Returns nullopt when the text is not such a value.
std::optional<double> parse_resistance(std::string_view text, char decimal = '.');

// A plain decimal number (optionally with an SI prefix when allow_prefix), locale-independent.
std::optional<double> parse_number(std::string_view text, char decimal = '.', bool allow_prefix = false);

}  // namespace photolot
