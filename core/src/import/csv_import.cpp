// Bench-log import: CSV text -> Lot. The user's guide is docs/bench-log-format.md.
//
// Options (photolot::ImportOptions), each with its default:
//   delimiter = 0        ',', ';' or '\t'; 0 detects it from the header: the first of tab,
//                        semicolon, comma that splits the header into recognisable columns.
//   decimal = 0          '.' or ','; 0: '.' unless the delimiter is ';', then ',' (or '.' when
//                        the first data rows only use '.').
//   id_column, lux_column, ohm_column, temp_column = ""
//                        a column by header text (case-insensitive) or 1-based number ("3");
//                        "" detects it from the header by common names (see columns.h).
//   lux_unit, ohm_unit, temp_unit = ""
//                        forces a column's unit ("lx", "fc", "kohm", "Mohm", "degC", "K"...);
//                        "" takes the unit from the header, else lx, ohm, degC.
//   overload_ohm = NaN   the bound for over-range readings written without one ("OL"); NaN
//                        keeps them censored with an unknown bound.
//   default_unit_id = "" the unit id for logs with no id column; "" uses the file's stem.
//
// The text: UTF-8 with or without a byte-order mark; CRLF, LF or CR line ends; RFC 4180 quotes
// (a quoted field may hold delimiters, newlines and doubled quotes); blank lines, lines of
// delimiters only, and lines starting with '#' skipped anywhere. Lines before the header (a
// preamble) are skipped with a note. The header is the first line, among the first 64, that
// names an illuminance and a resistance column.
//
// Values: numbers via std::from_chars, never the C locale. A plain number is in the column's
// unit; a resistance with an SI prefix, IEC 60062 letter code or unit of its own ("4k7",
// "12.3k", "1M0", "4.7 kΩ") is in ohms as written, whatever the column's unit. Over range:
// "OL", "O.L", "overload", "over", "inf" (bound overload_ohm) or ">20M", "> 20 MΩ" (bound as
// written) -> ReadingKind::censored. 0 lx -> ReadingKind::dark (a dark reading over range keeps
// kind dark and the bound as its resistance: conservative for a dark-resistance minimum).
//
// Places: line and column are 1-based; columns count characters (UTF-8 code points) from the
// start of the physical line, as editors do, and point at the start of the offending field.
//
// Worked examples (each is a test in tests/import/csv_import_test.cpp, DocExample*):
//   1. "unit,lux,ohm\nA1,10,4700\n"          -> unit A1, 10 lx, 4700 ohm
//   2. "Unit;E [fc];R (kΩ)\r\nA1;1,5;4,7\r\n" -> 1.5 fc = 16.1459 lx, 4700 ohm
//   3. "id,lux,R\nA1,0,>20M\n"                -> dark reading, bound 20 Mohm
//   4. "id,lux,R\nA1,10,abc\n"                -> skipped: "file:2:7: resistance 'abc' is not
//                                                 a number or an over-range marker"
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <limits>
#include <numeric>
#include <string_view>

#include "../units/value_scan.h"
#include "columns.h"
#include "csv_reader.h"
#include "photolot/import.h"
#include "photolot/read_file.h"
#include "photolot/units.h"

