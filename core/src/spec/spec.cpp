// The spec file: TOML read with toml++. The layout, every key, its unit and default are in
// docs/spec-format.md; sample-data/demo-spec.toml is a commented example.
//
//   [part]        number (required), description
//   [limits]      r10_min_ohm, r10_max_ohm, gamma_min, gamma_max, dark_min_ohm,
//                 max_rms_log_residual  (at least one; resistances as numbers or "15k", "1.5M")
//   [conditions]  reference_lux (10), dark_dwell_s (10), temp_c (25)
//   [inspection]  mode ("sampling" | "100%"), level ("I" | "II" | "III"), aql (percent),
//                 lot_size
//   [tolerance_interval]  coverage (0.99), confidence (0.95)
//   [temperature] coefficient_pct_per_c
//
// Every problem is collected (unknown keys, wrong types, impossible values) with the line and
// column of the value that causes it; a spec with any error is not returned.
#include "photolot/spec.h"

#include <fmt/format.h>
#include <toml++/toml.h>

#include <algorithm>
#include <charconv>
#include <cstdint>
#include <fstream>
#include <nlohmann/json.hpp>
#include <set>
#include <sstream>

#include "photolot/acceptance.h"
#include "photolot/read_file.h"
#include "photolot/units.h"

namespace photolot {

std::string_view to_string(InspectionLevel level) {
  switch (level) {
    case InspectionLevel::level_i:
      return "I";
    case InspectionLevel::level_ii:
      return "II";
    case InspectionLevel::level_iii:
      return "III";
  }
  return "?";
}

std::optional<InspectionLevel> parse_inspection_level(std::string_view text) {
  // Roman numerals as the standard writes them; lower case accepted too.
  if (text == "I" || text == "i") return InspectionLevel::level_i;
  if (text == "II" || text == "ii") return InspectionLevel::level_ii;
  if (text == "III" || text == "iii") return InspectionLevel::level_iii;
  return std::nullopt;
}

std::string_view to_string(InspectionMode mode) {
  switch (mode) {
    case InspectionMode::sampling:
      return "sampling";
    case InspectionMode::full:
      return "100%";
  }
  return "?";
}

std::string to_string(const SpecError& error) {
  if (error.line == 0) return fmt::format("{}: {}", error.file, error.message);
  return fmt::format("{}:{}:{}: {}", error.file, error.line, error.column, error.message);
}

std::string Spec::validate() const {
  auto positive = [](double v) { return std::isnan(v) || (std::isfinite(v) && v > 0); };
  if (part_number.empty()) return "part_number is empty: a spec names the part it is for";
  if (!positive(r10_ohm.min) || !positive(r10_ohm.max))
    return fmt::format("r10_ohm = [{}, {}] must be above 0 ohm", r10_ohm.min, r10_ohm.max);
  if (r10_ohm.has_min() && r10_ohm.has_max() && r10_ohm.min > r10_ohm.max)
    return fmt::format("r10_ohm.min = {} must not be above r10_ohm.max = {}", r10_ohm.min,
                       r10_ohm.max);
  if (!positive(gamma.min) || !positive(gamma.max))
    return fmt::format("gamma = [{}, {}] must be above 0", gamma.min, gamma.max);
  if (gamma.has_min() && gamma.has_max() && gamma.min > gamma.max)
    return fmt::format("gamma.min = {} must not be above gamma.max = {}", gamma.min, gamma.max);
  if (!positive(dark_min_ohm))
    return fmt::format("dark_min_ohm = {} must be above 0 ohm", dark_min_ohm);
  if (!positive(max_rms_log_residual))
    return fmt::format("max_rms_log_residual = {} must be above 0", max_rms_log_residual);
  if (!r10_ohm.any() && !gamma.any() && std::isnan(dark_min_ohm) &&
      std::isnan(max_rms_log_residual))
    return "no limit is set: a spec needs at least one of R10, gamma, dark resistance or RMS "
           "residual";
  if (!(conditions.reference_lux > 0 && std::isfinite(conditions.reference_lux)))
    return fmt::format("conditions.reference_lux = {} must be above 0 lx",
                       conditions.reference_lux);
  if (!(conditions.dark_dwell_s >= 0 && std::isfinite(conditions.dark_dwell_s)))
    return fmt::format("conditions.dark_dwell_s = {} must be 0 s or more", conditions.dark_dwell_s);
  if (!std::isfinite(conditions.temp_c) || conditions.temp_c < -273.15)
    return fmt::format("conditions.temp_c = {} must be a temperature above absolute zero",
                       conditions.temp_c);
  if (inspection.mode == InspectionMode::sampling && !is_tabulated_aql(inspection.aql_pct))
    return fmt::format("inspection.aql = {} is not a column of ISO 2859-1 Table II-A known here",
                       inspection.aql_pct);
  if (inspection.lot_size && *inspection.lot_size < 1)
    return "inspection.lot_size = 0 must be at least 1";
  if (!(tolerance_coverage > 0 && tolerance_coverage < 1))
    return fmt::format("tolerance_coverage = {} must lie strictly between 0 and 1",
                       tolerance_coverage);
  if (!(tolerance_confidence > 0 && tolerance_confidence < 1))
    return fmt::format("tolerance_confidence = {} must lie strictly between 0 and 1",
                       tolerance_confidence);
  if (!std::isnan(temp_coeff_pct_per_c) && !(std::abs(temp_coeff_pct_per_c) < 10))
    return fmt::format("temp_coeff_pct_per_c = {} must lie between -10 and 10 %/degC",
                       temp_coeff_pct_per_c);
  return {};
}

namespace {

class Reader {
 public:
  explicit Reader(std::string file) : file_(std::move(file)) {}

