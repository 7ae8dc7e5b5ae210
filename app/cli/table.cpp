// Text output of photolot-cli.
#include "table.h"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cctype>
#include <cmath>
#include <cstdlib>
#include <map>

#include "photolot/number_format.h"

namespace photolot::cli {
namespace {

// Display width of UTF-8 text: code points (every character we print is one column wide).
std::size_t width(std::string_view s) {
  std::size_t n = 0;
  for (unsigned char c : s) n += (c & 0xC0) != 0x80;
  return n;
}

void pad_right(fmt::memory_buffer& out, std::string_view s, std::size_t w) {
  out.append(s);
  for (std::size_t i = width(s); i < w; ++i) out.push_back(' ');
}
void pad_left(fmt::memory_buffer& out, std::string_view s, std::size_t w) {
  for (std::size_t i = width(s); i < w; ++i) out.push_back(' ');
  out.append(s);
}

std::string fixed(double v, int decimals) {
  return std::isfinite(v) ? fmt::format("{:.{}f}", v, decimals) : "-";
}

}  // namespace

bool environment_is_utf8() {
  for (const char* name : {"LC_ALL", "LC_CTYPE", "LANG"}) {
    const char* v = std::getenv(name);
    if (!v || !*v) continue;
    std::string s(v);
    std::transform(s.begin(), s.end(), s.begin(), [](unsigned char c) { return std::tolower(c); });
    return s.find("utf-8") != std::string::npos || s.find("utf8") != std::string::npos;
  }
  return false;
}

OhmFormat ohm_format(const TextStyle& style) { return {.unicode = style.unicode, .missing = "-"}; }

std::string format_ohm(double ohm, const TextStyle& style) {
  return photolot::format_ohm(ohm, ohm_format(style));
}

std::string format_ohm_range(double lo, double hi, double reference, const TextStyle& style) {
  return photolot::format_ohm_range(lo, hi, reference, ohm_format(style));
}

std::string unit_table(const std::vector<UnitFit>& units, const TextStyle& style) {
  const char* dash = style.unicode ? "–" : "-";
  struct Row {
    std::array<std::string, 8> cells;
  };
  // Columns: id, points, R10, R10 interval, gamma, gamma interval, RMS, flags.
  std::array<std::string, 8> header{"unit",  "pts",          "R10",   "R10 95% CI",
                                    "gamma", "gamma 95% CI", "rms %", "flags"};
  std::vector<Row> rows;
  rows.reserve(units.size());
  for (const auto& u : units) {
    Row r;
    r.cells[0] = u.id;
    r.cells[1] = fmt::format("{}", u.points);
    std::string flags;
    for (const auto& f : u.flags) flags += (flags.empty() ? "" : ",") + f;
    if (u.ok()) {
      r.cells[2] = format_ohm(u.r10_ohm, style);
      r.cells[3] = format_ohm_range(u.r10_ci95_ohm[0], u.r10_ci95_ohm[1], u.r10_ohm, style);
      r.cells[4] = fixed(u.gamma, 3);
      r.cells[5] = std::isfinite(u.gamma_ci95[0]) && std::isfinite(u.gamma_ci95[1])
                       ? fmt::format("{:.3f}{}{:.3f}", u.gamma_ci95[0], dash, u.gamma_ci95[1])
                       : "-";
      // The rms of ln-residuals as a percentage of the reading: 100 * (exp(rms) - 1).
      r.cells[6] = fixed(100.0 * std::expm1(u.rms_log_residual), 2);
      r.cells[7] = flags;
    } else {
      for (int c = 2; c <= 6; ++c) r.cells[c] = "-";
      r.cells[7] =
          "not fitted: " + std::string(to_string(u.status)) + (flags.empty() ? "" : " " + flags);
    }
    rows.push_back(std::move(r));
  }
  std::array<std::size_t, 8> w{};
  for (std::size_t c = 0; c < 8; ++c) w[c] = width(header[c]);
  for (const auto& r : rows)
    for (std::size_t c = 0; c < 8; ++c) w[c] = std::max(w[c], width(r.cells[c]));

  fmt::memory_buffer out;
  auto line = [&](const std::array<std::string, 8>& cells) {
    for (std::size_t c = 0; c < 8; ++c) {
      bool left = c == 0 || c == 7;
      if (c) out.append(std::string_view("  "));
      if (c == 7) {
        out.append(cells[c]);
      } else if (left) {
        pad_right(out, cells[c], w[c]);
      } else {
        pad_left(out, cells[c], w[c]);
      }
    }
    // No trailing blanks when the flags column is empty.
    while (out.size() && out.data()[out.size() - 1] == ' ') out.resize(out.size() - 1);
    out.push_back('\n');
  };
  line(header);
  for (const auto& r : rows) line(r.cells);
  return fmt::to_string(out);
}

std::string lot_summary(const Lot& lot, const LotFit& fit) {
  std::map<std::string, std::size_t> reasons;
  for (const auto& u : fit.units)
    if (!u.ok()) ++reasons[std::string(to_string(u.status))];
  std::size_t fitted = fit.fitted_count();
  std::string not_fitted = fmt::format("{} not fitted", fit.units.size() - fitted);
  if (!reasons.empty()) {
    std::string list;
    for (const auto& [why, n] : reasons)
      list += fmt::format("{}{} {}", list.empty() ? "" : ", ", why, n);
    not_fitted += " (" + list + ")";
  }
  std::size_t readings = 0;
  for (const auto& u : lot.units) readings += u.readings.size();
  const ImportCounts& c = lot.counts;
  return fmt::format(
      "lot {}: {} units, {} fitted, {}\n"
      "readings {} (censored {}, dark {}); rows read {}, skipped {}, duplicates dropped {}, "
      "conflicts {}\n",
      lot.name.empty() ? "(unnamed)" : lot.name, fit.units.size(), fitted, not_fitted, readings,
      c.censored, c.dark, c.rows_read, c.rows_skipped, c.duplicates_dropped, c.conflicts);
}

std::string diagnostic_line(const std::string& file, std::uint32_t line, std::uint32_t column,
                            std::string_view severity, const std::string& message) {
  std::string place = file;
  if (line > 0) place += fmt::format(":{}", line);
  if (line > 0 && column > 0) place += fmt::format(":{}", column);
  return fmt::format("{}: {}: {}\n", place, severity, message);
}

std::string diagnostic_lines(const std::vector<Diagnostic>& diagnostics, std::size_t max_shown,
                             const std::string& all_in) {
  std::string out;
  std::size_t shown = max_shown == 0 ? diagnostics.size() : std::min(max_shown, diagnostics.size());
  for (std::size_t i = 0; i < shown; ++i) {
    const auto& d = diagnostics[i];
    out += diagnostic_line(d.file, d.line, d.column, to_string(d.severity), d.message);
  }
  if (shown < diagnostics.size())
    out += fmt::format("... and {} more message{} ({})\n", diagnostics.size() - shown,
                       diagnostics.size() - shown == 1 ? "" : "s",
                       all_in.empty() ? "--max-messages 0 shows them all" : "all are in " + all_in);
  return out;
}

}  // namespace photolot::cli