namespace photolot {

std::string ImportOptions::validate() const {
  auto show = [](char c) -> std::string {
    if (c == '\t') return "'\\t'";
    if (c >= 32 && c < 127) return fmt::format("'{}'", c);
    return fmt::format("{}", static_cast<int>(static_cast<unsigned char>(c)));
  };
  if (delimiter != 0 && delimiter != ',' && delimiter != ';' && delimiter != '\t')
    return fmt::format("delimiter = {} must be ',', ';', '\\t' or 0 (detect)", show(delimiter));
  if (decimal != 0 && decimal != '.' && decimal != ',')
    return fmt::format("decimal = {} must be '.', ',' or 0 (detect)", show(decimal));
  if (delimiter != 0 && delimiter == decimal)
    return fmt::format("decimal = {} must differ from delimiter = {}", show(decimal),
                       show(delimiter));
  struct UnitField {
    const char* name;
    const std::string& value;
    Quantity quantity;
  };
  for (const auto& u : {UnitField{"lux_unit", lux_unit, Quantity::illuminance},
                        UnitField{"ohm_unit", ohm_unit, Quantity::resistance},
                        UnitField{"temp_unit", temp_unit, Quantity::temperature}}) {
    if (u.value.empty()) continue;
    const auto found = find_unit(u.value);
    if (!found || found->quantity != u.quantity)
      return fmt::format("{} = '{}' must be a unit of {} ({})", u.name, u.value,
                         to_string(u.quantity),
                         u.quantity == Quantity::illuminance  ? "lx, klx, fc"
                         : u.quantity == Quantity::resistance ? "ohm, kohm, Mohm"
                                                              : "degC, K, degF");
  }
  struct ColumnField {
    const char* name;
    const std::string& value;
  };
  const ColumnField columns[] = {{"id_column", id_column},
                                 {"lux_column", lux_column},
                                 {"ohm_column", ohm_column},
                                 {"temp_column", temp_column}};
  for (const auto& c : columns) {
    if (!c.value.empty() && detail::trim(c.value).empty())
      return fmt::format("{} = '{}' must name a column: a header text or a number from 1", c.name,
                         c.value);
    if (!c.value.empty() && c.value.find_first_not_of("0123456789") == std::string::npos &&
        (c.value.size() > 6 || std::stoul(c.value) == 0))
      return fmt::format("{} = '{}' must be a column number from 1 or a header name", c.name,
                         c.value);
  }
  for (std::size_t i = 0; i < 4; ++i)
    for (std::size_t j = i + 1; j < 4; ++j)
      if (!columns[i].value.empty() && detail::trim(columns[i].value).size() &&
          detail::trim(columns[i].value) == detail::trim(columns[j].value))
        return fmt::format("{} = '{}' must differ from {} = '{}': one column has one role",
                           columns[i].name, columns[i].value, columns[j].name, columns[j].value);
  if (!std::isnan(overload_ohm) && !(overload_ohm > 0 && std::isfinite(overload_ohm)))
    return fmt::format("overload_ohm = {} must be above 0 and finite, or NaN (unknown)",
                       overload_ohm);
  if (default_unit_id.find_first_of("\r\n") != std::string::npos ||
      detail::invalid_utf8_at(default_unit_id) != std::string::npos)
    return "default_unit_id must be one line of UTF-8 text";
  return {};
}

namespace {

using detail::CsvReader;
using detail::Field;

constexpr std::size_t kNone = static_cast<std::size_t>(-1);
constexpr std::size_t kHeaderSearchLines = 64;
constexpr std::size_t kRowDiagnosticsPerFile = 1000;

std::string stem_of(const std::string& path) {
  const std::string stem = std::filesystem::path(path).stem().string();
  return stem.empty() ? path : stem;
}

// Line and column of a byte offset (error paths only).
std::pair<std::uint32_t, std::uint32_t> place_of(std::string_view text, std::size_t offset,
                                                 std::size_t text_start) {
  std::uint32_t line = 1;
  std::size_t line_start = text_start;
  for (std::size_t i = text_start; i < offset; ++i) {
    if (text[i] == '\n') {
      ++line;
      line_start = i + 1;
    }
  }
  return {line, detail::column_of(text.data() + line_start, text.data() + offset)};
}

// At most max_bytes of text, cut on a character boundary, "..." when cut.
std::string shorten(std::string_view text, std::size_t max_bytes) {
  if (text.size() <= max_bytes) return std::string(text);
  std::size_t n = max_bytes;
  while (n > 0 && (static_cast<unsigned char>(text[n]) & 0xC0) == 0x80) --n;
  return std::string(text.substr(0, n)) + "...";
}

bool iequals(std::string_view a, std::string_view b) {
  if (a.size() != b.size()) return false;
  for (std::size_t i = 0; i < a.size(); ++i) {
    char x = a[i], y = b[i];
    if (x >= 'A' && x <= 'Z') x = static_cast<char>(x - 'A' + 'a');
    if (y >= 'A' && y <= 'Z') y = static_cast<char>(y - 'A' + 'a');
    if (x != y) return false;
  }
  return true;
}

bool is_overload_word(std::string_view t) {
  for (std::string_view w :
       {"ol", "o.l", "o.l.", "+ol", "overload", "over", "over range", "overrange", "over-range",
        "ovl", "inf", "+inf", "infinity", "+infinity", "\xE2\x88\x9E" /* ∞ */})
    if (iequals(t, w)) return true;
  return false;
}

// Everything known about one file before its data rows are read.
struct Prepared {
  FileLayout layout;
  std::size_t data_offset = 0;
  std::uint32_t data_line = 1;
  std::size_t data_line_start = 0;
  std::size_t text_start = 0;  // after the BOM
  std::size_t id = kNone, lux = kNone, ohm = kNone, temp = kNone;
  std::string lux_header;  // to recognise a repeated header row
  std::uint32_t preamble_lines = 0;
  std::uint32_t first_preamble_line = 0;
};

FileError file_error(std::string_view name, std::uint32_t line, std::uint32_t column,
                     std::string message) {
  return FileError{std::string(name), line, column, std::move(message)};
}

std::vector<std::string> cells_of(const std::vector<Field>& fields) {
  std::vector<std::string> cells;
  std::string scratch;
  cells.reserve(fields.size());
  for (const auto& f : fields) cells.emplace_back(detail::field_text(f, scratch));
  return cells;
}

// Checks the text, finds the header, delimiter, decimal mark and columns.
std::optional<FileError> prepare(std::string_view name, std::string_view text,
                                 const ImportOptions& options, Prepared& out) {
  FileLayout& layout = out.layout;
  layout.file = std::string(name);
  if (text.empty()) return file_error(name, 0, 0, "the file is empty");
  if (text.starts_with("\xFF\xFE") || text.starts_with("\xFE\xFF"))
    return file_error(name, 1, 1, "the file is UTF-16 text; save it as UTF-8 (or CSV UTF-8)");
  if (text.starts_with("PK\x03\x04"))
    return file_error(name, 1, 1,
                      "the file is a ZIP archive (a spreadsheet such as .xlsx or .ods?); "
                      "export the sheet as CSV");
  if (text.starts_with("%PDF")) return file_error(name, 1, 1, "the file is a PDF, not a CSV log");
  std::size_t start = 0;
  if (text.starts_with("\xEF\xBB\xBF")) {
    layout.had_bom = true;
    start = 3;
  }
  out.text_start = start;
  if (const void* nul = std::memchr(text.data(), '\0', text.size())) {
    const auto [line, column] = place_of(text, static_cast<const char*>(nul) - text.data(), start);
    return file_error(name, line, column,
                      "the file holds binary data (a NUL byte), not a text log");
  }

  const std::vector<char> candidates = options.delimiter != 0 ? std::vector<char>{options.delimiter}
                                       : options.decimal == ',' ? std::vector<char>{'\t', ';'}
                                                                : std::vector<char>{'\t', ';', ','};
  // Record boundaries do not depend on the delimiter (quotes aside), so walk records with the
  // first candidate and re-split each one with every candidate.
  CsvReader walker(text, candidates.front(), start, 1, start);
  std::vector<Field> fields;
  std::string problem;
  std::string first_line;
  std::uint32_t first_line_number = 0;
  std::size_t first_line_offset = 0;
  bool found = false;
  const bool columns_by_number = [&] {
    auto number = [](const std::string& s) {
      return !s.empty() && s.find_first_not_of("0123456789") == std::string::npos;
    };
    return number(options.lux_column) && number(options.ohm_column);
  }();
  for (std::size_t records = 0; records < kHeaderSearchLines && !found; ++records) {
    const auto status = walker.next(fields);
    if (status == CsvReader::Status::end) break;
    const std::size_t begin = walker.record_begin();
    const std::uint32_t line = walker.record_line();
    const std::size_t line_start = walker.record_line_start();
    if (first_line_number == 0) {
      first_line_number = line;
      first_line_offset = begin;
      first_line = std::string(text.substr(begin, walker.record_end() - begin));
      while (!first_line.empty() && (first_line.back() == '\n' || first_line.back() == '\r'))
        first_line.pop_back();
    }
    for (char delimiter : candidates) {
      CsvReader reader(text, delimiter, begin, line, line_start);
      if (reader.next(fields) != CsvReader::Status::record) continue;
      std::vector<std::string> cells = cells_of(fields);
      std::string why;
      auto cols = detail::resolve_columns(cells, options, why);
      std::size_t lux = detail::find_role(cols, ColumnRole::lux);
      std::size_t ohm = detail::find_role(cols, ColumnRole::ohm);
      bool headerless = false;
      if (columns_by_number && records == 0 && lux != kNone && lux < cells.size() &&
          detail::scan_quantity(cells[lux], options.decimal ? options.decimal : '.',
                                Quantity::illuminance)) {
        headerless = true;  // numbered columns and a first row of numbers: no header at all
      }
      if (why.empty() && lux != kNone && ohm != kNone) {
        if (const std::size_t bad =
                detail::invalid_utf8_at(text.substr(begin, reader.record_end() - begin));
            bad != std::string_view::npos) {
          const auto [l, c] = place_of(text, begin + bad, start);
          return file_error(name, l, c,
                            "the header is not UTF-8 text (save the file as UTF-8 or CSV UTF-8)");
        }
        found = true;
        layout.delimiter = delimiter;
        layout.header_line = headerless ? 0 : line;
        if (headerless)
          for (std::size_t i = 0; i < cols.size(); ++i)
            cols[i].header = fmt::format("column {}", i + 1);
        layout.columns = std::move(cols);
        out.lux_header = headerless ? std::string() : cells[lux];
        if (headerless) {
          out.data_offset = begin;
          out.data_line = line;
          out.data_line_start = line_start;
        } else {
          out.data_offset = reader.offset();
          out.data_line = reader.line();
          out.data_line_start = reader.line_start();
        }
        break;
      }
      if (!why.empty() && problem.empty()) problem = why;
    }
    if (!found) {
      if (out.preamble_lines == 0) out.first_preamble_line = line;
      ++out.preamble_lines;
    }
  }
  if (!found) {
    if (first_line_number == 0)
      return file_error(name, 0, 0, "the file holds no data (only blank or comment lines)");
    if (!problem.empty()) return file_error(name, first_line_number, 1, problem);
    if (const std::size_t bad = detail::invalid_utf8_at(first_line); bad != std::string::npos) {
      const auto [l, c] = place_of(text, first_line_offset + bad, start);
      return file_error(name, l, c,
                        "no recognisable header, and the first line is not UTF-8 text (save the "
                        "file as UTF-8 or CSV UTF-8)");
    }
    return file_error(
        name, first_line_number, 1,
        fmt::format("no header naming an illuminance column (lux, lx, fc, E...) and a "
                    "resistance column (ohm, R, kohm...) in the first {} lines; the first "
                    "line reads '{}'",
                    kHeaderSearchLines, shorten(first_line, 80)));
  }
  out.id = detail::find_role(layout.columns, ColumnRole::unit_id);
  out.lux = detail::find_role(layout.columns, ColumnRole::lux);
  out.ohm = detail::find_role(layout.columns, ColumnRole::ohm);
  out.temp = detail::find_role(layout.columns, ColumnRole::temp_c);

  // Decimal mark.
  if (options.decimal != 0) {
    layout.decimal = options.decimal;
  } else if (layout.delimiter != ';') {
    layout.decimal = '.';
  } else {
    // ';' files usually write decimal commas; take '.' when the first rows only use '.'.
    bool comma = false, point = false;
    CsvReader reader(text, ';', out.data_offset, out.data_line, out.data_line_start);
    std::string scratch;
    for (int rows = 0; rows < 50 && reader.next(fields) == CsvReader::Status::record; ++rows) {
      for (std::size_t col : {out.lux, out.ohm, out.temp}) {
        if (col == kNone || col >= fields.size()) continue;
        const std::string_view t = detail::field_text(fields[col], scratch);
        comma |= t.find(',') != std::string_view::npos;
        point |= t.find('.') != std::string_view::npos;
      }
    }
    layout.decimal = (point && !comma) ? '.' : ',';
  }
  return std::nullopt;
}

void fill_preview(std::string_view text, const Prepared& p, std::size_t rows, FileLayout& layout) {
  CsvReader reader(text, layout.delimiter, p.data_offset, p.data_line, p.data_line_start);
  std::vector<Field> fields;
  for (std::size_t i = 0; i < rows; ++i) {
    const auto status = reader.next(fields);
    if (status == CsvReader::Status::end) break;
    layout.preview.push_back(cells_of(fields));
  }
}

// Import state across files: the lot being built, plus per-reading facts needed to tell
// duplicates from conflicts at the end.
struct ReadingExtra {
  double half_step_ohm = 0;  // rounding of the resistance as written
  std::uint32_t column = 0;  // of the resistance field
  bool over_range = false;
};

struct Pending {
  Reading r;
  ReadingExtra x;
  std::uint32_t unit;
};

struct FileTally {
  std::size_t duplicates = 0;
  std::uint32_t first_duplicate_line = 0;
  std::string first_duplicate_of;
  std::size_t censored = 0;
  std::uint32_t first_censored_line = 0;
  std::size_t dark = 0;
  std::uint32_t first_dark_line = 0;
  std::size_t censored_unknown_bound = 0;
};

// A data row in the two shapes the reader gives it: the general reader's fields, or the
// offsets of a plain record (one quote-free line). Both give the same texts and places.
struct FieldRow {
  const std::vector<Field>& fields;
  std::uint32_t record_line;
  bool record_ascii;
  std::size_t size() const { return fields.size(); }
  std::uint32_t line() const { return record_line; }
  bool ascii() const { return record_ascii; }
  std::string_view text(std::size_t i, std::string& scratch) const {
    return detail::field_text(fields[i], scratch);
  }
  const Field& field(std::size_t i) const { return fields[i]; }
  // How far past field i's text bytes may be read (null: not past it): a field with doubled
  // quotes is unquoted into scratch, outside the text.
  const char* readable_end(std::size_t i, const char* text_end) const {
    return fields[i].has_escapes ? nullptr : text_end;
  }
  // 1-based column of field i; on one line of ASCII a column is a byte offset.
  std::uint32_t column(std::size_t i) const {
    const Field& f = fields[i];
    return record_ascii ? static_cast<std::uint32_t>(f.start - f.line_start) + 1
                        : detail::column_of(f.line_start, f.start);
  }
};

struct PlainRow {
  const detail::PlainRecord& record;
  std::size_t size() const { return record.count; }
  std::uint32_t line() const { return record.line; }
  bool ascii() const { return record.ascii; }
  std::string_view text(std::size_t i, std::string& /*scratch*/) const {
    return detail::trim(record.raw(i));
  }
  Field field(std::size_t i) const { return record.field(i); }
  const char* readable_end(std::size_t /*i*/, const char* text_end) const { return text_end; }
  std::uint32_t column(std::size_t i) const {
    return record.ascii ? record.cut[i] + 1
                        : detail::column_of(record.line_start, record.line_start + record.cut[i]);
  }
};

class Builder {
 public:
  explicit Builder(const ImportOptions& options) : options_(options) {}

