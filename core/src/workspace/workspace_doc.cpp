// The workspace document: parse, check, resolve, write (workspace_doc.h).
#include "photolot/workspace_doc.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <fstream>
#include <limits>
#include <set>
#include <system_error>
#include <utility>

#include "../io/json_text.h"
#include "photolot/read_file.h"

namespace photolot::workspace {
namespace {

namespace fs = std::filesystem;
using Json = results::Json;

// Deeper than any document photolot writes (the results document nests five levels); keeps a
// hostile "[[[[..." from exhausting the stack of whatever walks the value later.
constexpr int kMaxDepth = 64;

// A member's problem: thrown inside this file only, caught by parse().
struct Bad {
  std::string field;
  std::string message;
};

std::string type_name(const Json& v) { return v.is_null() ? "null" : std::string(v.type_name()); }

const Json* member(const Json& object, const char* key) {
  const auto it = object.find(key);
  return it == object.end() || it->is_null() ? nullptr : &*it;
}

std::string text_member(const Json& object, const char* key, const std::string& field) {
  const Json* v = member(object, key);
  if (!v) return {};
  if (!v->is_string()) throw Bad{field, "must be a string, not " + type_name(*v)};
  return v->get<std::string>();
}

std::optional<double> number_member(const Json& object, const char* key, const std::string& field) {
  const Json* v = member(object, key);
  if (!v) return std::nullopt;
  if (!v->is_number()) throw Bad{field, "must be a number, not " + type_name(*v)};
  const double x = v->get<double>();
  if (!std::isfinite(x)) throw Bad{field, "must be a finite number"};
  return x;
}

std::optional<int> int_member(const Json& object, const char* key, const std::string& field) {
  const Json* v = member(object, key);
  if (!v) return std::nullopt;
  if (v->is_number_unsigned()) {
    if (v->get<std::uint64_t>() > std::uint64_t(std::numeric_limits<int>::max()))
      throw Bad{field, fmt::format("= {} is too large", v->get<std::uint64_t>())};
    return static_cast<int>(v->get<std::uint64_t>());
  }
  if (v->is_number_integer()) {
    const std::int64_t x = v->get<std::int64_t>();
    if (x < std::numeric_limits<int>::min()) throw Bad{field, fmt::format("= {} is too small", x)};
    return static_cast<int>(x);
  }
  throw Bad{field, "must be a whole number, not " + type_name(*v)};
}

std::optional<bool> bool_member(const Json& object, const char* key, const std::string& field) {
  const Json* v = member(object, key);
  if (!v) return std::nullopt;
  if (!v->is_boolean()) throw Bad{field, "must be true or false, not " + type_name(*v)};
  return v->get<bool>();
}

char char_member(const Json& object, const char* key, const std::string& field, char fallback) {
  if (!member(object, key)) return fallback;
  const std::string s = text_member(object, key, field);
  if (s.size() > 1) throw Bad{field, "must be a string of at most one character"};
  return s.empty() ? 0 : s[0];
}

const Json& object_member(const Json& object, const char* key, const std::string& field) {
  static const Json kEmpty = Json::object();
  const Json* v = member(object, key);
  if (!v) return kEmpty;
  if (!v->is_object()) throw Bad{field, "must be an object, not " + type_name(*v)};
  return *v;
}

std::string char_text(char c) { return c == 0 ? std::string() : std::string(1, c); }

bool is_hex64(const std::string& s) {
  return s.size() == 64 && std::all_of(s.begin(), s.end(), [](char c) {
           return (c >= '0' && c <= '9') || (c >= 'a' && c <= 'f');
         });
}

fs::path absolute_folder(const fs::path& folder) {
  std::error_code ec;
  fs::path f = folder.empty() ? fs::path(".") : folder;
  if (!f.is_absolute()) {
    const fs::path a = fs::absolute(f, ec);
    if (!ec) f = a;
  }
  return f.lexically_normal();
}

// True when `path` (lexically normal) lies under `folder` (lexically normal).
bool under(const fs::path& path, const fs::path& folder) {
  const fs::path rel = path.lexically_relative(folder);
  return !rel.empty() && *rel.begin() != "..";
}

// A stored path: refused when it could not name a file a person chose (empty, control
// characters, beyond the system's limits), else resolved against the folder.
Source read_source(const Json& s, std::size_t i, const fs::path& folder) {
  const std::string at = fmt::format("sources[{}]", i);
  if (!s.is_object()) throw Bad{at, "must be an object, not " + type_name(s)};
  const Json* p = member(s, "path");
  if (!p) throw Bad{at + ".path", "is missing"};
  Source source;
  source.stored_path = text_member(s, "path", at + ".path");
  const std::string& stored = source.stored_path;
  if (stored.empty()) throw Bad{at + ".path", "is empty"};
  for (unsigned char c : stored) {
    if (c < 0x20 || c == 0x7F) {
      throw Bad{at + ".path", fmt::format("holds a control character (byte {:#04x})", c)};
    }
  }
  if (stored.size() > kMaxPathBytes) {
    throw Bad{at + ".path", fmt::format("is {} bytes long; paths over {} bytes are refused",
                                        stored.size(), kMaxPathBytes)};
  }
  const fs::path given(stored);
  for (const auto& part : given) {
    if (part.native().size() > kMaxNameBytes) {
      throw Bad{at + ".path", fmt::format("has a name of {} bytes; names over {} bytes are refused",
                                          part.native().size(), kMaxNameBytes)};
    }
  }
  source.path = (given.is_absolute() ? given : folder / given).lexically_normal();
  if (source.path.native().size() > kMaxPathBytes) {
    throw Bad{at + ".path", fmt::format("resolves to a path of {} bytes; paths over {} bytes are "
                                        "refused",
                                        source.path.native().size(), kMaxPathBytes)};
  }
  if (source.path.filename().empty()) throw Bad{at + ".path", "names a folder, not a file"};
  source.outside_folder = !under(source.path, folder);
  source.sha256_hex = text_member(s, "sha256", at + ".sha256");
  if (!source.sha256_hex.empty() && !is_hex64(source.sha256_hex)) {
    throw Bad{at + ".sha256", "must be 64 lowercase hexadecimal digits (SHA-256)"};
  }
  if (const Json* b = member(s, "bytes")) {
    if (!b->is_number_unsigned() && !(b->is_number_integer() && b->get<std::int64_t>() >= 0))
      throw Bad{at + ".bytes", "must be a whole number of bytes, not " + b->dump()};
    source.bytes = b->get<std::uint64_t>();
  }
  return source;
}

void read_import(const Json& j, ImportOptions& o) {
  o.delimiter = char_member(j, "delimiter", "import.delimiter", o.delimiter);
  o.decimal = char_member(j, "decimal", "import.decimal", o.decimal);
  const std::pair<const char*, std::string*> texts[] = {
      {"id_column", &o.id_column},   {"lux_column", &o.lux_column},
      {"ohm_column", &o.ohm_column}, {"temp_column", &o.temp_column},
      {"lux_unit", &o.lux_unit},     {"ohm_unit", &o.ohm_unit},
      {"temp_unit", &o.temp_unit},   {"default_unit_id", &o.default_unit_id}};
  for (const auto& [key, out] : texts) {
    if (member(j, key)) *out = text_member(j, key, std::string("import.") + key);
  }
  if (auto x = number_member(j, "overload_ohm", "import.overload_ohm")) o.overload_ohm = *x;
  if (const std::string problem = o.validate(); !problem.empty()) throw Bad{"import", problem};
}

FitChoices read_fit(const Json& j) {
  FitChoices f;
  if (member(j, "loss")) {
    f.loss = text_member(j, "loss", "fit.loss");
    if (*f.loss != "huber" && *f.loss != "cauchy" && *f.loss != "none")
      throw Bad{"fit.loss", "= \"" + *f.loss + "\" is not huber, cauchy or none"};
  }
  f.meter_accuracy_pct = number_member(j, "meter_accuracy_pct", "fit.meter_accuracy_pct");
  f.outlier_threshold = number_member(j, "outlier_threshold", "fit.outlier_threshold");
  f.min_span_decades = number_member(j, "min_span_decades", "fit.min_span_decades");
  f.confidence = number_member(j, "confidence", "fit.confidence");
  f.min_levels = int_member(j, "min_levels", "fit.min_levels");
  f.over_range_bounds = bool_member(j, "over_range_bounds", "fit.over_range_bounds");
  return f;
}

View read_view(const Json& j) {
  View v;
  if (const Json* units = member(j, "selected_units")) {
    if (!units->is_array()) throw Bad{"view.selected_units", "must be an array of unit ids"};
    for (std::size_t i = 0; i < units->size(); ++i) {
      if (!(*units)[i].is_string())
        throw Bad{fmt::format("view.selected_units[{}]", i), "must be a string (a unit id)"};
      v.selected_units.push_back((*units)[i].get<std::string>());
    }
  }
  v.filter = text_member(j, "filter", "view.filter");
  v.tab = text_member(j, "tab", "view.tab");
  return v;
}

void read_document(const Json& j, const fs::path& folder, Document& doc) {
  if (!j.is_object()) throw Bad{"", "the document is not a JSON object"};
  const Json* format = member(j, "format");
  if (!format || !format->is_string() || format->get<std::string>() != kFormat) {
    throw Bad{"format", fmt::format("is not \"{}\": not a photolot workspace", kFormat)};
  }
  const auto version = int_member(j, "version", "version");
  if (!version) throw Bad{"version", "is missing"};
  if (*version < 1 || *version > kVersion) {
    throw Bad{"version",
              fmt::format("{} is not supported (this build reads 1 to {})", *version, kVersion)};
  }
  doc.saved_by = text_member(j, "saved_by", "saved_by");
  if (const Json* sources = member(j, "sources")) {
    if (!sources->is_array()) throw Bad{"sources", "must be an array, not " + type_name(*sources)};
    if (sources->size() > kMaxSources) {
      throw Bad{"sources", fmt::format("lists {} files; a workspace of more than {} is refused",
                                       sources->size(), kMaxSources)};
    }
    std::set<fs::path> seen;
    for (std::size_t i = 0; i < sources->size(); ++i) {
      Source s = read_source((*sources)[i], i, folder);
      if (!seen.insert(s.path).second) {
        doc.warnings.push_back(
            fmt::format("sources[{}]: '{}' is listed twice; read once", i, s.stored_path));
        continue;
      }
      doc.sources.push_back(std::move(s));
    }
  }
  read_import(object_member(j, "import", "import"), doc.import_options);
  doc.fit = read_fit(object_member(j, "fit", "fit"));
  doc.view = read_view(object_member(j, "view", "view"));
  if (member(j, "model")) doc.model = object_member(j, "model", "model");
  if (member(j, "spec")) {
    const Json& spec = object_member(j, "spec", "spec");
    if (!member(spec, "toml")) throw Bad{"spec.toml", "is missing"};
    doc.spec =
        SpecSection{text_member(spec, "file", "spec.file"), text_member(spec, "toml", "spec.toml")};
  }
  if (const Json* r = member(j, "results")) {
    const results::ReadResult read = results::from_json(*r);
    if (read.ok()) {
      doc.results = *r;
    } else {
      doc.warnings.push_back("results: " + read.error->message +
                             "; set aside, the lot is fitted again from its logs");
    }
  }
}

}  // namespace

std::string to_string(const Error& e, std::string_view file) {
  if (e.line > 0) return fmt::format("{}:{}:{}: {}", file, e.line, e.column, e.message);
  if (e.field.empty()) return fmt::format("{}: {}", file, e.message);
  return fmt::format("{}: {} {}", file, e.field, e.message);
}

ParseResult parse(std::string_view text, const fs::path& folder_in) {
  ParseResult result;
  const fs::path folder = absolute_folder(folder_in);
  Json j;
  bool too_deep = false;
  const auto depth_guard = [&too_deep](int depth, Json::parse_event_t, Json&) {
    if (depth > kMaxDepth) too_deep = true;
    return !too_deep;
  };
  if (auto e = json_text::parse(text, j, depth_guard)) {
    result.error = Error{e->line, e->column, "", std::move(e->message)};
    return result;
  }
  if (too_deep) {
    result.error = Error{0, 0, "",
                         fmt::format("values are nested more than {} levels deep; "
                                     "not a photolot workspace",
                                     kMaxDepth)};
    return result;
  }
  try {
    read_document(j, folder, result.doc);
  } catch (const Bad& bad) {
    result.doc = Document{};
    result.error = Error{0, 0, bad.field, bad.message};
  }
  return result;
}

ParseResult load(const fs::path& file) {
  ParseResult result;
  FileRead read = read_regular_file(file.string(), kMaxFileBytes);
  switch (read.problem) {
    case ReadProblem::none:
      break;
    case ReadProblem::missing:
      result.error = Error{0, 0, "", "cannot read: no such file"};
      return result;
    case ReadProblem::folder:
    case ReadProblem::not_regular:
      result.error = Error{0, 0, "", "is not a file (a folder, device or pipe); nothing was read"};
      return result;
    case ReadProblem::too_large:
      result.error = Error{0, 0, "",
                           fmt::format("is {} bytes; a workspace over {} bytes is refused "
                                       "unread",
                                       read.size, kMaxFileBytes)};
      return result;
    case ReadProblem::unreadable:
      result.error = Error{0, 0, "", "cannot read: permission denied or unreadable"};
      return result;
    case ReadProblem::read_error:
      result.error = Error{0, 0, "", "cannot read: a read error"};
      return result;
  }
  const std::string& text = read.text;
  fs::path folder = file.parent_path();
  if (folder.empty()) folder = ".";
  return parse(text, folder);
}

results::Json to_json(const ImportOptions& o) {
  Json j = Json::object();
  j["delimiter"] = char_text(o.delimiter);
  j["decimal"] = char_text(o.decimal);
  j["id_column"] = o.id_column;
  j["lux_column"] = o.lux_column;
  j["ohm_column"] = o.ohm_column;
  j["temp_column"] = o.temp_column;
  j["lux_unit"] = o.lux_unit;
  j["ohm_unit"] = o.ohm_unit;
  j["temp_unit"] = o.temp_unit;
  j["overload_ohm"] = std::isfinite(o.overload_ohm) ? Json(o.overload_ohm) : Json();
  j["default_unit_id"] = o.default_unit_id;
  return j;
}

std::optional<Error> from_json(const results::Json& j, ImportOptions& options) {
  try {
    if (!j.is_object()) throw Bad{"import", "must be an object, not " + type_name(j)};
    ImportOptions o = options;
    read_import(j, o);
    options = std::move(o);
  } catch (const Bad& bad) {
    return Error{0, 0, bad.field, bad.message};
  }
  return std::nullopt;
}

std::string to_text(const Document& doc, const fs::path& folder_in) {
  const fs::path folder = absolute_folder(folder_in);
  Json j = Json::object();
  j["format"] = kFormat;
  j["version"] = kVersion;
  j["saved_by"] = doc.saved_by.empty() ? std::string("photolot ") + PHOTOLOT_VERSION : doc.saved_by;
  Json sources = Json::array();
  for (const auto& s : doc.sources) {
    fs::path path = s.path.is_absolute() ? s.path : folder / s.path;
    path = path.lexically_normal();
    const std::string stored =
        under(path, folder) ? path.lexically_relative(folder).generic_string() : path.string();
    Json entry = {{"path", stored}, {"sha256", s.sha256_hex}, {"bytes", s.bytes}};
    sources.push_back(std::move(entry));
  }
  j["sources"] = std::move(sources);
  j["import"] = to_json(doc.import_options);
  Json fit = Json::object();
  if (doc.fit.loss) fit["loss"] = *doc.fit.loss;
  if (doc.fit.meter_accuracy_pct) fit["meter_accuracy_pct"] = *doc.fit.meter_accuracy_pct;
  if (doc.fit.outlier_threshold) fit["outlier_threshold"] = *doc.fit.outlier_threshold;
  if (doc.fit.min_levels) fit["min_levels"] = *doc.fit.min_levels;
  if (doc.fit.min_span_decades) fit["min_span_decades"] = *doc.fit.min_span_decades;
  if (doc.fit.confidence) fit["confidence"] = *doc.fit.confidence;
  if (doc.fit.over_range_bounds) fit["over_range_bounds"] = *doc.fit.over_range_bounds;
  j["fit"] = std::move(fit);
  if (doc.model.is_object()) j["model"] = doc.model;
  j["view"] = {{"selected_units", doc.view.selected_units},
               {"filter", doc.view.filter},
               {"tab", doc.view.tab}};
  j["spec"] = doc.spec ? Json{{"file", doc.spec->file}, {"toml", doc.spec->toml}} : Json();
  j["results"] = doc.results;
  return j.dump(2) + "\n";
}

std::string_view to_string(SourceState state) {
  switch (state) {
    case SourceState::file:
      return "file";
    case SourceState::missing:
      return "missing";
    case SourceState::not_a_file:
      return "not a file";
    case SourceState::too_large:
      return "too large";
  }
  return "?";
}

SourceCheck check_source(const Source& source, const fs::path& folder_in) {
  const fs::path folder = absolute_folder(folder_in);
  SourceCheck check;
  std::error_code ec;
  check.real_path = fs::weakly_canonical(source.path, ec);
  if (ec) check.real_path = source.path;
  fs::path real_folder = fs::weakly_canonical(folder, ec);
  if (ec) real_folder = folder;
  check.outside_folder = source.outside_folder || !under(check.real_path, real_folder);
  const fs::file_status status = fs::status(source.path, ec);  // follows links
  if (ec || !fs::exists(status)) {
    check.state = SourceState::missing;
    check.detail = "no such file";
    return check;
  }
  switch (status.type()) {
    case fs::file_type::regular:
      break;
    case fs::file_type::directory:
      check.state = SourceState::not_a_file;
      check.detail = "a folder, not a file";
      return check;
    case fs::file_type::character:
    case fs::file_type::block:
      check.state = SourceState::not_a_file;
      check.detail = "a device, not a file; never read";
      return check;
    case fs::file_type::fifo:
    case fs::file_type::socket:
      check.state = SourceState::not_a_file;
      check.detail = "a pipe or socket, not a file; never read";
      return check;
    default:
      check.state = SourceState::not_a_file;
      check.detail = "not a regular file; never read";
      return check;
  }
  check.bytes = fs::file_size(source.path, ec);
  if (ec) {
    check.state = SourceState::missing;
    check.detail = "cannot be read: " + ec.message();
    return check;
  }
  if (check.bytes > kMaxLogFileBytes) {
    check.state = SourceState::too_large;
    check.detail = fmt::format("{} bytes; bench logs over {} bytes are refused unread", check.bytes,
                               kMaxLogFileBytes);
    return check;
  }
  check.state = SourceState::file;
  return check;
}

}  // namespace photolot::workspace
