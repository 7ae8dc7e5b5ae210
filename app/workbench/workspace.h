// The workspace file as the workbench holds it: the document of core's workspace_doc.h (format,
// checks, path resolution; docs/workbench.md) with the fit options as the solver's own struct
// and the curve-model choices of fit_handling.h (the document's "model" member).
// Written atomically (QSaveFile).
#pragma once

#include <QString>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

#include "fit_handling.h"
#include "photolot/fitting/fit.h"
#include "photolot/import.h"
#include "photolot/workspace_doc.h"

namespace photolot::workbench {

struct WorkspaceSource {
  std::string path;  // absolute in memory; relative to the workspace folder on disk when inside it
  std::string sha256_hex;
  std::uint64_t bytes = 0;
  std::string stored_path;      // as the file wrote it (set when loaded)
  bool outside_folder = false;  // resolved outside the workspace's folder (set when loaded)
};

struct WorkspaceView {
  std::vector<std::string> selected_units;
  std::string filter;
  std::string tab;
};

struct Workspace {
  std::vector<WorkspaceSource> sources;
  ImportOptions import_options;
  fitting::FitOptions fit_options;
  FitHandling model;  // curve model, bench profile, temperature ("model" in the file)
  WorkspaceView view;
  nlohmann::json spec;     // null until the spec step lands
  nlohmann::json results;  // the results document, null until it lands
  std::vector<std::string>
      warnings;  // what loading set aside (a results member that does not read)
};

// The fit options to the choices a workspace saves, and back: a choice not saved keeps the
// option's default; the result is checked with FitOptions::validate(). Error text names the field.
workspace::FitChoices fit_choices(const fitting::FitOptions& options);
std::optional<std::string> apply_fit_choices(const workspace::FitChoices& choices,
                                             fitting::FitOptions& options);

// Serialises with paths made relative to `folder` where they lie inside it.
std::string workspace_to_text(const Workspace& workspace, const QString& folder);
// Parses and resolves relative paths against `folder` (workspace_doc.h's checks). The error
// names the place (line:column) or the member.
std::optional<std::string> workspace_from_text(std::string_view text, const QString& folder,
                                               Workspace& workspace);

// Writes through a temporary file renamed into place (QSaveFile). Returns an error or empty.
QString save_workspace(const QString& path, const Workspace& workspace);
// Reads a workspace file (never its sources); on failure the error names the file and, for
// JSON, the line and column.
QString load_workspace(const QString& path, Workspace& workspace);

// A source whose file is missing or whose content no longer matches the saved hash.
struct SourceChange {
  std::string path;
  bool missing = false;
};
std::vector<SourceChange> changed_sources(const Workspace& workspace);

}  // namespace photolot::workbench
