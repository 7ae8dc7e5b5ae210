// The bench-log rows of docs/bad-input.md (L01...), each through import_files beside a good log:
// the user sees a message naming file, line and column, and the good file and good rows are
// kept. Expected behaviour is the catalogue's, chosen for what an inspection bench needs:
// nothing silently dropped, nothing invented.
#include <cmath>
#include <filesystem>
#include <fstream>
#include <string>

#include "bad_input_support.h"
#include "test_support.h"

namespace photolot::test {
namespace {

// The good log beside every bad file is kept whole.
void expect_good_kept(const ImportResult& r) {
  EXPECT_EQ(readings_of(r, "G1"), 4u);
  EXPECT_EQ(readings_of(r, "G2"), 4u);
}

// A file refused as a whole: a FileError naming it, nothing of it in the lot.
void expect_refused(const ImportResult& r, const std::string& name, const std::string& text) {
  ASSERT_EQ(r.errors.size(), 1u);
  EXPECT_NE(r.errors[0].file.find(name), std::string::npos);
  EXPECT_NE(r.errors[0].message.find(text), std::string::npos) << r.errors[0].message;
  expect_good_kept(r);
  EXPECT_EQ(r.lot.units.size(), 2u);
}

// A row skipped with a diagnostic at line:column; the file's other rows kept.
void expect_row_skipped(const ImportResult& r, const std::string& text, int line, int column) {
  EXPECT_TRUE(r.errors.empty());
  const std::string found = find_message(r, text);
  EXPECT_EQ(found.substr(0, found.find(": ")), std::to_string(line) + ":" + std::to_string(column))
      << found;
  expect_good_kept(r);
}

constexpr const char* kHead = "unit,lux,ohm\n";

TEST(BadLog, L01EmptyFileIsRefusedAndTheOtherFilesKept) {
  expect_refused(import_beside_good("empty.csv", ""), "empty.csv", "empty");
}

TEST(BadLog, L02HeaderOnlyFileIsWarnedOf) {
  const auto r = import_beside_good("header.csv", kHead);
  EXPECT_EQ(find_message(r, "no data rows after the header").substr(0, 2), "1:");
  expect_good_kept(r);
}

TEST(BadLog, L03BlankAndCommentLinesOnlyIsRefused) {
  expect_refused(import_beside_good("blank.csv", "\n# nothing measured\n\n"), "blank.csv",
                 "holds no data");
}

TEST(BadLog, L04TruncatedLastRowIsSkippedAndTheRestKept) {
  const auto r = import_beside_good("cut.csv", std::string(kHead) + "T1,1,90000\nT1,10,");
  expect_row_skipped(r, "missing resistance", 3, 7);
  EXPECT_EQ(readings_of(r, "T1"), 1u);
}

TEST(BadLog, L05TruncatedInsideAQuoteIsSkippedAndReadingResumes) {
  const auto r = import_beside_good(
      "quote.csv", std::string(kHead) + "T1,1,90000\n\"T1,10,20000\nT1,100,4000\n");
  expect_row_skipped(r, "never closed", 3, 1);
  EXPECT_EQ(readings_of(r, "T1"), 2u);
}

TEST(BadLog, L06BinaryFileIsRefusedAtItsFirstNulByte) {
  const auto r = import_beside_good("bin.csv", std::string("unit,lux,ohm\nA\0B", 16));
  expect_refused(r, "bin.csv", "binary");
  EXPECT_EQ(r.errors[0].line, 2u);
}

TEST(BadLog, L07Utf16LittleEndianIsRefusedWithHowToSaveIt) {
  std::string text = "\xFF\xFE";
  for (char c : std::string(kHead)) text += std::string{c, '\0'};
  expect_refused(import_beside_good("u16le.csv", text), "u16le.csv", "UTF-8");
}

TEST(BadLog, L08Utf16BigEndianIsRefusedWithHowToSaveIt) {
  std::string text = "\xFE\xFF";
  for (char c : std::string(kHead)) text += std::string{'\0', c};
  expect_refused(import_beside_good("u16be.csv", text), "u16be.csv", "UTF-16");
}

TEST(BadLog, L09Latin1HeaderIsRefusedAsNotUtf8) {
  // "Temp (\xB0C)": the degree sign in ISO 8859-1 is the single byte 0xB0 (ISO/IEC 8859-1).
  const auto r = import_beside_good("latin1.csv",
                                    "unit,lux,ohm,Temp (\xB0"
                                    "C)\nA1,10,4700,25\n");
  expect_refused(r, "latin1.csv", "not UTF-8");
}

TEST(BadLog, L10Latin1UnitIdIsSkippedAsNotUtf8) {
  const auto r = import_beside_good("id.csv", std::string(kHead) +
                                                  "M\xFC"
                                                  "1,10,4700\nA1,10,4700\n");
  expect_row_skipped(r, "unit id is not UTF-8", 2, 1);
  EXPECT_EQ(readings_of(r, "A1"), 1u);
}

TEST(BadLog, L11HugeIlluminanceIsSkippedAsNotFinite) {
  // 1e400 is beyond the largest IEEE 754 double (about 1.8e308).
  const auto r = import_beside_good("big.csv", std::string(kHead) + "A1,1e400,4700\nA1,10,4700\n");
  expect_row_skipped(r, "not a finite number", 2, 4);
}

TEST(BadLog, L12HugeResistanceIsSkippedAsNotFinite) {
  const auto r = import_beside_good("big.csv", std::string(kHead) + "A1,10,1e400\nA1,1,9000\n");
  expect_row_skipped(r, "not a finite number", 2, 7);
}

TEST(BadLog, L13NanResistanceIsSkipped) {
  const auto r = import_beside_good("nan.csv", std::string(kHead) + "A1,10,nan\nA1,1,9000\n");
  expect_row_skipped(r, "resistance 'nan'", 2, 7);
  EXPECT_EQ(readings_of(r, "A1"), 1u);
}

TEST(BadLog, L14InfinityResistanceIsKeptAsOverRange) {
  // Meters show over range as "OL" or infinity; the reading is a lower bound, not a value.
  const auto r = import_beside_good("inf.csv", std::string(kHead) + "A1,10,inf\n");
  ASSERT_EQ(readings_of(r, "A1"), 1u);
  EXPECT_EQ(r.lot.counts.censored, 1u);
  expect_good_kept(r);
}

TEST(BadLog, L15NanIlluminanceIsSkipped) {
  const auto r = import_beside_good("nan.csv", std::string(kHead) + "A1,NaN,4700\nA1,1,9000\n");
  expect_row_skipped(r, "illuminance 'NaN'", 2, 4);
}

TEST(BadLog, L16NegativeIlluminanceIsSkipped) {
  const auto r = import_beside_good("neg.csv", std::string(kHead) + "A1,-10,4700\nA1,1,9000\n");
  expect_row_skipped(r, "negative", 2, 4);
}

TEST(BadLog, L17NegativeResistanceIsSkipped) {
  const auto r = import_beside_good("neg.csv", std::string(kHead) + "A1,10,-4700\nA1,1,9000\n");
  expect_row_skipped(r, "must be above zero", 2, 7);
}

TEST(BadLog, L18ZeroResistanceIsSkipped) {
  const auto r = import_beside_good("zero.csv", std::string(kHead) + "A1,10,0\nA1,1,9000\n");
  expect_row_skipped(r, "must be above zero", 2, 7);
}

TEST(BadLog, L19TemperatureBelowAbsoluteZeroKeepsTheReadingWithoutIt) {
  // Absolute zero is -273.15 degC (SI Brochure, 9th edition, 2.3.1).
  const auto r = import_beside_good("cold.csv", "unit,lux,ohm,temp_c\nA1,10,4700,-300\n");
  EXPECT_NE(find_message(r, "absolute zero"), "");
  ASSERT_EQ(readings_of(r, "A1"), 1u);
  EXPECT_TRUE(std::isnan(r.lot.units.back().readings[0].temp_c));
}

TEST(BadLog, L20ExactlyRepeatedRowIsDroppedAndCounted) {
  const auto r = import_beside_good("dup.csv", std::string(kHead) + "A1,10,4700\nA1,10,4700\n");
  EXPECT_EQ(readings_of(r, "A1"), 1u);
  EXPECT_EQ(r.lot.counts.duplicates_dropped, 1u);
  EXPECT_NE(find_message(r, "repeating a reading"), "");
}

TEST(BadLog, L21ConflictingRepeatKeepsBothAndWarns) {
  const auto r = import_beside_good("dup.csv", std::string(kHead) + "A1,10,4700\nA1,10,5600\n");
  EXPECT_EQ(readings_of(r, "A1"), 2u);
  EXPECT_EQ(r.lot.counts.conflicts, 1u);
  EXPECT_EQ(find_message(r, "differs from").substr(0, 2), "3:");
}

TEST(BadLog, L22DuplicateUnitAcrossFilesIsMergedIntoOne) {
  // G1 again at new levels in a second file: one unit with all its readings.
  const auto r = import_beside_good("more.csv", std::string(kHead) + "G1,2,55000\nG1,5,30000\n");
  EXPECT_EQ(readings_of(r, "G1"), 6u);
  EXPECT_EQ(r.lot.units.size(), 2u);
}

TEST(BadLog, L23MixedUnitsAcrossFilesAreEachScaledByTheirHeader) {
  // 1 fc = 10.763910 lx (NIST SP 811, B.8: footcandle); 20 kohm = 20000 ohm.
  const auto r = import_beside_good("fc.csv", "unit;E (fc);R (kOhm)\nH1;1;20\n");
  ASSERT_EQ(readings_of(r, "H1"), 1u);
  const Reading& x = r.lot.units.back().readings[0];
  EXPECT_NEAR(x.lux, 10.763910, 1e-5);
  EXPECT_DOUBLE_EQ(x.ohm, 20000.0);
  expect_good_kept(r);
}

TEST(BadLog, L24ResistanceColumnMissingIsRefused) {
  expect_refused(import_beside_good("nor.csv", "unit,lux,temp_c\nA1,10,25\n"), "nor.csv",
                 "no header naming");
}

TEST(BadLog, L25IlluminanceColumnMissingIsRefused) {
  expect_refused(import_beside_good("nolux.csv", "unit,ohm\nA1,4700\n"), "nolux.csv",
                 "no header naming");
}

TEST(BadLog, L26RowWithTooFewFieldsIsSkipped) {
  const auto r = import_beside_good("few.csv", std::string(kHead) + "A1,10\nA1,1,9000\n");
  expect_row_skipped(r, "too few fields", 2, 6);  // where the missing field would start
}

TEST(BadLog, L27MissingUnitIdIsSkipped) {
  const auto r = import_beside_good("noid.csv", std::string(kHead) + ",10,4700\nA1,1,9000\n");
  expect_row_skipped(r, "missing unit id", 2, 1);
}

TEST(BadLog, L28SpreadsheetWorkbookIsRefusedWithHowToExport) {
  // An .xlsx/.ods is a ZIP archive; its local file header starts "PK\3\4" (PKWARE APPNOTE 4.3.7).
  expect_refused(import_beside_good("lot.xlsx", std::string("PK\x03\x04\x14\0\0\0", 8)), "lot.xlsx",
                 "export the sheet as CSV");
}

TEST(BadLog, L29PdfIsRefused) {
  // A PDF file starts "%PDF-" (ISO 32000-1, 7.5.2).
  expect_refused(import_beside_good("lot.pdf", "%PDF-1.7\n"), "lot.pdf", "PDF");
}

TEST(BadLog, L30FileOverTheSizeLimitIsRefusedUnread) {
  // A sparse file of 1 GiB: the size is all that is looked at, so this is fast.
  const auto good = write_scratch_file("good.csv", kGoodLog);
  const auto huge = write_scratch_file("huge.csv", kHead);
  std::filesystem::resize_file(huge, std::uint64_t{1} << 30);
  const auto r = import_files({good.string(), huge.string()});
  expect_refused(r, "huge.csv", "1024 MiB, over the 256 MiB");
}

TEST(BadLog, L31MissingFileIsNamedAndTheOthersKept) {
  const auto good = write_scratch_file("good.csv", kGoodLog);
  const auto r = import_files({good.string(), (good.parent_path() / "nope.csv").string()});
  expect_refused(r, "nope.csv", "no such file");
}

TEST(BadLog, L32FolderGivenForAFileIsRefused) {
  const auto good = write_scratch_file("good.csv", kGoodLog);
  const auto r = import_files({good.string(), good.parent_path().string()});
  expect_refused(r, good.parent_path().string(), "folder");
}

TEST(BadLog, L36PipeGivenForAFileIsRefusedAtOnce) {
  // A named pipe (mkfifo) in place of a log: refused without waiting for a writer.
  const auto good = write_scratch_file("good.csv", kGoodLog);
  const auto pipe = good.parent_path() / "pipe.csv";
  std::filesystem::remove(pipe);  // from an earlier run
  ASSERT_EQ(::mkfifo(pipe.c_str(), 0600), 0);
  const auto r = import_files({good.string(), pipe.string()});
  expect_refused(r, "pipe.csv", "not a regular file (a device or a pipe)");
}

TEST(BadLog, L33HeaderRepeatedMidFileIsSkipped) {
  const auto r =
      import_beside_good("joined.csv", std::string(kHead) + "A1,10,4700\n" + kHead + "A1,1,9000\n");
  EXPECT_EQ(find_message(r, "header repeats").substr(0, 2), "3:");
  EXPECT_EQ(readings_of(r, "A1"), 2u);
}

TEST(BadLog, L34OverRangeMarkerWithANonsenseBoundIsSkipped) {
  const auto r = import_beside_good("ol.csv", std::string(kHead) + "A1,10,>abc\nA1,1,9000\n");
  expect_row_skipped(r, "over-range bound", 2, 7);
}

TEST(BadLog, L35ThousandsOfBadRowsAreCappedInTheListButAllCounted) {
  std::string text = kHead;
  for (int i = 0; i < 1500; ++i) text += "A1,x,1\n";
  text += "A1,10,4700\n";
  const auto r = import_beside_good("bad.csv", text);
  EXPECT_EQ(r.lot.counts.rows_skipped, 1500u);
  EXPECT_NE(find_message(r, "more skipped rows"), "");
  EXPECT_EQ(readings_of(r, "A1"), 1u);
  EXPECT_LT(r.lot.diagnostics.size(), 1100u);
}

}  // namespace
}  // namespace photolot::test
