// photolot-cli analyze --report, --pair and the model options, end to end. Each check is
// against something outside the program: ISO 2859-1's tables, planted truth in an invented lot
// (stated parameters, fixed seed), or the definitions of the trade's quantities.
#include <gtest/gtest.h>
#include <sys/wait.h>

#include <cmath>
#include <cstdio>
#include <fstream>
#include <iterator>
#include <map>
#include <nlohmann/json.hpp>
#include <set>
#include <sstream>

#include "test_support.h"

namespace {

namespace fs = std::filesystem;
using Json = nlohmann::json;

using photolot::test::CliRun;
using photolot::test::slurp;

std::string quote(const std::string& s) { return photolot::test::shell_quote(s); }

// Runs photolot-cli with args in `dir` (the current folder of the run).
CliRun run_cli(const std::vector<std::string>& args, const fs::path& dir) {
  return photolot::test::run_program(PHOTOLOT_CLI_PATH, args, dir);
}

std::string sample(const std::string& name) {
  return photolot::test::source_path("sample-data/" + name).string();
}

// A noise-free power-law unit at the given levels: R = r10 * (E / 10)^-gamma.
std::string unit_rows(const std::string& id, double r10, double gamma) {
  std::string rows;
  for (double lux : {1.0, 2.0, 5.0, 10.0, 20.0, 50.0, 100.0, 200.0, 500.0, 1000.0}) {
    char line[128];
    std::snprintf(line, sizeof line, "%s,%g,%.9g\n", id.c_str(), lux,
                  r10 * std::pow(lux / 10.0, -gamma));
    rows += line;
  }
  return rows;
}

// ---- the printed summary ----

TEST(CliReport, WritesTheSummaryWithTheDispositionPartAndNonconformingUnits) {
  const auto dir = photolot::test::scratch_dir();
  const CliRun r = run_cli({"analyze", sample("demo-lot.csv"), "--spec", sample("demo-spec.toml"),
                            "--json", "out.json", "--report", "summary.pdf", "--lot-id",
                            "REEL-417", "--inspector", "A. Tester", "--quiet"},
                           dir);
#if PHOTOLOT_CLI_HAS_REPORT
  ASSERT_EQ(r.code, 0) << r.err;
  ASSERT_TRUE(fs::exists(dir / "summary.pdf"));
  EXPECT_EQ(slurp(dir / "summary.pdf").substr(0, 5), "%PDF-");  // ISO 32000-1, 7.5.2
  EXPECT_NE(r.out.find("lot acceptance summary: summary.pdf"), std::string::npos) << r.out;
  // Read the pages back with poppler's pdftotext (an outside reader of the file).
  const std::string cmd = "pdftotext -layout " + quote((dir / "summary.pdf").string()) + " " +
                          quote((dir / "summary.txt").string());
  ASSERT_EQ(std::system(cmd.c_str()), 0);
  const std::string text = slurp(dir / "summary.txt");
  const Json doc = Json::parse(slurp(dir / "out.json"));
  // ISO 2859-1: lot 500, level II -> H, n 50; AQL 2.5 -> Ac 3, Re 4. The stamped disposition
  // follows from the count of nonconforming units by that rule.
  const int nonconforming = doc.at("acceptance").at("nonconforming");
  EXPECT_NE(text.find(nonconforming <= 3 ? "ACCEPT" : "REJECT"), std::string::npos) << text;
  EXPECT_NE(text.find("DEMO-LDR-20K"), std::string::npos) << "the spec's part number";
  EXPECT_NE(text.find("REEL-417"), std::string::npos);
  std::size_t listed = 0;
  for (const auto& u : doc.at("units")) {
    if (u.at("verdict") != "nonconforming") continue;
    ++listed;
    EXPECT_NE(text.find(u.at("id").get<std::string>()), std::string::npos) << u.at("id");
  }
  EXPECT_GT(listed, 0u);
#else
  EXPECT_EQ(r.code, 2);
  EXPECT_NE(r.err.find("no PDF support"), std::string::npos) << r.err;
  EXPECT_FALSE(fs::exists(dir / "summary.pdf"));
  EXPECT_FALSE(fs::exists(dir / "out.json"));
#endif
}

TEST(CliReport, HeaderFieldsNeedTheReport) {
  const auto dir = photolot::test::scratch_dir();
  EXPECT_EQ(run_cli({"analyze", sample("demo-lot.csv"), "--paper", "letter"}, dir).code, 2);
  EXPECT_EQ(run_cli({"analyze", sample("demo-lot.csv"), "--report", "x.pdf", "--paper", "a3"}, dir)
                .code,
            2);
  EXPECT_FALSE(fs::exists(dir / "x.pdf"));
}

// ---- verdicts in the units ----

TEST(CliVerdicts, EachUnitCarriesItsVerdictAndReasons) {
  const auto dir = photolot::test::scratch_dir();
  const CliRun r = run_cli({"analyze", sample("demo-lot.csv"), "--spec", sample("demo-spec.toml"),
                            "--json", "out.json", "--quiet"},
                           dir);
  ASSERT_EQ(r.code, 0) << r.err;
  const Json doc = Json::parse(slurp(dir / "out.json"));
  std::size_t nonconforming = 0;
  for (const auto& u : doc.at("units")) {
    const std::string v = u.at("verdict");
    ASSERT_TRUE(v == "conforming" || v == "nonconforming") << u.dump();
    // A unit is nonconforming exactly when it breaks a limit (ISO 2859-1, 3.1.5: a unit with
    // one or more nonconformities); the demo spec's R10 window is 15k-27k ohm.
    EXPECT_EQ(v == "nonconforming", !u.at("reasons").empty()) << u.dump();
    const double r10 = u.at("r10_ohm");
    if (r10 < 15e3 || r10 > 27e3) {
      EXPECT_EQ(v, "nonconforming") << u.dump();
    }
    nonconforming += v == "nonconforming";
  }
  EXPECT_EQ(nonconforming, doc.at("acceptance").at("nonconforming").get<std::size_t>());
  EXPECT_FALSE(doc.contains("verdicts")) << "the verdicts live in the units now";
}

TEST(CliVerdicts, NoSpecNoVerdict) {
  const auto dir = photolot::test::scratch_dir();
  ASSERT_EQ(run_cli({"analyze", sample("demo-lot.csv"), "--json", "out.json", "--quiet"}, dir).code,
            0);
  const Json doc = Json::parse(slurp(dir / "out.json"));
  EXPECT_FALSE(doc.at("units").at(0).contains("verdict"));
}

// ---- pairing ----

// Six units 10 % apart in R10 (no two within 2 %), and two planted pairs: B/B2 with B2 0.5 %
// above B at every illuminance, C/C2 identical. Invented data.
fs::path planted_twins(const fs::path& dir) {
  std::string log = "unit,lux,ohm\n";
  for (int i = 0; i < 6; ++i)
    log += unit_rows("S" + std::to_string(i), 10e3 * std::pow(1.1, i), 0.70 + 0.02 * i);
  log += unit_rows("B", 30e3, 0.75) + unit_rows("B2", 30e3 * 1.005, 0.75);
  log += unit_rows("C", 40e3, 0.80) + unit_rows("C2", 40e3, 0.80);
  std::ofstream(dir / "twins.csv") << log;
  return dir / "twins.csv";
}

TEST(CliPairing, FindsThePlantedTwinsAndLeavesTheRestUnpaired) {
  const auto dir = photolot::test::scratch_dir();
  const auto log = planted_twins(dir);
  const CliRun r = run_cli({"analyze", log.string(), "--pair", "--pair-tolerance", "2",
                            "--pairs-csv", "picks.csv", "--json", "out.json"},
                           dir);
  ASSERT_EQ(r.code, 0) << r.err;
  const Json doc = Json::parse(slurp(dir / "out.json"));
  std::set<std::set<std::string>> pairs;
  std::map<std::string, double> error;
  for (const auto& p : doc.at("pairs")) {
    const std::string a = p.at("a"), b = p.at("b");
    pairs.insert({a, b});
    error[a + b] = p.at("tracking_error_pct");
  }
  EXPECT_EQ(pairs, (std::set<std::set<std::string>>{{"B", "B2"}, {"C", "C2"}}));
  // A constant ratio of 1.005 is an error of exactly 0.5 % over any range; identical curves 0.
  EXPECT_NEAR(error["BB2"], 0.5, 0.01);
  EXPECT_NEAR(error["CC2"], 0.0, 0.01);
  EXPECT_EQ(doc.at("unpaired").size(), 6u);
  EXPECT_EQ(doc.at("pairing").at("proof"), "proved optimal");
  // The pick list: a header and one row per pair.
  const std::string csv = slurp(dir / "picks.csv");
  EXPECT_EQ(std::count(csv.begin(), csv.end(), '\n'), 3);
  EXPECT_NE(r.out.find("pairs: 2 from 10 eligible units"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("worst error 0.50 %"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("pick list: picks.csv"), std::string::npos) << r.out;
}

TEST(CliPairing, TrimmableModeForgivesAConstantRatio) {
  // S0..S5 differ in gamma by 0.02 per step: over 1-1000 lx (3 decades) a gamma difference of
  // 0.02 drifts the ratio by 10^(3 x 0.02) = 1.148, far outside 2 %. A constant 10 % ratio
  // (D, D2) trims out entirely.
  const auto dir = photolot::test::scratch_dir();
  std::string log = "unit,lux,ohm\n";
  for (int i = 0; i < 4; ++i)
    log += unit_rows("S" + std::to_string(i), 20e3, 0.70 + 0.02 * i);
  log += unit_rows("D", 20e3, 0.90) + unit_rows("D2", 22e3, 0.90);
  std::ofstream(dir / "trim.csv") << log;
  const CliRun abs = run_cli({"analyze", "trim.csv", "--pair", "--json", "abs.json"}, dir);
  ASSERT_EQ(abs.code, 0) << abs.err;
  EXPECT_TRUE(Json::parse(slurp(dir / "abs.json")).at("pairs").empty());
  const CliRun trim = run_cli(
      {"analyze", "trim.csv", "--pair", "--pair-mode", "trimmable", "--json", "trim.json"}, dir);
  ASSERT_EQ(trim.code, 0) << trim.err;
  const Json pairs = Json::parse(slurp(dir / "trim.json")).at("pairs");
  ASSERT_EQ(pairs.size(), 1u);
  EXPECT_EQ(std::set<std::string>({pairs[0].at("a"), pairs[0].at("b")}),
            (std::set<std::string>{"D", "D2"}));
}

TEST(CliPairing, OnlyConformingUnitsArePairedUnderASpec) {
  const auto dir = photolot::test::scratch_dir();
  const CliRun r = run_cli({"analyze", sample("demo-lot.csv"), "--spec", sample("demo-spec.toml"),
                            "--pair", "--pair-tolerance", "5", "--json", "out.json", "--quiet"},
                           dir);
  ASSERT_EQ(r.code, 0) << r.err;
  const Json doc = Json::parse(slurp(dir / "out.json"));
  std::set<std::string> rejected;
  for (const auto& u : doc.at("units"))
    if (u.at("verdict") == "nonconforming") rejected.insert(u.at("id").get<std::string>());
  ASSERT_FALSE(rejected.empty());
  for (const auto& p : doc.at("pairs")) {
    EXPECT_FALSE(rejected.count(p.at("a").get<std::string>())) << p.dump();
    EXPECT_FALSE(rejected.count(p.at("b").get<std::string>())) << p.dump();
  }
  EXPECT_EQ(doc.at("pairing").at("counts").at("eligible").get<std::size_t>(),
            doc.at("units").size() - rejected.size());
}

TEST(CliPairing, BadRangeAndOptionsWithoutPairAreUsageErrors) {
  const auto dir = photolot::test::scratch_dir();
  const CliRun bad =
      run_cli({"analyze", sample("demo-lot.csv"), "--pair", "--pair-range", "100:10"}, dir);
  EXPECT_EQ(bad.code, 2);
  EXPECT_NE(bad.err.find("--pair-range"), std::string::npos) << bad.err;
  EXPECT_EQ(run_cli({"analyze", sample("demo-lot.csv"), "--pair-tolerance", "3"}, dir).code, 2);
}

// ---- models ----

TEST(CliModels, ChoosesTheDarkModelWhereAParallelConductanceBendsTheCurve) {
  // 20 invented units with 10 Mohm (1e-7 S) in parallel: at 1 lx a 200 kohm cell is pulled
  // down by 2 %, a bend the power law cannot follow; AICc (docs/models.md) should pick the dark
  // model for most units and recover G_dark near the truth.
  const auto dir = photolot::test::scratch_dir();
  ASSERT_EQ(run_cli({"simulate", "--units", "20", "--seed", "5", "--noise", "0.2",
                     "--dark-conductance", "1e-7", "--levels", "0.1,0.3,1,3,10,30,100,300,1000",
                     "--out", "lot.csv"},
                    dir)
                .code,
            0);
  const CliRun r =
      run_cli({"analyze", "lot.csv", "--model", "choose", "--json", "out.json", "--quiet"}, dir);
  ASSERT_EQ(r.code, 0) << r.err;
  const Json doc = Json::parse(slurp(dir / "out.json"));
  EXPECT_EQ(doc.at("inputs").at("options").at("model").at("model"), "choose");
  std::size_t dark = 0;
  for (const auto& u : doc.at("units")) {
    ASSERT_EQ(u.at("status"), "fitted") << u.dump();
    EXPECT_TRUE(u.at("aicc_power_law").is_number()) << u.dump();
    EXPECT_TRUE(u.at("aicc_dark_conductance").is_number()) << u.dump();
    if (u.at("model") == "dark_conductance") {
      ++dark;
      EXPECT_NEAR(std::log(u.at("dark_conductance_s").get<double>() / 1e-7), 0.0, 0.7)
          << u.dump();
    }
  }
  EXPECT_GE(dark, 16u);
  // The default, the power law (the trade's convention), keeps the plain curve for every unit.
  ASSERT_EQ(run_cli({"analyze", "lot.csv", "--json", "pl.json", "--quiet"}, dir).code, 0);
  // The document is named: a range-for over a member of a temporary would read freed memory.
  const Json plain = Json::parse(slurp(dir / "pl.json"));
  for (const auto& u : plain.at("units")) EXPECT_EQ(u.at("model"), "power_law");
}

TEST(CliModels, FitsTheTemperatureCoefficientWhenTheReadingsSpreadEnough) {
  // Invented lot: readings spread over 25 +- 7.5 degC, true coefficient -0.4 %/degC at 10 lx.
  const auto dir = photolot::test::scratch_dir();
  ASSERT_EQ(run_cli({"simulate", "--units", "30", "--seed", "8", "--noise", "0.2", "--temp", "25",
                     "--temp-span", "15", "--temp-coeff", "-0.4", "--out", "lot.csv"},
                    dir)
                .code,
            0);
  ASSERT_EQ(run_cli({"analyze", "lot.csv", "--json", "out.json", "--quiet"}, dir).code, 0);
  const Json t = Json::parse(slurp(dir / "out.json")).at("fit").at("temperature");
  EXPECT_TRUE(t.at("identifiable").get<bool>()) << t.dump();
  EXPECT_EQ(t.at("source"), "fitted");
  EXPECT_NEAR(t.at("coefficient_pct_per_c").get<double>(), -0.4, 0.05) << t.dump();
  // --temperature off: no coefficient, curves at the bench's temperature.
  ASSERT_EQ(
      run_cli({"analyze", "lot.csv", "--temperature", "off", "--json", "off.json", "--quiet"}, dir)
          .code,
      0);
  const Json off = Json::parse(slurp(dir / "off.json")).at("fit").at("temperature");
  EXPECT_NE(off.at("source"), "fitted") << off.dump();
}

TEST(CliModels, KeepsOverRangeReadingsAsBoundsByDefault) {
  // The demo lot has 3 readings over the meter's range (sample-data/README.md): by default they
  // enter the fit as one-sided bounds, so no unit loses them; with --no-over-range-bounds they
  // are left out.
  const auto dir = photolot::test::scratch_dir();
  ASSERT_EQ(run_cli({"analyze", sample("demo-lot.csv"), "--json", "a.json", "--quiet"}, dir).code,
            0);
  const Json doc = Json::parse(slurp(dir / "a.json"));
  EXPECT_EQ(doc.at("inputs").at("options").at("model").at("over_range_bounds"), true);
  EXPECT_EQ(doc.at("import").at("censored"), 3);
}

TEST(CliModels, ABadBenchProfileStopsWithItsLineAndWritesNothing) {
  const auto dir = photolot::test::scratch_dir();
  std::ofstream(dir / "bench.toml") << "lux_pct = 3.0\n[[ohm_range]]\nmax_ohm = \"lots\"\n";
  const CliRun r = run_cli(
      {"analyze", sample("demo-lot.csv"), "--bench", "bench.toml", "--json", "out.json"}, dir);
  EXPECT_EQ(r.code, 1) << r.err;
  EXPECT_NE(r.err.find("bench.toml:3:"), std::string::npos) << r.err;
  EXPECT_FALSE(fs::exists(dir / "out.json"));
}

TEST(CliModels, ABenchProfileWidensTheIntervalsOfAPoorMeter) {
  // The same readings (0.5 % noise, simulate's default) weighted as from a 5 % meter must give
  // wider R10 intervals than from a 0.5 % one: the stated standard uncertainty is a floor for
  // the interval (docs/models.md; GUM, JCGM 100:2008, type B evaluation).
  const auto dir = photolot::test::scratch_dir();
  ASSERT_EQ(run_cli({"simulate", "--units", "5", "--seed", "3", "--out", "lot.csv"}, dir).code, 0);
  std::ofstream(dir / "good.toml") << "lux_pct = 0.5\n[[ohm_range]]\nmax_ohm = 1e9\npct = 0.5\n"
                                      "digits = 0\nresolution_ohm = 1\n";
  std::ofstream(dir / "poor.toml") << "lux_pct = 5\n[[ohm_range]]\nmax_ohm = 1e9\npct = 5\n"
                                      "digits = 0\nresolution_ohm = 1\n";
  ASSERT_EQ(run_cli({"analyze", "lot.csv", "--bench", "good.toml", "--json", "g.json"}, dir).code,
            0);
  ASSERT_EQ(run_cli({"analyze", "lot.csv", "--bench", "poor.toml", "--json", "p.json"}, dir).code,
            0);
  const Json g = Json::parse(slurp(dir / "g.json")).at("units");
  const Json p = Json::parse(slurp(dir / "p.json")).at("units");
  ASSERT_EQ(g.size(), p.size());
  for (std::size_t i = 0; i < g.size(); ++i) {
    const double wg = g[i]["r10_ci95_ohm"][1].get<double>() - g[i]["r10_ci95_ohm"][0].get<double>();
    const double wp = p[i]["r10_ci95_ohm"][1].get<double>() - p[i]["r10_ci95_ohm"][0].get<double>();
    EXPECT_GT(wp, wg) << i;
  }
  EXPECT_TRUE(Json::parse(slurp(dir / "p.json")).at("inputs").at("options").at("model").contains(
      "bench"));
}

}  // namespace
