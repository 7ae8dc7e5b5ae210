#include "workspace.h"

#include <QFileInfo>
#include <QSaveFile>
#include <filesystem>

#include "engine.h"

namespace photolot::workbench {
namespace {

namespace fs = std::filesystem;

fs::path to_path(const QString& folder) { return fs::path(folder.toStdString()); }

// nlohmann::json and the ordered variant the core documents use are different types.
nlohmann::json plain(const results::Json& j) { return nlohmann::json::parse(j.dump()); }
results::Json ordered(const nlohmann::json& j) { return results::Json::parse(j.dump()); }

workspace::Document to_document(const Workspace& w) {
  workspace::Document doc;
  for (const auto& s : w.sources) {
    workspace::Source source;
    source.path = fs::path(s.path);
    source.sha256_hex = s.sha256_hex;
    source.bytes = s.bytes;
    doc.sources.push_back(std::move(source));
  }
  doc.import_options = w.import_options;
  doc.fit = fit_choices(w.fit_options);
  doc.model = ordered(to_json(w.model));
  doc.view = {w.view.selected_units, w.view.filter, w.view.tab};
  if (w.spec.is_object()) {
    doc.spec = workspace::SpecSection{w.spec.value("file", ""), w.spec.value("toml", "")};
  }
  if (!w.results.is_null()) doc.results = ordered(w.results);
  return doc;
}

std::optional<std::string> from_document(workspace::Document doc, Workspace& w) {
  Workspace out;
  for (auto& s : doc.sources) {
    out.sources.push_back(
        {s.path.string(), s.sha256_hex, s.bytes, s.stored_path, s.outside_folder});
  }
  out.import_options = doc.import_options;
  if (auto e = apply_fit_choices(doc.fit, out.fit_options)) return e;
  if (!doc.model.is_null()) {
    if (auto e = from_json(plain(doc.model), out.model)) return "model: " + *e;
  }
  out.view = {doc.view.selected_units, doc.view.filter, doc.view.tab};
  if (doc.spec) out.spec = {{"file", doc.spec->file}, {"toml", doc.spec->toml}};
  if (!doc.results.is_null()) out.results = plain(doc.results);
  out.warnings = std::move(doc.warnings);
  w = std::move(out);
  return std::nullopt;
}

}  // namespace

workspace::FitChoices fit_choices(const fitting::FitOptions& o) {
  workspace::FitChoices f;
  f.loss = std::string(fitting::to_string(o.loss));
  f.meter_accuracy_pct = o.meter_accuracy_pct;
  f.outlier_threshold = o.outlier_threshold;
  f.min_levels = o.min_levels;
  f.min_span_decades = o.min_span_decades;
  f.confidence = o.confidence;
  f.over_range_bounds = o.over_range_bounds;
  return f;
}

std::optional<std::string> apply_fit_choices(const workspace::FitChoices& f,
                                             fitting::FitOptions& options) {
  fitting::FitOptions o = options;
  if (f.loss) {
    bool known = false;
    for (auto l : {fitting::Loss::huber, fitting::Loss::cauchy, fitting::Loss::none}) {
      if (fitting::to_string(l) == *f.loss) {
        o.loss = l;
        known = true;
      }
    }
    if (!known) return "fit.loss = \"" + *f.loss + "\" is not huber, cauchy or none";
  }
  if (f.meter_accuracy_pct) o.meter_accuracy_pct = *f.meter_accuracy_pct;
  if (f.outlier_threshold) o.outlier_threshold = *f.outlier_threshold;
  if (f.min_levels) o.min_levels = *f.min_levels;
  if (f.min_span_decades) o.min_span_decades = *f.min_span_decades;
  if (f.confidence) o.confidence = *f.confidence;
  if (f.over_range_bounds) o.over_range_bounds = *f.over_range_bounds;
  if (const std::string problem = o.validate(); !problem.empty()) return "fit: " + problem;
  options = o;
  return std::nullopt;
}

std::string workspace_to_text(const Workspace& w, const QString& folder) {
  return workspace::to_text(to_document(w), to_path(folder));
}

std::optional<std::string> workspace_from_text(std::string_view text, const QString& folder,
                                               Workspace& w) {
  workspace::ParseResult read = workspace::parse(text, to_path(folder));
  if (!read.ok()) return workspace::to_string(*read.error, "workspace");
  return from_document(std::move(read.doc), w);
}

QString save_workspace(const QString& path, const Workspace& workspace) {
  const std::string text = workspace_to_text(workspace, QFileInfo(path).absolutePath());
  QSaveFile file(path);
  if (!file.open(QIODevice::WriteOnly)) {
    return QObject::tr("cannot write '%1': %2").arg(path, file.errorString());
  }
  file.write(text.data(), static_cast<qint64>(text.size()));
  if (!file.commit()) return QObject::tr("cannot write '%1': %2").arg(path, file.errorString());
  return {};
}

QString load_workspace(const QString& path, Workspace& workspace) {
  workspace::ParseResult read = workspace::load(to_path(QFileInfo(path).absoluteFilePath()));
  if (!read.ok())
    return QString::fromStdString(workspace::to_string(*read.error, path.toStdString()));
  if (auto e = from_document(std::move(read.doc), workspace)) {
    return QObject::tr("%1: %2").arg(path, QString::fromStdString(*e));
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
