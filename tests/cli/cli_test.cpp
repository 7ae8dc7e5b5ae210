// photolot-cli driven as a user drives it: exit codes, messages, the files it writes, and the
// numbers that come out of the whole path (import, fit, results document) checked against
// outside answers (a simulated lot's known truth; GSL's least squares).
#include <gsl/gsl_cdf.h>
#include <gsl/gsl_fit.h>
#include <gtest/gtest.h>
#include <sys/wait.h>

#include <cmath>
#include <fstream>
#include <iterator>
#include <nlohmann/json.hpp>
#include <regex>
#include <set>
#include <sstream>

#include "test_support.h"

namespace photolot {
namespace {

using Json = nlohmann::json;
namespace fs = std::filesystem;

using photolot::test::CliRun;
using photolot::test::slurp;

// Runs photolot-cli with args in `dir` (the current folder of the run).
CliRun run_cli(const std::vector<std::string>& args, const fs::path& dir) {
  return photolot::test::run_program(PHOTOLOT_CLI_PATH, args, dir);
}

std::string sample(const std::string& name) {
  return test::source_path("sample-data/" + name).string();
}

// Distinct values of the first column of a CSV file (after its header): the unit ids.
std::set<std::string> first_column(const std::string& path, char sep) {
  std::ifstream in(path);
  std::string line;
  std::getline(in, line);
  std::set<std::string> ids;
  while (std::getline(in, line))
    if (!line.empty()) ids.insert(line.substr(0, line.find(sep)));
  return ids;
}

TEST(Cli, PrintsItsVersion) {
  auto dir = test::scratch_dir();
  CliRun r = run_cli({"--version"}, dir);
  EXPECT_EQ(r.code, 0);
  EXPECT_NE(r.out.find(PHOTOLOT_VERSION), std::string::npos) << r.out;
}

TEST(Cli, ExitsWithTwoOnABadOptionOrNoCommand) {
  auto dir = test::scratch_dir();
  EXPECT_EQ(run_cli({"analyze", "--no-such-option", sample("demo-lot.csv")}, dir).code, 2);
  EXPECT_EQ(run_cli({}, dir).code, 2);
  EXPECT_EQ(run_cli({"analyze"}, dir).code, 2);  // no file
  EXPECT_EQ(run_cli({"analyze", "--loss", "square", sample("demo-lot.csv")}, dir).code, 2);
  CliRun bad = run_cli(
      {"analyze", "--meter-accuracy", "-1", sample("demo-lot.csv"), "--json", "x.json"}, dir);
  EXPECT_EQ(bad.code, 2);
  EXPECT_NE(bad.err.find("meter_accuracy_pct"), std::string::npos) << bad.err;
  EXPECT_FALSE(fs::exists(dir / "x.json"));
  EXPECT_EQ(run_cli({"simulate", "--units", "0", "--out", "s.csv"}, dir).code, 2);
}

TEST(Cli, ShowsHelpWithExitCodeZero) {
  auto dir = test::scratch_dir();
  CliRun r = run_cli({"analyze", "--help"}, dir);
  EXPECT_EQ(r.code, 0);
  EXPECT_NE(r.out.find("--units-csv"), std::string::npos);
}

// A file that cannot be read at all is an input error: exit 1, and no output file appears
// even when the other files are good.
void expect_input_error(const fs::path& dir, const std::string& bad_file) {
  CliRun r = run_cli({"analyze", sample("demo-lot.csv"), bad_file, "--json", "out.json",
                      "--units-csv", "units.csv"},
                     dir);
  EXPECT_EQ(r.code, 1) << r.err;
  EXPECT_NE(r.err.find(fs::path(bad_file).filename().string()), std::string::npos) << r.err;
  EXPECT_FALSE(fs::exists(dir / "out.json"));
  EXPECT_FALSE(fs::exists(dir / "units.csv"));
}

TEST(Cli, ExitsWithOneOnAMissingFileAndWritesNothing) {
  auto dir = test::scratch_dir();
  expect_input_error(dir, (dir / "no-such-log.csv").string());
}

TEST(Cli, ExitsWithOneOnAnEmptyFileAndWritesNothing) {
  auto dir = test::scratch_dir();
  expect_input_error(dir, test::write_scratch_file("empty.csv", "").string());
}

TEST(Cli, ExitsWithOneOnABinaryFileAndWritesNothing) {
  auto dir = test::scratch_dir();
  std::string bytes("\x89PNG\r\n\x1a\n\0\0\0\rIHDR\0\0\x01\0", 20);
  expect_input_error(dir, test::write_scratch_file("photo.csv", bytes).string());
}

TEST(Cli, AnalysesTheSampleLot) {
  auto dir = test::scratch_dir();
  CliRun r = run_cli(
      {"analyze", sample("demo-lot.csv"), "--json", "out.json", "--units-csv", "units.csv"}, dir);
  ASSERT_EQ(r.code, 0) << r.err;
  auto ids = first_column(sample("demo-lot.csv"), ',');
  Json j = Json::parse(slurp(dir / "out.json"));
  EXPECT_EQ(j["units"].size(), ids.size());
  EXPECT_EQ(j["fit"]["units"], ids.size());
  // The table has one line per unit, and the counts line says how many units there were.
  for (const auto& id : ids) EXPECT_NE(r.out.find("\n" + id + " "), std::string::npos) << id;
  EXPECT_NE(r.out.find(std::to_string(ids.size()) + " units"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("results document: out.json"), std::string::npos);
  // The unit table: a header and one row per unit.
  std::string csv = slurp(dir / "units.csv");
  EXPECT_EQ(std::count(csv.begin(), csv.end(), '\n'), static_cast<long>(ids.size() + 1));
  // The input is fingerprinted by its size.
  EXPECT_EQ(j["inputs"]["files"][0]["size_bytes"], fs::file_size(sample("demo-lot.csv")));
}

TEST(Cli, MergesTheSecondSessionIntoTheSameUnits) {
  auto dir = test::scratch_dir();
  CliRun one = run_cli({"analyze", sample("demo-lot.csv"), "--json", "one.json"}, dir);
  CliRun both = run_cli(
      {"analyze", sample("demo-lot.csv"), sample("demo-lot-session2.csv"), "--json", "both.json"},
      dir);
  ASSERT_EQ(both.code, 0) << both.err;
  Json a = Json::parse(slurp(dir / "one.json")), b = Json::parse(slurp(dir / "both.json"));
  EXPECT_EQ(a["units"].size(), b["units"].size());  // the session's units are already in the lot
  std::size_t second_rows = 0;
  {
    std::ifstream in(sample("demo-lot-session2.csv"));
    std::string line;
    std::getline(in, line);
    while (std::getline(in, line)) second_rows += !line.empty();
  }
  EXPECT_EQ(b["import"]["rows_used"].get<std::size_t>(),
            a["import"]["rows_used"].get<std::size_t>() + second_rows);
}

TEST(Cli, ReportsSkippedRowsWithFileLineAndColumn) {
  auto dir = test::scratch_dir();
  std::string log = "unit,lux,ohm\n";
  for (double lux : {1, 10, 100, 1000}) log += "A1," + std::to_string(lux) + ",2000\n";
  log += "A1,50,twelve\n";  // line 6: no resistance
  for (double lux : {1, 10, 100, 1000}) log += "A2," + std::to_string(lux) + ",3000\n";
  auto path = test::write_scratch_file("bench.csv", log);
  CliRun r = run_cli({"analyze", path.string(), "--json", "out.json"}, dir);
  EXPECT_EQ(r.code, 0) << r.err;  // a bad row never sinks the lot
  EXPECT_TRUE(std::regex_search(r.err, std::regex("bench\\.csv:6:[1-9][0-9]*: "))) << r.err;
  Json j = Json::parse(slurp(dir / "out.json"));
  EXPECT_EQ(j["import"]["rows_skipped"], 1);
  EXPECT_EQ(j["units"].size(), 2u);
  bool placed = false;
  for (const auto& d : j["diagnostics"]) placed = placed || (d["line"] == 6 && d["column"] > 0);
  EXPECT_TRUE(placed) << j["diagnostics"];
}

TEST(Cli, CapsTheMessagesShownAndSaysHowManyMore) {
  auto dir = test::scratch_dir();
  std::string log = "unit,lux,ohm\n";
  for (double lux : {1, 10, 100, 1000}) log += "A1," + std::to_string(lux) + ",2000\n";
  for (int i = 0; i < 30; ++i) log += "A1,5,x" + std::to_string(i) + "\n";
  auto path = test::write_scratch_file("noisy.csv", log);
  CliRun r = run_cli({"analyze", path.string(), "--max-messages", "5"}, dir);
  EXPECT_EQ(r.code, 0);
  std::size_t placed = 0;
  std::istringstream lines(r.err);
  for (std::string line; std::getline(lines, line);)
    placed += line.rfind(path.string() + ":", 0) == 0;
  EXPECT_EQ(placed, 5u) << r.err;
  EXPECT_NE(r.err.find("and 25 more"), std::string::npos) << r.err;
}

TEST(Cli, RecoversTheKnownTruthOfASimulatedLot) {
  // 40 units, 0.5 % reading noise, 10 levels over three decades: each unit's R10 and gamma
  // should come back within a few standard errors (ln R10 to about 0.3 %, gamma to about
  // 0.003), and the 95 % intervals should hold the truth for about 95 % of the units.
  auto dir = test::scratch_dir();
  CliRun sim = run_cli({"simulate", "--units", "40", "--seed", "11", "--noise", "0.5", "--out",
                        "lot.csv", "--truth", "truth.csv"},
                       dir);
  ASSERT_EQ(sim.code, 0) << sim.err;
  CliRun r = run_cli({"analyze", "lot.csv", "--json", "out.json", "--quiet"}, dir);
  ASSERT_EQ(r.code, 0) << r.err;
  Json j = Json::parse(slurp(dir / "out.json"));
  std::ifstream truth(dir / "truth.csv");
  std::string line;
  std::getline(truth, line);
  std::size_t i = 0, gamma_inside = 0, r10_inside = 0;
  while (std::getline(truth, line)) {
    std::istringstream row(line);
    std::string id, r10, gamma;
    std::getline(row, id, ',');
    std::getline(row, r10, ',');
    std::getline(row, gamma, ',');
    const Json& u = j["units"][i++];
    ASSERT_EQ(u["id"], id);
    ASSERT_EQ(u["status"], "fitted") << u["message"];
    double true_r10 = std::stod(r10), true_gamma = std::stod(gamma);
    EXPECT_NEAR(std::log(u["r10_ohm"].get<double>() / true_r10), 0.0, 0.01) << id;
    EXPECT_NEAR(u["gamma"].get<double>(), true_gamma, 0.01) << id;
    gamma_inside += u["gamma_ci95"][0] <= true_gamma && true_gamma <= u["gamma_ci95"][1];
    r10_inside += u["r10_ci95_ohm"][0] <= true_r10 && true_r10 <= u["r10_ci95_ohm"][1];
  }
  EXPECT_EQ(i, 40u);
  // Binomial(40, 0.95): at least 34 inside has probability above 0.99.
  EXPECT_GE(gamma_inside, 34u);
  EXPECT_GE(r10_inside, 34u);
}

TEST(Cli, MatchesGslLeastSquaresWithoutARobustLoss) {
  // With --loss none the fit is ordinary least squares of ln R on ln(E / 10 lx), which GSL's
  // gsl_fit_linear computes independently: gamma = -slope, R10 = exp(intercept), and the 95 %
  // interval of gamma is slope +- t(0.975, n - 2) * se(slope) (gsl_cdf_tdist_Pinv).
  const double lux[] = {1, 3, 10, 30, 100, 300, 1000};
  const double ohm[] = {101000, 46300, 19700, 8800, 3950, 1720, 790};
  constexpr std::size_t n = std::size(lux);
  std::string log = "unit,lux,ohm\n";
  double x[n], y[n];
  for (std::size_t k = 0; k < n; ++k) {
    log += "P7," + std::to_string(lux[k]) + "," + std::to_string(ohm[k]) + "\n";
    x[k] = std::log(lux[k] / 10.0);
    y[k] = std::log(ohm[k]);
  }
  double c0, c1, cov00, cov01, cov11, sumsq;
  gsl_fit_linear(x, 1, y, 1, n, &c0, &c1, &cov00, &cov01, &cov11, &sumsq);
  // For unweighted data gsl_fit_linear estimates the covariance from the scatter of the points
  // (GSL manual, "Linear regression"), i.e. already scaled by sumsq / (n - 2).
  const double t = gsl_cdf_tdist_Pinv(0.975, n - 2);
  const double half = t * std::sqrt(cov11);

  auto dir = test::scratch_dir();
  auto path = test::write_scratch_file("ols.csv", log);
  CliRun r = run_cli({"analyze", path.string(), "--loss", "none", "--json", "out.json"}, dir);
  ASSERT_EQ(r.code, 0) << r.err;
  Json u = Json::parse(slurp(dir / "out.json"))["units"][0];
  ASSERT_EQ(u["status"], "fitted") << u["message"];
  EXPECT_NEAR(u["gamma"].get<double>(), -c1, 1e-9);
  EXPECT_NEAR(u["r10_ohm"].get<double>() / std::exp(c0), 1.0, 1e-9);
  EXPECT_NEAR(u["gamma_ci95"][0].get<double>(), -c1 - half, 1e-7);
  EXPECT_NEAR(u["gamma_ci95"][1].get<double>(), -c1 + half, 1e-7);
  EXPECT_NEAR(u["rms_log_residual"].get<double>(), std::sqrt(sumsq / n), 1e-9);
  // The table shows R10 with an engineering prefix, three significant digits (here tens of
  // kilohms: one decimal); --ascii spells the unit "kohm".
  CliRun ascii = run_cli({"analyze", path.string(), "--ascii", "--loss", "none"}, dir);
  char expected[32];
  std::snprintf(expected, sizeof expected, "%.1f kohm", std::exp(c0) / 1000);
  EXPECT_NE(ascii.out.find(expected), std::string::npos) << expected << "\n" << ascii.out;
  EXPECT_EQ(ascii.out.find("\xce\xa9"), std::string::npos);  // no "Ω" (U+03A9) in ASCII mode
  // R10's interval is exp(intercept +- t * se(intercept)).
  const double half0 = t * std::sqrt(cov00);
  EXPECT_NEAR(u["r10_ci95_ohm"][0].get<double>() / std::exp(c0 - half0), 1.0, 1e-7);
  EXPECT_NEAR(u["r10_ci95_ohm"][1].get<double>() / std::exp(c0 + half0), 1.0, 1e-7);
}

TEST(Cli, WritesTheSameBytesWhateverTheThreadCount) {
  auto dir = test::scratch_dir();
  ASSERT_EQ(
      run_cli({"analyze", sample("demo-lot.csv"), "--threads", "1", "--json", "a.json"}, dir).code,
      0);
  ASSERT_EQ(
      run_cli({"analyze", sample("demo-lot.csv"), "--threads", "2", "--json", "b.json"}, dir).code,
      0);
  ASSERT_EQ(run_cli({"analyze", sample("demo-lot.csv"), "--json", "c.json"}, dir).code, 0);
  std::string a = slurp(dir / "a.json");
  EXPECT_FALSE(a.empty());
  EXPECT_EQ(a, slurp(dir / "b.json"));
  EXPECT_EQ(a, slurp(dir / "c.json"));
}

TEST(Cli, SimulatesTheSameLotForTheSameSeed) {
  auto dir = test::scratch_dir();
  ASSERT_EQ(run_cli({"simulate", "--units", "5", "--seed", "9", "--out", "a.csv"}, dir).code, 0);
  ASSERT_EQ(run_cli({"simulate", "--units", "5", "--seed", "9", "--out", "b.csv"}, dir).code, 0);
  ASSERT_EQ(run_cli({"simulate", "--units", "5", "--seed", "10", "--out", "c.csv"}, dir).code, 0);
  EXPECT_EQ(slurp(dir / "a.csv"), slurp(dir / "b.csv"));
  EXPECT_NE(slurp(dir / "a.csv"), slurp(dir / "c.csv"));
  EXPECT_EQ(first_column((dir / "a.csv").string(), ',').size(), 5u);
}

TEST(Cli, RemakesTheSampleDataFromItsStatedCommand) {
  // sample-data/README.md states the command that made the demo lot; running it again must
  // give the same bytes, or the README is wrong.
  auto dir = test::scratch_dir();
  CliRun r = run_cli({"simulate",
                      "--units",
                      "60",
                      "--seed",
                      "2026",
                      "--dark",
                      "--dark-median",
                      "3M",
                      "--censor-above",
                      "5M",
                      "--outliers",
                      "0.004",
                      "--temp",
                      "23.5",
                      "--temp-span",
                      "1.5",
                      "--session2-levels",
                      "3,30,300",
                      "--session2-units",
                      "12",
                      "--session2-out",
                      "s2.csv",
                      "--out",
                      "lot.csv",
                      "--truth",
                      "truth.csv"},
                     dir);
  ASSERT_EQ(r.code, 0) << r.err;
  EXPECT_EQ(slurp(dir / "lot.csv"), slurp(sample("demo-lot.csv")));
  EXPECT_EQ(slurp(dir / "s2.csv"), slurp(sample("demo-lot-session2.csv")));
  EXPECT_EQ(slurp(dir / "truth.csv"), slurp(sample("demo-lot-truth.csv")));
}

}  // namespace
}  // namespace photolot
