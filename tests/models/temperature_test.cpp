// Temperature handling: the joint lot coefficient where readings span enough temperature, and
// the "not identifiable" path that applies the spec's coefficient (or none) and says which.
#include <gtest/gtest.h>

#include <cmath>
#include <string>

#include "photolot/fitting/models.h"
#include "simulate.h"

namespace {

using photolot::Lot;
using photolot::LotFit;
using photolot::fitting::ExtendedFitOptions;
using photolot::fitting::FitOptions;
using photolot::test::Rng;
using photolot::test::UnitSim;

Lot simulate_lot(const UnitSim& base, int units, std::uint64_t seed, std::vector<UnitSim>* truth) {
  Rng rng(seed);
  Lot lot;
  lot.name = "invented test lot";
  for (int i = 0; i < units; ++i) {
    UnitSim s = base;
    // Lot spread: R10 within about +-30 %, gamma within +-0.05.
    s.r10_ohm = base.r10_ohm * std::exp(0.15 * rng.normal());
    s.gamma = base.gamma + 0.025 * rng.normal();
    lot.units.push_back(photolot::test::simulate_unit(s, rng, "T" + std::to_string(i + 1)));
    if (truth) truth->push_back(s);
  }
  return lot;
}

TEST(LotTemperature, FitsTheSharedCoefficientJointlyAndStatesR10At25C) {
  UnitSim base;
  base.noise_pct = 0.5;
  base.temp_c = 25;
  base.temp_span_c = 10;      // readings between 20 and 30 degC
  base.tc10_pct_per_c = 0.4;  // a few tenths of a percent per degC near 10 lx (trade, memory)
  base.tc_slope = -0.2;       // stronger at low light: larger below 10 lx
  std::vector<UnitSim> truth;
  const Lot lot = simulate_lot(base, 30, 5, &truth);
  FitOptions options;
  options.meter_accuracy_pct = 0.5;
  options.threads = 2;
  const LotFit fit = photolot::fitting::fit_lot_extended(lot, options, ExtendedFitOptions{});
  const auto& t = fit.temperature;
  EXPECT_TRUE(t.identifiable) << t.message;
  EXPECT_EQ(t.source, "fitted");
  EXPECT_GT(t.span_c, 9.0);
  EXPECT_NEAR(t.coefficient_pct_per_c, 0.4, 0.03) << t.message;
  EXPECT_NEAR(t.slope_pct_per_c_per_decade, -0.2, 0.05) << t.message;
  for (std::size_t i = 0; i < fit.units.size(); ++i) {
    const auto& u = fit.units[i];
    ASSERT_TRUE(u.ok()) << u.message;
    EXPECT_TRUE(u.curve.temperature_handled);
    // R10 at 25 degC: the true curve there, within a few times the 0.5 % noise / sqrt(10).
    EXPECT_NEAR(std::log(u.r10_ohm / photolot::test::true_ohm(truth[i], 10.0, 25.0)), 0.0, 0.01)
        << u.id;
    EXPECT_NEAR(u.gamma, truth[i].gamma, 0.02) << u.id;
  }
}

TEST(LotTemperature, SaysNotIdentifiableAtConstantTemperatureAndAppliesTheSpecCoefficient) {
  UnitSim base;
  base.noise_pct = 0.5;
  base.temp_c = 30;           // a warm bench, every reading at 30 degC
  base.tc10_pct_per_c = 0.3;  // the truth, and what the spec states
  std::vector<UnitSim> truth;
  const Lot lot = simulate_lot(base, 10, 9, &truth);
  ExtendedFitOptions ext;
  ext.spec_tc10_pct_per_c = 0.3;
  FitOptions options;
  const LotFit fit = photolot::fitting::fit_lot_extended(lot, options, ext);
  const auto& t = fit.temperature;
  EXPECT_FALSE(t.identifiable);
  EXPECT_EQ(t.source, "spec");
  EXPECT_DOUBLE_EQ(t.coefficient_pct_per_c, 0.3);
  EXPECT_DOUBLE_EQ(t.span_c, 0.0);
  EXPECT_NE(t.message.find("not identifiable"), std::string::npos) << t.message;
  EXPECT_NE(t.message.find("spec"), std::string::npos) << t.message;
  for (std::size_t i = 0; i < fit.units.size(); ++i) {
    const auto& u = fit.units[i];
    ASSERT_TRUE(u.ok()) << u.message;
    EXPECT_TRUE(u.curve.temperature_handled);
    EXPECT_DOUBLE_EQ(u.curve.tc10_pct_per_c, 0.3);
    EXPECT_TRUE(std::isnan(u.temp_coeff_pct_per_c));
    // Stated at 25 degC: R(10 lx, 30 degC) / (1 + 0.3 % x 5 degC), the correction applied.
    EXPECT_NEAR(std::log(u.r10_ohm / photolot::test::true_ohm(truth[i], 10.0, 25.0)), 0.0, 0.01)
        << u.id;
  }
}

TEST(LotTemperature, SaysNoneWhenNotIdentifiableAndNoSpecCoefficientIsGiven) {
  UnitSim base;
  base.temp_c = 22;
  const Lot lot = simulate_lot(base, 4, 13, nullptr);
  const LotFit fit = photolot::fitting::fit_lot_extended(lot);
  EXPECT_FALSE(fit.temperature.identifiable);
  EXPECT_EQ(fit.temperature.source, "none");
  EXPECT_TRUE(std::isnan(fit.temperature.coefficient_pct_per_c));
  for (const auto& u : fit.units) EXPECT_FALSE(u.curve.temperature_handled);
}

TEST(LotFitExtended, GivesTheSameResultsWhateverTheThreadCount) {
  UnitSim base;
  base.temp_span_c = 8;
  base.tc10_pct_per_c = 0.25;
  base.dark_conductance_s = 1e-7;
  const Lot lot = simulate_lot(base, 12, 21, nullptr);
  FitOptions one, many;
  one.threads = 1;
  many.threads = 2;
  const LotFit a = photolot::fitting::fit_lot_extended(lot, one);
  const LotFit b = photolot::fitting::fit_lot_extended(lot, many);
  EXPECT_EQ(a.temperature.coefficient_pct_per_c, b.temperature.coefficient_pct_per_c);
  ASSERT_EQ(a.units.size(), b.units.size());
  for (std::size_t i = 0; i < a.units.size(); ++i) {
    EXPECT_EQ(a.units[i].r10_ohm, b.units[i].r10_ohm);
    EXPECT_EQ(a.units[i].gamma, b.units[i].gamma);
    EXPECT_EQ(a.units[i].message, b.units[i].message);
  }
}

}  // namespace

