// The results document as JSON: writing (deterministic bytes) and reading back.
// docs/results-format.md lists every key; keep the two in step.
#include <cmath>
#include <map>

#include <fmt/format.h>

#include "photolot/results.h"

namespace photolot::results {
namespace {

Json number(double v) { return std::isfinite(v) ? Json(v) : Json(nullptr); }
Json pair(const std::array<double, 2>& v) { return Json::array({number(v[0]), number(v[1])}); }
Json numbers(const std::vector<double>& v) {
  Json out = Json::array();
  for (double x : v) out.push_back(number(x));
  return out;
}

Json temperature_to_json(const LotTemperature& t) {
  Json j = Json::object();
  j["identifiable"] = t.identifiable;
  j["span_c"] = number(t.span_c);
  j["coefficient_pct_per_c"] = number(t.coefficient_pct_per_c);
  j["slope_pct_per_c_per_decade"] = number(t.slope_pct_per_c_per_decade);
  j["source"] = t.source;
  j["message"] = t.message;
  return j;
}

Json counts_to_json(const ImportCounts& c) {
  Json j = Json::object();
  j["rows_read"] = c.rows_read;
  j["rows_used"] = c.rows_used;
  j["rows_skipped"] = c.rows_skipped;
  j["duplicates_dropped"] = c.duplicates_dropped;
  j["conflicts"] = c.conflicts;
  j["censored"] = c.censored;
  j["dark"] = c.dark;
  return j;
}

Json curve_to_json(const Curve& c) {
  Json j = Json::object();
  j["model"] = std::string(to_string(c.model));
  j["params"] = numbers(c.params);
  j["covariance"] = numbers(c.covariance);
  j["temperature_handled"] = c.temperature_handled;
  j["tc10_pct_per_c"] = number(c.tc10_pct_per_c);
  j["tc_slope_pct_per_c_per_decade"] = number(c.tc_slope_pct_per_c_per_decade);
  return j;
}

Json fit_summary_to_json(const ResultsDocument& doc) {
  Json j = Json::object();
  j["method"] = doc.fit_method;
  std::size_t fitted = 0;
  std::map<std::string, std::size_t> not_fitted;  // sorted by reason: deterministic
  for (const auto& u : doc.units) {
    if (u.ok())
      ++fitted;
    else
      ++not_fitted[std::string(to_string(u.status))];
  }
  j["units"] = doc.units.size();
  j["fitted"] = fitted;
  Json reasons = Json::object();
  for (const auto& [reason, n] : not_fitted) reasons[reason] = n;
  j["not_fitted"] = reasons;
  j["temperature"] = temperature_to_json(doc.temperature);
  return j;
}

Json diagnostic_to_json(const Diagnostic& d) {
  Json j = Json::object();
  j["file"] = d.file;
  j["line"] = d.line;
  j["column"] = d.column;
  j["severity"] = std::string(to_string(d.severity));
  j["message"] = d.message;
  return j;
}

// ---- reading ----

// A reading failure with the JSON path of the offending value.
struct SchemaError {
  std::string message;
};

class Reader {
 public:
  explicit Reader(std::string path) : path_(std::move(path)) {}

  const Json& member(const Json& obj, const char* key) const {
    if (!obj.is_object()) throw SchemaError{fmt::format("{}: expected an object", path_)};
    auto it = obj.find(key);
    if (it == obj.end()) throw SchemaError{fmt::format("{}: missing key \"{}\"", path_, key)};
    return *it;
  }
  Reader at(const char* key) const { return Reader(path_.empty() ? key : path_ + "." + key); }
  Reader at(std::size_t i) const { return Reader(fmt::format("{}[{}]", path_, i)); }

