// The pairing's results-document section and the bench's pick list.
#include <fmt/format.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <system_error>

#include "photolot/pairing.h"

namespace photolot {
namespace {

nlohmann::json number_or_null(double v) {
  return std::isfinite(v) ? nlohmann::json(v) : nlohmann::json(nullptr);
}

// A text cell for a spreadsheet: a leading =, +, -, @, tab or carriage return would start a
// formula, so such cells get a leading apostrophe (OWASP, "CSV Injection"); cells holding the
// delimiter, a quote or a line break are quoted (RFC 4180).
std::string text_cell(const std::string& text) {
  std::string cell = text;
  if (!cell.empty() && (cell[0] == '=' || cell[0] == '+' || cell[0] == '-' || cell[0] == '@' ||
                        cell[0] == '\t' || cell[0] == '\r'))
    cell.insert(cell.begin(), '\'');
  if (cell.find_first_of(",\"\r\n") == std::string::npos) return cell;
  std::string quoted = "\"";
  for (char c : cell) {
    if (c == '"') quoted += '"';
    quoted += c;
  }
  return quoted + '"';
}

std::string number_cell(double v, int digits) {
  return std::isfinite(v) ? fmt::format("{:.{}f}", v, digits) : std::string();
}

}  // namespace

nlohmann::json pairing_json(const Pairing& p) {
  const PairOptions& o = p.options;
  nlohmann::json section;
  section["pairing"] = {
      {"mode", to_string(o.mode)},
      {"range", {{"lux_lo", o.lux_lo}, {"lux_hi", o.lux_hi}}},
      {"tolerance_pct", o.tolerance_pct},
      {"candidate_cap_per_unit", o.candidate_cap_per_unit},
      {"proof", to_string(p.proof)},
      {"proof_detail", p.proof_detail},
      {"cancelled", p.cancelled},
      {"total_error_pct", p.total_error_pct},
      {"total_error_rounding_bound_pct", p.total_error_rounding_bound_pct},
      {"counts",
       {{"eligible", p.counts.eligible},
        {"fitted", p.counts.fitted},
        {"pairs", p.counts.pairs},
        {"unpaired", p.counts.unpaired},
        {"tolerance_edges", p.counts.tolerance_edges},
        {"matched_edges", p.counts.matched_edges},
        {"components", p.counts.components},
        {"largest_component", p.counts.largest_component},
        {"rounds", p.counts.rounds},
        {"repaired_edges", p.counts.repaired_edges}}},
  };
  nlohmann::json pairs = nlohmann::json::array();
  for (const UnitPair& u : p.pairs)
    pairs.push_back({{"a", u.a_id},
                     {"b", u.b_id},
                     {"a_index", u.a},
                     {"b_index", u.b},
                     {"tracking_error_pct", number_or_null(u.tracking_error_pct)},
                     {"tracking_error_sigma_pct", number_or_null(u.tracking_error_sigma_pct)},
                     {"worst_lux", number_or_null(u.worst_lux)}});
  section["pairs"] = std::move(pairs);
  nlohmann::json unpaired = nlohmann::json::array();
  for (const UnpairedUnit& u : p.unpaired) {
    nlohmann::json item = {{"id", u.id}, {"index", u.index}, {"reason", u.reason}};
    if (u.nearest) {
      item["nearest"] = u.nearest_id;
      item["nearest_error_pct"] = number_or_null(u.nearest_error_pct);
    } else {
      item["nearest"] = nullptr;
      item["nearest_error_pct"] = nullptr;
    }
    unpaired.push_back(std::move(item));
  }
  section["unpaired"] = std::move(unpaired);
  return section;
}

std::string pick_list_csv(const Pairing& p) {
  std::string out = fmt::format("pair,unit_a,unit_b,tracking_error_pct,tracking_error_sigma_pct\n");
  for (std::size_t k = 0; k < p.pairs.size(); ++k) {
    const UnitPair& u = p.pairs[k];
    out += fmt::format("{},{},{},{},{}\n", k + 1, text_cell(u.a_id), text_cell(u.b_id),
                       number_cell(u.tracking_error_pct, 4),
                       number_cell(u.tracking_error_sigma_pct, 4));
  }
  return out;
}

std::string write_pick_list_csv(const Pairing& p, const std::string& path) {
  namespace fs = std::filesystem;
  const fs::path target(path);
  fs::path temp = target;
  temp += ".tmp";
  {
    std::ofstream f(temp, std::ios::binary | std::ios::trunc);
    if (!f) return fmt::format("{}: cannot create the temporary file {}", path, temp.string());
    const std::string text = pick_list_csv(p);
    f.write(text.data(), static_cast<std::streamsize>(text.size()));
    f.close();
    if (!f) {
      std::error_code ignored;
      fs::remove(temp, ignored);
      return fmt::format("{}: writing {} failed", path, temp.string());
    }
  }
  std::error_code ec;
  fs::rename(temp, target, ec);
  if (ec) {
    std::error_code ignored;
    fs::remove(temp, ignored);
    return fmt::format("{}: cannot move the pick list into place: {}", path, ec.message());
  }
  return {};
}

}  // namespace photolot