  void add(const std::string& name, std::string_view text, ImportResult& result) {
    const std::uint32_t file_index = static_cast<std::uint32_t>(lot_.source_files.size());
    lot_.source_files.push_back(name);
    if (lot_.name.empty()) lot_.name = stem_of(name);
    tallies_.emplace_back();
    Prepared p;
    if (auto error = prepare(name, text, options_, p)) {
      p.layout.error = *error;
      result.errors.push_back(*error);
      result.layouts.push_back(std::move(p.layout));
      return;
    }
    fill_preview(text, p, 5, p.layout);
    if (p.preamble_lines > 0)
      note(file_index, p.first_preamble_line, 0, Severity::note,
           fmt::format("{} line{} before the header skipped", p.preamble_lines,
                       p.preamble_lines == 1 ? "" : "s"));
    std::string default_id = options_.default_unit_id;
    if (p.id == kNone) {
      if (default_id.empty()) default_id = stem_of(name);
      note(file_index, p.layout.header_line, 0, Severity::note,
           fmt::format("no unit id column: every row is unit '{}'{}", default_id,
                       options_.default_unit_id.empty() ? " (the file's name)" : ""));
    }
    read_rows(file_index, text, p, default_id);
    result.layouts.push_back(std::move(p.layout));
  }

  // A file that could not be read: registered so file indices stay in step with the paths.
  void add_missing(const std::string& name) {
    lot_.source_files.push_back(name);
    if (lot_.name.empty()) lot_.name = stem_of(name);
    tallies_.emplace_back();
  }