namespace {

TEST(LotTemperature, NamesTheOutcomeOfEachWayOfHandlingIt) {
  // The same invented lot four ways: readings over 20-30 degC are fitted; handling off and a
  // run that applies a given coefficient do not look for one (not sought, whatever the
  // readings); one temperature for every reading cannot show one (not identifiable).
  using photolot::TemperatureOutcome;
  using photolot::fitting::TemperatureMode;
  UnitSim base;
  base.noise_pct = 0.5;
  base.temp_c = 25;
  base.temp_span_c = 10;
  base.tc10_pct_per_c = 0.4;
  const Lot spread = simulate_lot(base, 20, 21, nullptr);
  ExtendedFitOptions ext;
  const LotFit fitted = photolot::fitting::fit_lot_extended(spread, FitOptions{}, ext);
  EXPECT_EQ(fitted.temperature.outcome, TemperatureOutcome::fitted) << fitted.temperature.message;
  EXPECT_TRUE(fitted.temperature.reason.empty());

  ext.temperature = TemperatureMode::off;
  const LotFit off = photolot::fitting::fit_lot_extended(spread, FitOptions{}, ext);
  EXPECT_EQ(off.temperature.outcome, TemperatureOutcome::not_sought);
  EXPECT_NE(off.temperature.reason.find("off"), std::string::npos) << off.temperature.reason;

  ext.temperature = TemperatureMode::apply;
  ext.spec_tc10_pct_per_c = 0.3;
  const LotFit applied = photolot::fitting::fit_lot_extended(spread, FitOptions{}, ext);
  EXPECT_EQ(applied.temperature.outcome, TemperatureOutcome::not_sought);
  EXPECT_EQ(applied.temperature.source, "spec");
  EXPECT_EQ(applied.temperature.message.find("not identifiable"), std::string::npos)
      << applied.temperature.message;

  base.temp_span_c = 0;
  const Lot flat = simulate_lot(base, 20, 21, nullptr);
  ext.temperature = TemperatureMode::fit;
  const LotFit one = photolot::fitting::fit_lot_extended(flat, FitOptions{}, ext);
  EXPECT_EQ(one.temperature.outcome, TemperatureOutcome::not_identifiable);
  EXPECT_NE(one.temperature.reason.find("span"), std::string::npos) << one.temperature.reason;
  EXPECT_EQ(one.temperature.message.find(one.temperature.reason), 18u)
      << "the message opens with \"not identifiable: \" and the reason";
}

}  // namespace
