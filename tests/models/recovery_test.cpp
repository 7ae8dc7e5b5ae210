// Recovery of known parameters from simulated units (simulate.h, fixed seeds): the dark
// conductance, over-range readings, and the model choice over many seeds.
#include <gtest/gtest.h>

#include <cmath>
#include <numeric>
#include <vector>

#include "photolot/fitting/models.h"
#include "simulate.h"

namespace {

using photolot::UnitFit;
using photolot::fitting::ExtendedFitOptions;
using photolot::fitting::FitOptions;
using photolot::fitting::ModelChoice;
using photolot::fitting::TemperatureMode;
using photolot::test::Rng;
using photolot::test::UnitSim;

ExtendedFitOptions no_temperature() {
  ExtendedFitOptions e;
  e.temperature = TemperatureMode::off;
  return e;
}

TEST(DarkConductanceFit, RecoversSimulatedParametersAndItsIntervalsCoverThem) {
  UnitSim sim;
  sim.r10_ohm = 20e3;
  sim.gamma = 0.8;
  sim.dark_conductance_s = 2e-7;
  sim.noise_pct = 0.5;
  sim.dark_ohm = 1.0 / sim.dark_conductance_s;  // a dark reading at 0 lx is 1 / G_dark
  ExtendedFitOptions ext = no_temperature();
  ext.model = ModelChoice::dark_conductance;
  FitOptions options;
  options.meter_accuracy_pct = 0.5;  // the simulated noise, so the intervals mean what they say
  Rng rng(7);
  const int n = 200;
  double sum_ln_r10 = 0, sum_gamma = 0, sum_ln_g = 0;
  int covered = 0;
  for (int i = 0; i < n; ++i) {
    const UnitFit f =
        photolot::fitting::fit_unit_extended(photolot::test::simulate_unit(sim, rng), options, ext);
    ASSERT_TRUE(f.ok()) << f.message;
    sum_ln_r10 += std::log(f.r10_ohm / photolot::test::true_ohm(sim, 10.0, 25.0));
    sum_gamma += f.gamma - sim.gamma;
    sum_ln_g += std::log(f.dark_conductance_s / sim.dark_conductance_s);
    if (f.gamma_ci95[0] <= sim.gamma && sim.gamma <= f.gamma_ci95[1]) ++covered;
  }
  // Mean errors over 200 units: well inside the 0.5 % reading noise.
  EXPECT_NEAR(sum_ln_r10 / n, 0.0, 0.001);
  EXPECT_NEAR(sum_gamma / n, 0.0, 0.002);
  EXPECT_NEAR(sum_ln_g / n, 0.0, 0.02);
  // A 95 % interval covers the truth in about 95 % of units; binomial sd at n = 200 is 1.5 %.
  EXPECT_GE(covered, 180);
  EXPECT_LE(covered, 198);
}

// Readings above the meter's range, at levels where the true resistance straddles the bound:
// left out, the readings that remain are the low ones (a truncated sample) and the fitted
// curve bends down at low light (gamma too small); as one-sided terms they are not.
TEST(CensoredReadings, OneSidedTermsAvoidTheBiasOfDroppingThem) {
  UnitSim sim;
  sim.r10_ohm = 20e3;
  sim.gamma = 0.8;
  sim.lux = {0.5, 1, 2, 5, 10, 20, 50, 100};
  sim.repeats = 3;
  sim.noise_pct = 3.0;
  sim.meter_max_ohm = photolot::test::true_ohm(sim, 1.0, 25.0);  // half the 1 lx readings over
  FitOptions options;
  options.meter_accuracy_pct = 3.0;
  options.loss = photolot::fitting::Loss::none;
  ExtendedFitOptions with = no_temperature();
  with.model = ModelChoice::power_law;
  ExtendedFitOptions without = with;
  without.censored_terms = false;
  Rng rng(11);
  const int n = 200;
  double bias_with = 0, bias_without = 0;
  std::vector<double> err;
  for (int i = 0; i < n; ++i) {
    const photolot::Unit u = photolot::test::simulate_unit(sim, rng);
    const UnitFit a = photolot::fitting::fit_unit_extended(u, options, with);
    const UnitFit b = photolot::fitting::fit_unit_extended(u, options, without);
    ASSERT_TRUE(a.ok() && b.ok()) << a.message << " / " << b.message;
    ASSERT_GT(a.censored_points, 0);
    bias_with += (a.gamma - sim.gamma) / n;
    bias_without += (b.gamma - sim.gamma) / n;
    err.push_back(a.gamma - sim.gamma);
  }
  double var = 0;
  for (double e : err) var += (e - bias_with) * (e - bias_with) / (n - 1);
  const double se_mean = std::sqrt(var / n);
  RecordProperty("bias_with", std::to_string(bias_with));
  RecordProperty("bias_without", std::to_string(bias_without));
  // One-sided terms: mean error within 3 standard errors of zero.
  EXPECT_LT(std::abs(bias_with), 3 * se_mean) << "bias " << bias_with << " se " << se_mean;
  // Dropped: a bias of the expected sign, many standard errors away.
  EXPECT_LT(bias_without, -6 * se_mean) << "bias " << bias_without << " se " << se_mean;
}

// Power-law data should keep the power law; data bent by a dark conductance should pick the
// dark-conductance model. AICc charges the extra parameter 2 + the small-sample term, so on
// straight-line data the richer model wins only by chance (a few percent).
TEST(ModelChoice, PicksThePowerLawForStraightDataAndTheDarkModelForSaturatingData) {
  FitOptions options;
  ExtendedFitOptions ext = no_temperature();
  UnitSim straight;
  straight.noise_pct = 0.5;
  UnitSim bent = straight;
  bent.dark_conductance_s = 1e-7;  // 10 Mohm: 7 % of the conductance at 0.1 lx
  Rng rng(3);
  const int n = 100;
  int straight_ok = 0, bent_ok = 0;
  for (int i = 0; i < n; ++i) {
    const UnitFit a = photolot::fitting::fit_unit_extended(
        photolot::test::simulate_unit(straight, rng), options, ext);
    const UnitFit b = photolot::fitting::fit_unit_extended(photolot::test::simulate_unit(bent, rng),
                                                           options, ext);
    ASSERT_TRUE(a.ok() && b.ok());
    ASSERT_TRUE(std::isfinite(a.aicc_power_law) && std::isfinite(a.aicc_dark_conductance));
    if (a.curve.model == photolot::ModelKind::power_law) ++straight_ok;
    if (b.curve.model == photolot::ModelKind::dark_conductance) ++bent_ok;
    // The evidence is reported: the choice follows the lower AICc.
    EXPECT_EQ(b.curve.model == photolot::ModelKind::dark_conductance,
              b.aicc_dark_conductance < b.aicc_power_law);
  }
  RecordProperty("straight_ok", straight_ok);
  RecordProperty("bent_ok", bent_ok);
  EXPECT_GE(straight_ok, 90) << "power law kept in " << straight_ok << " of " << n;
  EXPECT_GE(bent_ok, 95) << "dark model picked in " << bent_ok << " of " << n;
}

}  // namespace