  ImportResult finish(ImportResult result) {
    distribute();
    summarise();
    // Diagnostics in file order, then line, then column.
    std::vector<std::size_t> order(lot_.diagnostics.size());
    std::iota(order.begin(), order.end(), 0);
    std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
      const auto& x = lot_.diagnostics[a];
      const auto& y = lot_.diagnostics[b];
      return std::tie(diag_file_[a], x.line, x.column) < std::tie(diag_file_[b], y.line, y.column);
    });
    std::vector<Diagnostic> sorted;
    sorted.reserve(order.size());
    for (std::size_t i : order) sorted.push_back(std::move(lot_.diagnostics[i]));
    lot_.diagnostics = std::move(sorted);
    result.lot = std::move(lot_);
    return result;
  }

 private:
  void note(std::uint32_t file, std::uint32_t line, std::uint32_t column, Severity severity,
            std::string message) {
    lot_.diagnostics.push_back(
        Diagnostic{lot_.source_files[file], line, column, severity, std::move(message)});
    diag_file_.push_back(file);
  }

  // The unit of a row: usually the previous row's (checked inline), else looked up or added.
  std::uint32_t unit_index(std::string_view id) {
    if (have_last_ && id.size() == last_id_.size() &&
        std::memcmp(id.data(), last_id_.data(), id.size()) == 0)
      return last_index_;
    return find_or_add_unit(id);
  }

