#include "engine.h"

#include <fmt/format.h>

#include <QCryptographicHash>

#include "photolot/import.h"
#include "photolot/read_file.h"

namespace photolot::workbench {

std::string sha256_hex(const std::string& bytes) {
  const QByteArray digest =
      QCryptographicHash::hash(QByteArrayView(bytes.data(), static_cast<qsizetype>(bytes.size())),
                               QCryptographicHash::Sha256);
  return digest.toHex().toStdString();
}

std::pair<SourceFile, std::string> read_source_file(const std::string& path, bool hash) {
  // A regular file only (a pipe would wait for a writer), within the import's limit.
  FileRead read = read_regular_file(path, kMaxLogFileBytes);
  if (!read.ok()) return {{}, fmt::format("cannot read '{}': {}", path, describe_log_read(read))};
  SourceFile source;
  source.path = path;
  source.content = std::move(read.text);
  if (hash) source.sha256_hex = sha256_hex(source.content);
  return {std::move(source), {}};
}

ImportResult run_import(const std::vector<SourceFile>& sources, const ImportOptions& options) {
  std::vector<std::pair<std::string, std::string>> named;
  named.reserve(sources.size());
  for (const auto& s : sources) named.emplace_back(s.path, s.content);
  return import_buffers(named, options);
}

FileLayout run_detect(const SourceFile& source, const ImportOptions& options,
                      std::size_t preview_rows) {
  return detect_layout(source.path, source.content, options, preview_rows);
}

LotFit run_fit(const Lot& lot, const fitting::FitOptions& options,
               const fitting::ExtendedFitOptions& model, const ProgressFn& progress,
               std::stop_token stop) {
  fitting::FitOptions fit = options;
  fit.over_range_bounds = model.censored_terms;
  return fitting::fit_lot_extended(lot, fit, model, progress, stop);
}

}  // namespace photolot::workbench
