#include "engine.h"

#include <QCryptographicHash>
#include <QFile>

#include <fmt/format.h>

namespace photolot::workbench {

std::string sha256_hex(const std::string& bytes) {
  const QByteArray digest = QCryptographicHash::hash(
      QByteArrayView(bytes.data(), static_cast<qsizetype>(bytes.size())),
      QCryptographicHash::Sha256);
  return digest.toHex().toStdString();
}

std::pair<SourceFile, std::string> read_source_file(const std::string& path) {
  QFile file(QString::fromStdString(path));
  if (!file.open(QIODevice::ReadOnly)) {
    return {{}, fmt::format("cannot read '{}': {}", path, file.errorString().toStdString())};
  }
  const QByteArray bytes = file.readAll();
  SourceFile source;
  source.path = path;
  source.content.assign(bytes.constData(), static_cast<std::size_t>(bytes.size()));
  source.sha256_hex = sha256_hex(source.content);
  return {std::move(source), {}};
}

bool import_available() { return PHOTOLOT_HAVE_IMPORT != 0; }
bool fit_available() { return PHOTOLOT_HAVE_FIT != 0; }
bool synth_available() { return PHOTOLOT_HAVE_SYNTH != 0; }

ImportResult run_import(const std::vector<SourceFile>& sources, const ImportOptions& options) {
#if PHOTOLOT_HAVE_IMPORT
  std::vector<std::pair<std::string, std::string>> named;
  named.reserve(sources.size());
  for (const auto& s : sources) named.emplace_back(s.path, s.content);
  ImportResult result = import_buffers(named, options);
  return result;
#else
  ImportResult result;
  for (const auto& s : sources) {
    result.lot.source_files.push_back(s.path);
    result.errors.push_back({s.path, 0, 0, std::string("import is ") + kNotAvailableYet});
  }
  return result;
#endif
}

FileLayout run_detect(const SourceFile& source, const ImportOptions& options,
                      std::size_t preview_rows) {
#if PHOTOLOT_HAVE_IMPORT
  return detect_layout(source.path, source.content, options, preview_rows);
#else
  FileLayout layout;
  layout.file = source.path;
  return layout;
#endif
}

LotFit run_fit(const Lot& lot, const fitting::FitOptions& options, const ProgressFn& progress,
               std::stop_token stop) {
#if PHOTOLOT_HAVE_FIT
  return fitting::fit_lot(lot, options, progress, stop);
#else
  LotFit fit;
  fit.method = std::string("fitting is ") + kNotAvailableYet;
  for (const auto& unit : lot.units) {
    UnitFit u;
    u.id = unit.id;
    u.status = FitStatus::solver_failed;
    u.message = fit.method;
    fit.units.push_back(std::move(u));
  }
  if (progress) progress(lot.units.size(), lot.units.size());
  return fit;
#endif
}

}  // namespace photolot::workbench
