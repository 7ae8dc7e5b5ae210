// The bench profile: the meter-accuracy formulas, the loader's errors, and the weights' effect
// on the reported intervals.
#include "photolot/bench_profile.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <string>
#include <vector>

#include "photolot/fitting/models.h"
#include "simulate.h"

namespace {

using photolot::BenchProfile;
using photolot::parse_bench_profile;

constexpr const char* kProfile = R"(# invented bench: a 4.5-digit meter
lux_pct = 2.0
[[ohm_range]]
max_ohm = 2e6
pct = 0.8
digits = 3
resolution_ohm = 100
[[ohm_range]]
max_ohm = 2000
pct = 0.5
digits = 2
resolution_ohm = 0.1
)";

TEST(BenchProfile, ReadsRangesAndPicksTheSmallestRangeThatHoldsTheReading) {
  const auto r = parse_bench_profile("bench.toml", kProfile);
  ASSERT_TRUE(r.ok()) << r.error->message;
  const BenchProfile& p = *r.profile;
  ASSERT_EQ(p.ohm_ranges.size(), 2u);
  EXPECT_EQ(p.range_for(1500)->max_ohm, 2000);  // sorted, smallest first
  EXPECT_EQ(p.range_for(2500)->max_ohm, 2e6);
  // "+-(percent of reading + digits)": u/R = pct/100 + digits x resolution / R
  // (the usual way meter accuracy is stated, common practice).
  EXPECT_DOUBLE_EQ(p.ohm_relative_sd(1000), 0.005 + 2 * 0.1 / 1000);
  EXPECT_DOUBLE_EQ(p.ohm_relative_sd(100e3), 0.008 + 3 * 100 / 100e3);
  // Effective variance: the lux meter's 2 % through a slope of 0.8.
  const double a = 0.005 + 2 * 0.1 / 1000, b = 0.8 * 0.02;
  EXPECT_DOUBLE_EQ(p.ln_ohm_sd(1000, 0.8), std::sqrt(a * a + b * b));
}

TEST(BenchProfile, NamesFileLineAndColumnOfABadValue) {
  const auto r = parse_bench_profile("bench.toml",
                                     "lux_pct = 2\n[[ohm_range]]\nmax_ohm = 2e3\n"
                                     "pct = \"half\"\n");
  ASSERT_FALSE(r.ok());
  EXPECT_EQ(r.error->file, "bench.toml");
  EXPECT_EQ(r.error->line, 4u);
  EXPECT_EQ(r.error->column, 7u);
  EXPECT_NE(r.error->message.find("pct"), std::string::npos) << r.error->message;
}

TEST(BenchProfile, NamesTheLineOfATomlSyntaxErrorAndOfAnUnknownKey) {
  const auto a = parse_bench_profile("b.toml", "lux_pct = 2\nlux_pct 3\n");
  ASSERT_FALSE(a.ok());
  EXPECT_EQ(a.error->line, 2u);
  const auto b = parse_bench_profile("b.toml", "lux_pct = 2\nlux_percent = 3\n");
  ASSERT_FALSE(b.ok());
  EXPECT_EQ(b.error->line, 2u);
  EXPECT_EQ(b.error->column, 1u);
  EXPECT_NE(b.error->message.find("lux_percent"), std::string::npos);
}

TEST(BenchProfile, RejectsARangeWithNoErrorAtAll) {
  const auto r = parse_bench_profile("b.toml", "[[ohm_range]]\nmax_ohm = 2e3\npct = 0\n");
  ASSERT_FALSE(r.ok());
  EXPECT_EQ(r.error->line, 1u);
  EXPECT_NE(r.error->message.find("ohm_range 1"), std::string::npos) << r.error->message;
}

// With weights from a bench profile and near noise-free readings, the slope's standard error is
// the meter's: for a straight line with known, equal sd sigma per point,
// se(slope) = sigma / sqrt(sum (x - mean x)^2) (ordinary least squares, any regression text).
// The JSON form the results document and the workspace share: what is written reads back to
// the same profile (and so to the same weights), and a bad field is named.
TEST(BenchProfile, JsonFormReadsBackToTheSameProfileAndNamesABadField) {
  const auto r = parse_bench_profile("bench.toml", kProfile);
  ASSERT_TRUE(r.ok()) << r.error->message;
  const auto text = photolot::bench_profile_json(*r.profile).dump();
  BenchProfile back;
  ASSERT_EQ(photolot::bench_profile_from_json(nlohmann::ordered_json::parse(text), back), "");
  EXPECT_EQ(back.lux_pct, 2.0);
  ASSERT_EQ(back.ohm_ranges.size(), 2u);
  for (const double ohm : {500.0, 1999.0, 2001.0, 1.5e6, 5e6})
    EXPECT_EQ(back.ln_ohm_sd(ohm, 0.75), r.profile->ln_ohm_sd(ohm, 0.75)) << ohm;

  auto bad = nlohmann::ordered_json::parse(text);
  bad["ohm_ranges"][1]["digits"] = "three";
  BenchProfile untouched;
  EXPECT_EQ(photolot::bench_profile_from_json(bad, untouched),
            "ohm_ranges[1].digits must be a number");
  EXPECT_TRUE(untouched.ohm_ranges.empty());
  bad["ohm_ranges"][1]["digits"] = -1;
  EXPECT_NE(photolot::bench_profile_from_json(bad, untouched).find("digits = -1"),
            std::string::npos);
  EXPECT_EQ(photolot::bench_profile_from_json(nlohmann::ordered_json::array(), untouched),
            "lux_pct must be a number");
}