  double num(const Json& obj, const char* key) const {
    const Json& v = member(obj, key);
    if (v.is_null()) return kNaN;
    if (!v.is_number()) throw at(key).wrong("a number or null");
    return v.get<double>();
  }
  template <typename T>
  T count(const Json& obj, const char* key) const {
    const Json& v = member(obj, key);
    if (!v.is_number_integer() || v.get<std::int64_t>() < 0) throw at(key).wrong("a count");
    return static_cast<T>(v.get<std::uint64_t>());
  }
  std::string str(const Json& obj, const char* key) const {
    const Json& v = member(obj, key);
    if (!v.is_string()) throw at(key).wrong("a string");
    return v.get<std::string>();
  }
  bool boolean(const Json& obj, const char* key) const {
    const Json& v = member(obj, key);
    if (!v.is_boolean()) throw at(key).wrong("true or false");
    return v.get<bool>();
  }
  const Json& array(const Json& obj, const char* key) const {
    const Json& v = member(obj, key);
    if (!v.is_array()) throw at(key).wrong("an array");
    return v;
  }
  std::vector<double> nums(const Json& obj, const char* key) const {
    const Json& v = array(obj, key);
    std::vector<double> out;
    out.reserve(v.size());
    Reader r = at(key);
    for (std::size_t i = 0; i < v.size(); ++i) {
      if (v[i].is_null())
        out.push_back(kNaN);
      else if (v[i].is_number())
        out.push_back(v[i].get<double>());
      else
        throw r.at(i).wrong("a number or null");
    }
    return out;
  }
  std::array<double, 2> pair(const Json& obj, const char* key) const {
    auto v = nums(obj, key);
    if (v.size() != 2) throw at(key).wrong("[low, high]");
    return {v[0], v[1]};
  }
  SchemaError wrong(const char* expected) const {
    return SchemaError{fmt::format("{}: expected {}", path_, expected)};
  }

