// Import of bench logs (CSV) into a Lot. The format and every option are documented in
// docs/bench-log-format.md and at the top of core/src/import/csv_import.cpp.
//
// A file that cannot be read at all (missing, empty, binary, no recognisable columns) is a
// FileError; a row that cannot be used is a Diagnostic in Lot::diagnostics, skipped and
// counted, and never sinks the lot.
#pragma once

#include <cstdint>
#include <functional>
#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "photolot/lot.h"

namespace photolot {

enum class ColumnRole : std::uint8_t { unit_id, lux, ohm, temp_c, ignored };
std::string_view to_string(ColumnRole role);

// Choices that override detection. Empty strings mean "detect".
struct ImportOptions {
  char delimiter = 0;  // ',', ';', '\t', or 0 to detect
  char decimal = 0;    // '.', ',', or 0: '.' unless the delimiter is ';', then ','
                       // (or '.' when the first data rows only use '.')
  // A column by header name (case-insensitive) or by 1-based number ("3").
  std::string id_column, lux_column, ohm_column, temp_column;
  // A unit forcing the column's scale: "lx", "lux", "fc"; "ohm", "kohm", "Mohm"; "degC", "K".
  std::string lux_unit, ohm_unit, temp_unit;
  double overload_ohm = kNaN;   // the bound for "OL"-style readings with no value (ohm)
  std::string default_unit_id;  // for logs of a single unit with no id column

  // Empty when valid; otherwise names the field, its value and the rule.
  std::string validate() const;
};

// A file that cannot be read at all. line and column are 1-based (columns count characters, as
// editors do); 0 means "the whole file".
struct FileError {
  std::string file;
  std::uint32_t line = 0;
  std::uint32_t column = 0;
  std::string message;
};

struct DetectedColumn {
  std::size_t index = 0;  // 0-based
  std::string header;     // as written
  ColumnRole role = ColumnRole::ignored;
  std::string unit;   // canonical: "lx", "fc", "ohm", "kohm", "Mohm", "degC", "K", or ""
  double scale = 1;   // value * scale = lx / ohm; temperature: see offset
  double offset = 0;  // degC = value * scale + offset
};

// What import saw in one file: shown by the workbench's import preview and in the JSON.
struct FileLayout {
  std::string file;
  char delimiter = ',';
  char decimal = '.';
  bool had_bom = false;
  std::size_t header_line = 0;  // 1-based
  std::vector<DetectedColumn> columns;
  std::vector<std::vector<std::string>> preview;  // first data rows, split into fields
  std::size_t data_rows = 0;                      // import only: data rows read from this file
  std::optional<FileError> error;                 // set when the file cannot be read at all
};

struct ImportResult {
  Lot lot;
  std::vector<FileLayout> layouts;  // one per file read
  std::vector<FileError> errors;    // files that could not be read at all
  bool ok() const { return errors.empty(); }
};

// The largest bench log import_files reads, in bytes (256 MiB: some 10 million rows; a lot of
// 10,000 units at 13 levels is about 3 MB). A larger file is refused with a FileError before
// anything is read, so a wrong file picked by mistake (a disk image, a video) cannot exhaust
// memory; split a larger log into several files of one lot.
inline constexpr std::uint64_t kMaxLogFileBytes = std::uint64_t{256} << 20;

struct FileRead;
// Words for a bench log that read_regular_file (read_file.h) could not read, to follow its
// name: "no such file", "is 1024 MiB, over the 256 MiB a bench log may have; ...". The import
// and the workbench's own reads say the same.
std::string describe_log_read(const FileRead& read);

// Import several files as one lot. Units in several files merge; exact duplicate rows are
// dropped, conflicting ones reported. `on_read`, when given, is called with each file's path
// and the bytes read from it (files that could not be read are not passed), before they are
// parsed: for a fingerprint of exactly what was imported.
using OnFileRead = std::function<void(const std::string& path, std::string_view content)>;
ImportResult import_files(const std::vector<std::string>& paths, const ImportOptions& options = {},
                          const OnFileRead& on_read = {});

// Import from memory (tests, fuzzing, the workbench's re-import); `name` stands in for the path.
ImportResult import_buffers(const std::vector<std::pair<std::string, std::string>>& named_contents,
                            const ImportOptions& options = {});

// Detection only, on the start of a file's content: for the import preview.
FileLayout detect_layout(std::string_view name, std::string_view content,
                         const ImportOptions& options = {}, std::size_t preview_rows = 20);

}  // namespace photolot
