// The spec file: what loads, and a clear error with line and column for each kind of mistake.
#include "photolot/spec.h"

#include <gtest/gtest.h>

#include <string>

#include "test_support.h"

using photolot::InspectionLevel;
using photolot::InspectionMode;
using photolot::parse_spec;
using photolot::SpecLoadResult;

namespace {

const char* kGood = R"(# a spec
[part]
number = "CELL-7"
description = "test cell"

[limits]
r10_min_ohm = "15k"
r10_max_ohm = 27000
gamma_min = 0.65
gamma_max = 0.85
dark_min_ohm = "1.5M"
max_rms_log_residual = 0.05

[conditions]
reference_lux = 10
dark_dwell_s = 10
temp_c = 25

[inspection]
level = "III"
aql = 0.65
lot_size = 500

[tolerance_interval]
coverage = 0.95
confidence = 0.9

[temperature]
coefficient_pct_per_c = -0.3
)";

// The base spec with one line replaced (1-based), to make each mistake in a known place.
std::string with_line(int line, const std::string& text) {
  std::string s = kGood, out;
  int n = 1;
  std::size_t start = 0;
  while (start <= s.size()) {
    std::size_t end = s.find('\n', start);
    if (end == std::string::npos) end = s.size();
    out += (n == line ? text : s.substr(start, end - start));
    if (end < s.size()) out += '\n';
    start = end + 1;
    ++n;
  }
  return out;
}

// The single error of a result; fails the test when there is not exactly one.
photolot::SpecError only_error(const SpecLoadResult& r) {
  EXPECT_FALSE(r.ok());
  EXPECT_EQ(r.errors.size(), 1u);
  if (r.errors.size() != 1)
    for (const auto& e : r.errors) ADD_FAILURE() << "seen: " << photolot::to_string(e);
  return r.errors.empty() ? photolot::SpecError{} : r.errors.front();
}

bool contains(const std::string& s, const std::string& part) {
  return s.find(part) != std::string::npos;
}

}  // namespace

TEST(SpecFile, LoadsEveryFieldWithSiPrefixes) {
  const auto r = parse_spec(kGood, "good.toml");
  ASSERT_TRUE(r.ok()) << (r.errors.empty() ? "" : photolot::to_string(r.errors[0]));
  const auto& s = *r.spec;
  EXPECT_EQ(s.part_number, "CELL-7");
  EXPECT_EQ(s.description, "test cell");
  EXPECT_DOUBLE_EQ(s.r10_ohm.min, 15e3);
  EXPECT_DOUBLE_EQ(s.r10_ohm.max, 27e3);
  EXPECT_DOUBLE_EQ(s.gamma.min, 0.65);
  EXPECT_DOUBLE_EQ(s.gamma.max, 0.85);
  EXPECT_DOUBLE_EQ(s.dark_min_ohm, 1.5e6);
  EXPECT_DOUBLE_EQ(s.max_rms_log_residual, 0.05);
  EXPECT_EQ(s.inspection.level, InspectionLevel::level_iii);
  EXPECT_EQ(s.inspection.mode, InspectionMode::sampling);
  EXPECT_DOUBLE_EQ(s.inspection.aql_pct, 0.65);
  EXPECT_EQ(s.inspection.lot_size, 500u);
  EXPECT_DOUBLE_EQ(s.tolerance_coverage, 0.95);
  EXPECT_DOUBLE_EQ(s.tolerance_confidence, 0.9);
  EXPECT_DOUBLE_EQ(s.temp_coeff_pct_per_c, -0.3);
  EXPECT_EQ(s.validate(), "");
}

TEST(SpecFile, TheDemoSpecLoads) {
  const auto r = photolot::load_spec(photolot::test::source_path("sample-data/demo-spec.toml"));
  ASSERT_TRUE(r.ok()) << (r.errors.empty() ? "" : photolot::to_string(r.errors[0]));
  EXPECT_TRUE(r.spec->r10_ohm.has_min() && r.spec->r10_ohm.has_max());
}

