// The unit table (CSV): the per-unit fields of the results document, one row per unit.
#include <fmt/format.h>

#include <cmath>

#include "photolot/results.h"

namespace photolot::results {

std::string csv_text_cell(std::string_view text) {
  std::string cell;
  cell.reserve(text.size() + 3);
  // OWASP, "CSV Injection": a cell a spreadsheet would evaluate starts with one of these.
  if (!text.empty() && (text[0] == '=' || text[0] == '+' || text[0] == '-' || text[0] == '@' ||
                        text[0] == '\t' || text[0] == '\r'))
    cell += '\'';
  cell += text;
  // RFC 4180: a field holding a comma, a double quote or a line break is quoted, and a quote
  // inside it is doubled.
  if (cell.find_first_of(",\"\r\n") == std::string::npos) return cell;
  std::string quoted = "\"";
  for (char c : cell) {
    if (c == '"') quoted += '"';
    quoted += c;
  }
  quoted += '"';
  return quoted;
}

std::string csv_number_cell(double value) {
  if (!std::isfinite(value)) return {};
  return fmt::format("{}", value);
}

namespace {

constexpr std::string_view kColumns[] = {"id",
                                         "status",
                                         "message",
                                         "model",
                                         "points",
                                         "levels",
                                         "outlier_points",
                                         "censored_points",
                                         "dark_readings",
                                         "r10_ohm",
                                         "r10_ci95_lo_ohm",
                                         "r10_ci95_hi_ohm",
                                         "gamma",
                                         "gamma_ci95_lo",
                                         "gamma_ci95_hi",
                                         "gamma_10_100",
                                         "rms_log_residual",
                                         "dark_conductance_s",
                                         "temp_coeff_pct_per_c",
                                         "flags"};

}  // namespace

std::vector<std::string_view> units_csv_columns() {
  return {std::begin(kColumns), std::end(kColumns)};
}

std::string units_csv(const std::vector<UnitFit>& units) {
  fmt::memory_buffer out;
  auto sink = std::back_inserter(out);
  for (std::size_t i = 0; i < std::size(kColumns); ++i)
    fmt::format_to(sink, "{}{}", i ? "," : "", kColumns[i]);
  out.push_back('\n');
  for (const auto& u : units) {
    std::string flags;
    for (const auto& f : u.flags) flags += (flags.empty() ? "" : " ") + f;
    fmt::format_to(sink, "{},{},{},{},{},{},{},{},{},", csv_text_cell(u.id),
                   csv_text_cell(to_string(u.status)), csv_text_cell(u.message),
                   csv_text_cell(to_string(u.curve.model)), u.points, u.levels, u.outlier_points,
                   u.censored_points, u.dark_readings);
    fmt::format_to(sink, "{},{},{},{},{},{},{},{},{},{},{}\n", csv_number_cell(u.r10_ohm),
                   csv_number_cell(u.r10_ci95_ohm[0]), csv_number_cell(u.r10_ci95_ohm[1]),
                   csv_number_cell(u.gamma), csv_number_cell(u.gamma_ci95[0]),
                   csv_number_cell(u.gamma_ci95[1]), csv_number_cell(u.gamma_10_100),
                   csv_number_cell(u.rms_log_residual), csv_number_cell(u.dark_conductance_s),
                   csv_number_cell(u.temp_coeff_pct_per_c), csv_text_cell(flags));
  }
  return fmt::to_string(out);
}

}  // namespace photolot::results
