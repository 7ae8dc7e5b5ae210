#include "csv_reader.h"

#include <cstring>

#if defined(__SSE2__)
#include <emmintrin.h>
#endif

namespace photolot::detail {

namespace {
thread_local bool simple_records_enabled = true;
}

void set_simple_records_enabled(bool enabled) { simple_records_enabled = enabled; }

std::string_view unquote_text(const Field& field, std::string& scratch) {
  const std::string_view s = field.raw;
  scratch.clear();
  for (std::size_t i = 0; i < s.size(); ++i) {
    scratch.push_back(s[i]);
    if (s[i] == '"' && i + 1 < s.size() && s[i + 1] == '"') ++i;
  }
  std::size_t b = 0, e = scratch.size();
  while (b < e && (scratch[b] == ' ' || scratch[b] == '\t')) ++b;
  while (e > b && (scratch[e - 1] == ' ' || scratch[e - 1] == '\t')) --e;
  return std::string_view(scratch).substr(b, e - b);
}

std::uint32_t column_of(const char* line_start, const char* at) {
  std::uint32_t column = 1;
  for (const char* p = line_start; p < at; ++p)
    if ((static_cast<unsigned char>(*p) & 0xC0) != 0x80) ++column;
  return column;
}

std::size_t invalid_utf8_at(std::string_view text) {
  const auto* s = reinterpret_cast<const unsigned char*>(text.data());
  const std::size_t n = text.size();
  std::size_t i = 0;
  while (i < n) {
    const unsigned char c = s[i];
    if (c < 0x80) {
      ++i;
      continue;
    }
    std::size_t len;
    std::uint32_t cp;
    if ((c & 0xE0) == 0xC0) {
      len = 2;
      cp = c & 0x1F;
    } else if ((c & 0xF0) == 0xE0) {
      len = 3;
      cp = c & 0x0F;
    } else if ((c & 0xF8) == 0xF0) {
      len = 4;
      cp = c & 0x07;
    } else {
      return i;
    }
    if (i + len > n) return i;
    for (std::size_t k = 1; k < len; ++k) {
      if ((s[i + k] & 0xC0) != 0x80) return i;
      cp = (cp << 6) | (s[i + k] & 0x3F);
    }
    // Overlong forms, surrogates and values past U+10FFFF are not UTF-8 (RFC 3629).
    if ((len == 2 && cp < 0x80) || (len == 3 && cp < 0x800) || (len == 4 && cp < 0x10000) ||
        (cp >= 0xD800 && cp <= 0xDFFF) || cp > 0x10FFFF)
      return i;
    i += len;
  }
  return std::string_view::npos;
}

CsvReader::CsvReader(std::string_view text, char delimiter, std::size_t offset, std::uint32_t line,
                     std::size_t line_start)
    : text_(text),
      delimiter_(delimiter),
      pos_(offset),
      line_(line),
      line_start_(line_start),
      simple_enabled_(simple_records_enabled) {
  stop_[static_cast<unsigned char>(delimiter)] = true;
  stop_['\r'] = true;
  stop_['\n'] = true;
}

void CsvReader::skip_line() {
  const char* base = text_.data();
  const std::size_t n = text_.size();
  while (pos_ < n && base[pos_] != '\n' && base[pos_] != '\r') ++pos_;
  if (pos_ < n) {
    if (base[pos_] == '\r' && pos_ + 1 < n && base[pos_ + 1] == '\n') ++pos_;
    ++pos_;
  }
  ++line_;
  line_start_ = pos_;
}

namespace {

// Where next_simple puts the fields it finds: the general reader's Field list, or the offsets
// of a PlainRecord. emit() returns false when the record does not fit (then nothing is read).
struct FieldSink {
  std::vector<Field>& fields;
  const char* base;
  const char* line_start;
  std::uint32_t line;
  bool emit(std::size_t begin, std::size_t end) {
    Field& f = fields.emplace_back();
    f.raw = std::string_view(base + begin, end - begin);
    f.start = base + begin;
    f.line_start = line_start;
    f.line = line;
    return true;
  }
  void abandon() { fields.clear(); }
};

struct PlainSink {
  PlainRecord& record;
  std::size_t line_offset;
  std::uint32_t count = 0;
  bool emit(std::size_t /*begin*/, std::size_t end) {
    if (count == PlainRecord::kMaxFields) return false;
    record.cut[++count] = static_cast<std::uint32_t>(end - line_offset + 1);
    return true;
  }
  void abandon() {}
};

}  // namespace

// The usual record: one line with no quote character. Splits it at the delimiter into exactly
// the fields the general loop below would make, and notes whether it is all ASCII. Returns
// false, with nothing changed but what the sink was given, when the line holds a quote or the
// sink refuses a field.
template <class Sink>
bool CsvReader::next_simple(Sink& sink) {
  const char* base = text_.data();
  const std::size_t n = text_.size();
  std::size_t begin = pos_;  // of the field being read
  std::size_t p = pos_;
  unsigned high = 0;  // bit 7 (scalar) or any bit (SIMD) set when a byte is not ASCII
#if defined(__SSE2__)
  // 16 bytes at a time: a mask of delimiters, one of quotes and line ends, one of high bits.
  const __m128i delimiter = _mm_set1_epi8(delimiter_);
  const __m128i lf = _mm_set1_epi8('\n');
  const __m128i cr = _mm_set1_epi8('\r');
  const __m128i quote = _mm_set1_epi8('"');
  while (p + 16 <= n) {
    const __m128i v = _mm_loadu_si128(reinterpret_cast<const __m128i*>(base + p));
    unsigned delimiters = static_cast<unsigned>(_mm_movemask_epi8(_mm_cmpeq_epi8(v, delimiter)));
    const unsigned others = static_cast<unsigned>(_mm_movemask_epi8(_mm_or_si128(
        _mm_cmpeq_epi8(v, quote), _mm_or_si128(_mm_cmpeq_epi8(v, lf), _mm_cmpeq_epi8(v, cr)))));
    const unsigned highs = static_cast<unsigned>(_mm_movemask_epi8(v));
    if (others != 0) {
      const unsigned k = static_cast<unsigned>(__builtin_ctz(others));
      if (base[p + k] == '"') {
        sink.abandon();
        return false;
      }
      delimiters &= (1u << k) - 1;
      for (; delimiters != 0; delimiters &= delimiters - 1) {
        const std::size_t at = p + static_cast<unsigned>(__builtin_ctz(delimiters));
        if (!sink.emit(begin, at)) return false;
        begin = at + 1;
      }
      high |= highs & ((1u << k) - 1);
      p += k;
      goto line_end;
    }
    for (; delimiters != 0; delimiters &= delimiters - 1) {
      const std::size_t at = p + static_cast<unsigned>(__builtin_ctz(delimiters));
      if (!sink.emit(begin, at)) return false;
      begin = at + 1;
    }
    high |= highs;
    p += 16;
  }
#endif
  for (;; ++p) {
    if (p >= n) break;
    const unsigned char c = static_cast<unsigned char>(base[p]);
    if (c == static_cast<unsigned char>(delimiter_)) {
      if (!sink.emit(begin, p)) return false;
      begin = p + 1;
      continue;
    }
    if (c == '"') {
      sink.abandon();
      return false;
    }
    if (c == '\n' || c == '\r') break;
    high |= c & 0x80u;
  }
#if defined(__SSE2__)
line_end:
#endif
  if (!sink.emit(begin, p)) return false;
  record_begin_ = pos_;
  record_line_ = line_;
  record_line_start_ = line_start_;
  record_ascii_ = high == 0;
  if (p < n) {
    if (base[p] == '\r' && p + 1 < n && base[p + 1] == '\n') ++p;
    ++p;
  }
  pos_ = p;
  ++line_;
  line_start_ = p;
  return true;
}

// Blank lines, lines of delimiters only, and '#' comment lines.
bool CsvReader::skip_blank_lines() {
  const char* base = text_.data();
  const std::size_t n = text_.size();
  const bool tab_is_space = delimiter_ != '\t';
  for (;;) {
    if (pos_ >= n) return false;
    const char c0 = base[pos_];
    if (c0 != ' ' && c0 != '\t' && c0 != '#' && !stop_[static_cast<unsigned char>(c0)])
      return true;  // the usual case: the line starts with data
    std::size_t p = pos_;
    while (p < n && (base[p] == ' ' || base[p] == delimiter_ || (tab_is_space && base[p] == '\t')))
      ++p;
    if (p >= n) {
      pos_ = n;
      return false;
    }
    if (base[p] == '\n' || base[p] == '\r' || base[p] == '#') {
      skip_line();
      continue;
    }
    return true;
  }
}

CsvReader::Status CsvReader::next_plain(PlainRecord& record) {
  if (pos_ >= text_.size()) return Status::end;
  const char c0 = text_[pos_];
  if ((c0 == ' ' || c0 == '\t' || c0 == '#' || stop_[static_cast<unsigned char>(c0)]) &&
      !skip_blank_lines())
    return Status::end;
  if (!simple_enabled_) return Status::not_plain;
  PlainSink sink{record, line_start_};
  if (!next_simple(sink)) return Status::not_plain;
  record.line_start = text_.data() + record_line_start_;
  record.line = record_line_;
  record.count = sink.count;
  record.ascii = record_ascii_;
  return Status::record;
}

CsvReader::Status CsvReader::next(std::vector<Field>& fields) {
  fields.clear();
  const char* base = text_.data();
  const std::size_t n = text_.size();
  const bool tab_is_space = delimiter_ != '\t';
  if (!skip_blank_lines()) return Status::end;

  if (simple_enabled_) {
    FieldSink sink{fields, base, base + line_start_, line_};
    if (next_simple(sink)) return Status::record;
  }
  record_ascii_ = false;
  record_begin_ = pos_;
  record_line_ = line_;
  record_line_start_ = line_start_;
  for (;;) {
    // A quoted field may have spaces before its opening quote.
    std::size_t q = pos_;
    if (q < n && (base[q] == ' ' || base[q] == '\t'))
      while (q < n && (base[q] == ' ' || (tab_is_space && base[q] == '\t'))) ++q;
    std::size_t p;
    if (q < n && base[q] == '"') {
      Field f;
      f.start = base + q;
      f.line_start = base + line_start_;
      f.line = line_;
      f.quoted = true;
      const std::uint32_t quote_line = line_;
      const std::size_t quote_line_start = line_start_;
      std::size_t c = q + 1;
      const std::size_t content = c;
      for (;;) {
        const void* hit = std::memchr(base + c, '"', n - c);
        if (!hit) {
          // Unterminated: report it, resume on the line after the opening quote.
          f.raw = std::string_view(base + content, n - content);
          fields.push_back(f);
          pos_ = q;
          line_ = quote_line;
          line_start_ = quote_line_start;
          skip_line();
          return Status::unterminated_quote;
        }
        const std::size_t quote = static_cast<const char*>(hit) - base;
        for (std::size_t k = c; k < quote; ++k) {
          if (base[k] == '\n') {
            ++line_;
            line_start_ = k + 1;
          }
        }
        if (quote + 1 < n && base[quote + 1] == '"') {
          f.has_escapes = true;
          c = quote + 2;
          continue;
        }
        f.raw = std::string_view(base + content, quote - content);
        p = quote + 1;
        break;
      }
      fields.push_back(f);
      // Anything between the closing quote and the delimiter is ignored (RFC 4180 allows none).
      while (p < n && !stop_[static_cast<unsigned char>(base[p])]) ++p;
    } else {
      p = pos_;
      while (p < n && !stop_[static_cast<unsigned char>(base[p])]) ++p;
      Field& f = fields.emplace_back();
      f.raw = std::string_view(base + pos_, p - pos_);
      f.start = base + pos_;
      f.line_start = base + line_start_;
      f.line = line_;
    }
    if (p < n && base[p] == delimiter_) {
      pos_ = p + 1;
      continue;
    }
    // End of the record.
    if (p < n) {
      if (base[p] == '\r' && p + 1 < n && base[p + 1] == '\n') ++p;
      ++p;
    }
    pos_ = p;
    ++line_;
    line_start_ = p;
    return Status::record;
  }
}

}  // namespace photolot::detail
