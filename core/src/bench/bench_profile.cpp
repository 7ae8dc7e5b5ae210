// Bench profile: validation, the uncertainty formulas (bench_profile.h) and the TOML loader.
#include "photolot/bench_profile.h"

#include <fmt/format.h>
#include <toml++/toml.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <sstream>

#include "photolot/read_file.h"

namespace photolot {

std::string BenchProfile::validate() const {
  if (!(lux_pct >= 0) || !std::isfinite(lux_pct))
    return fmt::format("lux_pct = {} must be a number of at least 0", lux_pct);
  for (std::size_t i = 0; i < ohm_ranges.size(); ++i) {
    const MeterRange& r = ohm_ranges[i];
    if (!(r.max_ohm > 0) || !std::isfinite(r.max_ohm))
      return fmt::format("ohm_range {}: max_ohm = {} must be a positive number", i + 1, r.max_ohm);
    if (!(r.pct >= 0) || !std::isfinite(r.pct))
      return fmt::format("ohm_range {}: pct = {} must be a number of at least 0", i + 1, r.pct);
    if (!(r.digits >= 0) || !std::isfinite(r.digits))
      return fmt::format("ohm_range {}: digits = {} must be a number of at least 0", i + 1,
                         r.digits);
    if (!(r.resolution_ohm >= 0) || !std::isfinite(r.resolution_ohm))
      return fmt::format("ohm_range {}: resolution_ohm = {} must be a number of at least 0", i + 1,
                         r.resolution_ohm);
    if (r.pct == 0 && r.digits * r.resolution_ohm == 0)
      return fmt::format(
          "ohm_range {}: pct and digits x resolution_ohm are both 0; a meter "
          "with no error would give a reading infinite weight",
          i + 1);
  }
  return {};
}

const MeterRange* BenchProfile::range_for(double ohm) const {
  if (ohm_ranges.empty()) return nullptr;
  const MeterRange* best = nullptr;
  for (const MeterRange& r : ohm_ranges)
    if (r.max_ohm >= ohm && (best == nullptr || r.max_ohm < best->max_ohm)) best = &r;
  if (best != nullptr) return best;
  return &*std::max_element(
      ohm_ranges.begin(), ohm_ranges.end(),
      [](const MeterRange& a, const MeterRange& b) { return a.max_ohm < b.max_ohm; });
}

double BenchProfile::ohm_relative_sd(double ohm) const {
  const MeterRange* r = range_for(ohm);
  if (r == nullptr || !(ohm > 0)) return 0.0;
  return r->pct / 100.0 + r->digits * r->resolution_ohm / ohm;
}

double BenchProfile::ln_ohm_sd(double ohm, double gamma) const {
  const double a = ohm_relative_sd(ohm);
  const double b = gamma * lux_pct / 100.0;
  return std::sqrt(a * a + b * b);
}

namespace {

FileError error_at(std::string_view name, const toml::source_region& where, std::string message) {
  return FileError{std::string(name), where.begin.line, where.begin.column, std::move(message)};
}

// A number (integer or float) under `key` of `table`; absent keys keep `out`.
std::optional<FileError> read_number(std::string_view name, const toml::table& table,
                                     std::string_view key, double& out, bool required) {
  const toml::node* node = table.get(key);
  if (node == nullptr) {
    if (!required) return std::nullopt;
    return error_at(name, table.source(), fmt::format("missing key '{}'", key));
  }
  if (auto v = node->value<double>()) {
    out = *v;
    return std::nullopt;
  }
  return error_at(name, node->source(), fmt::format("'{}' must be a number", key));
}

}  // namespace

BenchProfileResult parse_bench_profile(std::string_view name, std::string_view toml_text) {
  BenchProfileResult result;
  toml::table root;
  try {
    root = toml::parse(toml_text, name);
  } catch (const toml::parse_error& e) {
    result.error = error_at(name, e.source(), std::string(e.description()));
    return result;
  }
  BenchProfile p;
  for (auto&& [key, node] : root) {
    if (key != "lux_pct" && key != "ohm_range") {
      result.error =
          error_at(name, key.source(),
                   fmt::format("unknown key '{}' (expected lux_pct or ohm_range)", key.str()));
      return result;
    }
  }
  if (auto e = read_number(name, root, "lux_pct", p.lux_pct, false)) {
    result.error = e;
    return result;
  }
  if (const toml::node* ranges = root.get("ohm_range")) {
    const toml::array* arr = ranges->as_array();
    if (arr == nullptr) {
      result.error = error_at(name, ranges->source(),
                              "'ohm_range' must be an array of tables ([[ohm_range]])");
      return result;
    }
    for (const toml::node& item : *arr) {
      const toml::table* t = item.as_table();
      if (t == nullptr) {
        result.error = error_at(name, item.source(), "each ohm_range must be a table");
        return result;
      }
      for (auto&& [key, node] : *t) {
        if (key != "max_ohm" && key != "pct" && key != "digits" && key != "resolution_ohm") {
          result.error =
              error_at(name, key.source(),
                       fmt::format("unknown key '{}' in ohm_range (expected max_ohm, pct, digits, "
                                   "resolution_ohm)",
                                   key.str()));
          return result;
        }
      }
      MeterRange r;
      for (auto [key, field, required] :
           {std::tuple{"max_ohm", &r.max_ohm, true}, std::tuple{"pct", &r.pct, true},
            std::tuple{"digits", &r.digits, false},
            std::tuple{"resolution_ohm", &r.resolution_ohm, false}}) {
        if (auto e = read_number(name, *t, key, *field, required)) {
          result.error = e;
          return result;
        }
      }
      p.ohm_ranges.push_back(r);
      if (std::string why = BenchProfile{{r}, 0}.validate(); !why.empty()) {
        // Point at the table; the range's number in the message is its place in the file.
        why.replace(0, why.find(':'), fmt::format("ohm_range {}", p.ohm_ranges.size()));
        result.error = error_at(name, t->source(), why);
        return result;
      }
    }
  }
  std::sort(p.ohm_ranges.begin(), p.ohm_ranges.end(),
            [](const MeterRange& a, const MeterRange& b) { return a.max_ohm < b.max_ohm; });
  if (std::string why = p.validate(); !why.empty()) {
    result.error = error_at(name, root.source(), why);
    return result;
  }
  result.profile = std::move(p);
  return result;
}

BenchProfileResult load_bench_profile(const std::string& path) {
  // A bench profile is a few lines; a megabyte is not one.
  FileRead read = read_regular_file(path, std::uint64_t{1} << 20);
  if (read.ok()) return parse_bench_profile(path, read.text);
  BenchProfileResult r;
  r.error =
      FileError{path, 0, 0,
                read.problem == ReadProblem::missing || read.problem == ReadProblem::unreadable
                    ? std::string("cannot open the bench profile for reading")
                    : "the bench profile " + describe(read)};
  return r;
}

nlohmann::ordered_json bench_profile_json(const BenchProfile& profile) {
  nlohmann::ordered_json ranges = nlohmann::ordered_json::array();
  for (const MeterRange& r : profile.ohm_ranges)
    ranges.push_back({{"max_ohm", r.max_ohm},
                      {"pct", r.pct},
                      {"digits", r.digits},
                      {"resolution_ohm", r.resolution_ohm}});
  return {{"lux_pct", profile.lux_pct}, {"ohm_ranges", std::move(ranges)}};
}

std::string bench_profile_from_json(const nlohmann::ordered_json& j, BenchProfile& profile) {
  BenchProfile p;
  if (!j.is_object() || !j.contains("lux_pct") || !j["lux_pct"].is_number())
    return "lux_pct must be a number";
  p.lux_pct = j["lux_pct"];
  if (j.contains("ohm_ranges")) {
    if (!j["ohm_ranges"].is_array()) return "ohm_ranges must be an array";
    for (const auto& r : j["ohm_ranges"]) {
      for (const char* key : {"max_ohm", "pct", "digits", "resolution_ohm"})
        if (!r.is_object() || !r.contains(key) || !r[key].is_number())
          return fmt::format("ohm_ranges[{}].{} must be a number", p.ohm_ranges.size(), key);
      p.ohm_ranges.push_back({r["max_ohm"], r["pct"], r["digits"], r["resolution_ohm"]});
    }
  }
  if (std::string why = p.validate(); !why.empty()) return why;
  profile = std::move(p);
  return {};
}

}  // namespace photolot
