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

// A record read by CsvReader::next_plain: one physical line with no quote character, as the
// byte offsets of its fields from the line's start. Field i is [cut[i], cut[i + 1] - 1): cut[0]
// is 0 and cut[i + 1] is one past the delimiter or line end that closes field i. The fields are
// exactly the ones CsvReader::next would make (unquoted, no escapes, all on `line`).
struct PlainRecord {
  static constexpr std::size_t kMaxFields = 32;
  const char* line_start = nullptr;
  std::uint32_t line = 0;
  std::uint32_t count = 0;  // fields
  bool ascii = false;       // every byte of the line is ASCII
  std::array<std::uint32_t, kMaxFields + 1> cut{};

  std::string_view raw(std::size_t i) const {
    return std::string_view(line_start + cut[i], cut[i + 1] - 1 - cut[i]);
  }
  // The field as the general reader gives it (for diagnostics).
  Field field(std::size_t i) const {
    Field f;
    f.raw = raw(i);
    f.start = line_start + cut[i];
    f.line_start = line_start;
    f.line = line;
    return f;
  }
};

// Turns the quote-free fast path of CsvReader off (and with it every shortcut the importer takes
// for ASCII records) on this thread, for readers made afterwards: for tests that check the fast
// path against the general one.
void set_simple_records_enabled(bool enabled);

class CsvReader {
 public:
  // not_plain: only from next_plain.
  enum class Status { record, end, unterminated_quote, not_plain };

  // `text` must outlive the reader; `line`/`line_start` say where `offset` is.
  CsvReader(std::string_view text, char delimiter, std::size_t offset = 0, std::uint32_t line = 1,
            std::size_t line_start = 0);

  // Reads the next record into fields (cleared first). On unterminated_quote, `fields` holds the
  // fields read so far plus the open one, and the reader resumes on the line after the quote.
  Status next(std::vector<Field>& fields);

  // The importer's row loop: reads the next record into `record` when it is one line with no
  // quote and at most PlainRecord::kMaxFields fields (Status::record), or says Status::end.
  // Anything else returns Status::not_plain with the reader just before that record
  // (only blank and comment lines consumed): read it with next() instead. Never takes the fast
  // path when set_simple_records_enabled(false) was in force when the reader was made.
  Status next_plain(PlainRecord& record);

  // Where the last record started and ended (end: just past its line break).
  std::size_t record_begin() const { return record_begin_; }
  std::size_t record_end() const { return pos_; }
  std::uint32_t record_line() const { return record_line_; }
  std::size_t record_line_start() const { return record_line_start_; }
  // Whether the last record is all ASCII (then a column is its byte offset + 1 and any field
  // is valid UTF-8). Only ever true for records read by the quote-free fast path.
  bool record_ascii() const { return record_ascii_; }
  // Where the reader stands now (to restart another reader there).
  std::size_t offset() const { return pos_; }
  std::uint32_t line() const { return line_; }
  std::size_t line_start() const { return line_start_; }

 private:
  void skip_line();
  bool skip_blank_lines();  // false at the end of the text
  template <class Sink>
  bool next_simple(Sink& sink);
  std::string_view text_;
  char delimiter_;
  std::size_t pos_;
  std::uint32_t line_;
  std::size_t line_start_;
  std::size_t record_begin_ = 0;
  std::uint32_t record_line_ = 0;
  std::size_t record_line_start_ = 0;
  bool record_ascii_ = false;
  bool simple_enabled_ = true;
  std::array<bool, 256> stop_{};  // delimiter, CR, LF
};

}  // namespace photolot::detail
