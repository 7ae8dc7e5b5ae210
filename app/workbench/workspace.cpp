#include "workspace.h"

#include <QDir>
#include <QFile>
#include <QFileInfo>
#include <QSaveFile>

#include <cmath>

#include "engine.h"

namespace photolot::workbench {
namespace {

std::string char_to_string(char c) { return c == 0 ? std::string() : std::string(1, c); }

std::optional<std::string> read_char(const nlohmann::json& j, const char* field, char& out) {
  if (!j.contains(field)) return std::nullopt;
  const auto& v = j.at(field);
  if (!v.is_string() || v.get<std::string>().size() > 1) {
    return std::string(field) + " must be a string of at most one character";
  }
  const auto s = v.get<std::string>();
  out = s.empty() ? 0 : s[0];
  return std::nullopt;
}

template <typename T>
std::optional<std::string> read(const nlohmann::json& j, const char* field, T& out) {
  if (!j.contains(field) || j.at(field).is_null()) return std::nullopt;
  try {
    out = j.at(field).get<T>();
  } catch (const nlohmann::json::exception&) {
    return std::string(field) + " has the wrong type";
  }
  return std::nullopt;
}

}  // namespace

nlohmann::json to_json(const ImportOptions& o) {
  nlohmann::json j;
  j["delimiter"] = char_to_string(o.delimiter);
  j["decimal"] = char_to_string(o.decimal);
  j["id_column"] = o.id_column;
  j["lux_column"] = o.lux_column;
  j["ohm_column"] = o.ohm_column;
  j["temp_column"] = o.temp_column;
  j["lux_unit"] = o.lux_unit;
  j["ohm_unit"] = o.ohm_unit;
  j["temp_unit"] = o.temp_unit;
  j["overload_ohm"] = std::isfinite(o.overload_ohm) ? nlohmann::json(o.overload_ohm) : nullptr;
  j["default_unit_id"] = o.default_unit_id;
  return j;
}

std::optional<std::string> from_json(const nlohmann::json& j, ImportOptions& o) {
  if (!j.is_object()) return "import must be an object";
  for (auto e : {read_char(j, "delimiter", o.delimiter), read_char(j, "decimal", o.decimal),
                 read(j, "id_column", o.id_column), read(j, "lux_column", o.lux_column),
                 read(j, "ohm_column", o.ohm_column), read(j, "temp_column", o.temp_column),
                 read(j, "lux_unit", o.lux_unit), read(j, "ohm_unit", o.ohm_unit),
                 read(j, "temp_unit", o.temp_unit), read(j, "overload_ohm", o.overload_ohm),
                 read(j, "default_unit_id", o.default_unit_id)}) {
    if (e) return "import." + *e;
  }
  return std::nullopt;
}

nlohmann::json to_json(const fitting::FitOptions& o) {
  return {{"loss", std::string(fitting::to_string(o.loss))},
          {"meter_accuracy_pct", o.meter_accuracy_pct},
          {"outlier_threshold", o.outlier_threshold},
          {"min_levels", o.min_levels},
          {"min_span_decades", o.min_span_decades},
          {"confidence", o.confidence}};
}

std::optional<std::string> from_json(const nlohmann::json& j, fitting::FitOptions& o) {
  if (!j.is_object()) return "fit must be an object";
  std::string loss;
  for (auto e : {read(j, "loss", loss), read(j, "meter_accuracy_pct", o.meter_accuracy_pct),
                 read(j, "outlier_threshold", o.outlier_threshold),
                 read(j, "min_levels", o.min_levels),
                 read(j, "min_span_decades", o.min_span_decades),
                 read(j, "confidence", o.confidence)}) {
    if (e) return "fit." + *e;
  }
  if (!loss.empty()) {
    bool known = false;
    for (auto l : {fitting::Loss::huber, fitting::Loss::cauchy, fitting::Loss::none}) {
      if (fitting::to_string(l) == loss) {
        o.loss = l;
        known = true;
      }
    }
    if (!known) return "fit.loss = \"" + loss + "\" is not huber, cauchy or none";
  }
  return std::nullopt;
}

nlohmann::json workspace_to_json(const Workspace& w, const QString& folder) {
  nlohmann::json j;
  j["format"] = kWorkspaceFormat;
  j["version"] = kWorkspaceVersion;
  j["saved_by"] = std::string("photolot ") + PHOTOLOT_VERSION;
  const QDir dir(folder);
  nlohmann::json sources = nlohmann::json::array();
  for (const auto& s : w.sources) {
    const QString absolute = QFileInfo(QString::fromStdString(s.path)).absoluteFilePath();
    QString stored = dir.relativeFilePath(absolute);
    if (stored.startsWith(QLatin1String(".."))) stored = absolute;  // outside: keep it whole
    sources.push_back({{"path", stored.toStdString()}, {"sha256", s.sha256_hex}, {"bytes", s.bytes}});
  }
  j["sources"] = sources;
  j["import"] = to_json(w.import_options);
  j["fit"] = to_json(w.fit_options);
  j["model"] = to_json(w.model);
  j["view"] = {{"selected_units", w.view.selected_units},
               {"filter", w.view.filter},
               {"tab", w.view.tab}};
  j["spec"] = w.spec;
  j["results"] = w.results;
  return j;
}

std::optional<std::string> workspace_from_json(const nlohmann::json& j, const QString& folder,
                                               Workspace& w) {
  if (!j.is_object() || j.value("format", "") != kWorkspaceFormat) {
    return std::string("not a photolot workspace (\"format\" is not \"") + kWorkspaceFormat + "\")";
  }
  const int version = j.value("version", 0);
  if (version < 1 || version > kWorkspaceVersion) {
    return "workspace version " + std::to_string(version) + " is not supported (this build reads 1 to " +
           std::to_string(kWorkspaceVersion) + ")";
  }
  w = Workspace{};
  const QDir dir(folder);
  if (j.contains("sources")) {
    if (!j["sources"].is_array()) return "sources must be an array";
    for (std::size_t i = 0; i < j["sources"].size(); ++i) {
      const auto& s = j["sources"][i];
      WorkspaceSource source;
      if (!s.is_object() || !s.contains("path") || !s["path"].is_string()) {
        return "sources[" + std::to_string(i) + "].path must be a string";
      }
      const QString stored = QString::fromStdString(s["path"].get<std::string>());
      source.path = QDir::cleanPath(dir.absoluteFilePath(stored)).toStdString();
      if (auto e = read(s, "sha256", source.sha256_hex)) return "sources[" + std::to_string(i) + "]." + *e;
      if (auto e = read(s, "bytes", source.bytes)) return "sources[" + std::to_string(i) + "]." + *e;
      w.sources.push_back(std::move(source));
    }
  }
  if (j.contains("import")) {
    if (auto e = from_json(j["import"], w.import_options)) return e;
  }
  if (j.contains("fit")) {
    if (auto e = from_json(j["fit"], w.fit_options)) return e;
  }
  if (j.contains("model")) {
    if (auto e = from_json(j["model"], w.model)) return e;
  }
  if (j.contains("view") && j["view"].is_object()) {
    const auto& v = j["view"];
    if (auto e = read(v, "selected_units", w.view.selected_units)) return "view." + *e;
    if (auto e = read(v, "filter", w.view.filter)) return "view." + *e;
    if (auto e = read(v, "tab", w.view.tab)) return "view." + *e;
  }
  w.spec = j.value("spec", nlohmann::json());
  w.results = j.value("results", nlohmann::json());
  return std::nullopt;
}

QString save_workspace(const QString& path, const Workspace& workspace) {
  const nlohmann::json j = workspace_to_json(workspace, QFileInfo(path).absolutePath());
  const std::string text = j.dump(2) + "\n";
  QSaveFile file(path);
  if (!file.open(QIODevice::WriteOnly)) {
    return QObject::tr("cannot write '%1': %2").arg(path, file.errorString());
  }
  file.write(text.data(), static_cast<qint64>(text.size()));
  if (!file.commit()) return QObject::tr("cannot write '%1': %2").arg(path, file.errorString());
  return {};
}

QString load_workspace(const QString& path, Workspace& workspace) {
  QFile file(path);
  if (!file.open(QIODevice::ReadOnly)) {
    return QObject::tr("cannot read '%1': %2").arg(path, file.errorString());
  }
  const QByteArray bytes = file.readAll();
  nlohmann::json j;
  try {
    j = nlohmann::json::parse(bytes.constData(), bytes.constData() + bytes.size());
  } catch (const nlohmann::json::parse_error& e) {
    return QObject::tr("'%1' is not valid JSON (byte %2): %3")
        .arg(path)
        .arg(static_cast<qulonglong>(e.byte))
        .arg(QString::fromUtf8(e.what()));
  }
  if (auto e = workspace_from_json(j, QFileInfo(path).absolutePath(), workspace)) {
    return QObject::tr("'%1': %2").arg(path, QString::fromStdString(*e));
  }
  return {};
}

std::vector<SourceChange> changed_sources(const Workspace& workspace) {
  std::vector<SourceChange> changes;
  for (const auto& s : workspace.sources) {
    auto [file, error] = read_source_file(s.path);
    if (!error.empty()) {
      changes.push_back({s.path, true});
    } else if (!s.sha256_hex.empty() && file.sha256_hex != s.sha256_hex) {
      changes.push_back({s.path, false});
    }
  }
  return changes;
}

}  // namespace photolot::workbench
