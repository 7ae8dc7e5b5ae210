#include "display_format.h"

#include <fmt/format.h>
#include <photolot/number_format.h>

#include <cmath>

namespace photolot::workbench {
namespace {
const QString kDash = QStringLiteral("—");

std::string sig(double value, int digits) {
  // Fixed notation with enough decimals for `digits` significant digits (3 -> "20.3", "1.50").
  if (value == 0) return fmt::format("{:.{}f}", 0.0, digits - 1);
  const int magnitude = static_cast<int>(std::floor(std::log10(std::fabs(value))));
  const int decimals = std::max(0, digits - 1 - magnitude);
  if (magnitude >= 6 || magnitude < -4) return fmt::format("{:.{}g}", value, digits);
  return fmt::format("{:.{}f}", value, decimals);
}
}  // namespace

QString format_ohm(double ohm) {
  // The one resistance formatter the command line, the summary and the verdicts use too.
  return QString::fromStdString(photolot::format_ohm(ohm));
}

QString format_siemens(double siemens) {
  if (!std::isfinite(siemens)) return kDash;
  struct Prefix {
    double scale;
    const char* name;
  };
  static constexpr Prefix kPrefixes[] = {
      {1, "S"}, {1e-3, "mS"}, {1e-6, "µS"}, {1e-9, "nS"}, {1e-12, "pS"}};
  for (const auto& p : kPrefixes) {
    if (std::fabs(siemens) >= p.scale * 0.9995 || p.scale == 1e-12) {
      return QString::fromStdString(fmt::format("{} {}", sig(siemens / p.scale, 3), p.name));
    }
  }
  return kDash;
}

QString format_number(double value, int digits) {
  if (!std::isfinite(value)) return kDash;
  return QString::fromStdString(sig(value, digits));
}

QString format_interval(const std::array<double, 2>& interval, bool is_ohm, int digits) {
  if (!std::isfinite(interval[0]) || !std::isfinite(interval[1])) return kDash;
  const auto f = [&](double v) { return is_ohm ? format_ohm(v) : format_number(v, digits); };
  return QStringLiteral("%1 – %2").arg(f(interval[0]), f(interval[1]));
}

}  // namespace photolot::workbench
