// The results-document rows of docs/bad-input.md (R01...), each through results::from_json_text
// (what the workbench's workspace reader and any automation call): a bad document is refused
// with its place (line and column for broken JSON, the member's path for a wrong member), and
// nothing half-read is returned as if it were good.
#include <algorithm>
#include <string>

#include "bad_input_support.h"
#include "photolot/fitting/fit.h"
#include "photolot/results.h"

namespace photolot::test {
namespace {

// A real document: the good log imported and fitted.
std::string good_document() {
  const ImportResult imported = import_buffers({{"good.csv", kGoodLog}});
  const LotFit fit = fitting::fit_lot(imported.lot, fitting::FitOptions{});
  return results::to_json_text(results::make_document(imported.lot, fit));
}

void expect_refused(const std::string& text, const std::string& message, std::uint32_t line = 0,
                    std::uint32_t column = 0) {
  const results::ReadResult r = results::from_json_text(text);
  ASSERT_FALSE(r.ok());
  EXPECT_NE(r.error->message.find(message), std::string::npos) << r.error->message;
  EXPECT_EQ(r.error->line, line) << r.error->message;
  if (column) {
    EXPECT_EQ(r.error->column, column) << r.error->message;
  }
}

std::string replaced(std::string s, const std::string& from, const std::string& to) {
  const auto at = s.find(from);
  EXPECT_NE(at, std::string::npos) << from;
  return at == std::string::npos ? s : s.replace(at, from.size(), to);
}

TEST(BadResults, R00TheGoodDocumentOfTheseRowsReadsBack) {
  const results::ReadResult r = results::from_json_text(good_document());
  ASSERT_TRUE(r.ok()) << r.error->message;
  EXPECT_EQ(r.doc.units.size(), 2u);
}

TEST(BadResults, R01EmptyFileIsRefusedAsNotJson) { expect_refused("", "not valid JSON", 1, 1); }

TEST(BadResults, R02TruncatedDocumentIsRefusedAtTheCut) {
  const std::string doc = good_document();
  const std::string cut = doc.substr(0, doc.size() / 2);
  const auto lines = static_cast<std::uint32_t>(std::count(cut.begin(), cut.end(), '\n')) + 1;
  expect_refused(cut, "not valid JSON", lines);
}

TEST(BadResults, R03BinaryFileIsRefusedAsNotJson) {
  expect_refused(std::string("\x89PNG\r\n\x1a\n", 8), "not valid JSON", 1, 1);
}

TEST(BadResults, R04OtherJsonIsRefusedAsNotAResultsDocument) {
  expect_refused("{\"name\": \"a package manifest\"}\n", "missing key \"format\"");
}

TEST(BadResults, R05NewerVersionIsRefusedNamingBoth) {
  expect_refused(replaced(good_document(), "\"version\": 1", "\"version\": 7"),
                 "7 was written by a newer photolot");
}

TEST(BadResults, R06Utf16DocumentIsRefused) {
  std::string text = "\xFF\xFE";
  for (char c : good_document()) text += std::string{c, '\0'};
  expect_refused(text, "not valid JSON", 1, 1);
}

TEST(BadResults, R07HugeNumberIsRefusedAtItsPlace) {
  // RFC 8259, 9: a parser may limit the range of numbers; photolot's are IEEE 754 doubles, and
  // 1e400 is beyond the largest (about 1.8e308). Found by fuzz_results (a crash until fixed).
  const std::string bad =
      replaced(good_document(), "\"rows_read\": ", "\"rows_read\": 1e400, \"x\": ");
  const std::string head = bad.substr(0, bad.find("1e400"));
  const auto line = static_cast<std::uint32_t>(std::count(head.begin(), head.end(), '\n')) + 1;
  const auto column = static_cast<std::uint32_t>(head.size() - head.rfind('\n'));
  expect_refused(bad, "number overflow parsing '1e400'", line, column);
}

TEST(BadResults, R08NanLiteralIsRefusedAsNotJson) {
  // RFC 8259, 6: "Numeric values that cannot be represented ... (such as Infinity and NaN) are
  // not permitted."
  const std::string doc = good_document();
  const std::string bad = replaced(doc, "\"lot_name\": \"good\"", "\"lot_name\": NaN");
  const std::string head = bad.substr(0, bad.find("NaN"));
  const auto line = static_cast<std::uint32_t>(std::count(head.begin(), head.end(), '\n')) + 1;
  expect_refused(bad, "not valid JSON", line);
}

TEST(BadResults, R09UnitMissingAMemberIsRefusedNamingIt) {
  expect_refused(replaced(good_document(), "\"id\":\"G1\",", ""), "units[0]");
}

TEST(BadResults, R10UnitsNotAnArrayIsRefusedNamingIt) {
  const std::string doc = good_document();
  const auto from = doc.find("\"units\": [");
  const auto to = doc.find("\n  ]", from) + 4;
  expect_refused(std::string(doc).replace(from, to - from, "\"units\": {}"), "units");
}

TEST(BadResults, R11TopLevelArrayIsRefused) { expect_refused("[1, 2, 3]\n", "not a JSON object"); }

}  // namespace
}  // namespace photolot::test
