// The extended lot fit on the project's synthetic-lot generator (photolot/synth.h), with a dark
// conductance, over-range readings and a temperature spread all at once: the known truth is
// recovered to stated tolerances. The plain fit hands units with over-range readings on.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <vector>

#include "photolot/fitting/fit.h"
#include "photolot/fitting/models.h"
#include "photolot/synth.h"

namespace {

photolot::synth::LotSpec spec_with_everything() {
  photolot::synth::LotSpec s;
  s.seed = 42;
  s.units = 24;
  s.lux_levels = {0.1, 0.2, 0.5, 1, 2, 5, 10, 20, 50, 100};
  s.r10_median_ohm = 20e3;
  s.gamma_mean = 0.75;
  s.noise_pct = 0.5;
  s.dark_conductance_s = 1e-7;  // about 10 Mohm in parallel
  s.dark_readings = true;
  s.meter_max_ohm = 550e3;  // the 0.1 lx readings of the darker units are over range
  s.temp_span_c = 10;       // readings between 20 and 30 degC
  s.temp_coeff_pct_per_c = 0.3;
  return s;
}

TEST(ExtendedLotFit, RecoversDarkConductanceAndTemperatureFromASyntheticLot) {
  const auto sim = photolot::synth::simulate(spec_with_everything());
  ASSERT_GT(sim.lot.counts.censored, 0u);
  photolot::fitting::FitOptions options;
  options.meter_accuracy_pct = 0.5;
  const photolot::LotFit fit = photolot::fitting::fit_lot_extended(sim.lot, options, {});
  const auto& t = fit.temperature;
  ASSERT_TRUE(t.identifiable) << t.message;
  EXPECT_NEAR(t.coefficient_pct_per_c, 0.3, 0.03) << t.message;
  EXPECT_NEAR(t.slope_pct_per_c_per_decade, 0.0, 0.05) << t.message;  // the generator has none
  int dark_model = 0, censored_units = 0;
  std::vector<double> g_ratio;
  for (std::size_t i = 0; i < fit.units.size(); ++i) {
    const auto& u = fit.units[i];
    const auto& truth = sim.truth[i];
    ASSERT_TRUE(u.ok()) << u.message;
    censored_units += u.censored_points > 0;
    // R at 10 lx and 25 degC: 1 / (1 / R10_photo + G_dark), within 1 %.
    const double r10_true = 1.0 / (1.0 / truth.r10_ohm + truth.dark_conductance_s);
    EXPECT_NEAR(std::log(u.r10_ohm / r10_true), 0.0, 0.01) << u.id << ": " << u.message;
    if (u.curve.model == photolot::ModelKind::dark_conductance) {
      ++dark_model;
      EXPECT_NEAR(u.gamma, truth.gamma, 0.03) << u.id;
      g_ratio.push_back(u.dark_conductance_s / truth.dark_conductance_s);
    }
  }
  EXPECT_GT(censored_units, 0);
  // The generator spreads G_dark over the lot (lognormal, 30 %); units at its low end whose
  // 0.1 lx readings are over range show the bend in one or two levels only, and AICc keeps the
  // power law for them (a difference of a few units). Three in four picking the dark model is
  // what this lot's readings under light support.
  EXPECT_GE(dark_model, 18) << "of " << fit.units.size();
  std::sort(g_ratio.begin(), g_ratio.end());
  ASSERT_FALSE(g_ratio.empty());
  EXPECT_NEAR(g_ratio[g_ratio.size() / 2], 1.0, 0.1);  // median G_dark within 10 %
}

TEST(PlainFit, HandsUnitsWithOverRangeReadingsToTheExtendedFitWhenAsked) {
  auto spec = spec_with_everything();
  spec.dark_conductance_s = 0;
  spec.temp_span_c = 0;
  spec.dark_readings = false;
  spec.meter_max_ohm = 300e3;
  const auto sim = photolot::synth::simulate(spec);
  int handed = 0;
  for (const auto& unit : sim.lot.units) {
    if (!photolot::fitting::needs_extended_fit(unit)) continue;
    ++handed;
    photolot::fitting::FitOptions o;
    o.over_range_bounds = true;
    const auto plain = photolot::fitting::fit_unit(unit, o);
    const auto ext =
        photolot::fitting::fit_unit_extended(unit, {}, photolot::fitting::power_law_with_bounds());
    ASSERT_TRUE(plain.ok()) << plain.message;
    EXPECT_EQ(plain.gamma, ext.gamma);
    EXPECT_EQ(plain.message, ext.message);
    EXPECT_NE(plain.message.find("over-range bound"), std::string::npos) << plain.message;
    // Not asked: the plain fit leaves the over-range readings out.
    const auto dropped = photolot::fitting::fit_unit(unit);
    EXPECT_EQ(dropped.message.find("over-range bound"), std::string::npos) << dropped.message;
  }
  EXPECT_GT(handed, 0);
}

}  // namespace