  void error(const toml::source_region& where, std::string message) {
    errors_.push_back({file_, where.begin.line, where.begin.column, std::move(message)});
  }
  void error_file(std::string message) { errors_.push_back({file_, 0, 0, std::move(message)}); }

  // Unknown keys of a table are errors naming the key and its place.
  void check_keys(const toml::table& table, std::string_view table_name,
                  std::initializer_list<std::string_view> allowed) {
    for (const auto& [key, node] : table) {
      bool known = false;
      for (auto a : allowed) known = known || key.str() == a;
      if (!known) {
        std::string list;
        for (auto a : allowed) list += fmt::format("{}{}", list.empty() ? "" : ", ", a);
        error(key.source().begin.line ? key.source() : node.source(),
              table_name.empty()
                  ? fmt::format("unknown table or key '{}' (expected one of: {})", key.str(), list)
                  : fmt::format("unknown key '{}' in [{}] (expected one of: {})", key.str(),
                                table_name, list));
      }
    }
  }

  const toml::table* table(const toml::table& root, std::string_view name, bool required) {
    const toml::node* node = root.get(name);
    if (node == nullptr) {
      if (required) error_file(fmt::format("missing required table [{}]", name));
      return nullptr;
    }
    if (!node->is_table()) {
      error(node->source(),
            fmt::format("'{}' must be a table ([{}]), found {}", name, name, type_name(*node)));
      return nullptr;
    }
    return node->as_table();
  }

  static std::string_view type_name(const toml::node& node) {
    switch (node.type()) {
      case toml::node_type::string:
        return "a string";
      case toml::node_type::integer:
        return "an integer";
      case toml::node_type::floating_point:
        return "a decimal number";
      case toml::node_type::boolean:
        return "a boolean";
      case toml::node_type::table:
        return "a table";
      case toml::node_type::array:
        return "an array";
      default:
        return "a date or time";
    }
  }

  // A number (integer or float). NaN when absent or wrong (the error is recorded).
  double number(const toml::table& t, std::string_view table_name, std::string_view key) {
    const toml::node* node = t.get(key);
    if (node == nullptr) return kNaN;
    if (auto v = node->value<double>(); v && (node->is_integer() || node->is_floating_point())) {
      if (!std::isfinite(*v)) {
        error(node->source(),
              fmt::format("{}.{} = {} must be a finite number", table_name, key, *v));
        return kNaN;
      }
      return *v;
    }
    error(node->source(),
          fmt::format("{}.{} must be a number, found {}", table_name, key, type_name(*node)));
    return kNaN;
  }

