#include "csv_reader.h"

#include <cstring>

namespace photolot::detail {

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
    : text_(text), delimiter_(delimiter), pos_(offset), line_(line), line_start_(line_start) {
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

CsvReader::Status CsvReader::next(std::vector<Field>& fields) {
  fields.clear();
  const char* base = text_.data();
  const std::size_t n = text_.size();
  const bool tab_is_space = delimiter_ != '\t';

  // Blank lines, lines of delimiters only, and '#' comment lines.
  for (;;) {
    if (pos_ >= n) return Status::end;
    const char c0 = base[pos_];
    if (c0 != ' ' && c0 != '\t' && c0 != '#' && !stop_[static_cast<unsigned char>(c0)])
      break;  // the usual case: the line starts with data
    std::size_t p = pos_;
    while (p < n && (base[p] == ' ' || base[p] == delimiter_ || (tab_is_space && base[p] == '\t')))
      ++p;
    if (p >= n) {
      pos_ = n;
      return Status::end;
    }
    if (base[p] == '\n' || base[p] == '\r' || base[p] == '#') {
      skip_line();
      continue;
    }
    break;
  }

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
