// Units and number syntax of the bench logs.
//   - illuminance: lx = lm/m^2; 1 fc = 1 lm/ft^2 = 1 / 0.3048^2 lx (NIST SP 811, App. B.8)
//   - values with SI prefixes ("12.3k", "1.5M") and IEC 60062 letter codes ("4k7", "1M0", "R47")
//   - temperature: degC = K - 273.15; degC = (degF - 32) * 5/9
#pragma once

#include <cstdint>
#include <optional>
#include <string_view>

namespace photolot {

inline constexpr double kLuxPerFootcandle = 1.0 / (0.3048 * 0.3048);  // 10.763 910 416 709 722

constexpr double lux_from_footcandles(double fc) { return fc * kLuxPerFootcandle; }
constexpr double footcandles_from_lux(double lux) { return lux / kLuxPerFootcandle; }

// The quantities a bench log holds; their base units are lx, ohm and degC.
enum class Quantity : std::uint8_t { illuminance, resistance, temperature };
std::string_view to_string(Quantity quantity);

// A unit of one of those quantities: base = value * scale + offset.
struct UnitInfo {
  std::string_view canonical;  // "lx", "klx", "fc", "ohm", "kohm", "Mohm", "degC", "K", "degF"
  Quantity quantity = Quantity::illuminance;
  double scale = 1;
  double offset = 0;
};

// Looks a unit up by how logs write it: "lx", "lux", "fc", "Ω", "ohm", "kΩ", "kohm", "MΩ",
// "Mohm", "°C", "degC", "K", "°F"... Spaces inside are ignored ("k Ω", "deg C"); word forms are
// case-insensitive ("KOHM", "Lux"), symbols keep their case ("MΩ" is mega, "mΩ" is not known).
std::optional<UnitInfo> find_unit(std::string_view symbol);

// A resistance written as a plain number, with an SI prefix, or in IEC 60062 letter code, with
// an optional trailing unit ("ohm", "Ω") and, for letter codes, an optional tolerance letter.
// `decimal` is '.' or ','. Returns nullopt when the text is not such a value.
std::optional<double> parse_resistance(std::string_view text, char decimal = '.');

// A plain decimal number (optionally with an SI prefix when allow_prefix), locale-independent.
std::optional<double> parse_number(std::string_view text, char decimal = '.',
                                   bool allow_prefix = false);

}  // namespace photolot
