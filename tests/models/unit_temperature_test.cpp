// A unit's own temperature coefficient, over-range dark readings, and the options' rules.
#include <gtest/gtest.h>

#include <cmath>

#include "photolot/fitting/models.h"
#include "simulate.h"

namespace {

using photolot::fitting::ExtendedFitOptions;
using photolot::fitting::FitOptions;

TEST(UnitTemperature, FitsTheUnitsOwnCoefficientWhenItsReadingsSpanEnough) {
  photolot::test::UnitSim sim;
  sim.noise_pct = 0.2;
  sim.repeats = 3;
  sim.temp_span_c = 16;  // readings between 17 and 33 degC
  sim.tc10_pct_per_c = -0.35;
  photolot::test::Rng rng(23);
  const photolot::Unit unit = photolot::test::simulate_unit(sim, rng);
  FitOptions options;
  options.meter_accuracy_pct = 0.2;
  const photolot::UnitFit f = photolot::fitting::fit_unit_extended(unit, options, {});
  ASSERT_TRUE(f.ok()) << f.message;
  ASSERT_TRUE(std::isfinite(f.temp_coeff_pct_per_c)) << f.message;
  EXPECT_NEAR(f.temp_coeff_pct_per_c, -0.35, 0.05) << f.message;
  EXPECT_TRUE(f.curve.temperature_handled);
  EXPECT_NEAR(std::log(f.r10_ohm / photolot::test::true_ohm(sim, 10, 25)), 0.0, 0.005);
}

TEST(UnitTemperature, FallsBackToTheSpecCoefficientWhenTheUnitsOwnIsTooUncertain) {
  photolot::test::UnitSim sim;
  sim.noise_pct = 2.0;  // too noisy to pin the coefficient from ten readings
  sim.temp_span_c = 8;
  photolot::test::Rng rng(29);
  ExtendedFitOptions ext;
  ext.spec_tc10_pct_per_c = 0.2;
  const photolot::UnitFit f =
      photolot::fitting::fit_unit_extended(photolot::test::simulate_unit(sim, rng), {}, ext);
  ASSERT_TRUE(f.ok()) << f.message;
  EXPECT_TRUE(std::isnan(f.temp_coeff_pct_per_c));
  EXPECT_DOUBLE_EQ(f.curve.tc10_pct_per_c, 0.2);
  EXPECT_NE(f.message.find("not identifiable"), std::string::npos) << f.message;
}

// An over-range dark reading says only that 1/G_dark is above the bound: a bound far below the
// truth leaves the lit readings to set G_dark; a measured dark reading pins it.
TEST(DarkReadings, AnOverRangeDarkReadingIsABoundNotAValue) {
  photolot::test::UnitSim sim;
  sim.dark_conductance_s = 2e-7;
  photolot::test::Rng rng(31);
  photolot::Unit unit = photolot::test::simulate_unit(sim, rng);
  photolot::Reading dark;
  dark.lux = 0;
  dark.ohm = 1e6;  // "over 1 Mohm": true 1/G_dark is 5 Mohm
  dark.kind = photolot::ReadingKind::censored;
  unit.readings.push_back(dark);
  ExtendedFitOptions ext;
  ext.model = photolot::fitting::ModelChoice::dark_conductance;
  ext.temperature = photolot::fitting::TemperatureMode::off;
  FitOptions options;
  options.meter_accuracy_pct = 0.5;
  const photolot::UnitFit f = photolot::fitting::fit_unit_extended(unit, options, ext);
  ASSERT_TRUE(f.ok()) << f.message;
  EXPECT_EQ(f.dark_readings, 1);
  EXPECT_GT(1.0 / f.dark_conductance_s, 1e6);
  EXPECT_NEAR(std::log(f.dark_conductance_s / 2e-7), 0.0, 0.15);
}

TEST(ExtendedFitOptions, ValidateNamesTheFieldItsValueAndTheRule) {
  ExtendedFitOptions e;
  EXPECT_EQ(e.validate(), "");
  e.temperature = photolot::fitting::TemperatureMode::apply;
  EXPECT_NE(e.validate().find("spec_tc10_pct_per_c"), std::string::npos);
  e = {};
  e.min_temp_span_c = 0;
  EXPECT_NE(e.validate().find("min_temp_span_c = 0"), std::string::npos) << e.validate();
  e = {};
  e.bench = photolot::BenchProfile{};
  EXPECT_NE(e.validate().find("ohm_range"), std::string::npos) << e.validate();
  // Invalid options are a status with the reason, not a crash.
  const photolot::UnitFit f = photolot::fitting::fit_unit_extended(photolot::Unit{"X", {}}, {}, e);
  EXPECT_EQ(f.status, photolot::FitStatus::solver_failed);
  EXPECT_NE(f.message.find("invalid"), std::string::npos);
}

}  // namespace
