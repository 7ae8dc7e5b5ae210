// The plot geometry against outside references: the chi-square quantile of tables and of
// Boost.Math, a published data set for the sample moments, and Sturges' rule for the bins.
#include "geometry.h"

#include <gtest/gtest.h>

#include <boost/math/distributions/chi_squared.hpp>
#include <cmath>
#include <numeric>
#include <vector>

using photolot::report::Bivariate;

TEST(PlotGeometry, ChiSquareQuantileForTwoDegreesOfFreedomMatchesTablesAndBoost) {
  // NIST/SEMATECH e-Handbook of Statistical Methods, 1.3.6.7.4 (upper critical values of the
  // chi-square distribution): nu = 2, alpha 0.05 -> 5.991; alpha 0.01 -> 9.210.
  EXPECT_NEAR(photolot::report::chi_square_2dof_quantile(0.95), 5.991, 5e-4);
  EXPECT_NEAR(photolot::report::chi_square_2dof_quantile(0.99), 9.210, 5e-4);
  const boost::math::chi_squared chi2(2.0);
  for (double p : {0.5, 0.9, 0.95, 0.99})
    EXPECT_NEAR(photolot::report::chi_square_2dof_quantile(p), boost::math::quantile(chi2, p),
                1e-10);
}

TEST(PlotGeometry, EllipsePointsLieAtTheChiSquareDistanceFromTheMean) {
  // Every point d of the ellipse satisfies d' S^-1 d = q, S = [sx^2, r sx sy; r sx sy, sy^2].
  const Bivariate b{std::log(20e3), 0.75, 0.15, 0.03, -0.6};
  const double q = photolot::report::chi_square_2dof_quantile(0.95);
  const auto pts = photolot::report::tolerance_ellipse(b, q, 90);
  ASSERT_EQ(pts.size(), 91u);
  EXPECT_EQ(pts.front(), pts.back());
  const double det = b.sd_x * b.sd_x * b.sd_y * b.sd_y * (1 - b.rho * b.rho);
  double x_min = INFINITY, x_max = -INFINITY;
  for (const auto& [x, y] : pts) {
    const double dx = x - b.mean_x, dy = y - b.mean_y;
    const double m = (b.sd_y * b.sd_y * dx * dx - 2 * b.rho * b.sd_x * b.sd_y * dx * dy +
                      b.sd_x * b.sd_x * dy * dy) /
                     det;
    EXPECT_NEAR(m, q, 1e-9);
    x_min = std::min(x_min, x);
    x_max = std::max(x_max, x);
  }
  // The shadow of the ellipse on an axis is mean +- sqrt(q) sd, whatever the correlation.
  EXPECT_NEAR(x_max, b.mean_x + std::sqrt(q) * b.sd_x, 1e-12);
  EXPECT_NEAR(x_min, b.mean_x - std::sqrt(q) * b.sd_x, 1e-3 * b.sd_x);
}

TEST(PlotGeometry, SampleMomentsReproduceAnscombesFirstData) {
  // Anscombe, "Graphs in Statistical Analysis", The American Statistician 27 (1973): data set I
  // has mean x 9, mean y 7.50, variance of x 11 and correlation 0.816.
  const std::vector<double> x = {10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5};
  const std::vector<double> y = {8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68};
  const auto b = photolot::report::sample_bivariate(x, y);
  ASSERT_TRUE(b.has_value());
  EXPECT_NEAR(b->mean_x, 9.0, 1e-12);
  EXPECT_NEAR(b->mean_y, 7.50, 5e-3);
  EXPECT_NEAR(b->sd_x * b->sd_x, 11.0, 1e-12);
  EXPECT_NEAR(b->rho, 0.816, 5e-4);
}

TEST(PlotGeometry, SampleMomentsNeedSpreadAndThreePairs) {
  EXPECT_FALSE(
      photolot::report::sample_bivariate(std::vector<double>{1, 2}, std::vector<double>{1, 2}));
  EXPECT_FALSE(photolot::report::sample_bivariate(std::vector<double>{1, 1, 1},
                                                  std::vector<double>{1, 2, 3}));
}

TEST(PlotGeometry, HistogramUsesSturgesBinsAndCountsEveryValue) {
  // Sturges (1926): k = ceil(log2 n) + 1; for n = 40, log2 40 = 5.32 -> 7 bins.
  std::vector<double> v(40);
  std::iota(v.begin(), v.end(), 0.0);
  const auto h = photolot::report::make_histogram(v, 0.0, 39.0);
  EXPECT_EQ(h.counts.size(), 7u);
  EXPECT_EQ(std::accumulate(h.counts.begin(), h.counts.end(), std::size_t{0}), 40u);
  EXPECT_NEAR(h.width, 39.0 / 7, 1e-12);
}