TEST(SpecFile, UnknownKeyIsAnErrorNamingKeyAndLine) {
  const auto e = only_error(parse_spec(with_line(10, "gama_max = 0.85"), "s.toml"));
  EXPECT_EQ(e.file, "s.toml");
  EXPECT_EQ(e.line, 10u);
  EXPECT_EQ(e.column, 1u);
  EXPECT_TRUE(contains(e.message, "unknown key 'gama_max' in [limits]")) << e.message;
}

TEST(SpecFile, UnknownTableIsAnError) {
  const auto r = parse_spec(std::string(kGood) + "\n[extras]\nx = 1\n", "s.toml");
  const auto e = only_error(r);
  EXPECT_EQ(e.line, 31u);  // the [extras] header
  EXPECT_TRUE(contains(e.message, "'extras'")) << e.message;
}

TEST(SpecFile, WrongTypeIsAnErrorAtTheValue) {
  const auto e = only_error(parse_spec(with_line(9, "gamma_min = \"low\""), "s.toml"));
  EXPECT_EQ(e.line, 9u);
  EXPECT_EQ(e.column, 13u);
  EXPECT_TRUE(contains(e.message, "limits.gamma_min must be a number, found a string"))
      << e.message;
}

TEST(SpecFile, ResistanceTextThatIsNotAResistanceIsAnError) {
  const auto e = only_error(parse_spec(with_line(7, "r10_min_ohm = \"15q\""), "s.toml"));
  EXPECT_EQ(e.line, 7u);
  EXPECT_TRUE(contains(e.message, "\"15q\" is not a resistance")) << e.message;
}

TEST(SpecFile, MinAboveMaxIsAnErrorNamingBothLimits) {
  const auto e = only_error(parse_spec(with_line(7, "r10_min_ohm = \"30k\""), "s.toml"));
  EXPECT_EQ(e.line, 7u);
  EXPECT_TRUE(contains(e.message,
                       "limits.r10_min_ohm = 30000 ohm is above limits.r10_max_ohm = "
                       "27000 ohm"))
      << e.message;
  const auto g = only_error(parse_spec(with_line(9, "gamma_min = 0.9"), "s.toml"));
  EXPECT_EQ(g.line, 9u);
  EXPECT_TRUE(contains(g.message, "gamma_min = 0.9 is above limits.gamma_max = 0.85"));
}

TEST(SpecFile, MissingRequiredTableIsAnError) {
  std::string s = kGood;
  s.replace(s.find("[inspection]"), 12, "[inspectio]");
  const auto r = parse_spec(s, "s.toml");
  ASSERT_EQ(r.errors.size(), 2u);  // the misspelt table is unknown, and [inspection] is missing
  EXPECT_EQ(r.errors[0].line, 19u);
  EXPECT_TRUE(contains(r.errors[0].message, "unknown table or key 'inspectio'"));
  EXPECT_TRUE(contains(r.errors[1].message, "missing required table [inspection]"));
  EXPECT_FALSE(r.spec.has_value());
}

TEST(SpecFile, MalformedTomlIsAnErrorWithLineAndColumn) {
  const auto e = only_error(parse_spec(with_line(8, "r10_max_ohm = = 27000"), "s.toml"));
  EXPECT_EQ(e.line, 8u);
  EXPECT_GT(e.column, 0u);
  EXPECT_TRUE(contains(e.message, "not valid TOML")) << e.message;
}

TEST(SpecFile, AqlNotInTheTableIsAnError) {
  const auto e = only_error(parse_spec(with_line(21, "aql = 0.5"), "s.toml"));
  EXPECT_EQ(e.line, 21u);
  EXPECT_TRUE(contains(e.message, "inspection.aql = 0.5 is not an AQL column")) << e.message;
  EXPECT_TRUE(contains(e.message, "0.65")) << e.message;  // lists the ones known
}

