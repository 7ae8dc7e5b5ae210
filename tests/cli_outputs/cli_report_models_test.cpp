// photolot-cli analyze --report on simulated lots (invented units, stated parameters, fixed
// seeds): the summary read back with poppler's pdftotext must state the curve model, the
// temperature handling and the bench profile of the run, against the truth planted in the lot.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdlib>
#include <fstream>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "test_support.h"

#if PHOTOLOT_CLI_HAS_REPORT

namespace {

namespace fs = std::filesystem;
using Json = nlohmann::json;
using photolot::test::collapse_space;
using photolot::test::shell_quote;
using photolot::test::slurp;

// Runs photolot-cli in `dir`; fails the test when it does not finish with exit code 0.
void cli(const std::vector<std::string>& args, const fs::path& dir) {
  const auto r = photolot::test::run_program(PHOTOLOT_CLI_PATH, args, dir);
  ASSERT_EQ(r.code, 0) << r.err;
}

// The summary's text as pdftotext reads it, blanks collapsed; empty when it could not be read.
std::string summary_text(const fs::path& pdf) {
  const fs::path txt = fs::path(pdf).replace_extension(".txt");
  const std::string cmd = "pdftotext -layout " + shell_quote(pdf.string()) + " " +
                          shell_quote(txt.string()) + " 2>/dev/null";
  if (std::system(cmd.c_str()) != 0) return {};
  return collapse_space(slurp(txt));
}

// The number printed right after `key` (e.g. "Coefficient at 10 lx -0.397 %/°C"), NaN if none.
double number_after(const std::string& flat, const std::string& key) {
  const auto at = flat.find(key + " ");
  if (at == std::string::npos) return std::nan("");
  const std::string rest = flat.substr(at + key.size() + 1, 32);
  char* end = nullptr;
  const double v = std::strtod(rest.c_str(), &end);
  return end == rest.c_str() ? std::nan("") : v;
}

TEST(CliReportModels, ALotWithTemperatureSpreadShowsItsFittedCoefficientAt25Degrees) {
  // Invented lot: readings spread over 25 +- 7.5 degC, true coefficient -0.4 %/degC at 10 lx,
  // no change with illuminance (simulate's model); 0.2 % reading noise.
  const auto dir = photolot::test::scratch_dir();
  cli({"simulate", "--units", "30", "--seed", "8", "--noise", "0.2", "--temp", "25", "--temp-span",
       "15", "--temp-coeff", "-0.4", "--out", "lot.csv"},
      dir);
  cli({"analyze", "lot.csv", "--report", "summary.pdf", "--quiet"}, dir);
  const std::string flat = summary_text(dir / "summary.pdf");
  ASSERT_FALSE(flat.empty());
  EXPECT_NE(flat.find("Temperature effect identifiable"), std::string::npos) << flat;
  EXPECT_NEAR(number_after(flat, "Coefficient at 10 lx"), -0.4, 0.05) << flat;
  // The planted coefficient does not change with illuminance.
  EXPECT_NEAR(number_after(flat, "Change per decade of lux"), 0.0, 0.05) << flat;
  // Uniform over 25 +- 7.5 degC: 30 units x 10 readings come close to both ends.
  const double span = number_after(flat, "a span of");
  EXPECT_GT(span, 13.0) << flat;
  EXPECT_LE(span, 15.0) << flat;
  EXPECT_NE(flat.find("Coefficient applied fitted"), std::string::npos) << flat;
  EXPECT_NE(flat.find("R10 and gamma stated at 25 \u00b0C"), std::string::npos) << flat;
}

TEST(CliReportModels, ALotAtOneTemperatureSaysNotIdentifiableAndWhatWasApplied) {
  // Every reading at 25 degC: no span, so no coefficient can be fitted (docs/models.md).
  const auto dir = photolot::test::scratch_dir();
  cli({"simulate", "--units", "12", "--seed", "4", "--out", "lot.csv"}, dir);
  cli({"analyze", "lot.csv", "--report", "none.pdf", "--quiet"}, dir);
  const std::string none = summary_text(dir / "none.pdf");
  ASSERT_FALSE(none.empty());
  EXPECT_NE(none.find("Temperature effect not identifiable"), std::string::npos) << none;
  EXPECT_NE(none.find("a span of 0.0 \u00b0C"), std::string::npos) << none;
  EXPECT_NE(none.find("Coefficient applied none"), std::string::npos) << none;
  EXPECT_NE(none.find("stated at the bench temperature"), std::string::npos) << none;

  // With a spec that gives a coefficient (an invented -0.3 %/degC), that one is applied.
  std::ofstream(dir / "spec.toml") << "[part]\nnumber = \"INVENTED-1\"\n[limits]\n"
                                      "r10_min_ohm = \"10k\"\nr10_max_ohm = \"40k\"\n"
                                      "[inspection]\nmode = \"100%\"\n"
                                      "[temperature]\ncoefficient_pct_per_c = -0.3\n";
  cli({"analyze", "lot.csv", "--spec", "spec.toml", "--report", "spec.pdf", "--quiet"}, dir);
  const std::string spec = summary_text(dir / "spec.pdf");
  EXPECT_NE(spec.find("Temperature effect not identifiable"), std::string::npos) << spec;
  EXPECT_NE(spec.find("Coefficient applied the spec's coefficient, -0.300 %/\u00b0C"),
            std::string::npos)
      << spec;
  EXPECT_NE(spec.find("R10 and gamma stated at 25 \u00b0C"), std::string::npos) << spec;
}

TEST(CliReportModels, ALotWithADarkConductanceCountsTheModelsAndNamesEachRejectsModel) {
  // 20 invented units with 10 Mohm (1e-7 S) in parallel, read down to 0.1 lx where the leak
  // bends the curve; --model choose picks by AICc. A tight invented R10 window (19-21 kohm
  // around simulate's 20 kohm median) leaves some units nonconforming.
  const auto dir = photolot::test::scratch_dir();
  cli({"simulate", "--units", "20", "--seed", "5", "--noise", "0.2", "--dark-conductance", "1e-7",
       "--levels", "0.1,0.3,1,3,10,30,100,300,1000", "--out", "lot.csv"},
      dir);
  std::ofstream(dir / "spec.toml") << "[part]\nnumber = \"INVENTED-2\"\n[limits]\n"
                                      "r10_min_ohm = \"19k\"\nr10_max_ohm = \"21k\"\n"
                                      "[inspection]\nmode = \"100%\"\n";
  cli({"analyze", "lot.csv", "--model", "choose", "--spec", "spec.toml", "--json", "out.json",
       "--report", "summary.pdf", "--quiet"},
      dir);
  const std::string flat = summary_text(dir / "summary.pdf");
  ASSERT_FALSE(flat.empty());
  const Json doc = Json::parse(slurp(dir / "out.json"));
  std::size_t dark = 0, power = 0, listed = 0;
  for (const auto& u : doc.at("units")) {
    const bool is_dark = u.at("model") == "dark_conductance";
    (is_dark ? dark : power) += 1;
    if (u.at("verdict") != "nonconforming") continue;
    ++listed;
    const std::string row =
        u.at("id").get<std::string>() + (is_dark ? " dark conductance" : " power law");
    EXPECT_NE(flat.find(row), std::string::npos) << row;
  }
  // The planted leak should make the dark model win for most units (as in CliModels).
  EXPECT_GE(dark, 16u);
  EXPECT_GT(listed, 0u);
  EXPECT_NE(flat.find(std::to_string(power) + " power law, " + std::to_string(dark) +
                      " dark conductance; chosen per unit by the lower AICc"),
            std::string::npos)
      << flat;
}

TEST(CliReportModels, TheBenchProfileInUseIsPrintedWithItsMeterAccuracies) {
  const auto dir = photolot::test::scratch_dir();
  cli({"simulate", "--units", "6", "--seed", "3", "--out", "lot.csv"}, dir);
  // An invented bench: one 20 Mohm range at 0.5 % + 2 counts of 10 ohm, a 3 % lux meter.
  std::ofstream(dir / "bench.toml") << "lux_pct = 3.0\n[[ohm_range]]\nmax_ohm = 2e7\npct = 0.5\n"
                                       "digits = 2\nresolution_ohm = 10\n";
  cli({"analyze", "lot.csv", "--bench", "bench.toml", "--report", "with.pdf", "--quiet"}, dir);
  const std::string with = summary_text(dir / "with.pdf");
  ASSERT_FALSE(with.empty());
  EXPECT_NE(with.find("Bench profile bench.toml"), std::string::npos) << with;
  EXPECT_NE(with.find("range 20.0 M\u03a9: 0.5 % of reading + 2 digits of 10.0 \u03a9"),
            std::string::npos)
      << with;
  EXPECT_NE(with.find("Lux meter 3 % of reading"), std::string::npos) << with;

  cli({"analyze", "lot.csv", "--report", "without.pdf", "--quiet"}, dir);
  const std::string without = summary_text(dir / "without.pdf");
  EXPECT_NE(without.find("Bench profile none"), std::string::npos) << without;
  EXPECT_EQ(without.find("Lux meter"), std::string::npos) << without;
}

}  // namespace

#endif  // PHOTOLOT_CLI_HAS_REPORT