  [[gnu::noinline]] std::uint32_t find_or_add_unit(std::string_view id) {
    const std::uint64_t hash = std::hash<std::string_view>{}(id);
    const std::uint64_t tag = hash >> 32 << 32;
    if (id_slots_.empty()) id_slots_.assign(1024, 0);
    std::size_t mask = id_slots_.size() - 1;
    std::size_t i = hash & mask;
    for (; id_slots_[i] != 0; i = (i + 1) & mask) {
      const std::uint64_t slot = id_slots_[i];
      const std::uint32_t index = static_cast<std::uint32_t>(slot) - 1;
      if ((slot & ~std::uint64_t{0xFFFFFFFF}) == tag && lot_.units[index].id == id)
        return remember(id, index);
    }
    const std::uint32_t index = static_cast<std::uint32_t>(lot_.units.size());
    lot_.units.push_back(Unit{std::string(id), {}});
    unit_rows_.push_back(0);
    unit_hashes_.push_back(hash);
    id_slots_[i] = tag | (index + 1);
    if (2 * lot_.units.size() > id_slots_.size()) {  // keep the table at most half full
      id_slots_.assign(2 * id_slots_.size(), 0);
      mask = id_slots_.size() - 1;
      for (std::uint32_t u = 0; u < unit_hashes_.size(); ++u) {
        std::size_t k = unit_hashes_[u] & mask;
        while (id_slots_[k] != 0) k = (k + 1) & mask;
        id_slots_[k] = (unit_hashes_[u] >> 32 << 32) | (u + 1);
      }
    }
    return remember(id, index);
  }

  std::uint32_t remember(std::string_view id, std::uint32_t index) {
    last_id_.assign(id);
    last_index_ = index;
    have_last_ = true;
    return index;
  }

