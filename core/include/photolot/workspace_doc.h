// The workspace document: the workbench's saved state as one JSON text, our own versioned format
// (docs/workbench.md). This header is the Qt-free half of the workspace: the text to a checked
// structure (every member's type and range checked, paths resolved against the workspace's
// folder), the structure back to text, and a look at each source file before anything reads it.
// The workbench (app/workbench/workspace.h) adds the fit options and the file dialogs on top;
// the fuzz target "workspace" (tests/fuzz) drives parse() with arbitrary bytes.
//
//   {"format": "photolot-workspace", "version": 1, "saved_by": "photolot 0.1.0",
//    "sources": [{"path": "logs/reel-07.csv", "sha256": "<64 hex digits>", "bytes": 51234}],
//    "import": {...ImportOptions...}, "fit": {"loss": "huber", "meter_accuracy_pct": 1, ...},
//    "model": {...the workbench's curve-model choices...},
//    "view": {"selected_units": ["U0001"], "filter": "", "tab": "curves"},
//    "spec": {"file": "spec.toml", "toml": "..."} or null,
//    "results": {...the results document (results.h)...} or null}
//
// Opening a workspace never runs anything: the document holds data only (no command, no script,
// no link that is followed), and reading it writes nothing.
#pragma once

#include <cstdint>
#include <filesystem>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "photolot/import.h"
#include "photolot/results.h"

namespace photolot::workspace {

inline constexpr std::string_view kFormat = "photolot-workspace";
inline constexpr int kVersion = 1;
// Limits that keep a hostile document from doing harm: PATH_MAX and NAME_MAX of Linux (4096
// and 255 bytes, from memory), a cap on the number of sources, and on the file itself.
inline constexpr std::size_t kMaxPathBytes = 4096;
inline constexpr std::size_t kMaxNameBytes = 255;
inline constexpr std::size_t kMaxSources = 10000;
inline constexpr std::uint64_t kMaxFileBytes = std::uint64_t{1} << 30;  // 1 GiB

struct Source {
  std::string stored_path;      // as written in the document
  std::filesystem::path path;   // resolved: absolute, lexically normal
  bool outside_folder = false;  // the resolved path is not under the workspace's folder
  std::string sha256_hex;       // 64 lowercase hex digits, or empty when not known
  std::uint64_t bytes = 0;
};

// The fit choices as saved; a member not written keeps the fit's default. The loss is a name
// ("huber", "cauchy", "none"): the solver's enum lives in fitting/, above core.
struct FitChoices {
  std::optional<std::string> loss;
  std::optional<double> meter_accuracy_pct, outlier_threshold, min_span_decades, confidence;
  std::optional<int> min_levels;
  std::optional<bool> over_range_bounds;
};

struct View {
  std::vector<std::string> selected_units;
  std::string filter;
  std::string tab;
};

struct SpecSection {
  std::string file;  // the spec's file name when it was opened (shown, never read)
  std::string toml;  // the spec's text
};

struct Document {
  std::string saved_by;
  std::vector<Source> sources;
  ImportOptions import_options;
  FitChoices fit;
  View view;
  // The workbench's curve-model choices (model, bench profile, temperature handling): an
  // object, or null when not written. Checked member by member by the workbench, which owns
  // their meaning (the solver's options live in fitting/, above core).
  results::Json model;
  std::optional<SpecSection> spec;
  results::Json results;              // null, or a results document that results::from_json reads
  std::vector<std::string> warnings;  // what was set aside while reading (shown, never fatal)
};

// A document refused. JSON syntax errors have a line and column (1-based); an error about a
// member has line 0 and names the member in `field` ("sources[2].path").
struct Error {
  std::uint32_t line = 0;
  std::uint32_t column = 0;
  std::string field;
  std::string message;
};
// "file:line:column: message" or "file: field: message".
std::string to_string(const Error& error, std::string_view file);

struct ParseResult {
  Document doc;
  std::optional<Error> error;
  bool ok() const { return !error; }
};

// The text of a workspace file whose folder is `folder` (made absolute if it is not) to a
// document. Source paths are resolved against `folder`; nothing on disk is read or written.
// A results member that does not read is set aside with a warning (the lot is fitted again).
ParseResult parse(std::string_view text, const std::filesystem::path& folder);
// Reads the file (refused when it is not a regular file or is over kMaxFileBytes), then parse()
// with its folder. File errors are reported like parse errors.
ParseResult load(const std::filesystem::path& file);

// The document as text (indented two spaces, ends in '\n'). Source paths under `folder` are
// written relative to it ('/' separators), others whole.
std::string to_text(const Document& doc, const std::filesystem::path& folder);

// Import choices to and from a workspace member. from_json checks each member's type and then
// ImportOptions::validate(); members not present keep their defaults.
results::Json to_json(const ImportOptions& options);
std::optional<Error> from_json(const results::Json& j, ImportOptions& options);

// What a source file is, looked at without opening it (status only): shown to the user before
// anything is read, so that a workspace naming a device, a pipe or a folder reads nothing.
enum class SourceState { file, missing, not_a_file, too_large };
std::string_view to_string(SourceState state);

struct SourceCheck {
  SourceState state = SourceState::missing;
  std::filesystem::path real_path;  // symbolic links resolved (as far as they exist)
  bool outside_folder = false;      // lexically, or once links are resolved
  std::uint64_t bytes = 0;          // for a file
  std::string detail;               // for the user: "a character device", "no such file", ...
};
SourceCheck check_source(const Source& source, const std::filesystem::path& folder);

}  // namespace photolot::workspace