 private:
  std::string path_;
};

template <typename Enum, std::size_t N>
Enum parse_enum(const Reader& r, const std::string& text, const Enum (&values)[N]) {
  for (Enum e : values)
    if (to_string(e) == text) return e;
  throw SchemaError{r.wrong("a known name").message + fmt::format(", not \"{}\"", text)};
}

Curve curve_from_json(const Json& j, const Reader& r) {
  Curve c;
  static constexpr ModelKind kModels[] = {ModelKind::power_law, ModelKind::dark_conductance};
  c.model = parse_enum(r.at("model"), r.str(j, "model"), kModels);
  c.params = r.nums(j, "params");
  c.covariance = r.nums(j, "covariance");
  if (!c.covariance.empty() && c.covariance.size() != c.params.size() * c.params.size())
    throw r.at("covariance").wrong("params.size() squared values");
  c.temperature_handled = r.boolean(j, "temperature_handled");
  c.tc10_pct_per_c = r.num(j, "tc10_pct_per_c");
  c.tc_slope_pct_per_c_per_decade = r.num(j, "tc_slope_pct_per_c_per_decade");
  return c;
}

UnitFit unit_from_json(const Json& j, const Reader& r) {
  static constexpr FitStatus kStatuses[] = {FitStatus::fitted, FitStatus::no_valid_points,
                                            FitStatus::too_few_levels, FitStatus::span_too_small,
                                            FitStatus::solver_failed};
  UnitFit u;
  u.id = r.str(j, "id");
  u.status = parse_enum(r.at("status"), r.str(j, "status"), kStatuses);
  u.message = r.str(j, "message");
  u.curve = curve_from_json(r.member(j, "curve"), r.at("curve"));
  u.r10_ohm = r.num(j, "r10_ohm");
  u.r10_ci95_ohm = r.pair(j, "r10_ci95_ohm");
  u.gamma = r.num(j, "gamma");
  u.gamma_ci95 = r.pair(j, "gamma_ci95");
  u.gamma_10_100 = r.num(j, "gamma_10_100");
  u.ln_r10_sd = r.num(j, "ln_r10_sd");
  u.gamma_sd = r.num(j, "gamma_sd");
  u.rms_log_residual = r.num(j, "rms_log_residual");
  u.points = r.count<int>(j, "points");
  u.levels = r.count<int>(j, "levels");
  u.outlier_points = r.count<int>(j, "outlier_points");
  u.censored_points = r.count<int>(j, "censored_points");
  u.dark_readings = r.count<int>(j, "dark_readings");
  u.dof = r.count<int>(j, "dof");
  u.cost = r.num(j, "cost");
  u.iterations = r.count<int>(j, "iterations");
  u.aicc_power_law = r.num(j, "aicc_power_law");
  u.aicc_dark_conductance = r.num(j, "aicc_dark_conductance");
  u.dark_conductance_s = r.num(j, "dark_conductance_s");
  u.temp_coeff_pct_per_c = r.num(j, "temp_coeff_pct_per_c");
  u.dark_ohm = r.nums(j, "dark_ohm");
  const Json& censored = r.array(j, "dark_censored");
  if (censored.size() != u.dark_ohm.size()) throw r.at("dark_censored").wrong("one per dark_ohm");
  for (std::size_t i = 0; i < censored.size(); ++i) {
    if (!censored[i].is_boolean()) throw r.at("dark_censored").at(i).wrong("true or false");
    u.dark_censored.push_back(censored[i].get<bool>());
  }
  const Json& flags = r.array(j, "flags");
  for (std::size_t i = 0; i < flags.size(); ++i) {
    if (!flags[i].is_string()) throw r.at("flags").at(i).wrong("a string");
    u.flags.push_back(flags[i].get<std::string>());
  }
  if (auto it = j.find("residuals"); it != j.end()) {
    Reader rr = r.at("residuals");
    if (!it->is_array()) throw rr.wrong("an array");
    for (std::size_t i = 0; i < it->size(); ++i) {
      const Json& p = (*it)[i];
      Reader pr = rr.at(i);
      PointFit f;
      f.reading_index = pr.count<std::size_t>(p, "reading_index");
      f.lux = pr.num(p, "lux");
      f.ohm = pr.num(p, "ohm");
      f.residual_ln = pr.num(p, "residual_ln");
      f.weight = pr.num(p, "weight");
      f.outlier = pr.boolean(p, "outlier");
      u.residuals.push_back(f);
    }
  }
  return u;
}

// 1-based line and column of a byte offset in text.
std::pair<std::uint32_t, std::uint32_t> line_column(std::string_view text, std::size_t offset) {
  std::uint32_t line = 1, column = 1;
  for (std::size_t i = 0; i < offset && i < text.size(); ++i) {
    if (text[i] == '\n') {
      ++line;
      column = 1;
    } else {
      ++column;
    }
  }
  return {line, column};
}

}  // namespace

ResultsDocument make_document(const Lot& lot, const LotFit& fit) {
  ResultsDocument doc;
  doc.lot_name = lot.name;
  doc.import_counts = lot.counts;
  doc.fit_method = fit.method;
  doc.temperature = fit.temperature;
  doc.units = fit.units;
  doc.diagnostics = lot.diagnostics;
  return doc;
}

Json unit_to_json(const UnitFit& u, bool with_residuals) {
  Json j = Json::object();
  j["id"] = u.id;
  j["status"] = std::string(to_string(u.status));
  j["message"] = u.message;
  j["model"] = std::string(to_string(u.curve.model));
  j["r10_ohm"] = number(u.r10_ohm);
  j["r10_ci95_ohm"] = pair(u.r10_ci95_ohm);
  j["gamma"] = number(u.gamma);
  j["gamma_ci95"] = pair(u.gamma_ci95);
  j["gamma_10_100"] = number(u.gamma_10_100);
  j["ln_r10_sd"] = number(u.ln_r10_sd);
  j["gamma_sd"] = number(u.gamma_sd);
  j["rms_log_residual"] = number(u.rms_log_residual);
  j["points"] = u.points;
  j["levels"] = u.levels;
  j["outlier_points"] = u.outlier_points;
  j["censored_points"] = u.censored_points;
  j["dark_readings"] = u.dark_readings;
  j["dof"] = u.dof;
  j["cost"] = number(u.cost);
  j["iterations"] = u.iterations;
  j["aicc_power_law"] = number(u.aicc_power_law);
  j["aicc_dark_conductance"] = number(u.aicc_dark_conductance);
  j["dark_conductance_s"] = number(u.dark_conductance_s);
  j["temp_coeff_pct_per_c"] = number(u.temp_coeff_pct_per_c);
  j["dark_ohm"] = numbers(u.dark_ohm);
  Json censored = Json::array();
  for (bool b : u.dark_censored) censored.push_back(b);
  j["dark_censored"] = censored;
  j["flags"] = u.flags;
  j["curve"] = curve_to_json(u.curve);
  if (with_residuals) {
    Json points = Json::array();
    for (const auto& p : u.residuals) {
      Json q = Json::object();
      q["reading_index"] = p.reading_index;
      q["lux"] = number(p.lux);
      q["ohm"] = number(p.ohm);
      q["residual_ln"] = number(p.residual_ln);
      q["weight"] = number(p.weight);
      q["outlier"] = p.outlier;
      points.push_back(std::move(q));
    }
    j["residuals"] = std::move(points);
  }
  return j;
}

Json to_json(const ResultsDocument& doc) {
  Json j = Json::object();
  j["format"] = std::string(kFormatName);
  j["version"] = kFormatVersion;
  j["generator"] = doc.generator;
  j["lot_name"] = doc.lot_name;
  Json inputs = Json::object();
  Json files = Json::array();
  for (const auto& f : doc.files) {
    Json e = Json::object();
    e["path"] = f.path;
    e["size_bytes"] = f.size_bytes;
    e["fnv1a64"] = f.fnv1a64;
    files.push_back(std::move(e));
  }
  inputs["files"] = std::move(files);
  inputs["options"] = doc.options.is_object() ? doc.options : Json::object();
  j["inputs"] = std::move(inputs);
  j["import"] = counts_to_json(doc.import_counts);
  j["fit"] = fit_summary_to_json(doc);
  Json units = Json::array();
  for (const auto& u : doc.units) units.push_back(unit_to_json(u, doc.with_residuals));
  j["units"] = std::move(units);
  Json diagnostics = Json::array();
  for (const auto& d : doc.diagnostics) diagnostics.push_back(diagnostic_to_json(d));
  j["diagnostics"] = std::move(diagnostics);
  if (doc.sections.is_object())
    for (const auto& [key, value] : doc.sections.items())
      if (!j.contains(key)) j[key] = value;
  return j;
}

// Indented two spaces, except that each element of "units" and "diagnostics" is one compact
// line: a 10,000-unit document stays a few megabytes, and a unit is one grep-able line.
std::string to_json_text(const ResultsDocument& doc) {
  const Json j = to_json(doc);
  std::string out = "{\n";
  bool first = true;
  for (const auto& [key, value] : j.items()) {
    if (!first) out += ",\n";
    first = false;
    out += "  ";
    out += Json(key).dump();
    out += ": ";
    if ((key == "units" || key == "diagnostics") && value.is_array() && !value.empty()) {
      out += "[\n";
      for (std::size_t i = 0; i < value.size(); ++i) {
        out += "    ";
        out += value[i].dump(-1, ' ', false, Json::error_handler_t::replace);
        out += i + 1 < value.size() ? ",\n" : "\n";
      }
      out += "  ]";
    } else {
      std::string text = value.dump(2, ' ', false, Json::error_handler_t::replace);
      // Indent the nested lines by the two spaces of this level.
      for (char c : text) {
        out += c;
        if (c == '\n') out += "  ";
      }
    }
  }
  out += "\n}\n";
  return out;
}

ReadResult from_json(const Json& j) {
  ReadResult result;
  ResultsDocument& doc = result.doc;
  try {
    Reader r("");
    if (!j.is_object()) throw SchemaError{"the document is not a JSON object"};
    if (r.str(j, "format") != kFormatName)
      throw SchemaError{fmt::format("format: expected \"{}\", not a photolot results document",
                                    kFormatName)};
    const Json& version = r.member(j, "version");
    if (!version.is_number_integer()) throw r.at("version").wrong("a whole number");
    if (version.get<std::int64_t>() > kFormatVersion)
      throw SchemaError{fmt::format(
          "version: {} was written by a newer photolot; this one reads version {} and older",
          version.get<std::int64_t>(), kFormatVersion)};
    if (version.get<std::int64_t>() < 1) throw r.at("version").wrong("1 or more");
    doc.generator = r.str(j, "generator");
    doc.lot_name = r.str(j, "lot_name");

    const Json& inputs = r.member(j, "inputs");
    Reader ri = r.at("inputs");
    const Json& files = ri.array(inputs, "files");
    for (std::size_t i = 0; i < files.size(); ++i) {
      Reader rf = ri.at("files").at(i);
      doc.files.push_back(InputFile{rf.str(files[i], "path"),
                                    rf.count<std::uint64_t>(files[i], "size_bytes"),
                                    rf.str(files[i], "fnv1a64")});
    }
    doc.options = ri.member(inputs, "options");
    if (!doc.options.is_object()) throw ri.at("options").wrong("an object");

    const Json& counts = r.member(j, "import");
    Reader rc = r.at("import");
    ImportCounts& c = doc.import_counts;
    c.rows_read = rc.count<std::size_t>(counts, "rows_read");
    c.rows_used = rc.count<std::size_t>(counts, "rows_used");
    c.rows_skipped = rc.count<std::size_t>(counts, "rows_skipped");
    c.duplicates_dropped = rc.count<std::size_t>(counts, "duplicates_dropped");
    c.conflicts = rc.count<std::size_t>(counts, "conflicts");
    c.censored = rc.count<std::size_t>(counts, "censored");
    c.dark = rc.count<std::size_t>(counts, "dark");

    const Json& fit = r.member(j, "fit");
    Reader rfit = r.at("fit");
    doc.fit_method = rfit.str(fit, "method");
    const Json& t = rfit.member(fit, "temperature");
    Reader rt = rfit.at("temperature");
    doc.temperature.identifiable = rt.boolean(t, "identifiable");
    doc.temperature.span_c = rt.num(t, "span_c");
    doc.temperature.coefficient_pct_per_c = rt.num(t, "coefficient_pct_per_c");
    doc.temperature.slope_pct_per_c_per_decade = rt.num(t, "slope_pct_per_c_per_decade");
    doc.temperature.source = rt.str(t, "source");
    doc.temperature.message = rt.str(t, "message");

    const Json& units = r.array(j, "units");
    doc.units.reserve(units.size());
    for (std::size_t i = 0; i < units.size(); ++i) {
      doc.units.push_back(unit_from_json(units[i], r.at("units").at(i)));
      if (units[i].contains("residuals")) doc.with_residuals = true;
    }

    static constexpr Severity kSeverities[] = {Severity::note, Severity::warning, Severity::error};
    const Json& diagnostics = r.array(j, "diagnostics");
    for (std::size_t i = 0; i < diagnostics.size(); ++i) {
      Reader rd = r.at("diagnostics").at(i);
      const Json& d = diagnostics[i];
      doc.diagnostics.push_back(Diagnostic{
          rd.str(d, "file"), rd.count<std::uint32_t>(d, "line"),
          rd.count<std::uint32_t>(d, "column"),
          parse_enum(rd.at("severity"), rd.str(d, "severity"), kSeverities),
          rd.str(d, "message")});
    }

    static const char* const kCore[] = {"format", "version", "generator", "lot_name", "inputs",
                                        "import", "fit",     "units",     "diagnostics"};
    for (const auto& [key, value] : j.items()) {
      bool core = false;
      for (const char* k : kCore) core = core || key == k;
      if (!core) doc.sections[key] = value;
    }
  } catch (const SchemaError& e) {
    result.error = ReadError{0, 0, e.message};
  }
  return result;
}

ReadResult from_json_text(std::string_view text) {
  Json j;
  try {
    j = Json::parse(text.begin(), text.end());
  } catch (const Json::parse_error& e) {
    ReadResult result;
    // byte is the 1-based position of the character where parsing stopped.
    auto [line, column] = line_column(text, e.byte > 0 ? e.byte - 1 : 0);
    std::string message = e.what();
    // nlohmann's text starts "[json.exception.parse_error.101] parse error at line ..., column
    // ...: "; keep what follows, as the place is reported separately.
    if (auto pos = message.find(": "); pos != std::string::npos) message = message.substr(pos + 2);
    result.error = ReadError{line, column, "not valid JSON: " + message};
    return result;
  }
  return from_json(j);
}

}  // namespace photolot::results