  void read_rows(std::uint32_t file_index, std::string_view text, Prepared& p,
                 const std::string& default_id) {
    const FileLayout& layout = p.layout;
    const char decimal = layout.decimal;
    const DetectedColumn& lux_col = layout.columns[p.lux];
    const DetectedColumn& ohm_col = layout.columns[p.ohm];
    const DetectedColumn* temp_col = p.temp == kNone ? nullptr : &layout.columns[p.temp];
    const std::size_t needed = std::max({p.lux, p.ohm, p.id == kNone ? 0 : p.id}) + 1;
    CsvReader reader(text, layout.delimiter, p.data_offset, p.data_line, p.data_line_start);
    {
      // Room for one reading per line left, so the list is not copied as it grows.
      std::size_t lines = 0;
      const char* at = text.data() + p.data_offset;
      const char* end = text.data() + text.size();
      while ((at = static_cast<const char*>(std::memchr(at, '\n', end - at))) != nullptr) {
        ++lines;
        ++at;
      }
      pending_.reserve(pending_.size() + lines + 1);
    }
    std::vector<Field> fields;
    detail::PlainRecord plain;
    std::string scratch_id, scratch;
    std::size_t row_errors = 0, suppressed = 0;
    bool repeated_header_noted = false;
    std::uint32_t last_line = p.data_line;
    ImportCounts& counts = lot_.counts;
    // Numbers may be read a word at a time up to the end of the text, past their field.
    const char* const text_end = text.data() + text.size();

    auto reject = [&](const Field* at, std::uint32_t line, std::uint32_t column,
                      std::string message) {
      ++counts.rows_skipped;
      if (row_errors++ >= kRowDiagnosticsPerFile) {
        ++suppressed;
        return;
      }
      if (at) {
        line = at->line;
        column = detail::column_of(at->line_start, at->start);
      }
      note(file_index, line, column, Severity::error, std::move(message));
    };
    auto reject_at = [&](const auto& row, std::size_t i, std::string message) {
      const Field f = row.field(i);
      reject(&f, 0, 0, std::move(message));
    };

    // One data row, from either reader (the rows below).
    auto process = [&](const auto& row) {
      const std::uint32_t line = row.line();
      last_line = line;
      if (row.size() < needed) {
        // A repeated header among too-short rows is still a header.
        ++counts.rows_read;
        ++p.layout.data_rows;
        const Field last = row.field(row.size() - 1);
        const std::uint32_t column =
            detail::column_of(last.line_start, last.start + last.raw.size()) +
            (last.quoted ? 2 : 0);
        reject(
            nullptr, last.line, column,
            fmt::format("too few fields: {} of the {} needed for the {} column", row.size(), needed,
                        row.size() <= p.ohm   ? "resistance"
                        : row.size() <= p.lux ? "illuminance"
                                              : "unit id"));
        return;
      }
      const std::string_view lux_text = row.text(p.lux, scratch);
      if (!p.lux_header.empty() && iequals(lux_text, p.lux_header)) {
        if (!repeated_header_noted)
          note(file_index, line, 0, Severity::note,
               "the header repeats here (logs joined end to end?); skipped");
        repeated_header_noted = true;
        return;
      }
      ++counts.rows_read;
      ++p.layout.data_rows;

      // Unit id.
      std::string_view id;
      if (p.id != kNone) {
        id = row.text(p.id, scratch_id);
        if (id.empty()) {
          reject_at(row, p.id, "missing unit id");
          return;
        }
        if (!row.ascii() && detail::invalid_utf8_at(id) != std::string_view::npos) {
          reject_at(row, p.id, "unit id is not UTF-8 text");
          return;
        }
      } else {
        id = default_id;
      }

      // Illuminance.
      if (lux_text.empty()) {
        reject_at(row, p.lux, "missing illuminance");
        return;
      }
      std::optional<detail::ScannedValue> lux_value;
      if (detail::ScannedValue plain_value;
          detail::scan_plain(lux_text, decimal, plain_value, row.readable_end(p.lux, text_end)))
        lux_value = plain_value;
      else
        lux_value = detail::scan_quantity(lux_text, decimal, Quantity::illuminance);
      if (!lux_value) {
        reject_at(row, p.lux,
                  detail::is_non_finite_word(lux_text)
                      ? fmt::format("illuminance '{}' is not a finite number", lux_text)
                      : fmt::format("illuminance '{}' is not a number", lux_text));
        return;
      }
      const double lux = lux_value->self_scaled ? lux_value->value
                                                : lux_value->value * lux_col.scale + lux_col.offset;
      if (!std::isfinite(lux)) {
        reject_at(row, p.lux, fmt::format("illuminance '{}' is not a finite number", lux_text));
        return;
      }
      if (lux < 0) {
        reject_at(row, p.lux, fmt::format("illuminance '{}' is negative", lux_text));
        return;
      }

      // Resistance, or an over-range marker.
      const std::string_view ohm_text = row.text(p.ohm, scratch);
      Reading r;
      r.lux = lux;
      r.source = SourceRef{file_index, line};
      ReadingExtra extra;
      extra.column = row.column(p.ohm);
      if (ohm_text.empty()) {
        reject_at(row, p.ohm, "missing resistance");
        return;
      }
      const char lead = ohm_text[0];
      const bool digit_lead = (lead >= '0' && lead <= '9') || lead == '.';
      if (!digit_lead && (lead == '>' || ohm_text.starts_with("\xE2\x89\xA5" /* ≥ */))) {
        const std::string_view bound_text =
            detail::trim(ohm_text.substr(ohm_text[0] == '>' ? 1 : 3));
        const auto bound = detail::scan_resistance(bound_text, decimal);
        const double bound_ohm =
            bound ? (bound->self_scaled ? bound->value : bound->value * ohm_col.scale) : kNaN;
        if (!bound || !(bound_ohm > 0) || !std::isfinite(bound_ohm)) {
          reject_at(
              row, p.ohm,
              fmt::format("over-range bound '{}' is not a resistance above zero", bound_text));
          return;
        }
        r.ohm = bound_ohm;
        extra.over_range = true;
      } else if (!digit_lead && is_overload_word(ohm_text)) {
        r.ohm = options_.overload_ohm;
        extra.over_range = true;
      } else if (!digit_lead && (lead == '<' || ohm_text.starts_with("\xE2\x89\xA4" /* ≤ */))) {
        reject_at(row, p.ohm,
                  fmt::format("resistance '{}' is below the meter's range; not used", ohm_text));
        return;
      } else {
        std::optional<detail::ScannedValue> value;
        if (detail::ScannedValue plain_value;
            detail::scan_plain(ohm_text, decimal, plain_value, row.readable_end(p.ohm, text_end)))
          value = plain_value;
        else
          value = detail::scan_resistance(ohm_text, decimal);
        if (!value) {
          reject_at(row, p.ohm,
                    detail::is_non_finite_word(ohm_text)
                        ? fmt::format("resistance '{}' is not a finite number", ohm_text)
                        : fmt::format("resistance '{}' is not a number or an over-range marker",
                                      ohm_text));
          return;
        }
        const double scale = value->self_scaled ? 1.0 : ohm_col.scale;
        r.ohm = value->value * scale;
        extra.half_step_ohm = value->half_step * scale;
        if (!std::isfinite(r.ohm)) {
          reject_at(row, p.ohm, fmt::format("resistance '{}' is not a finite number", ohm_text));
          return;
        }
        if (!(r.ohm > 0)) {
          reject_at(row, p.ohm, fmt::format("resistance '{}' must be above zero", ohm_text));
          return;
        }
      }

      // Temperature (optional: a bad one is warned about and the reading kept without it).
      if (temp_col && p.temp < row.size()) {
        const std::string_view t = row.text(p.temp, scratch);
        if (!t.empty()) {
          std::optional<detail::ScannedValue> tv;
          if (detail::ScannedValue plain_value;
              detail::scan_plain(t, decimal, plain_value, row.readable_end(p.temp, text_end)))
            tv = plain_value;
          else
            tv = detail::scan_quantity(t, decimal, Quantity::temperature);
          const double temp_c =
              tv ? (tv->self_scaled ? tv->value : tv->value * temp_col->scale + temp_col->offset)
                 : kNaN;
          if (tv && std::isfinite(temp_c) && temp_c >= -273.15) {
            r.temp_c = temp_c;
          } else {
            const Field tf = row.field(p.temp);
            note(file_index, tf.line, detail::column_of(tf.line_start, tf.start), Severity::warning,
                 fmt::format("temperature '{}' is not {}; reading kept without a temperature", t,
                             tv ? "above absolute zero" : "a number"));
          }
        }
      }

      r.kind = lux == 0           ? ReadingKind::dark
               : extra.over_range ? ReadingKind::censored
                                  : ReadingKind::normal;
      const std::uint32_t u = unit_index(id);
      grouped_ &= u >= last_pending_unit_;
      last_pending_unit_ = u;
      ++unit_rows_[u];
      pending_.push_back(Pending{r, extra, u});
      ++counts.rows_used;
    };

    for (;;) {
      // The usual row first: one line, no quotes, as field offsets (PlainRow).
      auto status = reader.next_plain(plain);
      if (status == CsvReader::Status::record) {
        process(PlainRow{plain});
        continue;
      }
      if (status == CsvReader::Status::end) break;
      status = reader.next(fields);
      if (status == CsvReader::Status::end) break;
      if (status == CsvReader::Status::unterminated_quote) {
        last_line = reader.record_line();
        ++counts.rows_read;
        ++p.layout.data_rows;
        reject(&fields.back(), 0, 0,
               "quote opened here is never closed; the row is skipped and reading resumes on "
               "the next line");
        continue;
      }
      process(FieldRow{fields, reader.record_line(), reader.record_ascii()});
    }
    if (suppressed > 0)
      note(file_index, last_line, 0, Severity::note,
           fmt::format("{} more skipped rows in this file not listed (first {} shown)", suppressed,
                       kRowDiagnosticsPerFile));
    if (p.layout.data_rows == 0)
      note(file_index, layout.header_line, 0, Severity::warning, "no data rows after the header");
  }

