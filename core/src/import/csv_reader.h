// Internal to core: the CSV record reader behind the importer. RFC 4180 quoting (doubled quotes,
// delimiters and newlines inside quotes), CRLF, LF or lone CR line ends, blank lines (also lines
// of delimiters only, as spreadsheets write them) and '#' comment lines skipped.
#pragma once

#include <array>
#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

namespace photolot::detail {

struct Field {
  std::string_view raw;         // unquoted: as written; quoted: inside the quotes, "" still doubled
  const char* start = nullptr;  // first byte of the field as written (for its column)
  const char* line_start = nullptr;  // first byte of the physical line holding `start`
  std::uint32_t line = 0;            // 1-based physical line of `start`
  bool quoted = false;
  bool has_escapes = false;  // holds doubled quotes: use unquote()
};

// The field's text: trimmed, with doubled quotes undone (into `scratch` when needed).
std::string_view unquote_text(const Field& field, std::string& scratch);
inline std::string_view field_text(const Field& field, std::string& scratch) {
  if (field.has_escapes) return unquote_text(field, scratch);
  std::string_view s = field.raw;
  std::size_t b = 0, e = s.size();
  while (b < e && (s[b] == ' ' || s[b] == '\t')) ++b;
  while (e > b && (s[e - 1] == ' ' || s[e - 1] == '\t')) --e;
  return s.substr(b, e - b);
}

// 1-based column of `at` in its line, counted in characters (UTF-8 code points), as editors do.
std::uint32_t column_of(const char* line_start, const char* at);

// Offset of the first byte that breaks UTF-8 in text, or npos.
std::size_t invalid_utf8_at(std::string_view text);

class CsvReader {
 public:
  enum class Status { record, end, unterminated_quote };

  // `text` must outlive the reader; `line`/`line_start` say where `offset` is.
  CsvReader(std::string_view text, char delimiter, std::size_t offset = 0, std::uint32_t line = 1,
            std::size_t line_start = 0);

  // Reads the next record into fields (cleared first). On unterminated_quote, `fields` holds the
  // fields read so far plus the open one, and the reader resumes on the line after the quote.
  Status next(std::vector<Field>& fields);

  // Where the last record started and ended (end: just past its line break).
  std::size_t record_begin() const { return record_begin_; }
  std::size_t record_end() const { return pos_; }
  std::uint32_t record_line() const { return record_line_; }
  std::size_t record_line_start() const { return record_line_start_; }
  // Where the reader stands now (to restart another reader there).
  std::size_t offset() const { return pos_; }
  std::uint32_t line() const { return line_; }
  std::size_t line_start() const { return line_start_; }

 private:
  void skip_line();
  std::string_view text_;
  char delimiter_;
  std::size_t pos_;
  std::uint32_t line_;
  std::size_t line_start_;
  std::size_t record_begin_ = 0;
  std::uint32_t record_line_ = 0;
  std::size_t record_line_start_ = 0;
  std::array<bool, 256> stop_{};  // delimiter, CR, LF
};

}  // namespace photolot::detail
