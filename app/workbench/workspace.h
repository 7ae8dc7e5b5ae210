// The workspace file: one JSON document, our own versioned format (docs/workbench.md), with
// the source logs (paths relative to the workspace's folder, and SHA-256 of their content),
// the import choices, the fit options, the spec (when that step has landed), the view state and
// the results document the command line writes (when that has landed). Written atomically.
//
//   {"format": "photolot-workspace", "version": 1, "saved_by": "photolot 0.1.0",
//    "sources": [{"path": "logs/reel-07.csv", "sha256": "…", "bytes": 51234}],
//    "import": {...ImportOptions...}, "fit": {...FitOptions...}, "model": {...fit_handling.h...},
//    "view": {"selected_units": ["U0001"], "filter": "", "tab": "curves"},
//    "spec": null, "results": null}
#pragma once

#include <QString>

#include <optional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "fit_handling.h"
#include "photolot/fitting/fit.h"
#include "photolot/import.h"

namespace photolot::workbench {

inline constexpr const char* kWorkspaceFormat = "photolot-workspace";
inline constexpr int kWorkspaceVersion = 1;

struct WorkspaceSource {
  std::string path;  // absolute in memory; relative to the workspace folder on disk when inside it
  std::string sha256_hex;
  std::uint64_t bytes = 0;
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
};

nlohmann::json to_json(const ImportOptions& options);
// Fields not present keep their defaults; a wrong type is an error naming the field.
std::optional<std::string> from_json(const nlohmann::json& j, ImportOptions& options);
nlohmann::json to_json(const fitting::FitOptions& options);
std::optional<std::string> from_json(const nlohmann::json& j, fitting::FitOptions& options);

// Serialises with paths made relative to `folder` where they lie inside it.
nlohmann::json workspace_to_json(const Workspace& workspace, const QString& folder);
// Parses and resolves relative paths against `folder`. Error text names the field.
std::optional<std::string> workspace_from_json(const nlohmann::json& j, const QString& folder,
                                               Workspace& workspace);

// Writes through a temporary file renamed into place (QSaveFile). Returns an error or empty.
QString save_workspace(const QString& path, const Workspace& workspace);
// Reads a workspace file; on failure the error names the file and, for JSON, the byte offset.
QString load_workspace(const QString& path, Workspace& workspace);

// A source whose file is missing or whose content no longer matches the saved hash.
struct SourceChange {
  std::string path;
  bool missing = false;
};
std::vector<SourceChange> changed_sources(const Workspace& workspace);

}  // namespace photolot::workbench
