// The dark-conductance fit's covariance against Ceres Solver's own ceres::Covariance (a
// general-purpose library: it inverts J^T J of a ceres::Problem by its own route, dense SVD
// here). Our per-unit fit forms J^T W J from the Jacobian directly; on the same model, data and
// parameters (theta = [ln G10, gamma, ln G_dark], residuals (ln R - ln R_model) / sd, no robust
// loss) the two must agree to rounding, once both are scaled by chi^2 / (n - p) and ln G_dark
// is mapped to G_dark (d G / d ln G = G).
#include <ceres/ceres.h>
#include <gtest/gtest.h>

#include <cmath>
#include <vector>

#include "photolot/fitting/models.h"
#include "simulate.h"

namespace {

using photolot::fitting::FitOptions;

struct DarkResidual {
  double x, y, sd;
  template <typename T>
  bool operator()(const T* theta, T* r) const {
    // 1/R = exp(ln G10 + gamma x) + exp(ln G_dark)
    r[0] = (T(y) + log(exp(theta[0] + theta[1] * x) + exp(theta[2]))) / sd;
    return true;
  }
};

void expect_covariance_matches_ceres(const photolot::test::UnitSim& sim, std::uint64_t seed) {
  photolot::test::Rng rng(seed);
  const photolot::Unit unit = photolot::test::simulate_unit(sim, rng);
  const photolot::UnitFit fit = photolot::test::fit_dark_least_squares(unit);
  ASSERT_TRUE(fit.ok()) << fit.message;
  ASSERT_EQ(fit.curve.covariance.size(), 9u);

  const double sd = std::log1p(FitOptions{}.meter_accuracy_pct / 100.0);
  double theta[3] = {fit.curve.params[0], fit.curve.params[1], std::log(fit.curve.params[2])};
  ceres::Problem problem;
  double chi2 = 0;
  for (const photolot::Reading& r : unit.readings) {
    const DarkResidual d{std::log(r.lux / 10.0), std::log(r.ohm), sd};
    problem.AddResidualBlock(
        new ceres::AutoDiffCostFunction<DarkResidual, 1, 3>(new DarkResidual(d)), nullptr, theta);
    double res = 0;
    d(theta, &res);
    chi2 += res * res;
  }
  ceres::Covariance::Options co;
  co.algorithm_type = ceres::DENSE_SVD;
  ceres::Covariance covariance(co);
  const std::vector<std::pair<const double*, const double*>> blocks = {{theta, theta}};
  ASSERT_TRUE(covariance.Compute(blocks, &problem));
  double c[9];
  ASSERT_TRUE(covariance.GetCovarianceBlock(theta, theta, c));

  const std::size_t n = unit.readings.size(), p = 3;
  const double scale = chi2 / static_cast<double>(n - p);
  const double dmap[3] = {1.0, 1.0, fit.curve.params[2]};
  for (std::size_t i = 0; i < p; ++i)
    for (std::size_t j = 0; j < p; ++j) {
      const double ref = c[i * p + j] * scale * dmap[i] * dmap[j];
      const double tol =
          1e-9 * std::sqrt(std::abs(c[i * p + i] * c[j * p + j])) * scale * dmap[i] * dmap[j];
      EXPECT_NEAR(fit.curve.covariance[i * p + j], ref, tol) << "element " << i << "," << j;
    }
}

TEST(DarkConductanceCovariance, MatchesCeresCovarianceOnAStronglySaturatingUnit) {
  photolot::test::UnitSim sim;
  sim.dark_conductance_s = 2e-7;  // 5 Mohm in parallel: 14 % of the conductance at 0.1 lx
  expect_covariance_matches_ceres(sim, 20261202);
}

TEST(DarkConductanceCovariance, MatchesCeresCovarianceOnAWeaklySaturatingUnit) {
  photolot::test::UnitSim sim;
  sim.dark_conductance_s = 2e-8;  // 50 Mohm: about 1.4 % at 0.1 lx, a poorly determined G_dark
  sim.noise_pct = 0.2;
  expect_covariance_matches_ceres(sim, 7);
}

}  // namespace
