// The spec rows of docs/bad-input.md (S01...), each through load_spec on a file: the user sees
// every problem with file, line and column, and a spec with any problem is never used (the
// analysis is not judged against half a spec).
#include <filesystem>
#include <string>

#include "bad_input_support.h"
#include "photolot/spec.h"
#include "test_support.h"

namespace photolot::test {
namespace {

constexpr const char* kGood =
    "[part]\nnumber = \"INV-1\"\n"
    "[limits]\nr10_min_ohm = \"15k\"\nr10_max_ohm = \"27k\"\ngamma_min = 0.6\ngamma_max = 0.9\n"
    "[inspection]\nmode = \"sampling\"\nlevel = \"II\"\naql = 1.0\n";

SpecLoadResult load(const std::string& content) {
  return load_spec(write_scratch_file("spec.toml", content).string());
}

// Refused: no spec, an error containing `text` at line:column (0:0 for the whole file).
void expect_refused(const SpecLoadResult& r, const std::string& text, std::uint32_t line,
                    std::uint32_t column = 0) {
  EXPECT_FALSE(r.spec.has_value());
  ASSERT_FALSE(r.errors.empty());
  bool found = false;
  for (const auto& e : r.errors) {
    if (e.message.find(text) == std::string::npos) continue;
    found = true;
    EXPECT_NE(e.file.find("spec.toml"), std::string::npos);
    EXPECT_EQ(e.line, line) << to_string(e);
    if (column) {
      EXPECT_EQ(e.column, column) << to_string(e);
    }
  }
  EXPECT_TRUE(found) << "no error containing '" << text << "'; first: " << to_string(r.errors[0]);
}

std::string with_limit(const std::string& line) {
  std::string s = kGood;
  return s.replace(s.find("gamma_min"), 0, line + "\n");
}

TEST(BadSpec, S00TheGoodSpecOfTheseRowsLoads) { EXPECT_TRUE(load(kGood).ok()); }

TEST(BadSpec, S01EmptyFileIsRefusedAsMissingThePart) {
  expect_refused(load(""), "missing required table [part]", 0);
}

TEST(BadSpec, S02BinaryFileIsRefusedAsNotToml) {
  expect_refused(load(std::string("\x7f"
                                  "ELF\x02\x01\x01\0\0",
                                  9)),
                 "not valid TOML", 1);
}

TEST(BadSpec, S03TruncatedFileIsRefusedAtTheCut) {
  const std::string cut = std::string(kGood).substr(0, std::string(kGood).find("INV-1") + 3);
  expect_refused(load(cut), "not valid TOML", 2);
}

TEST(BadSpec, S04LimitsTheWrongWayRoundNameBothFields) {
  std::string s = kGood;
  s.replace(s.find("gamma_max = 0.9"), 15, "gamma_max = 0.5");
  expect_refused(load(s), "gamma_min", 6);
}

TEST(BadSpec, S05HugeNumberIsRefused) {
  // TOML 1.0 floats are IEEE 754 binary64; 1e400 cannot be one.
  expect_refused(load(with_limit("dark_min_ohm = 1e400")), "", 6);
}

TEST(BadSpec, S06NanIsRefusedAsNotFinite) {
  // TOML 1.0 allows nan and inf as float values; a limit must be a finite number.
  expect_refused(load(with_limit("max_rms_log_residual = nan")), "must be a finite number", 6);
}

TEST(BadSpec, S07InfinityIsRefusedAsNotFinite) {
  expect_refused(load(with_limit("dark_min_ohm = inf")), "must be a finite number", 6);
}

TEST(BadSpec, S08NegativeResistanceIsRefused) {
  std::string s = kGood;
  s.replace(s.find("\"15k\""), 5, "-15000");
  expect_refused(load(s), "must be above 0", 4);
}

TEST(BadSpec, S09UnknownInspectionLevelIsRefused) {
  // ISO 2859-1 Table I has general levels I, II and III only.
  std::string s = kGood;
  s.replace(s.find("\"II\""), 4, "\"IV\"");
  expect_refused(load(s), "level", 10);
}

TEST(BadSpec, S10AqlOutsideThePreferredSeriesIsRefused) {
  // ISO 2859-1's tables give AQLs in a preferred series (..., 2.5, 4.0, ...); 3 is not one.
  std::string s = kGood;
  s.replace(s.find("aql = 1.0"), 9, "aql = 3.0");
  expect_refused(load(s), "aql", 11);
}

TEST(BadSpec, S11MisspelledKeyIsRefusedNamingTheKnownOnes) {
  expect_refused(load(with_limit("gama_max = 0.9")), "unknown key 'gama_max'", 6, 1);
}

TEST(BadSpec, S12Utf16FileIsRefused) {
  std::string text = "\xFF\xFE";
  for (char c : std::string(kGood)) text += std::string{c, '\0'};
  const auto r = load(text);
  EXPECT_FALSE(r.spec.has_value());
  ASSERT_FALSE(r.errors.empty());
}

TEST(BadSpec, S13Latin1TextIsRefusedAsNotUtf8) {
  // TOML 1.0: "A TOML file must be a valid UTF-8 encoded Unicode document."
  std::string s = kGood;
  s.replace(s.find("INV-1"), 5,
            "INV-1 25\xB0"
            "C");
  expect_refused(load(s), "not valid TOML", 2);
}

TEST(BadSpec, S14FileOverTheSizeLimitIsRefusedUnread) {
  const auto path = write_scratch_file("spec.toml", kGood);
  std::filesystem::resize_file(path, std::uint64_t{1} << 30);  // sparse: fast
  expect_refused(load_spec(path.string()), "over the 1048576 a spec may have", 0);
}

TEST(BadSpec, S15MissingFileIsNamed) {
  const auto dir = scratch_dir();
  expect_refused(load_spec((dir / "spec.toml").string()), "cannot open", 0);
}

TEST(BadSpec, S17PipeGivenAsTheSpecIsRefusedAtOnce) {
  const auto pipe = scratch_dir() / "spec.toml";
  std::filesystem::remove(pipe);  // from an earlier run
  ASSERT_EQ(::mkfifo(pipe.c_str(), 0600), 0);
  expect_refused(load_spec(pipe.string()), "not a regular file (a device or a pipe)", 0);
}

TEST(BadSpec, S16WrongTypeIsRefusedNamingTheTypeFound) {
  expect_refused(load(with_limit("dark_min_ohm = true")), "found a boolean", 6);
}

}  // namespace
}  // namespace photolot::test
