// photolot-cli analyze --spec: verdicts and the disposition in the results document, checked
// against ISO 2859-1's tables and against the simulated demo lot's known truth.
#include <gtest/gtest.h>
#include <sys/wait.h>

#include <cmath>
#include <fstream>
#include <iterator>
#include <map>
#include <nlohmann/json.hpp>
#include <sstream>

#include "test_support.h"

namespace {

namespace fs = std::filesystem;
using Json = nlohmann::json;

using photolot::test::CliRun;
using photolot::test::slurp;

// Runs photolot-cli with args in `dir` (the current folder of the run).
CliRun run_cli(const std::vector<std::string>& args, const fs::path& dir) {
  return photolot::test::run_program(PHOTOLOT_CLI_PATH, args, dir);
}

std::string sample(const std::string& name) {
  return photolot::test::source_path("sample-data/" + name).string();
}

// The demo lot's truth file: unit id -> true R10 (ohm). Columns named in its header.
std::map<std::string, double> true_r10() {
  std::ifstream in(sample("demo-lot-truth.csv"));
  std::string line;
  std::getline(in, line);
  std::vector<std::string> header;
  {
    std::stringstream ss(line);
    for (std::string cell; std::getline(ss, cell, ',');) header.push_back(cell);
  }
  std::size_t id_col = 0, r10_col = 1;
  for (std::size_t i = 0; i < header.size(); ++i) {
    if (header[i].find("r10") != std::string::npos) r10_col = i;
    if (header[i] == "unit" || header[i] == "id") id_col = i;
  }
  std::map<std::string, double> truth;
  while (std::getline(in, line)) {
    std::vector<std::string> cells;
    std::stringstream ss(line);
    for (std::string cell; std::getline(ss, cell, ',');) cells.push_back(cell);
    if (cells.size() > std::max(id_col, r10_col)) truth[cells[id_col]] = std::stod(cells[r10_col]);
  }
  return truth;
}

}  // namespace

TEST(CliAcceptance, JudgesTheDemoLotAgainstTheDemoSpec) {
  const auto dir = photolot::test::scratch_dir();
  const CliRun r = run_cli({"analyze", sample("demo-lot.csv"), "--spec", sample("demo-spec.toml"),
                            "--json", "out.json", "--quiet"},
                           dir);
  ASSERT_EQ(r.code, 0) << r.err;
  const Json doc = Json::parse(slurp(dir / "out.json"));
  const Json& a = doc.at("acceptance");
  // ISO 2859-1: lot 500 (the spec's), level II -> H, n 50; AQL 2.5 at H -> Ac 3, Re 4.
  EXPECT_EQ(a.at("lot_size"), 500);
  EXPECT_EQ(a.at("code_letter"), "H");
  EXPECT_EQ(a.at("sample_size"), 50);
  EXPECT_EQ(a.at("accept_number"), 3);
  EXPECT_EQ(a.at("reject_number"), 4);
  EXPECT_EQ(a.at("measured"), 60);
  // The disposition follows the single-sampling rule from the count of nonconforming units.
  const int d = a.at("nonconforming");
  EXPECT_EQ(a.at("disposition"), d <= 3 ? "accept" : "reject");
  EXPECT_GT(d, 0) << "the demo spec is meant to fail a few units";

  // Units whose true R10 (the simulation's truth) lies more than 10 % outside the window must
  // be nonconforming, and ones more than 10 % inside every R10 limit must not fail on R10.
  const auto truth = true_r10();
  ASSERT_EQ(truth.size(), 60u);
  for (const auto& v : doc.at("units")) {
    const double t = truth.at(v.at("id").get<std::string>());
    bool fails_r10 = false;
    for (const auto& reason : v.at("reasons")) fails_r10 |= reason.at("characteristic") == "r10";
    if (t < 15e3 / 1.1 || t > 27e3 * 1.1) {
      EXPECT_TRUE(fails_r10) << v.dump();
    }
    if (t > 15e3 * 1.1 && t < 27e3 / 1.1) {
      EXPECT_FALSE(fails_r10) << v.dump();
    }
  }
  std::size_t judged = 0;
  for (const auto& u : doc.at("units")) judged += u.contains("verdict");
  EXPECT_EQ(judged, 60u);
  EXPECT_TRUE(doc.at("lot_statistics").at("r10_ohm").contains("capability"));
  EXPECT_NE(r.out.find("disposition (recommendation)"), std::string::npos) << r.out;
}

TEST(CliAcceptance, LotSizeOnTheCommandLineOverridesTheSpec) {
  const auto dir = photolot::test::scratch_dir();
  const CliRun r = run_cli({"analyze", sample("demo-lot.csv"), "--spec", sample("demo-spec.toml"),
                            "--lot-size", "1000", "--json", "out.json", "--quiet"},
                           dir);
  ASSERT_EQ(r.code, 0) << r.err;
  const Json a = Json::parse(slurp(dir / "out.json")).at("acceptance");
  // ISO 2859-1: lot 1000, level II -> J, n 80; AQL 2.5 at J -> Ac 5, Re 6.
  EXPECT_EQ(a.at("code_letter"), "J");
  EXPECT_EQ(a.at("sample_size"), 80);
  EXPECT_EQ(a.at("accept_number"), 5);
  // 60 of the 80 needed: undecided unless Re is already reached.
  const int d = a.at("nonconforming");
  EXPECT_EQ(a.at("disposition"), d >= 6 ? "reject" : "undecided");
}

TEST(CliAcceptance, ABadSpecStopsBeforeAnyOutputWithItsLine) {
  const auto dir = photolot::test::scratch_dir();
  std::ofstream(dir / "bad.toml") << "[part]\nnumber = \"X\"\n[limits]\ngamma_min = 0.9\n"
                                     "gamma_max = 0.8\n[inspection]\naql = 1.0\n";
  const CliRun r =
      run_cli({"analyze", sample("demo-lot.csv"), "--spec", "bad.toml", "--json", "out.json"}, dir);
  EXPECT_EQ(r.code, 1);
  EXPECT_NE(r.err.find("bad.toml:4:13: error: limits.gamma_min = 0.9 is above"), std::string::npos)
      << r.err;
  EXPECT_FALSE(fs::exists(dir / "out.json"));
}

TEST(CliAcceptance, LotSizeWithoutASpecIsAUsageError) {
  const auto dir = photolot::test::scratch_dir();
  const CliRun r = run_cli({"analyze", sample("demo-lot.csv"), "--lot-size", "500"}, dir);
  EXPECT_EQ(r.code, 2);
  EXPECT_NE(r.err.find("--lot-size needs --spec"), std::string::npos) << r.err;
}