  // A resistance: a number in ohm or a string with an SI prefix ("15k").
  double ohm(const toml::table& t, std::string_view table_name, std::string_view key) {
    const toml::node* node = t.get(key);
    if (node == nullptr) return kNaN;
    if (node->is_string()) {
      const std::string& text = node->as_string()->get();
      if (auto v = parse_resistance(text); v && std::isfinite(*v)) return *v;
      error(node->source(),
            fmt::format("{}.{} = \"{}\" is not a resistance (write ohm as a number, or with an SI "
                        "prefix or letter code such as \"15k\", \"1.5M\" or \"4k7\")",
                        table_name, key, text));
      return kNaN;
    }
    return number(t, table_name, key);
  }

  std::optional<std::string> string(const toml::table& t, std::string_view table_name,
                                    std::string_view key) {
    const toml::node* node = t.get(key);
    if (node == nullptr) return std::nullopt;
    if (!node->is_string()) {
      error(node->source(),
            fmt::format("{}.{} must be a string, found {}", table_name, key, type_name(*node)));
      return std::nullopt;
    }
    return node->as_string()->get();
  }

  const toml::source_region& where(const toml::table& t, std::string_view key) {
    const toml::node* node = t.get(key);
    return node != nullptr ? node->source() : t.source();
  }

  // In file order; errors about the whole file (line 0) last.
  std::vector<SpecError> take() {
    std::stable_sort(errors_.begin(), errors_.end(), [](const SpecError& a, const SpecError& b) {
      const auto key = [](const SpecError& e) {
        return std::pair{e.line == 0 ? UINT32_MAX : e.line, e.column};
      };
      return key(a) < key(b);
    });
    return std::move(errors_);
  }
  bool any() const { return !errors_.empty(); }

