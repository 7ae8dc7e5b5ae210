// The unit table: RFC 4180 quoting and OWASP's CSV-injection guidance (prefix a single quote to
// a text cell starting with =, +, -, @, tab or carriage return), numbers left as numbers.
#include <gtest/gtest.h>

#include "photolot/results.h"

namespace photolot::results {
namespace {

// A minimal RFC 4180 reader for the checks: fields of one record, quotes undone.
std::vector<std::vector<std::string>> parse_csv(const std::string& text) {
  std::vector<std::vector<std::string>> rows(1);
  std::string field;
  bool quoted = false, in_quotes = false;
  for (std::size_t i = 0; i < text.size(); ++i) {
    char c = text[i];
    if (in_quotes) {
      if (c == '"' && i + 1 < text.size() && text[i + 1] == '"') {
        field += '"';
        ++i;
      } else if (c == '"') {
        in_quotes = false;
      } else {
        field += c;
      }
    } else if (c == '"' && field.empty() && !quoted) {
      in_quotes = quoted = true;
    } else if (c == ',') {
      rows.back().push_back(field);
      field.clear();
      quoted = false;
    } else if (c == '\n') {
      rows.back().push_back(field);
      field.clear();
      quoted = false;
      rows.emplace_back();
    } else {
      field += c;
    }
  }
  if (rows.back().empty()) rows.pop_back();
  return rows;
}

TEST(UnitsCsv, NeutralisesTextCellsASpreadsheetWouldRunAsFormulas) {
  // OWASP "CSV Injection": the six leading characters to neutralise.
  EXPECT_EQ(csv_text_cell("=1+2"), "'=1+2");
  EXPECT_EQ(csv_text_cell("+SUM(A1)"), "'+SUM(A1)");
  EXPECT_EQ(csv_text_cell("-2+3"), "'-2+3");
  EXPECT_EQ(csv_text_cell("@cmd"), "'@cmd");
  EXPECT_EQ(csv_text_cell("\tx"), "'\tx");
  EXPECT_EQ(csv_text_cell("\rx"), "\"'\rx\"");  // neutralised, then quoted for the CR (RFC 4180)
  EXPECT_EQ(csv_text_cell("U0001"), "U0001");
  EXPECT_EQ(csv_text_cell("a=b"), "a=b");  // only the first character matters
}

TEST(UnitsCsv, QuotesCellsHoldingCommasQuotesAndLineBreaks) {
  // RFC 4180, section 2, rules 6 and 7.
  EXPECT_EQ(csv_text_cell("a,b"), "\"a,b\"");
  EXPECT_EQ(csv_text_cell("say \"hi\""), "\"say \"\"hi\"\"\"");
  EXPECT_EQ(csv_text_cell("two\nlines"), "\"two\nlines\"");
  EXPECT_EQ(csv_text_cell("=HYPERLINK(\"x\",\"y\")"), "\"'=HYPERLINK(\"\"x\"\",\"\"y\"\")\"");
}

TEST(UnitsCsv, LeavesNegativeNumbersAsNumbersAndNaNEmpty) {
  EXPECT_EQ(csv_number_cell(-0.5), "-0.5");
  EXPECT_EQ(csv_number_cell(18700), "18700");
  EXPECT_EQ(csv_number_cell(kNaN), "");
  EXPECT_EQ(csv_number_cell(std::numeric_limits<double>::infinity()), "");
}

TEST(UnitsCsv, WritesOneRowPerUnitUnderTheHeader) {
  UnitFit fitted;
  fitted.id = "=evil()";
  fitted.status = FitStatus::fitted;
  fitted.message = "converged, 5 iterations";
  fitted.r10_ohm = 18700;
  fitted.gamma = -0.5;  // not physical; shows a negative number is not neutralised
  fitted.r10_ci95_ohm = {18000, 19400};
  fitted.points = 10;
  fitted.flags = {"outlier-points", "censored"};
  UnitFit skipped;
  skipped.id = "U2";
  skipped.status = FitStatus::too_few_levels;
  skipped.message = "2 levels, 3 needed";

  auto rows = parse_csv(units_csv({fitted, skipped}));
  ASSERT_EQ(rows.size(), 3u);
  auto columns = units_csv_columns();
  ASSERT_EQ(rows[0].size(), columns.size());
  for (std::size_t i = 0; i < columns.size(); ++i) EXPECT_EQ(rows[0][i], columns[i]);
  auto col = [&](std::string_view name) {
    for (std::size_t i = 0; i < columns.size(); ++i)
      if (columns[i] == name) return i;
    ADD_FAILURE() << "no column " << name;
    return std::size_t{0};
  };
  ASSERT_EQ(rows[1].size(), columns.size());
  ASSERT_EQ(rows[2].size(), columns.size());
  EXPECT_EQ(rows[1][col("id")], "'=evil()");
  EXPECT_EQ(rows[1][col("status")], "fitted");
  EXPECT_EQ(rows[1][col("message")], "converged, 5 iterations");
  EXPECT_EQ(rows[1][col("r10_ohm")], "18700");
  EXPECT_EQ(rows[1][col("gamma")], "-0.5");
  EXPECT_EQ(rows[1][col("r10_ci95_lo_ohm")], "18000");
  EXPECT_EQ(rows[1][col("points")], "10");
  EXPECT_EQ(rows[1][col("flags")], "outlier-points censored");
  EXPECT_EQ(rows[2][col("status")], "too_few_levels");
  EXPECT_EQ(rows[2][col("r10_ohm")], "");
  EXPECT_EQ(rows[2][col("gamma_ci95_hi")], "");
}

}  // namespace
}  // namespace photolot::results
