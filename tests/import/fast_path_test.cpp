// The importer's fast paths (the quote-free record reader, the ASCII shortcuts for columns and
// UTF-8, the digit loop) must not change any result. Two kinds of check:
//   - number parsing against std::from_chars, the C++ standard library's correctly rounded
//     conversion (ISO/IEC 14882:2020 [charconv.from.chars]): outside this project;
//   - the whole import with the fast record path against the general RFC 4180 reader (whose
//     behaviour the other tests in this folder check against the RFC and the text itself),
//     on mutated logs: every reading, count, layout and diagnostic must be the same.
#include <gtest/gtest.h>

#include <charconv>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstring>
#include <string>

#include "../../core/src/import/csv_reader.h"
#include "../../core/src/units/value_scan.h"
#include "photolot/import.h"
#include "photolot/synth.h"
#include "photolot/units.h"

namespace photolot {
namespace {

struct Lcg {  // 64-bit LCG (Knuth, TAOCP vol. 2, MMIX constants)
  std::uint64_t state;
  std::size_t operator()() {
    state = state * 6364136223846793005ULL + 1442695040888963407ULL;
    return static_cast<std::size_t>(state >> 33);
  }
};

bool same_double(double a, double b) {
  return (std::isnan(a) && std::isnan(b)) || std::memcmp(&a, &b, sizeof a) == 0;
}

// Everything import returns, as text, so two results compare in one EXPECT_EQ with a readable
// difference. Doubles are written exactly (hex float).
std::string describe(const ImportResult& r) {
  std::string out;
  auto num = [](double v) {
    char buf[64];
    std::snprintf(buf, sizeof buf, "%a", v);
    return std::string(buf);
  };
  const ImportCounts& c = r.lot.counts;
  out += "counts " + std::to_string(c.rows_read) + " " + std::to_string(c.rows_used) + " " +
         std::to_string(c.rows_skipped) + " " + std::to_string(c.duplicates_dropped) + " " +
         std::to_string(c.conflicts) + " " + std::to_string(c.censored) + " " +
         std::to_string(c.dark) + "\n";
  for (const auto& u : r.lot.units) {
    out += "unit " + u.id + "\n";
    for (const auto& x : u.readings)
      out += "  " + num(x.lux) + " " + num(x.ohm) + " " + num(x.temp_c) + " " +
             std::to_string(static_cast<int>(x.kind)) + " " + std::to_string(x.source.file_index) +
             ":" + std::to_string(x.source.line) + "\n";
  }
  for (const auto& d : r.lot.diagnostics)
    out += "diag " + d.file + ":" + std::to_string(d.line) + ":" + std::to_string(d.column) + " " +
           std::to_string(static_cast<int>(d.severity)) + " " + d.message + "\n";
  for (const auto& e : r.errors)
    out += "error " + e.file + ":" + std::to_string(e.line) + ":" + std::to_string(e.column) + " " +
           e.message + "\n";
  for (const auto& l : r.layouts) {
    out += std::string("layout ") + l.delimiter + l.decimal + " " + std::to_string(l.header_line) +
           " " + std::to_string(l.data_rows) + "\n";
    for (const auto& row : l.preview) {
      out += " ";
      for (const auto& cell : row) out += " [" + cell + "]";
      out += "\n";
    }
  }
  return out;
}

ImportResult import_general(const std::string& text) {
  detail::set_simple_records_enabled(false);
  auto r = import_buffers({{"bench-a.csv", text}});
  detail::set_simple_records_enabled(true);
  return r;
}

// Values in plain and exponent form, with the decimal point and the decimal comma, compared
// with std::from_chars on the same digits.
TEST(FastPath, ParsesPlainNumbersExactlyAsFromChars) {
  Lcg next{7};
  for (int i = 0; i < 200000; ++i) {
    std::string s;
    if (next() % 8 == 0) s += next() % 2 ? '-' : '+';
    const std::size_t int_digits = next() % 24;
    for (std::size_t k = 0; k < int_digits; ++k) s += static_cast<char>('0' + next() % 10);
    if (next() % 2) {
      s += '.';
      const std::size_t frac = next() % 24;
      for (std::size_t k = 0; k < frac; ++k) s += static_cast<char>('0' + next() % 10);
    }
    if (next() % 4 == 0) {
      s += next() % 2 ? 'e' : 'E';
      if (next() % 2) s += next() % 2 ? '-' : '+';
      const std::size_t e = 1 + next() % 3;
      for (std::size_t k = 0; k < e; ++k) s += static_cast<char>('0' + next() % 10);
    }
    const std::string body = (!s.empty() && s[0] == '+') ? s.substr(1) : s;
    double want = 0;
    const auto [end, ec] = std::from_chars(body.data(), body.data() + body.size(), want);
    const bool whole = ec == std::errc() && end == body.data() + body.size();
    const auto got = parse_number(s, '.', false);
    if (!whole) {
      if (ec != std::errc::result_out_of_range) {
        EXPECT_FALSE(got.has_value()) << s;
      }
      continue;
    }
    ASSERT_TRUE(got.has_value()) << s;
    EXPECT_TRUE(same_double(*got, want)) << s << ": " << *got << " vs " << want;
    // The importer's inline plain-number path, where it applies, gives the same value and step.
    detail::ScannedValue plain;
    if (detail::scan_plain(s, '.', plain)) {
      const auto full = detail::scan_number(s, '.', false);
      ASSERT_TRUE(full.has_value()) << s;
      EXPECT_TRUE(same_double(plain.value, want)) << s;
      EXPECT_TRUE(same_double(plain.half_step, full->half_step)) << s;
    }
    std::string comma = s;
    for (char& c : comma)
      if (c == '.') c = ',';
    const auto got_comma = parse_number(comma, ',', false);
    ASSERT_TRUE(got_comma.has_value()) << comma;
    EXPECT_TRUE(same_double(*got_comma, want)) << comma;
    if (HasFailure()) break;
  }
}

// Mutations of both dialects and of a log with quotes, comments, CRLF and UTF-8: the fast
// record path and the general reader give the same import, byte for byte.
TEST(FastPath, ImportsMutatedLogsExactlyAsTheGeneralReader) {
  synth::LotSpec spec;
  spec.seed = 3;
  spec.units = 4;
  spec.lux_levels = {0.5, 10, 1000};
  spec.dark_readings = true;
  spec.meter_max_ohm = 2e6;
  spec.temp_span_c = 2;
  const auto sim = synth::simulate(spec);
  const std::string bases[] = {
      synth::to_csv(sim.lot, synth::Dialect::comma),
      synth::to_csv(sim.lot, synth::Dialect::semicolon),
      "# invented\r\nunit;lux;R (k\xCE\xA9);temp\r\n\"A;1\";10;4,7;25\r\nA;100;0,9;25\r\n"
      "B;0;>20M;24\r\nB;10;OL;24\r\nC;1;4k7;\r\n\xC3\xA9t\xC3\xA9;5;1,2;24\r\n",
      "id,lux,ohm\nA1 , 10 ,4700\n  A1,20,  2200\nA1,10,4700\nA1,10,4800\n\n,,\nA2,1e1,1.2e3\n"};
  const char alphabet[] = {';', ',', '"',  '\n', '\r',   '#',    '>',    '0', '9',
                           'k', ' ', '\t', '.',  '\xCE', '\xA9', '\xFF', 'e', '-'};
  Lcg next{2026};
  for (const std::string& base : bases) {
    ASSERT_EQ(describe(import_buffers({{"bench-a.csv", base}})), describe(import_general(base)));
    for (int round = 0; round < 1500; ++round) {
      std::string text = base;
      for (int k = 0, edits = 1 + static_cast<int>(next() % 5); k < edits; ++k) {
        const std::size_t at = next() % (text.size() + 1);
        const char c = alphabet[next() % sizeof alphabet];
        switch (next() % 3) {
          case 0:
            if (at < text.size()) text[at] = c;
            break;
          case 1:
            text.insert(text.begin() + static_cast<std::ptrdiff_t>(at), c);
            break;
          default:
            text.erase(at, next() % 4);
            break;
        }
      }
      ASSERT_EQ(describe(import_buffers({{"bench-a.csv", text}})), describe(import_general(text)))
          << text;
    }
  }
}

}  // namespace
}  // namespace photolot
