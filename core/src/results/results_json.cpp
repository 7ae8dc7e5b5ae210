// The results document as JSON: writing (deterministic bytes) and reading back.
// docs/results-format.md lists every key; keep the two in step.
#include <fmt/format.h>

#include <cmath>
#include <iterator>
#include <limits>
#include <map>
#include <set>
#include <tuple>

#include "../io/json_text.h"
#include "photolot/results.h"

namespace photolot::results {
namespace {

Json number(double v) { return std::isfinite(v) ? Json(v) : Json(nullptr); }

Json temperature_to_json(const LotTemperature& t) {
  Json j = Json::object();
  j["identifiable"] = t.identifiable;
  j["span_c"] = number(t.span_c);
  j["coefficient_pct_per_c"] = number(t.coefficient_pct_per_c);
  j["slope_pct_per_c_per_decade"] = number(t.slope_pct_per_c_per_decade);
  j["source"] = t.source;
  j["outcome"] = std::string(to_string(t.outcome));
  j["reason"] = t.reason;
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
    // A count beyond its field's type would come back as another number (found by fuzzing).
    if (v.get<std::uint64_t>() > static_cast<std::uint64_t>(std::numeric_limits<T>::max()))
      throw at(key).wrong(fmt::format("a count of at most {}", std::numeric_limits<T>::max()));
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
  SchemaError wrong(std::string_view expected) const {
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

// Documents written before `outcome` and `reason` existed said it only in the message's
// opening words; read them from there.
void legacy_temperature_outcome(LotTemperature& t) {
  const std::string_view m = t.message;
  const std::string_view lead = "not identifiable: ";
  if (t.identifiable) {
    t.outcome = TemperatureOutcome::fitted;
  } else if (m.rfind("temperature handling off", 0) == 0) {
    t.outcome = TemperatureOutcome::not_sought;
    t.reason = "temperature handling was off for this run";
  } else if (m.rfind(lead, 0) == 0) {
    t.outcome = TemperatureOutcome::not_identifiable;
    t.reason = std::string(m.substr(lead.size(), m.find(';') - lead.size()));
  } else if (!t.source.empty()) {
    t.outcome = TemperatureOutcome::not_sought;
  }
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

namespace {

// The per-unit line is written directly (no DOM): a 10,000-unit lot would otherwise build and
// free some 400,000 JSON values. Numbers are shortest round-trip, with ".0" on whole numbers as
// nlohmann::json writes them, so a value reads back as a floating-point number everywhere.
class LineWriter {
 public:
  explicit LineWriter(fmt::memory_buffer& out) : out_(out) {}
  void open() {
    out_.push_back('{');
    first_ = true;
  }
  void close() {
    out_.push_back('}');
    first_ = false;
  }
  void key(std::string_view k) {
    if (!first_) out_.push_back(',');
    first_ = false;
    out_.push_back('"');
    out_.append(k);  // keys are ours: plain ASCII, nothing to escape
    out_.append(std::string_view("\":"));
  }
  // A key read from a document (a member kept as it was read): escaped like any text.
  void read_key(std::string_view k) {
    if (!first_) out_.push_back(',');
    first_ = false;
    text(k);
    out_.push_back(':');
  }
  void number(double v) {
    if (!std::isfinite(v)) {
      out_.append(std::string_view("null"));
      return;
    }
    auto start = out_.size();
    fmt::format_to(std::back_inserter(out_), "{}", v);
    std::string_view written(out_.data() + start, out_.size() - start);
    if (written.find_first_of(".e") == std::string_view::npos) out_.append(std::string_view(".0"));
  }
  void integer(long long v) { fmt::format_to(std::back_inserter(out_), "{}", v); }
  void boolean(bool b) { out_.append(b ? std::string_view("true") : std::string_view("false")); }
  void text(std::string_view s) {
    bool plain = true;  // printable ASCII with nothing to escape: written as it is
    for (unsigned char c : s) plain = plain && c >= 0x20 && c < 0x7f && c != '"' && c != '\\';
    if (plain) {
      out_.push_back('"');
      out_.append(s);
      out_.push_back('"');
      return;
    }
    // nlohmann's escaping, with invalid UTF-8 replaced by U+FFFD rather than failing.
    out_.append(Json(std::string(s)).dump(-1, ' ', false, Json::error_handler_t::replace));
  }
  template <typename Range, typename Fn>
  void array(const Range& values, Fn each) {
    out_.push_back('[');
    bool first = true;
    for (const auto& v : values) {
      if (!first) out_.push_back(',');
      first = false;
      each(v);
    }
    out_.push_back(']');
  }
  void numbers(const std::vector<double>& v) {
    array(v, [this](double x) { number(x); });
  }
  void pair(const std::array<double, 2>& v) {
    array(v, [this](double x) { number(x); });
  }
  void num(std::string_view k, double v) {
    key(k);
    number(v);
  }
  void count(std::string_view k, long long v) {
    key(k);
    integer(v);
  }
  void str(std::string_view k, std::string_view v) {
    key(k);
    text(v);
  }

 private:
  fmt::memory_buffer& out_;
  bool first_ = true;
};

void append_unit(fmt::memory_buffer& out, const UnitFit& u, bool with_residuals,
                 const Json* extra = nullptr) {
  LineWriter w(out);
  w.open();
  w.str("id", u.id);
  w.str("status", to_string(u.status));
  w.str("message", u.message);
  w.str("model", to_string(u.curve.model));
  w.num("r10_ohm", u.r10_ohm);
  w.key("r10_ci95_ohm");
  w.pair(u.r10_ci95_ohm);
  w.num("gamma", u.gamma);
  w.key("gamma_ci95");
  w.pair(u.gamma_ci95);
  w.num("gamma_10_100", u.gamma_10_100);
  w.num("ln_r10_sd", u.ln_r10_sd);
  w.num("gamma_sd", u.gamma_sd);
  w.num("rms_log_residual", u.rms_log_residual);
  w.count("points", u.points);
  w.count("levels", u.levels);
  w.count("outlier_points", u.outlier_points);
  w.count("censored_points", u.censored_points);
  w.count("dark_readings", u.dark_readings);
  w.count("dof", u.dof);
  w.num("cost", u.cost);
  w.count("iterations", u.iterations);
  w.num("aicc_power_law", u.aicc_power_law);
  w.num("aicc_dark_conductance", u.aicc_dark_conductance);
  w.num("dark_conductance_s", u.dark_conductance_s);
  w.num("temp_coeff_pct_per_c", u.temp_coeff_pct_per_c);
  w.key("dark_ohm");
  w.numbers(u.dark_ohm);
  w.key("dark_censored");
  w.array(u.dark_censored, [&](bool b) { w.boolean(b); });
  w.key("flags");
  w.array(u.flags, [&](const std::string& f) { w.text(f); });
  w.key("curve");
  {
    LineWriter c(out);
    c.open();
    c.str("model", to_string(u.curve.model));
    c.key("params");
    c.numbers(u.curve.params);
    c.key("covariance");
    c.numbers(u.curve.covariance);
    c.key("temperature_handled");
    c.boolean(u.curve.temperature_handled);
    c.num("tc10_pct_per_c", u.curve.tc10_pct_per_c);
    c.num("tc_slope_pct_per_c_per_decade", u.curve.tc_slope_pct_per_c_per_decade);
    c.close();
  }
  if (extra && extra->is_object()) {
    for (const auto& [k, v] : extra->items()) {
      if (k == "residuals") continue;  // written below, from the unit itself
      w.read_key(k);
      out.append(v.dump(-1, ' ', false, Json::error_handler_t::replace));
    }
  }
  if (with_residuals) {
    w.key("residuals");
    w.array(u.residuals, [&](const PointFit& p) {
      LineWriter q(out);
      q.open();
      q.count("reading_index", static_cast<long long>(p.reading_index));
      q.num("lux", p.lux);
      q.num("ohm", p.ohm);
      q.num("residual_ln", p.residual_ln);
      q.num("weight", p.weight);
      q.key("outlier");
      q.boolean(p.outlier);
      q.close();
    });
  }
  w.close();
}

}  // namespace

Json unit_to_json(const UnitFit& u, bool with_residuals) {
  fmt::memory_buffer out;
  append_unit(out, u, with_residuals);
  return Json::parse(std::string_view(out.data(), out.size()));
}

namespace {

// Everything but the units, in document order; "units" holds an empty placeholder array.
Json header_to_json(const ResultsDocument& doc) {
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
  j["units"] = Json::array();
  Json diagnostics = Json::array();
  for (const auto& d : doc.diagnostics) diagnostics.push_back(diagnostic_to_json(d));
  j["diagnostics"] = std::move(diagnostics);
  if (doc.sections.is_object())
    for (const auto& [key, value] : doc.sections.items())
      if (!j.contains(key)) j[key] = value;
  return j;
}

void append_indented(fmt::memory_buffer& out, const Json& value) {
  std::string text = value.dump(2, ' ', false, Json::error_handler_t::replace);
  for (char c : text) {
    out.push_back(c);
    if (c == '\n') out.append(std::string_view("  "));
  }
}

}  // namespace

// The text is the one true form: to_json() parses it, so the DOM and the file never differ.
Json to_json(const ResultsDocument& doc) { return Json::parse(to_json_text(doc)); }

// Indented two spaces, except that each element of "units" and "diagnostics" is one compact
// line: a 10,000-unit document stays a few megabytes, and a unit is one grep-able line.
std::string to_json_text(const ResultsDocument& doc) {
  const Json header = header_to_json(doc);
  fmt::memory_buffer out;
  out.append(std::string_view("{\n"));
  bool first = true;
  for (const auto& [key, value] : header.items()) {
    if (!first) out.append(std::string_view(",\n"));
    first = false;
    out.append(std::string_view("  "));
    out.append(Json(key).dump());
    out.append(std::string_view(": "));
    if (key == "units") {
      if (doc.units.empty()) {
        out.append(std::string_view("[]"));
        continue;
      }
      out.append(std::string_view("[\n"));
      for (std::size_t i = 0; i < doc.units.size(); ++i) {
        out.append(std::string_view("    "));
        append_unit(out, doc.units[i], doc.with_residuals,
                    i < doc.unit_sections.size() ? &doc.unit_sections[i] : nullptr);
        out.append(i + 1 < doc.units.size() ? std::string_view(",\n") : std::string_view("\n"));
      }
      out.append(std::string_view("  ]"));
    } else if (key == "diagnostics" && !value.empty()) {
      out.append(std::string_view("[\n"));
      for (std::size_t i = 0; i < value.size(); ++i) {
        out.append(std::string_view("    "));
        out.append(value[i].dump(-1, ' ', false, Json::error_handler_t::replace));
        out.append(i + 1 < value.size() ? std::string_view(",\n") : std::string_view("\n"));
      }
      out.append(std::string_view("  ]"));
    } else {
      append_indented(out, value);
    }
  }
  out.append(std::string_view("\n}\n"));
  return fmt::to_string(out);
}

ReadResult from_json(const Json& j) {
  ReadResult result;
  ResultsDocument& doc = result.doc;
  try {
    Reader r("");
    if (!j.is_object()) throw SchemaError{"the document is not a JSON object"};
    if (r.str(j, "format") != kFormatName)
      throw SchemaError{
          fmt::format("format: expected \"{}\", not a photolot results document", kFormatName)};
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
    if (t.contains("outcome")) {
      static constexpr TemperatureOutcome kOutcomes[] = {
          TemperatureOutcome::not_stated, TemperatureOutcome::fitted,
          TemperatureOutcome::not_identifiable, TemperatureOutcome::not_sought};
      doc.temperature.outcome = parse_enum(rt.at("outcome"), rt.str(t, "outcome"), kOutcomes);
      doc.temperature.reason = rt.str(t, "reason");
    } else {
      legacy_temperature_outcome(doc.temperature);
    }

    const Json& units = r.array(j, "units");
    doc.units.reserve(units.size());
    for (std::size_t i = 0; i < units.size(); ++i) {
      doc.units.push_back(unit_from_json(units[i], r.at("units").at(i)));
      if (units[i].contains("residuals")) doc.with_residuals = true;
    }
    // Keys of later steps in the units: every key that is not one of the unit's own.
    {
      // The unit's own keys, as append_unit writes them.
      static const std::set<std::string, std::less<>> kOwnKeys = {"id",
                                                                  "status",
                                                                  "message",
                                                                  "model",
                                                                  "r10_ohm",
                                                                  "r10_ci95_ohm",
                                                                  "gamma",
                                                                  "gamma_ci95",
                                                                  "gamma_10_100",
                                                                  "ln_r10_sd",
                                                                  "gamma_sd",
                                                                  "rms_log_residual",
                                                                  "points",
                                                                  "levels",
                                                                  "outlier_points",
                                                                  "censored_points",
                                                                  "dark_readings",
                                                                  "dof",
                                                                  "cost",
                                                                  "iterations",
                                                                  "aicc_power_law",
                                                                  "aicc_dark_conductance",
                                                                  "dark_conductance_s",
                                                                  "temp_coeff_pct_per_c",
                                                                  "dark_ohm",
                                                                  "dark_censored",
                                                                  "flags",
                                                                  "curve",
                                                                  "residuals"};
      std::vector<Json> extras(units.size(), Json::object());
      bool any = false;
      for (std::size_t i = 0; i < units.size(); ++i)
        for (const auto& [key, value] : units[i].items())
          if (!kOwnKeys.count(key)) {
            extras[i][key] = value;
            any = true;
          }
      if (any) doc.unit_sections = std::move(extras);
    }

    static constexpr Severity kSeverities[] = {Severity::note, Severity::warning, Severity::error};
    const Json& diagnostics = r.array(j, "diagnostics");
    for (std::size_t i = 0; i < diagnostics.size(); ++i) {
      Reader rd = r.at("diagnostics").at(i);
      const Json& d = diagnostics[i];
      doc.diagnostics.push_back(Diagnostic{
          rd.str(d, "file"), rd.count<std::uint32_t>(d, "line"),
          rd.count<std::uint32_t>(d, "column"),
          parse_enum(rd.at("severity"), rd.str(d, "severity"), kSeverities), rd.str(d, "message")});
    }

    static const char* const kCore[] = {"format", "version", "generator", "lot_name",   "inputs",
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
  if (auto e = json_text::parse(text, j)) {
    ReadResult result;
    result.error = ReadError{e->line, e->column, std::move(e->message)};
    return result;
  }
  return from_json(j);
}

}  // namespace photolot::results