TEST(MeterWeights, IntervalsReflectTheMetersStatedAccuracy) {
  photolot::test::UnitSim sim;
  sim.noise_pct = 0.001;
  photolot::test::Rng rng(17);
  const photolot::Unit unit = photolot::test::simulate_unit(sim, rng);
  photolot::fitting::ExtendedFitOptions ext;
  ext.model = photolot::fitting::ModelChoice::power_law;
  ext.temperature = photolot::fitting::TemperatureMode::off;
  BenchProfile p;
  p.ohm_ranges = {{1e9, 1.0, 0, 0}};
  p.lux_pct = 2.0;
  ext.bench = p;
  const photolot::UnitFit f = photolot::fitting::fit_unit_extended(unit, {}, ext);
  ASSERT_TRUE(f.ok()) << f.message;
  double mx = 0, sxx = 0;
  for (double e : sim.lux) mx += std::log(e / 10) / sim.lux.size();
  for (double e : sim.lux) sxx += (std::log(e / 10) - mx) * (std::log(e / 10) - mx);
  const double sigma = std::hypot(0.01, sim.gamma * 0.02);
  EXPECT_NEAR(f.gamma_sd, sigma / std::sqrt(sxx), 1e-3 * sigma / std::sqrt(sxx));
  // Without the lux meter's share the interval is narrower, by the ratio of the sigmas.
  ext.bench->lux_pct = 0;
  const photolot::UnitFit g = photolot::fitting::fit_unit_extended(unit, {}, ext);
  EXPECT_NEAR(g.gamma_sd / f.gamma_sd, 0.01 / sigma, 1e-3);
}

}  // namespace

namespace {

// A bench profile that claims more than the bench delivers (0.1 % of reading on readings with
// 0.5 % noise) must still give every unit a curve: the scatter is a finding about the bench,
// not a reason to drop the unit. The fit says so in a flag, and its intervals follow the
// scatter seen, not the profile's claim: for a straight line the slope's standard error is
// sigma / sqrt(sum (x - mean x)^2) (ordinary least squares, any regression text), here with the
// simulation's sigma = ln(1.005) per reading. Ten points estimate sigma to within about a
// quarter (chi-square with 8 dof) and a median-based estimate less well, so each flagged
// unit's se is checked to a factor of 3 and the lot's median to 25 %.
TEST(MeterWeights, AProfileTighterThanTheScatterStillFitsEveryUnitAndSaysSo) {
  photolot::test::UnitSim sim;
  sim.noise_pct = 0.5;
  photolot::test::Rng rng(61);
  BenchProfile p;
  p.ohm_ranges = {{1e9, 0.1, 0, 0}};
  p.lux_pct = 0;
  double mx = 0, sxx = 0;
  for (double e : sim.lux) mx += std::log(e / 10) / sim.lux.size();
  for (double e : sim.lux) sxx += (std::log(e / 10) - mx) * (std::log(e / 10) - mx);
  const double se_expected = std::log1p(0.005) / std::sqrt(sxx);
  for (const auto model :
       {photolot::fitting::ModelChoice::power_law, photolot::fitting::ModelChoice::choose}) {
    SCOPED_TRACE(std::string(photolot::fitting::to_string(model)));
    photolot::fitting::ExtendedFitOptions ext;
    ext.model = model;
    ext.temperature = photolot::fitting::TemperatureMode::off;
    ext.bench = p;
    std::vector<double> ses;
    int flagged = 0;
    for (int i = 0; i < 40; ++i) {
      const photolot::Unit unit = photolot::test::simulate_unit(sim, rng);
      const photolot::UnitFit f = photolot::fitting::fit_unit_extended(unit, {}, ext);
      ASSERT_TRUE(f.ok()) << "unit " << i << ": " << f.message;
      if (std::find(f.flags.begin(), f.flags.end(), "scatter-above-bench-profile") == f.flags.end())
        continue;
      ++flagged;
      if (f.curve.model != photolot::ModelKind::power_law) continue;
      EXPECT_GT(f.gamma_sd, se_expected / 3) << "unit " << i << ": " << f.message;
      EXPECT_LT(f.gamma_sd, 3 * se_expected) << "unit " << i << ": " << f.message;
      ses.push_back(f.gamma_sd);
    }
    // The scatter is 5 x the profile's claim: nearly every unit must say so.
    EXPECT_GE(flagged, 36);
    ASSERT_GE(ses.size(), 30u);
    std::nth_element(ses.begin(), ses.begin() + ses.size() / 2, ses.end());
    EXPECT_NEAR(ses[ses.size() / 2], se_expected, 0.25 * se_expected);
  }
}

}  // namespace
