// The results document: one versioned JSON file that is both photolot-cli's output and the
// body of the workbench's saved workspace, so automation and the screens read the same numbers.
// The format is documented key by key in docs/results-format.md; the unit table (CSV) carries
// the per-unit fields of the same document.
//
// The document is assembled from sections. The core ones (inputs, import, fit, units,
// diagnostics) are typed here; a later step (statistics, acceptance, pairing) adds its own
// section to ResultsDocument::sections under its key and documents it beside the others.
//
// Output is deterministic: the same inputs and options give the same bytes (keys in a fixed
// order, numbers in shortest round-trip form, no timestamps). NaN is written as null.
#pragma once

#include <cstdint>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "photolot/fit_result.h"
#include "photolot/lot.h"

namespace photolot::results {

using Json = nlohmann::ordered_json;

inline constexpr std::string_view kFormatName = "photolot-results";
inline constexpr int kFormatVersion = 1;

// 64-bit FNV-1a (offset basis 14695981039346656037, prime 1099511628211) over the bytes.
std::uint64_t fnv1a64(std::string_view bytes);
std::string fnv1a64_hex(std::string_view bytes);  // 16 lower-case hex digits

struct InputFile {
  std::string path;  // as given by the user
  std::uint64_t size_bytes = 0;
  std::string fnv1a64;  // fnv1a64_hex of the content
};

// Describes a file by the bytes read from it (size and hash). Give it the bytes the lot was
// imported from (import_files' on_read), so the fingerprint is of what was read.
InputFile describe_content(const std::string& path, std::string_view content);

struct ResultsDocument {
  std::string generator = "photolot " PHOTOLOT_VERSION;
  std::string lot_name;

  // "inputs": the files and the options used, grouped by step ({"import": {...}, "fit": {...}}).
  std::vector<InputFile> files;
  Json options = Json::object();

  ImportCounts import_counts;  // "import"
  std::string fit_method;      // "fit": {"method": ...}
  LotTemperature temperature;  // "fit": {"temperature": {...}}

  std::vector<UnitFit> units;   // "units"
  // Keys later steps add to each element of "units" (e.g. the spec's "verdict" and "reasons"):
  // empty, or one JSON object per unit, in the order of `units`. Its members are written after
  // the unit's own keys and before "residuals"; reading a document back puts every key of a
  // unit that is not one of the unit's own here (empty when no unit has any).
  std::vector<Json> unit_sections;
  bool with_residuals = false;  // write each unit's per-point residuals ("residuals": [...])
  std::vector<Diagnostic> diagnostics;  // "diagnostics"

  // Further sections by key, written after the core ones in this order and read back as they
  // were written (e.g. "statistics", "acceptance", "pairing").
  Json sections = Json::object();
};

// Fills the core sections from an imported lot and its fit.
ResultsDocument make_document(const Lot& lot, const LotFit& fit);

Json to_json(const ResultsDocument& doc);
Json unit_to_json(const UnitFit& unit, bool with_residuals);
std::string to_json_text(const ResultsDocument& doc);  // indented two spaces, ends in '\n'

// Reading a document back (the workbench's workspace embeds one).
struct ReadError {
  std::uint32_t line = 0;    // 1-based; 0 when the error is about the whole document
  std::uint32_t column = 0;  // 1-based
  std::string message;
};
struct ReadResult {
  ResultsDocument doc;
  std::optional<ReadError> error;
  bool ok() const { return !error; }
};
ReadResult from_json_text(std::string_view text);
// From a parsed value (the workbench's workspace holds the document as one of its members).
ReadResult from_json(const Json& value);

// The unit table: one row per unit with the per-unit fields of the document, comma-separated,
// '.' decimals, a header row, CRLF-free ('\n' line ends). Text cells are CSV-quoted when needed
// and neutralised against spreadsheet formulas (see csv_text_cell); number cells are written
// as numbers, empty when NaN.
std::string units_csv(const std::vector<UnitFit>& units);
std::vector<std::string_view> units_csv_columns();

// One CSV cell holding text: a cell starting with '=', '+', '-', '@', tab or carriage return is
// prefixed with a single quote so a spreadsheet shows it rather than running it (OWASP, "CSV
// Injection"); then the cell is quoted when it holds a comma, quote, CR or LF, doubling quotes.
std::string csv_text_cell(std::string_view text);
// One CSV cell holding a number: shortest round-trip form, empty when NaN or infinite.
std::string csv_number_cell(double value);

}  // namespace photolot::results