TEST(SpecFile, BadInspectionLevelIsAnError) {
  const auto e = only_error(parse_spec(with_line(20, "level = \"IV\""), "s.toml"));
  EXPECT_EQ(e.line, 20u);
  EXPECT_TRUE(contains(e.message, "inspection.level = \"IV\"")) << e.message;
}

TEST(SpecFile, FullInspectionNeedsNoAql) {
  std::string s = with_line(21, "mode = \"100%\"");
  const auto r = parse_spec(s, "s.toml");
  ASSERT_TRUE(r.ok()) << (r.errors.empty() ? "" : photolot::to_string(r.errors[0]));
  EXPECT_EQ(r.spec->inspection.mode, InspectionMode::full);
}

// A lot size written as a float is refused by type, however large (20e51 is beyond any
// integer type; reading it as one was undefined behaviour, found by fuzzing).
TEST(SpecFile, LotSizeWrittenAsAFloatIsRefusedAtItsLine) {
  for (const char* value : {"20e51", "500.0"}) {
    std::string s = kGood;
    s.replace(s.find("lot_size = 500"), 14, std::string("lot_size = ") + value);
    const auto r = parse_spec(s, "s.toml");
    ASSERT_EQ(r.errors.size(), 1u) << value;
    EXPECT_EQ(r.errors[0].line, 22u);
    EXPECT_EQ(r.errors[0].message,
              "inspection.lot_size must be a whole number, found a decimal number")
        << value;
  }
}

TEST(SpecFile, CollectsEveryErrorNotOnlyTheFirst) {
  std::string s = with_line(9, "gamma_min = \"low\"");
  s = std::string(s).replace(s.find("lot_size = 500"), 14, "lot_size = 0");
  const auto r = parse_spec(s, "s.toml");
  ASSERT_EQ(r.errors.size(), 2u);
  EXPECT_EQ(r.errors[0].line, 9u);
  EXPECT_EQ(r.errors[1].line, 22u);
}

TEST(SpecFile, MissingFileIsAnError) {
  const auto r = photolot::load_spec("no-such-spec.toml");
  ASSERT_EQ(r.errors.size(), 1u);
  EXPECT_EQ(r.errors[0].file, "no-such-spec.toml");
}

TEST(SpecValidate, NamesTheFieldAndTheRule) {
  photolot::Spec s;
  s.part_number = "X";
  s.gamma = {0.9, 0.8};
  EXPECT_EQ(s.validate(), "gamma.min = 0.9 must not be above gamma.max = 0.8");
  s.gamma = {};
  EXPECT_TRUE(contains(s.validate(), "no limit is set"));
}

TEST(SpecFile, ReadsResistancesWithSiPrefixesAndUnits) {
  // SI prefixes (BIPM, The International System of Units, 9th edition): k = 1e3, M = 1e6;
  // IEC 60062 letter code: 4K7 = 4.7 kohm.
  struct Case {
    const char* text;
    double ohm;
  };
  const Case cases[] = {{"\"15k\"", 15e3},       {"\"1.5M\"", 1.5e6},
                        {"\"220 kohm\"", 220e3}, {"\"4.7 M\u03a9\"", 4.7e6},
                        {"\"12K\"", 12e3},       {"2.2e4", 2.2e4},
                        {"\"680\"", 680.0},      {"\"4k7\"", 4.7e3} /* IEC 60062 letter code */,
                        {"\"680 ohm\"", 680.0}};
  for (const auto& c : cases) {
    const auto r = parse_spec(with_line(11, std::string("dark_min_ohm = ") + c.text), "s.toml");
    ASSERT_TRUE(r.ok()) << c.text << ": " << (r.errors.empty() ? "" : r.errors[0].message);
    EXPECT_DOUBLE_EQ(r.spec->dark_min_ohm, c.ohm) << c.text;
  }
}
