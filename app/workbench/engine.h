// The workbench's door to the import and fit steps, over the bytes it holds for each log.
#pragma once

#include <stop_token>
#include <string>
#include <utility>
#include <vector>

#include "photolot/fit_result.h"
#include "photolot/fitting/fit.h"
#include "photolot/fitting/models.h"
#include "photolot/import.h"
#include "photolot/progress.h"

namespace photolot::workbench {

// A bench log as the workbench holds it: the path the user gave and the bytes read from it,
// so a re-import with other choices never needs the disk and a workspace can tell when the file
// changed (SHA-256 of the bytes).
struct SourceFile {
  std::string path;
  std::string content;
  std::string sha256_hex;
};

// Reads a file and, when hash is true, hashes it (the session hashes unhashed sources on its
// worker). On failure the returned message names the path and the cause.
std::pair<SourceFile, std::string> read_source_file(const std::string& path, bool hash = true);
std::string sha256_hex(const std::string& bytes);

ImportResult run_import(const std::vector<SourceFile>& sources, const ImportOptions& options);
FileLayout run_detect(const SourceFile& source, const ImportOptions& options,
                      std::size_t preview_rows = 20);
// The fit the command line's analyze runs (fitting/models.h): the curve model, over-range
// readings as one-sided bounds (when model.censored_terms), the bench profile's weights and
// the temperature handling, so both faces show the same numbers for the same choices.
LotFit run_fit(const Lot& lot, const fitting::FitOptions& options,
               const fitting::ExtendedFitOptions& model, const ProgressFn& progress,
               std::stop_token stop);

}  // namespace photolot::workbench
