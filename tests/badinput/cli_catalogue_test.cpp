// The command-line rows of docs/bad-input.md (C01...): photolot-cli run as a user runs it, for
// its exit code, its message on stderr, and what happens to an output file already there.
// Also checks that the catalogue and this program agree row for row.
#include <fstream>
#include <regex>
#include <set>

#include "bad_input_support.h"
#include "test_support.h"

namespace photolot::test {
namespace {

namespace fs = std::filesystem;

struct CliRun {
  int code = -1;
  std::string err;
};

// Runs photolot-cli with `args` (already shell-quoted where needed) in `dir`.
CliRun cli(const std::string& args, const fs::path& dir) {
  const int code = run_in(dir, "'" PHOTOLOT_CLI_PATH "' " + args + " >/dev/null 2>stderr.txt");
  return {code, read_file(dir / "stderr.txt")};
}

constexpr const char* kOld = "{\"an earlier\": \"results document\"}\n";

TEST(BadCli, C01MissingInputExitsOneAndLeavesTheOldOutput) {
  const fs::path dir = scratch_dir();
  std::ofstream(dir / "good.csv") << kGoodLog;
  std::ofstream(dir / "out.json") << kOld;
  const CliRun r = cli("analyze good.csv nope.csv --json out.json", dir);
  EXPECT_EQ(r.code, 1);  // app/cli/exit_codes.h: a file could not be read
  EXPECT_NE(r.err.find("nope.csv"), std::string::npos) << r.err;
  EXPECT_NE(r.err.find("no output written"), std::string::npos) << r.err;
  EXPECT_EQ(read_file(dir / "out.json"), kOld);
}

TEST(BadCli, C02BadRowsAreListedWithTheirPlaceAndTheLotIsAnalysed) {
  const fs::path dir = scratch_dir();
  std::ofstream(dir / "lot.csv") << kGoodLog << "G2,abc,1\n";
  const CliRun r = cli("analyze lot.csv --json out.json", dir);
  EXPECT_EQ(r.code, 0);
  EXPECT_NE(r.err.find("lot.csv:10:4"), std::string::npos) << r.err;
  EXPECT_NE(read_file(dir / "out.json").find("\"G2\""), std::string::npos);
}

TEST(BadCli, C03UnknownOptionExitsTwo) {
  const fs::path dir = scratch_dir();
  std::ofstream(dir / "good.csv") << kGoodLog;
  EXPECT_EQ(cli("analyze good.csv --no-such-option", dir).code, 2);
}

TEST(BadCli, C04OutputIntoAMissingFolderExitsOneNamingIt) {
  const fs::path dir = scratch_dir();
  std::ofstream(dir / "good.csv") << kGoodLog;
  const CliRun r = cli("analyze good.csv --json no/such/folder/out.json", dir);
  EXPECT_EQ(r.code, 1);
  EXPECT_NE(r.err.find("no/such/folder/out.json"), std::string::npos) << r.err;
}

TEST(BadCli, C05OutputOntoAFolderExitsOneAndTheFolderStays) {
  const fs::path dir = scratch_dir();
  std::ofstream(dir / "good.csv") << kGoodLog;
  fs::create_directory(dir / "out.json");
  const CliRun r = cli("analyze good.csv --json out.json", dir);
  EXPECT_EQ(r.code, 1);
  EXPECT_TRUE(fs::is_directory(dir / "out.json"));
}

TEST(BadInputCatalogue, EveryRowHasItsTestAndEveryTestItsRow) {
  const std::vector<std::string> rows = catalogue_ids();
  ASSERT_GE(rows.size(), 40u);
  const std::set<std::string> row_set(rows.begin(), rows.end());
  EXPECT_EQ(row_set.size(), rows.size()) << "an ID is used twice in docs/bad-input.md";
  std::set<std::string> tested;
  const auto* unit = ::testing::UnitTest::GetInstance();
  const std::regex id(R"(^([LSRCW][0-9]{2})[A-Z])");
  std::smatch m;
  for (int i = 0; i < unit->total_test_suite_count(); ++i) {
    const auto* suite = unit->GetTestSuite(i);
    for (int j = 0; j < suite->total_test_count(); ++j) {
      const std::string name = suite->GetTestInfo(j)->name();
      if (std::regex_search(name, m, id) && m[1] != "S00" && m[1] != "R00") tested.insert(m[1]);
    }
  }
  for (const auto& r : row_set) EXPECT_TRUE(tested.count(r)) << r << " has no test";
  for (const auto& t : tested) EXPECT_TRUE(row_set.count(t)) << t << " is not in the catalogue";
}

}  // namespace
}  // namespace photolot::test
