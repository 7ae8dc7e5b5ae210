// Resistances for people to read: an SI prefix that keeps the number between 1 and 1000, three
// significant figures ("18.7 kΩ", "2.10 MΩ", "470 Ω", "470 mΩ"). One version for every face
// without Qt (the command line's tables, the printed summary, the verdicts' sentences); fmt
// formats the digits, never the C locale.
#pragma once

#include <string>
#include <string_view>

namespace photolot {

struct OhmFormat {
  bool unicode = true;                  // "Ω" and "–"; false: "ohm" and "-" (plain ASCII)
  bool keep_trailing_zeros = true;      // "27.0 kΩ" (columns read evenly); false: "27 kΩ"
  std::string_view missing = "\u2014";  // printed for a NaN or infinite value
};

// The SI prefix (m, none, k, M, G, T) for a value and its factor: the largest whose factor is
// at most the value's magnitude after rounding to three significant figures, so 999.96 goes to
// "1.00 k" rather than "1000". Values below 1 m keep "m" (0.00047 is "0.47 m"); zero and
// non-finite values take no prefix.
struct EngineeringScale {
  double factor = 1;
  std::string_view prefix;  // "", "k", "M", ...
};
EngineeringScale engineering_scale(double value);

// Decimals that give a number in [1, 1000) three significant figures: 2, 1 or 0.
int three_figure_decimals(double scaled);

std::string format_ohm(double ohm, const OhmFormat& style = {});
// An interval in the prefix of `reference` (the interval's own `hi` when it is not finite):
// "18.5–18.9 kΩ".
std::string format_ohm_range(double lo, double hi, double reference, const OhmFormat& style = {});

}  // namespace photolot
