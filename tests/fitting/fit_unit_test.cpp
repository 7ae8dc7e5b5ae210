// fit_unit and fit_unit_closed_form: recovery of known truth, robustness to a misread,
// coverage of the intervals, agreement with outside least-squares and robust solvers, and the
// statuses of units that cannot be fitted.
#include <ceres/ceres.h>
#include <gsl/gsl_cdf.h>
#include <gsl/gsl_fit.h>
#include <gtest/gtest.h>

#include <boost/math/distributions/students_t.hpp>
#include <cmath>
#include <vector>

#include "photolot/fitting/fit.h"
#include "photolot/synth.h"

namespace {

using photolot::FitStatus;
using photolot::Reading;
using photolot::ReadingKind;
using photolot::Unit;
using photolot::UnitFit;
using photolot::fitting::FitOptions;
using photolot::fitting::Loss;

Reading reading(double lux, double ohm, ReadingKind kind = ReadingKind::normal) {
  Reading r;
  r.lux = lux;
  r.ohm = ohm;
  r.kind = kind;
  return r;
}

// A unit read exactly on R = r10 (E / 10)^-gamma at the given levels, times the factors.
Unit exact_unit(double r10_ohm, double gamma, const std::vector<double>& lux,
                const std::vector<double>& factor = {}) {
  Unit u;
  u.id = "T1";
  for (std::size_t i = 0; i < lux.size(); ++i) {
    u.readings.push_back(reading(
        lux[i], r10_ohm * std::pow(lux[i] / 10.0, -gamma) * (i < factor.size() ? factor[i] : 1.0)));
  }
  return u;
}

photolot::synth::SimulatedLot simulated(std::size_t units, double noise_pct, std::uint64_t seed,
                                        std::vector<double> lux = {}) {
  photolot::synth::LotSpec spec;
  spec.seed = seed;
  spec.units = units;
  spec.noise_pct = noise_pct;
  if (!lux.empty()) spec.lux_levels = std::move(lux);
  return photolot::synth::simulate(spec);
}

const std::vector<double> kTenLevels = {1, 2, 5, 10, 20, 50, 100, 200, 500, 1000};

TEST(FitUnit, RecoversKnownR10AndGammaFromASimulatedLot) {
  // 200 units, 0.5 % reading noise over three decades: the standard error of gamma is about
  // 0.001 and of ln R10 about 0.002, so 0.005 and 1 % leave several standard errors of room.
  const auto sim = simulated(200, 0.5, 20261201);
  for (std::size_t i = 0; i < sim.lot.units.size(); ++i) {
    const UnitFit f = photolot::fitting::fit_unit(sim.lot.units[i]);
    ASSERT_TRUE(f.ok()) << f.message;
    EXPECT_NEAR(f.gamma, sim.truth[i].gamma, 0.005) << f.id;
    EXPECT_NEAR(std::log(f.r10_ohm / sim.truth[i].r10_ohm), 0.0, 0.01) << f.id;
    EXPECT_EQ(f.points, 10);
    EXPECT_EQ(f.levels, 10);
    EXPECT_EQ(f.dof, 8);
  }
}

TEST(FitUnit, ReadsTheDatasheetTwoPointGammaFromTheFittedCurve) {
  // On an exact power law, log10(R10 / R100) is gamma itself (the datasheet definition of
  // gamma between 10 and 100 lx, common practice).
  const UnitFit f = photolot::fitting::fit_unit(exact_unit(15e3, 0.7, kTenLevels));
  ASSERT_TRUE(f.ok());
  EXPECT_NEAR(f.gamma, 0.7, 1e-9);
  EXPECT_NEAR(f.r10_ohm, 15e3, 15e3 * 1e-9);
  EXPECT_NEAR(f.gamma_10_100, std::log10(f.curve.ohm(10) / f.curve.ohm(100)), 1e-12);
  EXPECT_NEAR(f.gamma_10_100, 0.7, 1e-9);
}

TEST(FitUnit, IgnoresADecadeSlipOnOnePointOfTenLevels) {
  // One reading logged ten times too high (a range slip on the meter): the robust fit keeps
  // gamma within 0.01 of the truth and flags that point alone.
  const auto sim = simulated(20, 0.5, 7);
  for (std::size_t slipped : {0u, 4u, 9u}) {
    for (std::size_t i = 0; i < sim.lot.units.size(); ++i) {
      Unit u = sim.lot.units[i];
      u.readings[slipped].ohm *= 10.0;
      const UnitFit f = photolot::fitting::fit_unit(u);
      ASSERT_TRUE(f.ok()) << f.message;
      EXPECT_NEAR(f.gamma, sim.truth[i].gamma, 0.01) << u.id << " slip at " << slipped;
      EXPECT_NEAR(std::log(f.r10_ohm / sim.truth[i].r10_ohm), 0.0, 0.02);
      EXPECT_EQ(f.outlier_points, 1);
      EXPECT_TRUE(f.residuals[slipped].outlier);
      // Huber's weight beyond the corner is corner / |r|: a slip of ln 10 = 2.3 in ln R
      // against a corner of a few percent pulls with a few percent of a good point's weight.
      EXPECT_LT(f.residuals[slipped].weight, 0.05);
      // The rms over the kept points reflects the 0.5 % noise, not the slip.
      EXPECT_LT(f.rms_log_residual, 0.012);
    }
  }
  // The same slip moves the least-squares line well beyond 0.01: the robust loss is what holds
  // the fit, not the data.
  Unit u = sim.lot.units[0];
  u.readings[0].ohm *= 10.0;
  EXPECT_GT(std::abs(photolot::fitting::fit_unit_closed_form(u).gamma - sim.truth[0].gamma), 0.05);
}

TEST(FitUnit, CauchyLossAlsoIgnoresADecadeSlip) {
  const auto sim = simulated(10, 0.5, 11);
  FitOptions o;
  o.loss = Loss::cauchy;
  for (std::size_t i = 0; i < sim.lot.units.size(); ++i) {
    Unit u = sim.lot.units[i];
    u.readings[9].ohm /= 10.0;
    const UnitFit f = photolot::fitting::fit_unit(u, o);
    ASSERT_TRUE(f.ok()) << f.message;
    EXPECT_NEAR(f.gamma, sim.truth[i].gamma, 0.01);
    EXPECT_EQ(f.outlier_points, 1);
  }
}

// Fraction of units whose interval holds the truth, over a simulated lot.
struct Coverage {
  double gamma = 0, r10 = 0, ohm_at_1lx = 0;
};

Coverage coverage(const photolot::synth::SimulatedLot& sim, const FitOptions& o) {
  const auto lot = photolot::fitting::fit_lot(sim.lot, o);
  Coverage c;
  for (std::size_t i = 0; i < lot.units.size(); ++i) {
    const UnitFit& f = lot.units[i];
    const auto& t = sim.truth[i];
    c.gamma += f.gamma_ci95[0] <= t.gamma && t.gamma <= f.gamma_ci95[1];
    c.r10 += f.r10_ci95_ohm[0] <= t.r10_ohm && t.r10_ohm <= f.r10_ci95_ohm[1];
    const auto at1 = photolot::fitting::interval_at(f, 1.0, 0.95);
    const double truth1 = t.r10_ohm * std::pow(0.1, -t.gamma);
    c.ohm_at_1lx += at1.lo_ohm <= truth1 && truth1 <= at1.hi_ohm;
  }
  const double n = static_cast<double>(lot.units.size());
  return {c.gamma / n, c.r10 / n, c.ohm_at_1lx / n};
}

// 2,000 units: the count of intervals holding the truth is Binomial(2000, 0.95), standard
// deviation sqrt(0.95 * 0.05 / 2000) = 0.0049 in the fraction; 3 standard deviations allowed.
constexpr double kCoverageTolerance = 3 * 0.0049;

TEST(FitUnit, HuberIntervalsHoldTheTruthNinetyFivePercentOfTheTime) {
  // Six levels (4 dof) so the Student t factor matters: with the normal's 1.96 the coverage
  // would fall to about 0.89.
  const auto sim = simulated(2000, 0.5, 42, {1, 3, 10, 30, 100, 300});
  const Coverage c = coverage(sim, FitOptions{});
  EXPECT_NEAR(c.gamma, 0.95, kCoverageTolerance);
  EXPECT_NEAR(c.r10, 0.95, kCoverageTolerance);
  EXPECT_NEAR(c.ohm_at_1lx, 0.95, kCoverageTolerance);
}

TEST(FitUnit, HuberIntervalsKeepTheirCoverageWhenScatterExceedsTheMeterAccuracy) {
  // 5 % reading noise against a 1 % meter: with the corner left at the meter's accuracy most
  // points would lie beyond it and the intervals held the truth only about 70 % of the time
  // (measured while choosing the method); the corner follows the observed scatter instead.
  const auto sim = simulated(2000, 5.0, 43);
  const Coverage c = coverage(sim, FitOptions{});
  EXPECT_NEAR(c.gamma, 0.95, kCoverageTolerance);
  EXPECT_NEAR(c.r10, 0.95, kCoverageTolerance);
}

TEST(FitUnit, LeastSquaresIntervalsHoldTheTruthNinetyFivePercentOfTheTime) {
  FitOptions o;
  o.loss = Loss::none;
  const auto sim = simulated(2000, 1.0, 44, {1, 3, 10, 30, 100, 300});
  const Coverage c = coverage(sim, o);
  EXPECT_NEAR(c.gamma, 0.95, kCoverageTolerance);
  EXPECT_NEAR(c.r10, 0.95, kCoverageTolerance);
  EXPECT_NEAR(c.ohm_at_1lx, 0.95, kCoverageTolerance);
}

// The log data of a unit as GSL wants it: x = ln(E / 10 lx), y = ln R.
void log_data(const Unit& u, std::vector<double>& x, std::vector<double>& y) {
  for (const auto& r : u.readings) {
    x.push_back(std::log(r.lux / 10.0));
    y.push_back(std::log(r.ohm));
  }
}

TEST(FitUnit, WithoutRobustLossEqualsGslLinearFit) {
  // GNU GSL's gsl_fit_linear fits y = c0 + c1 x, so c0 = ln R10 and c1 = -gamma; its covariance
  // is scaled by the residual variance sumsq / (n - 2), as ours is, and cov(c0, c1) =
  // -cov(ln R10, gamma).
  const auto sim = simulated(5, 1.0, 3, {0.5, 1, 2, 5, 10, 20, 50, 100, 200, 500, 1000, 2000});
  FitOptions o;
  o.loss = Loss::none;
  for (const Unit& u : sim.lot.units) {
    std::vector<double> x, y;
    log_data(u, x, y);
    double c0, c1, cov00, cov01, cov11, sumsq;
    gsl_fit_linear(x.data(), 1, y.data(), 1, x.size(), &c0, &c1, &cov00, &cov01, &cov11, &sumsq);
    for (const UnitFit& f :
         {photolot::fitting::fit_unit(u, o), photolot::fitting::fit_unit_closed_form(u)}) {
      ASSERT_TRUE(f.ok());
      EXPECT_NEAR(f.curve.params[0], c0, 1e-12 * std::abs(c0));
      EXPECT_NEAR(f.gamma, -c1, 1e-12);
      EXPECT_NEAR(f.curve.covariance[0], cov00, 1e-9 * cov00);
      EXPECT_NEAR(f.curve.covariance[1], -cov01, 1e-9 * std::abs(cov01) + 1e-18);
      EXPECT_NEAR(f.curve.covariance[2], -cov01, 1e-9 * std::abs(cov01) + 1e-18);
      EXPECT_NEAR(f.curve.covariance[3], cov11, 1e-9 * cov11);
      EXPECT_EQ(f.iterations, 0);
    }
  }
}

TEST(FitUnit, WithoutRobustLossEqualsGslWeightedFitRescaledByItsChiSquare) {
  // gsl_fit_wlinear with weights 1 / sigma^2 returns (X'WX)^-1 unscaled; multiplied by
  // chisq / (n - 2) it is the scaled covariance we report. With one sigma for every point (a
  // meter accurate to a percentage of reading is one sigma in ln R) it fits the same line.
  const auto sim = simulated(5, 1.0, 5);
  FitOptions o;
  o.loss = Loss::none;
  const double sigma = std::log1p(o.meter_accuracy_pct / 100.0);
  for (const Unit& u : sim.lot.units) {
    std::vector<double> x, y;
    log_data(u, x, y);
    const std::vector<double> w(x.size(), 1.0 / (sigma * sigma));
    double c0, c1, cov00, cov01, cov11, chisq;
    gsl_fit_wlinear(x.data(), 1, w.data(), 1, y.data(), 1, x.size(), &c0, &c1, &cov00, &cov01,
                    &cov11, &chisq);
    const double s2 = chisq / static_cast<double>(x.size() - 2);
    const UnitFit f = photolot::fitting::fit_unit(u, o);
    ASSERT_TRUE(f.ok());
    EXPECT_NEAR(f.curve.params[0], c0, 1e-12 * std::abs(c0));
    EXPECT_NEAR(f.gamma, -c1, 1e-12);
    EXPECT_NEAR(f.ln_r10_sd, std::sqrt(cov00 * s2), 1e-9 * std::sqrt(cov00 * s2));
    EXPECT_NEAR(f.gamma_sd, std::sqrt(cov11 * s2), 1e-9 * std::sqrt(cov11 * s2));
    EXPECT_NEAR(f.curve.covariance[1], -cov01 * s2, 1e-9 * std::abs(cov01 * s2) + 1e-18);
    // The robust cost with Loss::none is chi-square / 2 in units of the meter's sigma.
    EXPECT_NEAR(f.cost, chisq / 2, 1e-9 * chisq);
  }
}

TEST(FitUnit, IntervalsUseStudentTOnNMinusTwoDegreesOfFreedom) {
  // The 95 % interval of ln R at 100 lx from GSL's gsl_fit_linear_est (standard error of the
  // fitted line at x) and GSL's t quantile gsl_cdf_tdist_Pinv; R10's from Boost.Math's
  // students_t. Five levels: 3 dof, t = 3.182 (t tables, e.g. NIST/SEMATECH e-Handbook 1.3.6.7.2).
  const auto sim = simulated(1, 2.0, 9, {1, 5, 10, 50, 100});
  FitOptions o;
  o.loss = Loss::none;
  const UnitFit f = photolot::fitting::fit_unit(sim.lot.units[0], o);
  ASSERT_TRUE(f.ok());
  ASSERT_EQ(f.dof, 3);
  std::vector<double> x, y;
  log_data(sim.lot.units[0], x, y);
  double c0, c1, cov00, cov01, cov11, sumsq;
  gsl_fit_linear(x.data(), 1, y.data(), 1, x.size(), &c0, &c1, &cov00, &cov01, &cov11, &sumsq);
  double y100, y100_err;
  gsl_fit_linear_est(std::log(10.0), c0, c1, cov00, cov01, cov11, &y100, &y100_err);
  const double t = gsl_cdf_tdist_Pinv(0.975, 3);
  EXPECT_NEAR(t, 3.182, 5e-4);  // t table, 3 dof, two-sided 95 %
  const auto at100 = photolot::fitting::interval_at(f, 100.0, 0.95);
  EXPECT_NEAR(std::log(at100.ohm), y100, 1e-12 * std::abs(y100));
  EXPECT_NEAR(std::log(at100.lo_ohm), y100 - t * y100_err, 1e-9);
  EXPECT_NEAR(std::log(at100.hi_ohm), y100 + t * y100_err, 1e-9);

  const boost::math::students_t dist(3);
  const double tb = boost::math::quantile(boost::math::complement(dist, 0.025));
  EXPECT_NEAR(std::log(f.r10_ci95_ohm[0]), c0 - tb * std::sqrt(cov00), 1e-9);
  EXPECT_NEAR(std::log(f.r10_ci95_ohm[1]), c0 + tb * std::sqrt(cov00), 1e-9);
  EXPECT_NEAR(f.gamma_ci95[0], -c1 - tb * std::sqrt(cov11), 1e-9);
  EXPECT_NEAR(f.gamma_ci95[1], -c1 + tb * std::sqrt(cov11), 1e-9);
}

// The whitened power-law residual for Ceres's own solver: (ln R - ln R10 + gamma x) / scale.
struct WhitenedResidual {
  double x, y, inv_scale;
  template <typename T>
  bool operator()(const T* p, T* r) const {
    r[0] = (T(y) - p[0] + p[1] * T(x)) * T(inv_scale);
    return true;
  }
};

std::array<double, 2> ceres_fit(const Unit& u, ceres::LossFunction* loss, double scale,
                                std::array<double, 2> start) {
  ceres::Problem::Options problem_options;
  problem_options.loss_function_ownership = ceres::DO_NOT_TAKE_OWNERSHIP;
  ceres::Problem problem(problem_options);
  for (const auto& r : u.readings) {
    auto* cost = new ceres::AutoDiffCostFunction<WhitenedResidual, 1, 2>(
        new WhitenedResidual{std::log(r.lux / 10.0), std::log(r.ohm), 1.0 / scale});
    problem.AddResidualBlock(cost, loss, start.data());
  }
  ceres::Solver::Options options;
  options.linear_solver_type = ceres::DENSE_QR;
  options.function_tolerance = 1e-16;
  options.gradient_tolerance = 1e-16;
  options.parameter_tolerance = 1e-16;
  options.max_num_iterations = 200;
  ceres::Solver::Summary summary;
  ceres::Solve(options, &problem, &summary);
  return start;
}

TEST(FitUnit, HuberMinimumMatchesCeresSolverWithHuberLoss) {
  // Folding the loss into the residual must leave the minimum where Ceres's own Solve with
  // ceres::HuberLoss puts it. With 0.1 % noise the corner stays at the meter's 1 % (3 x the
  // scatter is below it), so both solve the same problem.
  const auto sim = simulated(8, 0.1, 13);
  const FitOptions o;
  const double scale = std::log1p(o.meter_accuracy_pct / 100.0);
  for (const Unit& unit : sim.lot.units) {
    Unit u = unit;
    u.readings[2].ohm *= 10.0;
    u.readings[7].ohm *= 1.04;
    const UnitFit f = photolot::fitting::fit_unit(u, o);
    ASSERT_TRUE(f.ok());
    ceres::HuberLoss huber(1.0);
    const auto p = ceres_fit(u, &huber, scale, {std::log(20e3), 0.7});
    EXPECT_NEAR(f.curve.params[0], p[0], 1e-7);
    EXPECT_NEAR(f.gamma, p[1], 1e-7);
  }
}

TEST(FitUnit, CauchyMinimumMatchesCeresSolverWithCauchyLoss) {
  const auto sim = simulated(8, 0.1, 17);
  FitOptions o;
  o.loss = Loss::cauchy;
  const double scale = std::log1p(o.meter_accuracy_pct / 100.0);
  for (const Unit& unit : sim.lot.units) {
    Unit u = unit;
    u.readings[5].ohm *= 1.05;
    const UnitFit f = photolot::fitting::fit_unit(u, o);
    ASSERT_TRUE(f.ok());
    ceres::CauchyLoss cauchy(1.0);
    // Cauchy's loss is not convex: start Ceres next to our answer and check it stays there.
    const auto p = ceres_fit(u, &cauchy, scale, {f.curve.params[0] + 1e-3, f.gamma - 1e-3});
    EXPECT_NEAR(f.curve.params[0], p[0], 1e-7);
    EXPECT_NEAR(f.gamma, p[1], 1e-7);
  }
}

TEST(FitUnit, ReportsTooFewLevelsWithNoNumbers) {
  Unit u = exact_unit(10e3, 0.8, {1, 1, 100, 100, 100});
  const UnitFit f = photolot::fitting::fit_unit(u);
  EXPECT_EQ(f.status, FitStatus::too_few_levels);
  EXPECT_NE(f.message.find("2 distinct illuminance levels"), std::string::npos) << f.message;
  EXPECT_TRUE(std::isnan(f.gamma));
  EXPECT_TRUE(std::isnan(f.r10_ohm));
  EXPECT_EQ(f.points, 5);
}

TEST(FitUnit, ReportsASpanUnderOneDecade) {
  const UnitFit f = photolot::fitting::fit_unit(exact_unit(10e3, 0.8, {10, 20, 50, 80}));
  EXPECT_EQ(f.status, FitStatus::span_too_small);
  EXPECT_NE(f.message.find("0.90 decades"), std::string::npos) << f.message;
  EXPECT_TRUE(std::isnan(f.gamma));
}

TEST(FitUnit, ReportsNoValidPointsWhenEveryReadingIsOverRangeOrDark) {
  Unit u;
  u.id = "T9";
  u.readings.push_back(reading(1, 2e6, ReadingKind::censored));
  u.readings.push_back(reading(0, 5e6, ReadingKind::dark));
  u.readings.push_back(reading(5, photolot::kNaN));
  const UnitFit f = photolot::fitting::fit_unit(u);
  EXPECT_EQ(f.status, FitStatus::no_valid_points);
  EXPECT_FALSE(f.message.empty());
  EXPECT_EQ(f.censored_points, 1);
  EXPECT_EQ(f.dark_readings, 1);
  EXPECT_TRUE(std::isnan(f.gamma));
  EXPECT_EQ(photolot::fitting::fit_unit(Unit{}).status, FitStatus::no_valid_points);
}

TEST(FitUnit, KeepsCensoredAndDarkReadingsOutOfTheCurve) {
  const auto sim = simulated(1, 0.5, 21);
  const Unit& plain = sim.lot.units[0];
  Unit mixed = plain;
  mixed.readings.insert(mixed.readings.begin(), reading(0.5, 1e6, ReadingKind::censored));
  mixed.readings.push_back(reading(0, 4e6, ReadingKind::dark));
  mixed.readings.push_back(reading(0, 2e7, ReadingKind::censored));
  const UnitFit a = photolot::fitting::fit_unit(plain);
  const UnitFit b = photolot::fitting::fit_unit(mixed);
  ASSERT_TRUE(b.ok());
  EXPECT_EQ(a.gamma, b.gamma);
  EXPECT_EQ(a.r10_ohm, b.r10_ohm);
  EXPECT_EQ(a.curve.covariance, b.curve.covariance);
  EXPECT_EQ(b.points, a.points);
  EXPECT_EQ(b.censored_points, 1);
  EXPECT_EQ(b.dark_readings, 2);
  EXPECT_EQ(b.dark_ohm, (std::vector<double>{4e6, 2e7}));
  EXPECT_EQ(b.dark_censored, (std::vector<bool>{false, true}));
  // Residuals point back at the readings they came from (the censored one is index 0).
  EXPECT_EQ(b.residuals.front().reading_index, 1u);
  EXPECT_NE(std::find(b.flags.begin(), b.flags.end(), "censored"), b.flags.end());
  EXPECT_NE(std::find(b.flags.begin(), b.flags.end(), "dark"), b.flags.end());
}

TEST(FitUnit, FitsTwoLevelsWhenAllowedButSaysItHasNoIntervals) {
  FitOptions o;
  o.min_levels = 2;
  const UnitFit f = photolot::fitting::fit_unit(exact_unit(10e3, 0.8, {1, 100}), o);
  ASSERT_TRUE(f.ok());
  EXPECT_NEAR(f.gamma, 0.8, 1e-12);
  EXPECT_EQ(f.dof, 0);
  EXPECT_TRUE(std::isnan(f.gamma_sd));
  EXPECT_NE(f.message.find("no scatter"), std::string::npos);
  EXPECT_NE(std::find(f.flags.begin(), f.flags.end(), "few-points"), f.flags.end());
  const auto at = photolot::fitting::interval_at(f, 10.0);
  EXPECT_NEAR(at.ohm, 10e3, 1e-6);
  EXPECT_TRUE(std::isnan(at.lo_ohm));
}

TEST(FitUnit, RefusesInvalidOptionsInItsMessage) {
  FitOptions o;
  o.meter_accuracy_pct = 0;
  const UnitFit f = photolot::fitting::fit_unit(exact_unit(10e3, 0.8, kTenLevels), o);
  EXPECT_EQ(f.status, FitStatus::solver_failed);
  EXPECT_NE(f.message.find("meter_accuracy_pct"), std::string::npos);
}

}  // namespace
