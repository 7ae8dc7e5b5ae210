#include "spec_toml.h"

#include <cmath>

#include <fmt/format.h>

namespace photolot::workbench {
namespace {

// A TOML basic string: quotes, backslashes and control characters escaped.
std::string quoted(const std::string& text) {
  std::string out = "\"";
  for (char c : text) {
    switch (c) {
      case '"': out += "\\\""; break;
      case '\\': out += "\\\\"; break;
      case '\n': out += "\\n"; break;
      case '\t': out += "\\t"; break;
      default:
        if (static_cast<unsigned char>(c) < 0x20) {
          out += fmt::format("\\u{:04x}", static_cast<unsigned>(c));
        } else {
          out += c;
        }
    }
  }
  return out + "\"";
}

// Shortest round-trip form, always with a decimal point or exponent so TOML reads a float.
std::string number(double v) {
  std::string s = fmt::format("{}", v);
  if (s.find_first_of(".eE") == std::string::npos) s += ".0";
  return s;
}

void optional_line(std::string& out, const char* key, double v) {
  if (!std::isnan(v)) out += fmt::format("{} = {}\n", key, number(v));
}

}  // namespace

std::string spec_to_toml(const Spec& s) {
  std::string out = "# photolot purchase spec, written by the workbench (layout: docs/spec-format.md)\n\n";
  out += "[part]\n";
  out += "number = " + quoted(s.part_number) + "\n";
  if (!s.description.empty()) out += "description = " + quoted(s.description) + "\n";
  out += "\n[limits]\n";
  optional_line(out, "r10_min_ohm", s.r10_ohm.min);
  optional_line(out, "r10_max_ohm", s.r10_ohm.max);
  optional_line(out, "gamma_min", s.gamma.min);
  optional_line(out, "gamma_max", s.gamma.max);
  optional_line(out, "dark_min_ohm", s.dark_min_ohm);
  optional_line(out, "max_rms_log_residual", s.max_rms_log_residual);
  out += "\n[conditions]\n";
  out += fmt::format("reference_lux = {}\n", number(s.conditions.reference_lux));
  out += fmt::format("dark_dwell_s = {}\n", number(s.conditions.dark_dwell_s));
  out += fmt::format("temp_c = {}\n", number(s.conditions.temp_c));
  out += "\n[inspection]\n";
  out += "mode = " + quoted(std::string(to_string(s.inspection.mode))) + "\n";
  out += "level = " + quoted(std::string(to_string(s.inspection.level))) + "\n";
  out += fmt::format("aql = {}\n", number(s.inspection.aql_pct));
  if (s.inspection.lot_size) out += fmt::format("lot_size = {}\n", *s.inspection.lot_size);
  out += "\n[tolerance_interval]\n";
  out += fmt::format("coverage = {}\n", number(s.tolerance_coverage));
  out += fmt::format("confidence = {}\n", number(s.tolerance_confidence));
  if (!std::isnan(s.temp_coeff_pct_per_c)) {
    out += fmt::format("\n[temperature]\ncoefficient_pct_per_c = {}\n", number(s.temp_coeff_pct_per_c));
  }
  return out;
}

}  // namespace photolot::workbench
