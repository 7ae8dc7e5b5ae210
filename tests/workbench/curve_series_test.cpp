// What the curves view plots, computed without a widget.
#include "curve_series.h"

#include <gtest/gtest.h>

#include <cmath>

namespace photolot::workbench {
namespace {

Lot one_unit_lot() {
  Lot lot;
  Unit u;
  u.id = "A";
  for (double lux : {1.0, 3.0, 10.0, 30.0, 100.0}) {
    u.readings.push_back({lux, 20e3 * std::pow(lux / 10, -0.75), kNaN, ReadingKind::normal, {}});
  }
  u.readings.push_back({0.5, 2e6, kNaN, ReadingKind::censored, {}});
  u.readings.push_back({0.0, 5e6, kNaN, ReadingKind::dark, {}});
  lot.units.push_back(u);
  return lot;
}

TEST(CurveSeries, FittedLineFollowsThePowerLaw) {
  // R(E) = R10 (E / 10 lx)^-gamma, so R(100 lx) = R10 / 10^gamma: the datasheet two-point gamma
  // log10(R10 / R100) (common practice across photoresistor datasheets).
  Lot lot = one_unit_lot();
  LotFit fit;
  UnitFit u;
  u.status = FitStatus::fitted;
  u.curve = make_power_law(20e3, 0.75);
  fit.units.push_back(u);
  CurveSeriesOptions options;
  options.bands = false;
  const auto series = build_curve_series(lot, &fit, {0}, options);
  ASSERT_EQ(series.size(), 1u);
  const auto& s = series[0];
  ASSERT_EQ(s.line_lux.size(), 2u);  // a straight line on log-log axes needs two points
  EXPECT_DOUBLE_EQ(s.line_lux.front(), 1.0);
  EXPECT_DOUBLE_EQ(s.line_lux.back(), 100.0);
  EXPECT_NEAR(std::log10(s.line_ohm.front() / s.line_ohm.back()) / 2, 0.75, 1e-12);
  EXPECT_NEAR(s.line_ohm.back(), 20e3 / std::pow(10, 0.75), 1e-6);
}

TEST(CurveSeries, KeepsOverRangeApartAndDarkReadingsOff) {
  Lot lot = one_unit_lot();
  const auto series = build_curve_series(lot, nullptr, {0});
  ASSERT_EQ(series.size(), 1u);
  EXPECT_EQ(series[0].normal_lux.size(), 5u);
  EXPECT_EQ(series[0].censored_lux.size(), 1u);  // the 0.5 lx over-range reading
  EXPECT_TRUE(series[0].line_lux.empty());       // not fitted: no line
}

TEST(CurveSeries, BandAtTenLuxIsStudentTTimesTheStandardErrorOfLnR10) {
  // Var(ln R10) = 0.01 -> sd 0.1 at 10 lx (the gradient there is (1, 0)). With 8 degrees of
  // freedom t(0.975) = 2.306 (NIST/SEMATECH e-Handbook 1.3.6.7.2, table of t critical values).
  Lot lot = one_unit_lot();
  LotFit fit;
  UnitFit u;
  u.status = FitStatus::fitted;
  u.dof = 8;
  u.curve = make_power_law(20e3, 0.75, {0.01, 0, 0, 0.0004});
  fit.units.push_back(u);
  CurveSeriesOptions options;
  options.line_samples = 3;  // 1, 10, 100 lx
  const auto s = build_curve_series(lot, &fit, {0}, options)[0];
  ASSERT_EQ(s.line_lux.size(), 3u);
  EXPECT_NEAR(s.line_lux[1], 10.0, 1e-9);
  EXPECT_NEAR(std::log(s.band_high_ohm[1] / s.line_ohm[1]), 2.306 * 0.1, 0.0005);
  EXPECT_NEAR(std::log(s.line_ohm[1] / s.band_low_ohm[1]), 2.306 * 0.1, 0.0005);
}

TEST(CurveSeries, MarksTheFitsOutliersApart) {
  Lot lot = one_unit_lot();
  LotFit fit;
  UnitFit u;
  u.status = FitStatus::fitted;
  u.curve = make_power_law(20e3, 0.75);
  for (std::size_t i = 0; i < 5; ++i) {
    PointFit p;
    p.reading_index = i;
    p.lux = lot.units[0].readings[i].lux;
    p.outlier = i == 2;
    p.residual_ln = i == 2 ? 2.3 : 0.0;
    u.residuals.push_back(p);
  }
  fit.units.push_back(u);
  const auto s = build_curve_series(lot, &fit, {0})[0];
  EXPECT_EQ(s.normal_lux.size(), 4u);
  ASSERT_EQ(s.outlier_lux.size(), 1u);
  EXPECT_DOUBLE_EQ(s.outlier_lux[0], 10.0);
  EXPECT_EQ(s.outlier_residual_ln.size(), 1u);
  EXPECT_EQ(s.residual_ln.size(), 4u);
}

}  // namespace
}  // namespace photolot::workbench