  static bool same_key(const Reading& a, const Reading& b) {
    if (a.lux != b.lux) return false;
    if (std::isnan(a.temp_c) || std::isnan(b.temp_c))
      return std::isnan(a.temp_c) && std::isnan(b.temp_c);
    return a.temp_c == b.temp_c;
  }

  static bool same_value(const Reading& a, const ReadingExtra& xa, const Reading& b,
                         const ReadingExtra& xb) {
    if (xa.over_range != xb.over_range) return false;
    if (std::isnan(a.ohm) || std::isnan(b.ohm)) return std::isnan(a.ohm) && std::isnan(b.ohm);
    const double tolerance =
        std::max(xa.half_step_ohm, xb.half_step_ohm) + 1e-12 * std::max(a.ohm, b.ohm);
    return std::abs(a.ohm - b.ohm) <= tolerance;
  }

  std::string where(const SourceRef& s) const {
    return fmt::format("{}:{}", lot_.source_files[s.file_index], s.line);
  }

  static std::string ohm_text(double ohm) {
    if (std::isnan(ohm)) return "over range (bound unknown)";
    if (ohm >= 1e6) return fmt::format("{:g} Mohm", ohm / 1e6);
    if (ohm >= 1e3) return fmt::format("{:g} kohm", ohm / 1e3);
    return fmt::format("{:g} ohm", ohm);
  }

  // Same unit, illuminance and temperature: a resistance equal within the rounding of either
  // value as written is a duplicate (the later row dropped); a different one is a conflict
  // (both kept, a warning). Readings wait in one flat list until here, then move into their
  // units with exact sizes.
  void distribute() {
    const std::size_t n_units = lot_.units.size();
    std::vector<std::uint32_t> start(n_units + 1, 0);
    for (std::size_t u = 0; u < n_units; ++u) start[u + 1] = start[u] + unit_rows_[u];
    // Readings usually arrive a unit at a time (unit indices never fall): then the units'
    // readings already lie contiguous in file order and need no regrouping.
    std::vector<std::uint32_t> slots;
    if (!grouped_) {
      slots.resize(pending_.size());
      std::vector<std::uint32_t> fill(start.begin(), start.end() - 1);
      for (std::uint32_t i = 0; i < pending_.size(); ++i) slots[fill[pending_[i].unit]++] = i;
    }
    const bool grouped = grouped_;
    auto slot = [&](std::uint32_t k) { return grouped ? k : slots[k]; };
    std::vector<std::uint8_t> dropped;  // made for the first unit that needs the check
    std::vector<std::uint32_t> order;
    auto before = [&](std::uint32_t a, std::uint32_t b) {
      const Reading& x = pending_[a].r;
      const Reading& y = pending_[b].r;
      if (x.lux != y.lux) return x.lux < y.lux;
      const bool xn = std::isnan(x.temp_c), yn = std::isnan(y.temp_c);
      if (xn != yn) return yn;
      return !xn && x.temp_c < y.temp_c;
    };
    for (std::size_t u = 0; u < n_units; ++u) {
      const std::uint32_t b = start[u], e = start[u + 1];
      auto& readings = lot_.units[u].readings;
      readings.reserve(e - b);
      // Illuminance strictly rising in file order (the usual sweep): already sorted, and no two
      // readings share a key, so there is nothing to sort or to check. Copied while checking.
      bool rising = true;
      double previous_lux = -std::numeric_limits<double>::infinity();
      for (std::uint32_t k = b; k < e; ++k) {
        const Reading& r = pending_[slot(k)].r;
        if (!(r.lux > previous_lux)) {
          rising = false;
          break;
        }
        previous_lux = r.lux;
        readings.push_back(r);
      }
      if (rising) {
        for (std::uint32_t k = b; k < e; ++k) tally_kept(pending_[slot(k)]);
        continue;
      }
      readings.clear();
      if (dropped.empty()) dropped.assign(pending_.size(), 0);
      order.resize(e - b);
      for (std::uint32_t k = b; k < e; ++k) order[k - b] = slot(k);  // file order
      if (order.size() <= 32) {
        for (std::size_t i = 1; i < order.size(); ++i) {  // insertion sort: stable, small
          const std::uint32_t v = order[i];
          std::size_t j = i;
          for (; j > 0 && before(v, order[j - 1]); --j) order[j] = order[j - 1];
          order[j] = v;
        }
      } else {
        std::stable_sort(order.begin(), order.end(), before);
      }
      check_group_duplicates(u, order, dropped);
      for (std::uint32_t k = b; k < e; ++k) {
        const std::uint32_t i = slot(k);
        if (dropped[i]) continue;
        readings.push_back(pending_[i].r);
        tally_kept(pending_[i]);
      }
    }
    pending_.clear();
  }

  void check_group_duplicates(std::size_t u, const std::vector<std::uint32_t>& order,
                              std::vector<std::uint8_t>& dropped) {
    for (std::size_t g = 0; g < order.size();) {
      std::size_t end = g + 1;
      while (end < order.size() && same_key(pending_[order[g]].r, pending_[order[end]].r)) ++end;
      for (std::size_t j = g + 1; j < end; ++j) {
        const Pending& later = pending_[order[j]];
        const Pending* match = nullptr;
        for (std::size_t i = g; i < j; ++i) {
          const Pending& earlier = pending_[order[i]];
          if (dropped[order[i]]) continue;
          if (same_value(earlier.r, earlier.x, later.r, later.x)) {
            match = &earlier;
            break;
          }
        }
        const Reading& r = later.r;
        if (match) {
          dropped[order[j]] = 1;
          ++lot_.counts.duplicates_dropped;
          --lot_.counts.rows_used;
          FileTally& t = tallies_[r.source.file_index];
          ++t.duplicates;
          if (t.first_duplicate_line == 0 || r.source.line < t.first_duplicate_line) {
            t.first_duplicate_line = r.source.line;
            t.first_duplicate_of = where(match->r.source);
          }
        } else {
          const Reading& first = pending_[order[g]].r;
          ++lot_.counts.conflicts;
          note(r.source.file_index, r.source.line, later.x.column, Severity::warning,
               fmt::format(
                   "unit {} at {:g} lx{}: resistance {} differs from {} read at {} "
                   "beyond the rounding of either; both kept",
                   lot_.units[u].id, r.lux,
                   std::isnan(r.temp_c) ? std::string() : fmt::format(", {:g} degC", r.temp_c),
                   ohm_text(r.ohm), ohm_text(first.ohm), where(first.source)));
        }
      }
      g = end;
    }
  }

