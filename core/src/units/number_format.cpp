// Resistances with an engineering prefix (photolot/number_format.h).
#include "photolot/number_format.h"

#include <fmt/format.h>

#include <array>
#include <cmath>
#include <utility>

namespace photolot {
namespace {

std::string digits(double scaled, int decimals, bool keep_trailing_zeros) {
  std::string s = fmt::format("{:.{}f}", scaled, decimals);
  if (!keep_trailing_zeros && s.find('.') != std::string::npos) {
    while (s.back() == '0') s.pop_back();
    if (s.back() == '.') s.pop_back();
  }
  return s;
}

std::string_view ohm_symbol(const OhmFormat& style) { return style.unicode ? "\u03a9" : "ohm"; }

}  // namespace

EngineeringScale engineering_scale(double value) {
  static constexpr std::array<std::pair<double, std::string_view>, 6> kPrefixes{
      {{1e-3, "m"}, {1, ""}, {1e3, "k"}, {1e6, "M"}, {1e9, "G"}, {1e12, "T"}}};
  double a = std::fabs(value);
  if (!(a > 0) || !std::isfinite(a)) return {1, ""};
  // Round to three significant figures first, so 999.96 becomes 1.00 k rather than 1000.
  const double step = std::pow(10.0, std::floor(std::log10(a)) - 2);
  a = std::round(a / step) * step;
  std::size_t i = 0;
  while (i + 1 < kPrefixes.size() && a >= kPrefixes[i + 1].first * 0.9995) ++i;
  return {kPrefixes[i].first, kPrefixes[i].second};
}

int three_figure_decimals(double scaled) {
  const double a = std::fabs(scaled);
  if (a >= 99.95) return 0;
  if (a >= 9.995) return 1;
  return 2;
}

std::string format_ohm(double ohm, const OhmFormat& style) {
  if (!std::isfinite(ohm)) return std::string(style.missing);
  const EngineeringScale s = engineering_scale(ohm);
  const double scaled = ohm / s.factor;
  return fmt::format("{} {}{}",
                     digits(scaled, three_figure_decimals(scaled), style.keep_trailing_zeros),
                     s.prefix, ohm_symbol(style));
}

std::string format_ohm_range(double lo, double hi, double reference, const OhmFormat& style) {
  if (!std::isfinite(lo) || !std::isfinite(hi)) return std::string(style.missing);
  const EngineeringScale s = engineering_scale(std::isfinite(reference) ? reference : hi);
  const int d = three_figure_decimals((std::isfinite(reference) ? reference : hi) / s.factor);
  return fmt::format("{}{}{} {}{}", digits(lo / s.factor, d, style.keep_trailing_zeros),
                     style.unicode ? "\u2013" : "-",
                     digits(hi / s.factor, d, style.keep_trailing_zeros), s.prefix,
                     ohm_symbol(style));
}

}  // namespace photolot
