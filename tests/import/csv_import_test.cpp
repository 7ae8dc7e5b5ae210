// Bench-log import. Logs here are small invented examples (no real bench or lot). Expected
// values come from the text itself (where a field stands, what it says), from RFC 4180 for
// quoting, RFC 3629 for UTF-8, NIST SP 811 for foot-candles and IEC 60062 for letter codes.
#include <gtest/gtest.h>

#include <cmath>
#include <string>

#include "photolot/import.h"
#include "photolot/synth.h"
#include "photolot/units.h"
#include "test_support.h"

// GCC 12 warns falsely (-Wrestrict) on assigning short literals to std::string members
// (GCC bug 105329); nothing overlaps here.
#if defined(__GNUC__) && !defined(__clang__)
#pragma GCC diagnostic ignored "-Wrestrict"
#endif

namespace photolot {
namespace {

ImportResult import_text(const std::string& text, const ImportOptions& options = {},
                         const std::string& name = "bench-a.csv") {
  return import_buffers({{name, text}}, options);
}

ImportOptions with_default_id(const std::string& id) {
  ImportOptions o;
  o.default_unit_id = id;
  return o;
}

const Unit* find_unit_by_id(const Lot& lot, const std::string& id) {
  for (const auto& u : lot.units)
    if (u.id == id) return &u;
  return nullptr;
}

// The first diagnostic of a severity, or nullptr.
const Diagnostic* first_of(const Lot& lot, Severity severity) {
  for (const auto& d : lot.diagnostics)
    if (d.severity == severity) return &d;
  return nullptr;
}

bool has_message(const Lot& lot, const std::string& part) {
  for (const auto& d : lot.diagnostics)
    if (d.message.find(part) != std::string::npos) return true;
  return false;
}

void expect_counts_add_up(const ImportCounts& c) {
  EXPECT_EQ(c.rows_read, c.rows_used + c.rows_skipped + c.duplicates_dropped);
}

// ---- the worked examples at the top of core/src/import/csv_import.cpp ----

TEST(CsvImport, DocExample1ReadsAPlainCommaLog) {
  const auto r = import_text("unit,lux,ohm\nA1,10,4700\n");
  ASSERT_TRUE(r.ok());
  ASSERT_EQ(r.lot.units.size(), 1u);
  EXPECT_EQ(r.lot.units[0].id, "A1");
  ASSERT_EQ(r.lot.units[0].readings.size(), 1u);
  EXPECT_EQ(r.lot.units[0].readings[0].lux, 10);
  EXPECT_EQ(r.lot.units[0].readings[0].ohm, 4700);
  EXPECT_TRUE(std::isnan(r.lot.units[0].readings[0].temp_c));
}

TEST(CsvImport, DocExample2ReadsFootcandlesAndKilohmsWithDecimalComma) {
  const auto r = import_text("Unit;E [fc];R (k\xCE\xA9)\r\nA1;1,5;4,7\r\n");
  ASSERT_TRUE(r.ok());
  ASSERT_EQ(r.lot.units.size(), 1u);
  const Reading& x = r.lot.units[0].readings.at(0);
  EXPECT_NEAR(x.lux, 1.5 * 10.763910416709722, 1e-9);  // NIST SP 811, App. B.8
  EXPECT_NEAR(x.lux, 16.1459, 1e-4);
  EXPECT_NEAR(x.ohm, 4700, 1e-9);
  EXPECT_EQ(r.layouts.at(0).delimiter, ';');
  EXPECT_EQ(r.layouts.at(0).decimal, ',');
}

TEST(CsvImport, DocExample3KeepsADarkReadingOverRangeWithItsBound) {
  const auto r = import_text("id,lux,R\nA1,0,>20M\n");
  ASSERT_TRUE(r.ok());
  const Reading& x = r.lot.units.at(0).readings.at(0);
  EXPECT_EQ(x.kind, ReadingKind::dark);
  EXPECT_NEAR(x.ohm, 20e6, 1e-6);
  EXPECT_EQ(r.lot.counts.dark, 1u);
  EXPECT_EQ(r.lot.counts.censored, 1u);
}

TEST(CsvImport, DocExample4SkipsTextInTheResistanceColumnWithItsPlace) {
  const auto r = import_text("id,lux,R\nA1,10,abc\n");
  ASSERT_TRUE(r.ok());
  const Diagnostic* d = first_of(r.lot, Severity::error);
  ASSERT_NE(d, nullptr);
  EXPECT_EQ(d->file, "bench-a.csv");
  EXPECT_EQ(d->line, 2u);
  EXPECT_EQ(d->column, 7u);  // "A1,10," is six characters
  EXPECT_EQ(d->message, "resistance 'abc' is not a number or an over-range marker");
  EXPECT_EQ(r.lot.counts.rows_skipped, 1u);
  EXPECT_TRUE(r.lot.units.empty());
}

// The "fuller example" of docs/bench-log-format.md, as printed there.
TEST(CsvImport, ReadsTheFullerExampleOfTheFormatGuide) {
  const auto r = import_text(
      "# Incoming inspection, bench 2 (an invented example)\n"
      "# Cells light-adapted 1 h at 500 lx before the run\n"
      "Serial;Illuminance [lx];Resistance [k\xCE\xA9];Temperature [\xC2\xB0"
      "C]\n"
      "X-0001;0;>20000;24,8\n"
      "X-0001;1;92,4;24,9\n"
      "X-0001;10;18,7;25,0\n"
      "X-0001;100;3,81;25,1\n"
      "X-0002;10;OL;25,0\n");
  ASSERT_TRUE(r.ok());
  ASSERT_EQ(r.lot.units.size(), 2u);
  const auto& a = r.lot.units[0].readings;
  ASSERT_EQ(a.size(), 4u);
  EXPECT_EQ(a[0].kind, ReadingKind::dark);
  EXPECT_NEAR(a[0].ohm, 20e6, 1e-6);
  EXPECT_NEAR(a[2].ohm, 18700, 1e-9);
  EXPECT_NEAR(a[3].temp_c, 25.1, 1e-12);
  EXPECT_EQ(r.lot.units[1].readings.at(0).kind, ReadingKind::censored);
  EXPECT_TRUE(std::isnan(r.lot.units[1].readings.at(0).ohm));
  EXPECT_EQ(r.lot.counts.censored, 2u);
  EXPECT_EQ(r.lot.counts.dark, 1u);
  EXPECT_EQ(first_of(r.lot, Severity::error), nullptr);
}

// ---- dialects ----

TEST(CsvImport, ReadsCommaDelimitedLfLogWithTemperature) {
  const auto r = import_text(
      "unit,lux,ohm,temp_c\n"
      "U1,1,100000,24.5\n"
      "U1,10,20000,24.6\n"
      "U2,10,21000,24.7\n");
  ASSERT_TRUE(r.ok());
  ASSERT_EQ(r.lot.units.size(), 2u);
  EXPECT_EQ(r.lot.units[0].readings.size(), 2u);
  EXPECT_EQ(r.lot.units[0].readings[1].temp_c, 24.6);
  EXPECT_EQ(r.lot.units[1].readings[0].source.line, 4u);
  EXPECT_EQ(r.lot.counts.rows_read, 3u);
  EXPECT_EQ(r.lot.counts.rows_used, 3u);
  EXPECT_EQ(r.layouts.at(0).header_line, 1u);
  expect_counts_add_up(r.lot.counts);
}

TEST(CsvImport, ReadsSemicolonDecimalCommaCrlfLog) {
  const auto r = import_text(
      "Unit;Lux;Resistance (k\xCE\xA9);Temp [\xC2\xB0"
      "C]\r\n"
      "U1;10;20,5;25,1\r\n"
      "U1;100;3,25;25,0\r\n");
  ASSERT_TRUE(r.ok());
  const auto& rd = r.lot.units.at(0).readings;
  ASSERT_EQ(rd.size(), 2u);
  EXPECT_NEAR(rd[0].ohm, 20500, 1e-9);
  EXPECT_NEAR(rd[1].ohm, 3250, 1e-9);
  EXPECT_NEAR(rd[0].temp_c, 25.1, 1e-12);
  EXPECT_EQ(rd[1].source.line, 3u);
}

TEST(CsvImport, ReadsTabDelimitedLog) {
  const auto r = import_text("serial\tE [lx]\tR [ohm]\nS-7\t10\t1.5e4\nS-7\t100\t2.6e3\n");
  ASSERT_TRUE(r.ok());
  EXPECT_EQ(r.layouts.at(0).delimiter, '\t');
  ASSERT_EQ(r.lot.units.size(), 1u);
  EXPECT_EQ(r.lot.units[0].id, "S-7");
  EXPECT_EQ(r.lot.units[0].readings.at(0).ohm, 15000);
}

// RFC 3629, section 6: a UTF-8 byte-order mark EF BB BF may start the text; it is not content.
TEST(CsvImport, SkipsUtf8ByteOrderMark) {
  const auto r = import_text("\xEF\xBB\xBFunit,lux,ohm\nA,10,1000\n");
  ASSERT_TRUE(r.ok());
  EXPECT_TRUE(r.layouts.at(0).had_bom);
  EXPECT_EQ(r.layouts.at(0).columns.at(0).role, ColumnRole::unit_id);
  EXPECT_EQ(r.lot.units.at(0).id, "A");
  // Columns are counted after the mark: the bad field starts at character 1 of line 2.
  const auto bad = import_text("\xEF\xBB\xBFlux,ohm\nx,10\n", with_default_id("A"));
  const Diagnostic* d = first_of(bad.lot, Severity::error);
  ASSERT_NE(d, nullptr);
  EXPECT_EQ(d->column, 1u);
}

// RFC 4180, section 2: fields in double quotes may hold delimiters, line breaks and doubled
// quotes (one '"' each).
TEST(CsvImport, ReadsQuotedFieldsWithDelimitersQuotesAndNewlines) {
  const auto r = import_text(
      "\"unit\",\"lux\",\"ohm\",\"note\"\n"
      "\"A,1\",\"10\",\"4700\",\"said \"\"ok\"\"\"\n"
      "\"B \"\"2\"\"\",10,4800,\"two\nlines\"\n"
      "C,bad,4900,x\n");
  ASSERT_TRUE(r.ok());
  ASSERT_EQ(r.lot.units.size(), 2u);
  EXPECT_EQ(r.lot.units[0].id, "A,1");
  EXPECT_EQ(r.lot.units[1].id, "B \"2\"");
  EXPECT_EQ(r.lot.units[1].readings.at(0).ohm, 4800);
  // The quoted newline moves the next record to line 5.
  const Diagnostic* d = first_of(r.lot, Severity::error);
  ASSERT_NE(d, nullptr);
  EXPECT_EQ(d->line, 5u);
  EXPECT_EQ(d->column, 3u);
  EXPECT_EQ(r.layouts.at(0).preview.at(0).at(3), "said \"ok\"");
}

TEST(CsvImport, SkipsCommentBlankAndDelimiterOnlyLines) {
  const auto r = import_text(
      "# bench 2, invented example\n"
      "\n"
      "unit,lux,ohm\n"
      "# conditioned 1 h at 500 lx\n"
      ",,\n"
      "   \n"
      "A,10,1000\n");
  ASSERT_TRUE(r.ok());
  EXPECT_EQ(r.layouts.at(0).header_line, 3u);
  EXPECT_EQ(r.lot.counts.rows_read, 1u);
  EXPECT_EQ(r.lot.units.at(0).readings.at(0).source.line, 7u);
  EXPECT_EQ(first_of(r.lot, Severity::error), nullptr);
}

TEST(CsvImport, SkipsPreambleBeforeTheHeaderWithANote) {
  const auto r = import_text("Bench log, invented\nOperator: nobody\nunit,lux,ohm\nA,10,1000\n");
  ASSERT_TRUE(r.ok());
  EXPECT_EQ(r.layouts.at(0).header_line, 3u);
  EXPECT_TRUE(has_message(r.lot, "2 lines before the header skipped"));
  EXPECT_EQ(r.lot.units.size(), 1u);
}

TEST(CsvImport, TakesPointDecimalsInASemicolonFileThatUsesThem) {
  const auto r = import_text("unit;lux;ohm\nA;10.5;1000.25\n");
  ASSERT_TRUE(r.ok());
  EXPECT_EQ(r.layouts.at(0).decimal, '.');
  EXPECT_NEAR(r.lot.units.at(0).readings.at(0).ohm, 1000.25, 1e-12);
}

// ---- values ----

TEST(CsvImport, ReadsPrefixedAndLetterCodeResistancesAsOhmsWhateverTheColumnUnit) {
  // IEC 60062: 4K7 = 4.7 kohm, 1M0 = 1.0 Mohm; SI prefixes: 12.3k = 12 300 ohm.
  const auto r = import_text(
      "unit,lux,R [k\xCE\xA9]\n"
      "A,1,4K7\n"
      "A,2,1M0\n"
      "A,3,12.3k\n"
      "A,4,27KK\n"
      "A,5,2.5\n");
  ASSERT_TRUE(r.ok());
  const auto& rd = r.lot.units.at(0).readings;
  ASSERT_EQ(rd.size(), 5u);
  EXPECT_NEAR(rd[0].ohm, 4700, 1e-9);
  EXPECT_NEAR(rd[1].ohm, 1e6, 1e-6);
  EXPECT_NEAR(rd[2].ohm, 12300, 1e-9);
  EXPECT_NEAR(rd[3].ohm, 27000, 1e-9);  // K multiplier, K (10 %) tolerance
  EXPECT_NEAR(rd[4].ohm, 2500, 1e-9);   // plain number: the column's kohm
}

TEST(CsvImport, KeepsOverRangeReadingAsCensored) {
  ImportOptions o;
  o.overload_ohm = 40e6;
  const auto r = import_text(
      "unit,lux,ohm\n"
      "A,0.1,OL\n"
      "A,0.2,O.L\n"
      "A,0.3,overload\n"
      "A,0.4,>20M\n"
      "A,0.5,> 20 M\xCE\xA9\n"
      "A,0.6,inf\n",
      o);
  ASSERT_TRUE(r.ok());
  const auto& rd = r.lot.units.at(0).readings;
  ASSERT_EQ(rd.size(), 6u);
  for (const auto& x : rd) EXPECT_EQ(x.kind, ReadingKind::censored);
  EXPECT_EQ(rd[0].ohm, 40e6);
  EXPECT_EQ(rd[2].ohm, 40e6);
  EXPECT_NEAR(rd[3].ohm, 20e6, 1e-6);
  EXPECT_NEAR(rd[4].ohm, 20e6, 1e-6);
  EXPECT_EQ(r.lot.counts.censored, 6u);
  EXPECT_EQ(r.lot.counts.rows_skipped, 0u);
  const Diagnostic* n = first_of(r.lot, Severity::note);
  ASSERT_NE(n, nullptr);
  EXPECT_EQ(n->line, 2u);
  EXPECT_TRUE(has_message(r.lot, "6 readings over the meter's range"));
}

TEST(CsvImport, KeepsOverRangeWithoutABoundAsNaNAndSaysSo) {
  const auto r = import_text("unit,lux,ohm\nA,0.1,OL\n");
  const Reading& x = r.lot.units.at(0).readings.at(0);
  EXPECT_EQ(x.kind, ReadingKind::censored);
  EXPECT_TRUE(std::isnan(x.ohm));
  EXPECT_TRUE(has_message(r.lot, "set overload_ohm"));
}

TEST(CsvImport, ScalesAPlainOverRangeBoundByTheColumnUnit) {
  const auto r = import_text("unit,lux,R (kohm)\nA,0.1,>20000\n");
  EXPECT_NEAR(r.lot.units.at(0).readings.at(0).ohm, 20e6, 1e-6);
}

TEST(CsvImport, KeepsDarkReadingsApartAndCountsThem) {
  const auto r = import_text("unit,lux,ohm\nA,0,5M\nA,10,20k\nB,0,6M\n");
  ASSERT_TRUE(r.ok());
  EXPECT_EQ(r.lot.units.at(0).readings.at(0).kind, ReadingKind::dark);
  EXPECT_EQ(r.lot.units.at(0).readings.at(1).kind, ReadingKind::normal);
  EXPECT_EQ(r.lot.counts.dark, 2u);
  EXPECT_EQ(r.lot.counts.rows_skipped, 0u);
  EXPECT_TRUE(has_message(r.lot, "2 dark readings (0 lx)"));
}

// ---- bad rows: each skipped with its place, the rest kept ----

struct BadRow {
  const char* row;
  std::uint32_t column;
  const char* message;
};

TEST(CsvImport, SkipsEachKindOfBadRowWithFileLineAndColumn) {
  const BadRow cases[] = {
      {"A,ten,1000", 3, "illuminance 'ten' is not a number"},
      {"A,10,-5", 6, "resistance '-5' must be above zero"},
      {"A,10,0", 6, "resistance '0' must be above zero"},
      {"A,-1,1000", 3, "illuminance '-1' is negative"},
      {"A,nan,1000", 3, "illuminance 'nan' is not a finite number"},
      {"A,inf,1000", 3, "illuminance 'inf' is not a finite number"},
      {"A,10,nan", 6, "resistance 'nan' is not a finite number"},
      {"A,10", 5, "too few fields: 2 of the 3 needed for the resistance column"},
      {",10,1000", 1, "missing unit id"},
      {"A,,1000", 3, "missing illuminance"},
      {"A,10,<10", 6, "resistance '<10' is below the meter's range; not used"},
  };
  for (const auto& c : cases) {
    const std::string text = std::string("unit,lux,ohm\nB,10,2000\n") + c.row + "\nB,100,400\n";
    const auto r = import_text(text, {}, "lot-7.csv");
    ASSERT_TRUE(r.ok()) << c.row;
    const Diagnostic* d = first_of(r.lot, Severity::error);
    ASSERT_NE(d, nullptr) << c.row;
    EXPECT_EQ(d->file, "lot-7.csv");
    EXPECT_EQ(d->line, 3u) << c.row;
    EXPECT_EQ(d->column, c.column) << c.row;
    EXPECT_EQ(d->message, c.message) << c.row;
    EXPECT_EQ(r.lot.counts.rows_skipped, 1u) << c.row;
    // One bad row never sinks the lot.
    ASSERT_EQ(r.lot.units.size(), 1u) << c.row;
    EXPECT_EQ(r.lot.units[0].readings.size(), 2u) << c.row;
    expect_counts_add_up(r.lot.counts);
  }
}

TEST(CsvImport, CountsColumnsInCharactersNotBytes) {
  // "Ω1" is two characters but three bytes: the bad field starts at character 4.
  const auto r = import_text(
      "unit,lux,ohm\n\xCE\xA9"
      "1,x,1000\n");
  const Diagnostic* d = first_of(r.lot, Severity::error);
  ASSERT_NE(d, nullptr);
  EXPECT_EQ(d->column, 4u);
}

TEST(CsvImport, ResumesAfterAnUnterminatedQuote) {
  const auto r = import_text("unit,lux,ohm\nA,10,1000\n\"B,10,1000\nC,10,1000\n");
  // The open quote swallows the rest of the file, so the row is reported and reading resumes
  // on the next line: C is kept.
  const Diagnostic* d = first_of(r.lot, Severity::error);
  ASSERT_NE(d, nullptr);
  EXPECT_EQ(d->line, 3u);
  EXPECT_EQ(d->column, 1u);
  EXPECT_NE(find_unit_by_id(r.lot, "C"), nullptr);
  EXPECT_EQ(find_unit_by_id(r.lot, "B"), nullptr);
}

TEST(CsvImport, WarnsOfABadTemperatureAndKeepsTheReading) {
  const auto r = import_text("unit,lux,ohm,temp\nA,10,1000,warm\n");
  const auto& x = r.lot.units.at(0).readings.at(0);
  EXPECT_TRUE(std::isnan(x.temp_c));
  const Diagnostic* d = first_of(r.lot, Severity::warning);
  ASSERT_NE(d, nullptr);
  EXPECT_EQ(d->column, 11u);
  EXPECT_EQ(r.lot.counts.rows_used, 1u);
}

TEST(CsvImport, SkipsARepeatedHeaderFromJoinedLogs) {
  const auto r = import_text("unit,lux,ohm\nA,10,1000\nunit,lux,ohm\nB,10,1100\n");
  EXPECT_EQ(r.lot.units.size(), 2u);
  EXPECT_EQ(r.lot.counts.rows_read, 2u);
  EXPECT_EQ(first_of(r.lot, Severity::error), nullptr);
  EXPECT_TRUE(has_message(r.lot, "header repeats"));
}

TEST(CsvImport, ConvertsKelvinTemperatures) {
  // 0 degC = 273.15 K (SI Brochure, 9th edition).
  const auto r = import_text("unit,lux,ohm,T [K]\nA,10,1000,298.15\n");
  EXPECT_NEAR(r.lot.units.at(0).readings.at(0).temp_c, 25.0, 1e-9);
}

// ---- several files ----

TEST(CsvImport, MergesAUnitAcrossFilesInFirstAppearanceOrder) {
  const auto r = import_buffers({{"day1.csv", "unit,lux,ohm\nB,10,2000\nA,10,1000\n"},
                                 {"day2.csv", "unit;lux;ohm\nA;100;200\nC;10;3000\n"}});
  ASSERT_TRUE(r.ok());
  ASSERT_EQ(r.lot.units.size(), 3u);
  EXPECT_EQ(r.lot.units[0].id, "B");
  EXPECT_EQ(r.lot.units[1].id, "A");
  EXPECT_EQ(r.lot.units[2].id, "C");
  ASSERT_EQ(r.lot.units[1].readings.size(), 2u);
  EXPECT_EQ(r.lot.units[1].readings[1].source.file_index, 1u);
  EXPECT_EQ(r.lot.units[1].readings[1].source.line, 2u);
  EXPECT_EQ(r.lot.name, "day1");
  EXPECT_EQ(r.lot.source_files.size(), 2u);
  EXPECT_EQ(r.layouts.size(), 2u);
}

TEST(CsvImport, DropsExactDuplicateRowsAndCountsThem) {
  const auto r = import_buffers({{"a.csv", "unit,lux,ohm,temp\nA,10,1000,25\nA,100,200,25\n"},
                                 {"b.csv", "unit,lux,ohm,temp\nA,10,1000,25\nA,10,1000,30\n"}});
  ASSERT_TRUE(r.ok());
  const auto& rd = r.lot.units.at(0).readings;
  EXPECT_EQ(rd.size(), 3u);  // the 30 degC row is another reading, not a duplicate
  EXPECT_EQ(r.lot.counts.duplicates_dropped, 1u);
  EXPECT_EQ(r.lot.counts.conflicts, 0u);
  EXPECT_TRUE(has_message(r.lot, "repeats a.csv:2"));
  expect_counts_add_up(r.lot.counts);
}

TEST(CsvImport, TreatsTheSameReadingAtAnotherPrecisionAsADuplicate) {
  // 4.7k is 4650..4750 ohm as written; 4712 falls inside that rounding.
  const auto r = import_text("unit,lux,ohm\nA,10,4.7k\nA,10,4712\n");
  EXPECT_EQ(r.lot.units.at(0).readings.size(), 1u);
  EXPECT_EQ(r.lot.counts.duplicates_dropped, 1u);
}

TEST(CsvImport, ReportsConflictingRowsAndKeepsBoth) {
  const auto r = import_buffers(
      {{"a.csv", "unit,lux,ohm\nA,10,4700\n"}, {"b.csv", "unit,lux,ohm\nA,10,5100\n"}});
  ASSERT_TRUE(r.ok());
  EXPECT_EQ(r.lot.units.at(0).readings.size(), 2u);
  EXPECT_EQ(r.lot.counts.conflicts, 1u);
  const Diagnostic* w = first_of(r.lot, Severity::warning);
  ASSERT_NE(w, nullptr);
  EXPECT_EQ(w->file, "b.csv");
  EXPECT_EQ(w->line, 2u);
  EXPECT_EQ(w->column, 6u);
  EXPECT_NE(w->message.find("a.csv:2"), std::string::npos);
  EXPECT_NE(w->message.find("both kept"), std::string::npos);
}

TEST(CsvImport, IsDeterministic) {
  const std::string text = "unit,lux,ohm\nB,10,2000\nA,10,1000\nB,10,2500\nA,x,1\n";
  const auto a = import_text(text);
  const auto b = import_text(text);
  ASSERT_EQ(a.lot.units.size(), b.lot.units.size());
  ASSERT_EQ(a.lot.diagnostics.size(), b.lot.diagnostics.size());
  for (std::size_t i = 0; i < a.lot.diagnostics.size(); ++i)
    EXPECT_EQ(a.lot.diagnostics[i].message, b.lot.diagnostics[i].message);
}

// The generator's logs (photolot/synth.h) come back as the lot they were written from, to the
// six significant digits the writer keeps ({:.6g}: half a unit in the sixth digit is a relative
// 5e-6), in both dialects.
TEST(CsvImport, RoundTripsASyntheticLotInBothDialects) {
  synth::LotSpec spec;
  spec.seed = 11;
  spec.units = 25;
  spec.dark_readings = true;
  spec.meter_max_ohm = 2e6;  // some low-light and dark readings go over range
  spec.temp_span_c = 3;
  const auto sim = synth::simulate(spec);
  for (const auto dialect : {synth::Dialect::comma, synth::Dialect::semicolon}) {
    const auto r = import_text(synth::to_csv(sim.lot, dialect));
    ASSERT_TRUE(r.ok());
    EXPECT_EQ(first_of(r.lot, Severity::error), nullptr);
    ASSERT_EQ(r.lot.units.size(), sim.lot.units.size());
    std::size_t censored = 0;
    for (std::size_t u = 0; u < sim.lot.units.size(); ++u) {
      const auto& want = sim.lot.units[u];
      const auto& got = r.lot.units[u];
      EXPECT_EQ(got.id, want.id);
      ASSERT_EQ(got.readings.size(), want.readings.size()) << want.id;
      for (std::size_t i = 0; i < want.readings.size(); ++i) {
        const Reading& a = want.readings[i];
        const Reading& b = got.readings[i];
        EXPECT_NEAR(b.lux, a.lux, 5e-6 * a.lux);
        EXPECT_NEAR(b.ohm, a.ohm, 5e-6 * a.ohm);
        EXPECT_NEAR(b.temp_c, a.temp_c, 0.005 + 1e-9);  // written with two decimals
        // A 0 lx row is a dark reading even when over range (its bound kept).
        EXPECT_EQ(b.kind, a.lux == 0 ? ReadingKind::dark : a.kind);
        censored += a.kind == ReadingKind::censored;
      }
    }
    EXPECT_GT(censored, 0u);
    EXPECT_EQ(r.lot.counts.censored, censored);
    EXPECT_EQ(r.lot.counts.dark, spec.units);
  }
}

// Mutated logs (bytes replaced, inserted, cut, with a fixed seed) must never crash or lose
// count of a row: every row read is used, skipped or dropped, and every skipped row has a place.
TEST(CsvImport, KeepsItsCountsOnMutatedLogs) {
  const std::string base =
      "# invented\r\nunit;lux;R (k\xCE\xA9);temp\r\n\"A;1\";10;4,7;25\r\nA;100;0,9;25\r\n"
      "B;0;>20M;24\r\nB;10;OL;24\r\nC;1;4k7;\r\n";
  const char alphabet[] = {';', ',', '"', '\n', '\r', '#', '>', '0', '9', 'k', '\xCE', ' ', '\0'};
  std::uint64_t state = 42;
  auto next = [&] {  // 64-bit LCG (Knuth, TAOCP vol. 2, MMIX constants)
    state = state * 6364136223846793005ULL + 1442695040888963407ULL;
    return static_cast<std::size_t>(state >> 33);
  };
  for (int round = 0; round < 2000; ++round) {
    std::string text = base;
    for (int k = 0, edits = 1 + static_cast<int>(next() % 4); k < edits; ++k) {
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
    const auto r = import_text(text);
    expect_counts_add_up(r.lot.counts);
    std::size_t errors = 0, readings = 0;
    for (const auto& d : r.lot.diagnostics) {
      if (d.severity != Severity::error) continue;
      ++errors;
      EXPECT_GT(d.line, 0u) << text;
      EXPECT_GT(d.column, 0u) << text;
    }
    EXPECT_EQ(errors, r.lot.counts.rows_skipped) << text;
    for (const auto& u : r.lot.units) readings += u.readings.size();
    EXPECT_EQ(readings, r.lot.counts.rows_used) << text;
    if (HasFailure()) break;
  }
}

// ---- files that cannot be read at all ----

TEST(CsvImport, ReportsAMissingFileAndStillReadsTheOthers) {
  const auto good = test::write_scratch_file("good.csv", "unit,lux,ohm\nA,10,1000\n");
  const std::string missing = (good.parent_path() / "missing.csv").string();
  const auto r = import_files({missing, good.string()});
  EXPECT_FALSE(r.ok());
  ASSERT_EQ(r.errors.size(), 1u);
  EXPECT_EQ(r.errors[0].file, missing);
  EXPECT_EQ(r.errors[0].message, "no such file");
  EXPECT_EQ(r.lot.units.size(), 1u);
  EXPECT_EQ(r.lot.units[0].readings[0].source.file_index, 1u);
}

TEST(CsvImport, ReadsAFileFromDisk) {
  const auto path = test::write_scratch_file("lot-3.csv", "unit,lux,ohm\r\nA,10,1000\r\n");
  const auto r = import_files({path.string()});
  ASSERT_TRUE(r.ok());
  EXPECT_EQ(r.lot.name, "lot-3");
  EXPECT_EQ(r.lot.units.at(0).readings.at(0).ohm, 1000);
}

struct FatalCase {
  std::string text;
  std::uint32_t line, column;
  std::string message_part;
};

TEST(CsvImport, RejectsFilesThatCannotBeReadAtAll) {
  const FatalCase cases[] = {
      {"", 0, 0, "empty"},
      {"# only a comment\n\n", 0, 0, "no data"},
      {std::string("unit,lux,ohm\nA,1\0,2\n", 20), 2, 4, "binary"},
      {"\xFF\xFE u\0n\0", 1, 1, "UTF-16"},
      {"PK\x03\x04[Content_Types].xml", 1, 1, "ZIP"},
      // A Latin-1 degree sign (0xB0) where UTF-8 needs two bytes.
      {"unit,lux,ohm,Temp [\xB0"
       "C]\nA,10,1,25\n",
       1, 20, "not UTF-8"},
      {"Einheit,Beleuchtungsst\xE4rke\nA,10\n", 1, 23, "not UTF-8"},
      {"alpha,beta,gamma\n1,2,3\n", 1, 1, "no header naming"},
  };
  for (const auto& c : cases) {
    const auto r = import_text(c.text);
    ASSERT_EQ(r.errors.size(), 1u) << c.message_part;
    EXPECT_EQ(r.errors[0].file, "bench-a.csv");
    EXPECT_EQ(r.errors[0].line, c.line) << c.message_part;
    EXPECT_EQ(r.errors[0].column, c.column) << c.message_part;
    EXPECT_NE(r.errors[0].message.find(c.message_part), std::string::npos) << r.errors[0].message;
    EXPECT_TRUE(r.lot.units.empty());
    ASSERT_TRUE(r.layouts.at(0).error);
  }
}

// ---- headers and explicit choices ----

TEST(CsvImport, NeverReadsAnR10HeaderAsAResistanceColumn) {
  // In the IEC 60062 letter code R10 is 0.10 ohm; as a header it names a summary column.
  const auto r = import_text("unit,lux,R10,ohm\nA,10,20000,21000\n");
  ASSERT_TRUE(r.ok());
  EXPECT_EQ(r.layouts.at(0).columns.at(2).role, ColumnRole::ignored);
  EXPECT_EQ(r.layouts.at(0).columns.at(3).role, ColumnRole::ohm);
  EXPECT_EQ(r.lot.units.at(0).readings.at(0).ohm, 21000);
  const auto only = import_text("unit,lux,R10 (k\xCE\xA9)\nA,10,20\n");
  EXPECT_FALSE(only.ok());
}

TEST(CsvImport, RecognisesHeadersWithUnitsInBracketsSlashesAndWords) {
  const auto layout =
      detect_layout("x.csv",
                    "Part No.,Illuminance / fc,Resistance (M\xCE\xA9),Cell temp [\xC2\xB0"
                    "F],Time [s]\n1,2,3,4,5\n");
  ASSERT_FALSE(layout.error) << layout.error->message;
  ASSERT_EQ(layout.columns.size(), 5u);
  EXPECT_EQ(layout.columns[0].role, ColumnRole::unit_id);
  EXPECT_EQ(layout.columns[1].role, ColumnRole::lux);
  EXPECT_EQ(layout.columns[1].unit, "fc");
  EXPECT_EQ(layout.columns[2].role, ColumnRole::ohm);
  EXPECT_EQ(layout.columns[2].unit, "Mohm");
  EXPECT_EQ(layout.columns[2].scale, 1e6);
  EXPECT_EQ(layout.columns[3].role, ColumnRole::temp_c);
  EXPECT_EQ(layout.columns[3].unit, "degF");
  EXPECT_EQ(layout.columns[4].role, ColumnRole::ignored);  // "T"-like but seconds
}

TEST(CsvImport, RecognisesAHeaderThatIsAUnitName) {
  const auto r = import_text("sn,lux,k\xCE\xA9\nA,10,4.7\n");
  ASSERT_TRUE(r.ok());
  EXPECT_NEAR(r.lot.units.at(0).readings.at(0).ohm, 4700, 1e-9);
}

TEST(CsvImport, ExplicitColumnsAndUnitsBeatDetection) {
  ImportOptions o;
  o.lux_column = "Setpoint";
  o.ohm_column = "4";
  o.ohm_unit = "kohm";
  const auto r = import_text("unit,lux,Setpoint,R (ohm),R2\nA,999,10,4.7,1\n", o);
  ASSERT_TRUE(r.ok()) << r.errors.at(0).message;
  const Reading& x = r.lot.units.at(0).readings.at(0);
  EXPECT_EQ(x.lux, 10);
  EXPECT_NEAR(x.ohm, 4700, 1e-9);
  EXPECT_EQ(r.layouts.at(0).columns.at(1).role, ColumnRole::ignored);
}

TEST(CsvImport, ExplicitDelimiterAndDecimalBeatDetection) {
  ImportOptions o;
  o.delimiter = ';';
  o.decimal = '.';
  const auto r = import_text("unit;lux;ohm\nA;10;1,000\nA;100;250.5\n", o);
  EXPECT_EQ(r.layouts.at(0).decimal, '.');
  EXPECT_EQ(r.lot.counts.rows_skipped, 1u);  // "1,000" is not a number with '.' decimals
  EXPECT_NEAR(r.lot.units.at(0).readings.at(0).ohm, 250.5, 1e-12);
}

TEST(CsvImport, ReadsAHeaderlessLogByColumnNumbers) {
  ImportOptions o;
  o.id_column = "1";
  o.lux_column = "2";
  o.ohm_column = "3";
  const auto r = import_text("A,10,1000\nA,100,200\n", o);
  ASSERT_TRUE(r.ok()) << r.errors.at(0).message;
  EXPECT_EQ(r.layouts.at(0).header_line, 0u);
  EXPECT_EQ(r.lot.units.at(0).readings.size(), 2u);
}

TEST(CsvImport, NamesTheOptionWhenItMatchesNoColumn) {
  ImportOptions o;
  o.lux_column = "Illum";
  const auto r = import_text("unit,lux,ohm\nA,10,1000\n", o);
  ASSERT_EQ(r.errors.size(), 1u);
  EXPECT_NE(r.errors[0].message.find("lux_column = 'Illum' names no column"), std::string::npos);
}

TEST(CsvImport, UsesTheFileStemForALogWithoutAnIdColumn) {
  const auto r = import_text("lux,ohm\n10,1000\n100,200\n", {}, "logs/cell-42.csv");
  ASSERT_EQ(r.lot.units.size(), 1u);
  EXPECT_EQ(r.lot.units[0].id, "cell-42");
  EXPECT_EQ(r.lot.name, "cell-42");
  const auto named = import_text("lux,ohm\n10,1000\n", with_default_id("U9"));
  EXPECT_EQ(named.lot.units.at(0).id, "U9");
}

TEST(ImportOptions, ValidateNamesFieldValueAndRule) {
  EXPECT_EQ(ImportOptions{}.validate(), "");
  ImportOptions o;
  o.delimiter = '|';
  EXPECT_EQ(o.validate(), "delimiter = '|' must be ',', ';', '\\t' or 0 (detect)");
  o = {};
  o.delimiter = ',';
  o.decimal = ',';
  EXPECT_EQ(o.validate(), "decimal = ',' must differ from delimiter = ','");
  o = {};
  o.ohm_unit = "lx";
  EXPECT_EQ(o.validate(), "ohm_unit = 'lx' must be a unit of resistance (ohm, kohm, Mohm)");
  o = {};
  o.overload_ohm = -1;
  EXPECT_EQ(o.validate(), "overload_ohm = -1 must be above 0 and finite, or NaN (unknown)");
  o = {};
  o.lux_column = "0";
  EXPECT_EQ(o.validate(), "lux_column = '0' must be a column number from 1 or a header name");
  o = {};
  o.temp_column = " ";
  EXPECT_EQ(o.validate(), "temp_column = ' ' must name a column: a header text or a number from 1");
  o = {};
  o.lux_column = "2";
  o.ohm_column = "2";
  EXPECT_EQ(o.validate(),
            "lux_column = '2' must differ from ohm_column = '2': one column has one role");
  // import refuses invalid options with the same message.
  const auto r = import_text("unit,lux,ohm\nA,10,1\n", o);
  ASSERT_EQ(r.errors.size(), 1u);
  EXPECT_NE(r.errors[0].message.find("one column has one role"), std::string::npos);
}

TEST(DetectLayout, ShowsDelimiterDecimalHeaderAndFirstRows) {
  const auto layout = detect_layout("p.csv",
                                    "# invented preview example\nUnit;Lux;Ohm\nA;1,5;100\nB;2;200\n"
                                    "C;3;300\n",
                                    {}, 2);
  ASSERT_FALSE(layout.error);
  EXPECT_EQ(layout.delimiter, ';');
  EXPECT_EQ(layout.decimal, ',');
  EXPECT_EQ(layout.header_line, 2u);
  ASSERT_EQ(layout.preview.size(), 2u);
  EXPECT_EQ(layout.preview[0], (std::vector<std::string>{"A", "1,5", "100"}));
  EXPECT_EQ(layout.columns.at(2).role, ColumnRole::ohm);
}

}  // namespace
}  // namespace photolot