  void tally_kept(const Pending& p) {
    const Reading& r = p.r;
    FileTally& t = tallies_[r.source.file_index];
    if (r.kind == ReadingKind::dark) {
      ++lot_.counts.dark;
      ++t.dark;
      if (t.first_dark_line == 0 || r.source.line < t.first_dark_line)
        t.first_dark_line = r.source.line;
    }
    if (p.x.over_range) {
      ++lot_.counts.censored;
      ++t.censored;
      if (std::isnan(r.ohm)) ++t.censored_unknown_bound;
      if (t.first_censored_line == 0 || r.source.line < t.first_censored_line)
        t.first_censored_line = r.source.line;
    }
  }

  // One note per file for its dark, censored and duplicate readings.
  void summarise() {
    for (std::uint32_t f = 0; f < tallies_.size(); ++f) {
      const FileTally& t = tallies_[f];
      if (t.dark > 0)
        note(f, t.first_dark_line, 0, Severity::note,
             fmt::format("{} dark reading{} (0 lx) kept apart from the curve; the first is here",
                         t.dark, t.dark == 1 ? "" : "s"));
      if (t.censored > 0)
        note(f, t.first_censored_line, 0, Severity::note,
             fmt::format("{} reading{} over the meter's range kept as censored (the resistance "
                         "is above the bound){}; the first is here",
                         t.censored, t.censored == 1 ? "" : "s",
                         t.censored_unknown_bound > 0
                             ? fmt::format("; {} without a bound (set overload_ohm)",
                                           t.censored_unknown_bound)
                             : std::string()));
      if (t.duplicates > 0)
        note(f, t.first_duplicate_line, 0, Severity::note,
             fmt::format("{} row{} repeating a reading already read dropped; the first here "
                         "repeats {}",
                         t.duplicates, t.duplicates == 1 ? "" : "s", t.first_duplicate_of));
    }
  }

  const ImportOptions& options_;
  Lot lot_;
  std::vector<Pending> pending_;          // readings of all files, in file order
  std::vector<FileTally> tallies_;        // per file
  std::vector<std::uint32_t> diag_file_;  // file index of each diagnostic
  // Unit id -> index in lot_.units: open addressing with linear probing over a power-of-two
  // table of (high 32 bits of the id's hash << 32 | index + 1), 0 for empty; the hashes kept
  // per unit for growing the table. No node per id, no division per look-up.
  std::vector<std::uint64_t> id_slots_;
  std::vector<std::uint64_t> unit_hashes_;
  std::vector<std::uint32_t> unit_rows_;  // readings waiting in pending_, per unit
  bool grouped_ = true;                   // pending_ holds each unit's readings contiguous
  std::uint32_t last_pending_unit_ = 0;
  std::string last_id_;
  std::uint32_t last_index_ = 0;
  bool have_last_ = false;
};

ImportResult options_error(const ImportOptions& options) {
  ImportResult result;
  result.errors.push_back(FileError{"", 0, 0, "import options: " + options.validate()});
  return result;
}

}  // namespace

ImportResult import_buffers(const std::vector<std::pair<std::string, std::string>>& named_contents,
                            const ImportOptions& options) {
  if (!options.validate().empty()) return options_error(options);
  Builder builder(options);
  ImportResult result;
  for (const auto& [name, content] : named_contents) builder.add(name, content, result);
  return builder.finish(std::move(result));
}

std::string describe_log_read(const FileRead& read) {
  if (read.problem != ReadProblem::too_large) return describe(read);
  return fmt::format("is {} MiB, over the {} MiB a bench log may have; split it into several files",
                     read.size >> 20, kMaxLogFileBytes >> 20);
}

ImportResult import_files(const std::vector<std::string>& paths, const ImportOptions& options,
                          const OnFileRead& on_read) {
  if (!options.validate().empty()) return options_error(options);
  Builder builder(options);
  ImportResult result;
  for (const auto& path : paths) {
    FileRead read = read_regular_file(path, kMaxLogFileBytes);
    if (!read.ok()) {
      FileError e{path, 0, 0, describe_log_read(read)};
      result.errors.push_back(e);
      FileLayout layout;
      layout.file = path;
      layout.error = e;
      result.layouts.push_back(layout);
      builder.add_missing(path);
      continue;
    }
    if (on_read) on_read(path, read.text);
    builder.add(path, read.text, result);
  }
  return builder.finish(std::move(result));
}

FileLayout detect_layout(std::string_view name, std::string_view content,
                         const ImportOptions& options, std::size_t preview_rows) {
  Prepared p;
  if (const std::string why = options.validate(); !why.empty()) {
    p.layout.file = std::string(name);
    p.layout.error = FileError{std::string(name), 0, 0, "import options: " + why};
    return p.layout;
  }
  if (auto error = prepare(name, content, options, p)) {
    p.layout.error = *error;
    return p.layout;
  }
  fill_preview(content, p, preview_rows, p.layout);
  return p.layout;
}

}  // namespace photolot
