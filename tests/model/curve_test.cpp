// The curve evaluator against the closed forms it implements.
#include <gtest/gtest.h>

#include <cmath>

#include "photolot/curve.h"

using photolot::Curve;
using photolot::ModelKind;

TEST(Curve, PowerLawPassesThroughR10AndFallsWithSlopeGamma) {
  const Curve c = photolot::make_power_law(20e3, 0.8);
  EXPECT_NEAR(c.ohm(10.0), 20e3, 1e-9);
  // One decade more light divides R by 10^gamma (the datasheet two-point definition).
  EXPECT_NEAR(c.ohm(100.0), 20e3 / std::pow(10.0, 0.8), 1e-9);
  EXPECT_NEAR(c.two_point_gamma(10.0, 100.0), 0.8, 1e-12);
  EXPECT_NEAR(c.local_gamma(3.0), 0.8, 1e-12);
}

TEST(Curve, PowerLawIntervalGrowsAwayFromTheReferenceLevel) {
  // var ln R(x) = var a + x^2 var b - 2 x cov(a, b), x = ln(E / 10 lx)
  const Curve c = photolot::make_power_law(20e3, 0.8, {1e-4, 0.0, 0.0, 4e-4});
  EXPECT_NEAR(c.ln_ohm_sd(10.0), 1e-2, 1e-12);
  const double x = std::log(100.0 / 10.0);
  EXPECT_NEAR(c.ln_ohm_sd(100.0), std::sqrt(1e-4 + x * x * 4e-4), 1e-12);
}

TEST(Curve, DarkConductanceFlattensAtLowLight) {
  Curve c;
  c.model = ModelKind::dark_conductance;
  const double g10 = 1.0 / 20e3;
  c.params = {std::log(g10), 0.8, 1e-7};  // dark resistance 10 MOhm
  // At 10 lx the two conductances add: 1/R = G_dark + G10.
  EXPECT_NEAR(c.ohm(10.0), 1.0 / (1e-7 + g10), 1e-6);
  // Far below 1 lx the curve tends to the dark resistance and its slope to zero.
  EXPECT_NEAR(c.ohm(1e-9), 1e7, 1e7 * 1e-3);
  EXPECT_LT(c.local_gamma(1e-6), 0.01);
  EXPECT_NEAR(c.local_gamma(1e4), 0.8, 1e-3);
}

TEST(Curve, TemperatureTermAppliesTheCoefficientAtItsIlluminance) {
  Curve c = photolot::make_power_law(20e3, 0.8);
  c.temperature_handled = true;
  c.tc10_pct_per_c = -0.5;
  c.tc_slope_pct_per_c_per_decade = 0.2;
  EXPECT_NEAR(c.ohm(10.0, 35.0), 20e3 * (1 - 0.05), 1e-6);
  // One decade up, the coefficient is -0.3 %/degC.
  EXPECT_NEAR(c.ohm(100.0, 35.0) / c.ohm(100.0), 1 - 0.03, 1e-12);
}
