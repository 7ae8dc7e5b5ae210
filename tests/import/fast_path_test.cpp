// The importer's fast paths (the quote-free record reader, the ASCII shortcuts for columns and
// UTF-8, the digit loop) must not change any result. Two kinds of check:
//   - number parsing against std::from_chars, the C++ standard library's correctly rounded
//     conversion (ISO/IEC 14882:2020 [charconv.from.chars]): outside this project;
//   - the whole import with the fast record path against the general RFC 4180 reader (whose
//     behaviour the other tests in this folder check against the RFC and the text itself),
//     on mutated logs: every reading, count, layout and diagnostic must be the same.
#include <gtest/gtest.h>

#include <algorithm>
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

// The one-word (SWAR) mantissa read, where eight bytes past the number's start are readable:
// every length from 1 to 24 characters, with and without a decimal mark and an exponent,
// followed inside the readable buffer by bytes that must not be taken (digits, the other
// decimal mark, bytes of 0xFA and above whose +6 carries out of the byte), and numbers that
// end exactly at the buffer's end. Each against std::from_chars on the number's own text.
TEST(FastPath, ReadsShortMantissasInOneWordExactlyAsFromChars) {
  Lcg next{11};
  const char followers[] = {'0', '7', '9', ',', '.', ';', '\n', ' ', 'e', '\xFA', '\xFF', '\x2F'};
  for (int i = 0; i < 300000; ++i) {
    const char decimal = next() % 2 ? '.' : ',';
    std::string number;
    const std::size_t int_digits = 1 + next() % 12;
    for (std::size_t k = 0; k < int_digits; ++k) number += static_cast<char>('0' + next() % 10);
    if (next() % 3 != 0) {
      number += decimal;
      const std::size_t frac = next() % 10;  // 0: "12." is not a plain number
      for (std::size_t k = 0; k < frac; ++k) number += static_cast<char>('0' + next() % 10);
    }
    if (next() % 5 == 0) number += next() % 2 ? "e+06" : "E-3";
    if (next() % 8 == 0) number.insert(number.begin(), '-');
    // The buffer: the number, then 0 to 9 bytes that are readable but not part of it.
    std::string buffer = number;
    const std::size_t tail = next() % 10;
    for (std::size_t k = 0; k < tail; ++k) buffer += followers[next() % sizeof followers];
    const std::string_view text(buffer.data(), number.size());
    std::string dotted = number;
    for (char& c : dotted)
      if (c == decimal) c = '.';
    double want = 0;
    const auto [end, ec] = std::from_chars(dotted.data(), dotted.data() + dotted.size(), want);
    const bool whole = ec == std::errc() && end == dotted.data() + dotted.size();
    detail::ScannedValue fast, bounded;
    const bool fast_ok = detail::scan_plain(text, decimal, fast, buffer.data() + buffer.size());
    const bool bounded_ok = detail::scan_plain(text, decimal, bounded);  // never past the text
    ASSERT_EQ(fast_ok, bounded_ok) << number << " in " << buffer;
    if (!fast_ok) {
      // Only what the full scanner reads instead: no digit after the mark, or more digits
      // than a double holds exactly (over 2^53 needs 16 or more).
      const auto digits =
          std::count_if(number.begin(), number.end(), [](char c) { return c >= '0' && c <= '9'; });
      const std::size_t mark = number.find(decimal);
      const bool empty_fraction =
          mark != std::string::npos &&
          (mark + 1 == number.size() || number[mark + 1] < '0' || number[mark + 1] > '9');
      EXPECT_TRUE(!whole || empty_fraction || digits >= 16) << number;
      continue;
    }
    ASSERT_TRUE(whole) << number;
    EXPECT_TRUE(same_double(fast.value, want)) << number << " in " << buffer;
    EXPECT_TRUE(same_double(fast.half_step, bounded.half_step)) << number;
    const auto full = detail::scan_number(text, decimal, false);
    ASSERT_TRUE(full.has_value()) << number;
    EXPECT_TRUE(same_double(fast.half_step, full->half_step)) << number;
    if (HasFailure()) break;
  }
}

// Lines of more fields than the plain record holds, quotes after many fields, and units whose
// readings come sorted, unsorted, repeated and interleaved with other units: the plain record
// path, the regrouping and the sorted-sweep shortcut give what the general reader gives.
TEST(FastPath, ImportsWideLinesAndInterleavedUnitsExactlyAsTheGeneralReader) {
  std::string wide = "unit,lux,ohm";
  for (int k = 0; k < 40; ++k) wide += ",x" + std::to_string(k);
  wide += "\n";
  for (int row = 0; row < 6; ++row) {
    wide += "W1," + std::to_string(1 << row) + "," + std::to_string(10000 >> row);
    for (int k = 0; k < 40; ++k) wide += row % 2 ? ",\"q\"" : ",1";
    wide += "\n";
  }
  const std::string interleaved =
      "unit,lux,ohm,temp\n"
      "A,1,9000,25\nB,1,8000,25\nA,10,1000,25\nB,10,900,25\n"  // interleaved: regrouped
      "C,1,5000,25\nC,10,700,25\nC,100,90,25\n"                // a sorted sweep
      "D,100,90,25\nD,10,700,25\nD,1,5000,25\n"                // a falling sweep
      "E,1,5000,25\nE,1,5000,25\nE,10,700,25\nE,10,710,25\n"   // duplicate, conflict
      "F,1,5000,\nF,1,5000,25\nF,1,5001,26\n"                  // same lux, other keys
      "A,100,120,25\n";                                        // A again, later
  for (const std::string& text : {wide, interleaved}) {
    const auto fast = import_buffers({{"bench-a.csv", text}});
    EXPECT_EQ(describe(fast), describe(import_general(text)));
    EXPECT_GT(fast.lot.counts.rows_used, 0u);
  }
  // Facts of the text itself (read off the rows above): unit A has its three readings in file
  // order; E drops one repeated row and keeps both conflicting ones.
  const auto r = import_buffers({{"bench-a.csv", interleaved}});
  ASSERT_EQ(r.lot.units.size(), 6u);
  ASSERT_EQ(r.lot.units[0].readings.size(), 3u);
  EXPECT_EQ(r.lot.units[0].readings[2].ohm, 120.0);
  EXPECT_EQ(r.lot.units[4].readings.size(), 3u);
  EXPECT_EQ(r.lot.counts.duplicates_dropped, 1u);
  EXPECT_EQ(r.lot.counts.conflicts, 1u);
}

}  // namespace
}  // namespace photolot