 private:
  std::string file_;
  std::vector<SpecError> errors_;
};

void read_limits(Reader& r, const toml::table& t, Spec& spec) {
  r.check_keys(t, "limits",
               {"r10_min_ohm", "r10_max_ohm", "gamma_min", "gamma_max", "dark_min_ohm",
                "max_rms_log_residual"});
  spec.r10_ohm.min = r.ohm(t, "limits", "r10_min_ohm");
  spec.r10_ohm.max = r.ohm(t, "limits", "r10_max_ohm");
  spec.gamma.min = r.number(t, "limits", "gamma_min");
  spec.gamma.max = r.number(t, "limits", "gamma_max");
  spec.dark_min_ohm = r.ohm(t, "limits", "dark_min_ohm");
  spec.max_rms_log_residual = r.number(t, "limits", "max_rms_log_residual");

  auto must_be_positive = [&](double v, std::string_view key, std::string_view unit) {
    if (!std::isnan(v) && !(v > 0))
      r.error(r.where(t, key), fmt::format("limits.{} = {} must be above 0{}", key, v, unit));
  };
  must_be_positive(spec.r10_ohm.min, "r10_min_ohm", " ohm");
  must_be_positive(spec.r10_ohm.max, "r10_max_ohm", " ohm");
  must_be_positive(spec.gamma.min, "gamma_min", "");
  must_be_positive(spec.gamma.max, "gamma_max", "");
  must_be_positive(spec.dark_min_ohm, "dark_min_ohm", " ohm");
  must_be_positive(spec.max_rms_log_residual, "max_rms_log_residual", "");
  if (spec.r10_ohm.has_min() && spec.r10_ohm.has_max() && spec.r10_ohm.min > spec.r10_ohm.max)
    r.error(r.where(t, "r10_min_ohm"),
            fmt::format("limits.r10_min_ohm = {} ohm is above limits.r10_max_ohm = {} ohm",
                        spec.r10_ohm.min, spec.r10_ohm.max));
  if (spec.gamma.has_min() && spec.gamma.has_max() && spec.gamma.min > spec.gamma.max)
    r.error(r.where(t, "gamma_min"),
            fmt::format("limits.gamma_min = {} is above limits.gamma_max = {}", spec.gamma.min,
                        spec.gamma.max));
  if (t.empty())
    r.error(t.source(),
            "[limits] sets no limit: give at least one of r10_min_ohm, r10_max_ohm, gamma_min, "
            "gamma_max, dark_min_ohm, max_rms_log_residual");
}

void read_inspection(Reader& r, const toml::table& t, Spec& spec) {
  r.check_keys(t, "inspection", {"mode", "level", "aql", "lot_size"});
  auto& in = spec.inspection;
  if (auto mode = r.string(t, "inspection", "mode")) {
    if (*mode == "sampling") {
      in.mode = InspectionMode::sampling;
    } else if (*mode == "100%") {
      in.mode = InspectionMode::full;
    } else {
      r.error(r.where(t, "mode"),
              fmt::format("inspection.mode = \"{}\" must be \"sampling\" or \"100%\"", *mode));
    }
  }
  if (auto level = r.string(t, "inspection", "level")) {
    if (auto l = parse_inspection_level(*level)) {
      in.level = *l;
    } else {
      r.error(r.where(t, "level"),
              fmt::format("inspection.level = \"{}\" must be one of the general inspection levels "
                          "\"I\", \"II\", \"III\"",
                          *level));
    }
  }  // absent: level II, the level ISO 2859-1 uses unless another is specified
  const double aql = r.number(t, "inspection", "aql");
  if (!std::isnan(aql)) {
    in.aql_pct = aql;
    if (!is_tabulated_aql(aql)) {
      std::string list;
      for (double a : tabulated_aqls()) list += fmt::format("{}{}", list.empty() ? "" : ", ", a);
      r.error(r.where(t, "aql"),
              fmt::format("inspection.aql = {} is not an AQL column of ISO 2859-1 Table II-A known "
                          "here (one of: {})",
                          aql, list));
    }
  } else if (t.get("aql") == nullptr && in.mode == InspectionMode::sampling) {
    r.error(t.source(), "[inspection] with mode \"sampling\" needs aql (percent nonconforming)");
  }
  if (const toml::node* node = t.get("lot_size")) {
    // Only an integer node is read as one: toml++'s value<int64_t>() of a float converts it
    // unchecked, undefined for 20e51 (found by fuzzing).
    const auto v = node->is_integer() ? node->value<std::int64_t>() : std::nullopt;
    if (!v) {
      r.error(node->source(), fmt::format("inspection.lot_size must be a whole number, found {}",
                                          Reader::type_name(*node)));
    } else if (*v < 1) {
      r.error(node->source(), fmt::format("inspection.lot_size = {} must be at least 1", *v));
    } else {
      in.lot_size = static_cast<std::size_t>(*v);
    }
  }
}

}  // namespace

SpecLoadResult parse_spec(std::string_view content, std::string_view name) {
  SpecLoadResult result;
  Reader r{std::string(name)};
  toml::table root;
#if TOML_EXCEPTIONS
  try {
    root = toml::parse(content, name);
  } catch (const toml::parse_error& e) {
    r.error(e.source(), fmt::format("not valid TOML: {}", e.description()));
    result.errors = r.take();
    return result;
  }
#else
  auto parsed = toml::parse(content, name);
  if (!parsed) {
    r.error(parsed.error().source(),
            fmt::format("not valid TOML: {}", parsed.error().description()));
    result.errors = r.take();
    return result;
  }
  root = std::move(parsed).table();
#endif

  Spec spec;
  spec.source_file = std::string(name);
  r.check_keys(root, "",
               {"part", "limits", "conditions", "inspection", "tolerance_interval", "temperature"});

  if (const auto* part = r.table(root, "part", true)) {
    r.check_keys(*part, "part", {"number", "description"});
    if (auto number = r.string(*part, "part", "number")) {
      spec.part_number = *number;
      if (number->empty()) r.error(r.where(*part, "number"), "part.number must not be empty");
    } else if (part->get("number") == nullptr) {
      r.error(part->source(), "[part] needs number (the part number the spec is for)");
    }
    spec.description = r.string(*part, "part", "description").value_or("");
  }
  if (const auto* limits = r.table(root, "limits", true)) read_limits(r, *limits, spec);
  if (const auto* cond = r.table(root, "conditions", false)) {
    r.check_keys(*cond, "conditions", {"reference_lux", "dark_dwell_s", "temp_c"});
    auto& c = spec.conditions;
    if (double v = r.number(*cond, "conditions", "reference_lux"); !std::isnan(v)) {
      c.reference_lux = v;
      if (!(v > 0))
        r.error(r.where(*cond, "reference_lux"),
                fmt::format("conditions.reference_lux = {} must be above 0 lx", v));
    }
    if (double v = r.number(*cond, "conditions", "dark_dwell_s"); !std::isnan(v)) {
      c.dark_dwell_s = v;
      if (v < 0)
        r.error(r.where(*cond, "dark_dwell_s"),
                fmt::format("conditions.dark_dwell_s = {} must be 0 s or more", v));
    }
    if (double v = r.number(*cond, "conditions", "temp_c"); !std::isnan(v)) {
      c.temp_c = v;
      if (v < -273.15)
        r.error(r.where(*cond, "temp_c"),
                fmt::format("conditions.temp_c = {} is below absolute zero", v));
    }
  }
  if (const auto* insp = r.table(root, "inspection", true)) read_inspection(r, *insp, spec);
  if (const auto* tol = r.table(root, "tolerance_interval", false)) {
    r.check_keys(*tol, "tolerance_interval", {"coverage", "confidence"});
    for (auto [key, field] : {std::pair{"coverage", &spec.tolerance_coverage},
                              std::pair{"confidence", &spec.tolerance_confidence}}) {
      const double v = r.number(*tol, "tolerance_interval", key);
      if (std::isnan(v)) continue;
      *field = v;
      if (!(v > 0 && v < 1))
        r.error(r.where(*tol, key),
                fmt::format("tolerance_interval.{} = {} must lie strictly between 0 and 1 (write "
                            "0.99 for 99 %)",
                            key, v));
    }
  }
  if (const auto* temp = r.table(root, "temperature", false)) {
    r.check_keys(*temp, "temperature", {"coefficient_pct_per_c"});
    const double v = r.number(*temp, "temperature", "coefficient_pct_per_c");
    spec.temp_coeff_pct_per_c = v;
    if (!std::isnan(v) && !(std::abs(v) < 10))
      r.error(r.where(*temp, "coefficient_pct_per_c"),
              fmt::format("temperature.coefficient_pct_per_c = {} must lie between -10 and 10 "
                          "%/degC",
                          v));
  }

  if (!r.any()) {
    if (std::string problem = spec.validate(); !problem.empty()) r.error_file(problem);
  }
  result.errors = r.take();
  if (result.errors.empty()) result.spec = std::move(spec);
  return result;
}

SpecLoadResult load_spec(const std::string& path) {
  FileRead read = read_regular_file(path, kMaxSpecFileBytes);
  if (read.ok()) return parse_spec(read.text, path);
  SpecLoadResult result;
  if (read.problem == ReadProblem::too_large) {
    result.errors.push_back(
        {path, 0, 0,
         fmt::format("the spec file is {} bytes, over the {} a spec may have: not a spec file?",
                     read.size, kMaxSpecFileBytes)});
  } else if (read.problem == ReadProblem::missing || read.problem == ReadProblem::unreadable) {
    result.errors.push_back({path, 0, 0, "cannot open the spec file"});
  } else {
    result.errors.push_back({path, 0, 0, "the spec file " + describe(read)});
  }
  return result;
}

nlohmann::json spec_json(const Spec& spec) {
  auto num = [](double v) { return std::isfinite(v) ? nlohmann::json(v) : nlohmann::json(); };
  nlohmann::json j;
  j["part_number"] = spec.part_number;
  j["description"] = spec.description;
  j["source_file"] = spec.source_file;
  j["limits"] = {{"r10_min_ohm", num(spec.r10_ohm.min)},
                 {"r10_max_ohm", num(spec.r10_ohm.max)},
                 {"gamma_min", num(spec.gamma.min)},
                 {"gamma_max", num(spec.gamma.max)},
                 {"dark_min_ohm", num(spec.dark_min_ohm)},
                 {"max_rms_log_residual", num(spec.max_rms_log_residual)}};
  j["conditions"] = {{"reference_lux", spec.conditions.reference_lux},
                     {"dark_dwell_s", spec.conditions.dark_dwell_s},
                     {"temp_c", spec.conditions.temp_c}};
  j["inspection"] = {
      {"mode", to_string(spec.inspection.mode)},
      {"level", to_string(spec.inspection.level)},
      {"aql", spec.inspection.aql_pct},
      {"lot_size",
       spec.inspection.lot_size ? nlohmann::json(*spec.inspection.lot_size) : nlohmann::json()}};
  j["tolerance_interval"] = {{"coverage", spec.tolerance_coverage},
                             {"confidence", spec.tolerance_confidence}};
  j["temperature"] = {{"coefficient_pct_per_c", num(spec.temp_coeff_pct_per_c)}};
  return j;
}

}  // namespace photolot
