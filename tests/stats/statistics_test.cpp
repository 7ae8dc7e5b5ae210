// Lot statistics against GSL, hand-computed worked examples and simulated lots of known spread.
#include "photolot/statistics.h"

#include <gsl/gsl_cdf.h>
#include <gsl/gsl_sort.h>
#include <gsl/gsl_statistics_double.h>
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <nlohmann/json.hpp>
#include <numbers>
#include <random>
#include <vector>

using photolot::Limits;
using photolot::LotFit;
using photolot::UnitFit;

namespace {

// A standard normal stream from mt19937_64 (whose output the C++ standard fixes) by Box-Muller,
// so the simulated lots are the same with every standard library.
class Normal {
 public:
  explicit Normal(std::uint64_t seed) : engine_(seed) {}
  double operator()() {
    const double u1 = (static_cast<double>(engine_() >> 11) + 0.5) * 0x1.0p-53;
    const double u2 = (static_cast<double>(engine_() >> 11) + 0.5) * 0x1.0p-53;
    return std::sqrt(-2 * std::log(u1)) * std::cos(2 * std::numbers::pi * u2);
  }

 private:
  std::mt19937_64 engine_;
};

UnitFit fitted(std::string id, double r10_ohm, double gamma, double ln_r10_sd = 0.01,
               double gamma_sd = 0.005) {
  UnitFit u;
  u.id = std::move(id);
  u.status = photolot::FitStatus::fitted;
  u.r10_ohm = r10_ohm;
  u.gamma = gamma;
  u.ln_r10_sd = ln_r10_sd;
  u.gamma_sd = gamma_sd;
  u.rms_log_residual = 0.01;
  return u;
}

}  // namespace

TEST(Quantile, MatchesGslType7OnRandomData) {
  Normal normal(7);
  for (std::size_t n : {1u, 2u, 5u, 17u, 60u, 1001u}) {
    std::vector<double> x(n);
    for (auto& v : x) v = 3 + 2 * normal();
    std::sort(x.begin(), x.end());
    for (double p : {0.0, 0.01, 0.05, 0.25, 0.5, 0.95, 0.99, 1.0}) {
      // GSL's gsl_stats_quantile_from_sorted_data interpolates as Hyndman and Fan's type 7.
      const double ref = gsl_stats_quantile_from_sorted_data(x.data(), 1, n, p);
      EXPECT_NEAR(photolot::quantile_type7(x, p), ref, 1e-12) << "n " << n << " p " << p;
    }
  }
}

TEST(Summary, MeanSdAndMedianMatchGsl) {
  Normal normal(11);
  std::vector<double> x(250);
  for (auto& v : x) v = 0.75 + 0.03 * normal();
  const auto s = photolot::summarize(x, {});
  EXPECT_EQ(s.n, x.size());
  EXPECT_NEAR(s.mean, gsl_stats_mean(x.data(), 1, x.size()), 1e-13);  // GSL reference
  EXPECT_NEAR(s.sd, gsl_stats_sd(x.data(), 1, x.size()), 1e-13);      // GSL, n - 1 divisor
  std::vector<double> sorted = x;
  gsl_sort(sorted.data(), 1, sorted.size());
  EXPECT_NEAR(s.median, gsl_stats_median_from_sorted_data(sorted.data(), 1, sorted.size()), 1e-13);
  EXPECT_DOUBLE_EQ(s.min, sorted.front());
  EXPECT_DOUBLE_EQ(s.max, sorted.back());
  EXPECT_NEAR(s.percentiles[1], gsl_stats_quantile_from_sorted_data(sorted.data(), 1, 250, 0.05),
              1e-13);
  // Tolerance interval = mean -+ k2 s with Howe's factor (NIST/SEMATECH 7.2.6.3).
  const double k2 = photolot::tolerance_factor_howe(250, 0.99, 0.95);
  EXPECT_NEAR(s.tolerance_interval[0], s.mean - k2 * s.sd, 1e-12);
  EXPECT_NEAR(s.tolerance_interval[1], s.mean + k2 * s.sd, 1e-12);
}

TEST(Summary, RemovesFitNoiseToRecoverTheKnownSpreadOfASimulatedLot) {
  // True ln R10 ~ N(ln 20 kohm, 0.15); each unit's fitted value adds its own noise of known sd
  // (0.05 to 0.15, as a poorly measured lot would). Observed variance = 0.15^2 + mean e^2, so
  // removing the mean fit variance must recover 0.15. With 2000 units the estimate's standard
  // error is about 0.0035; the tolerance is 0.012 (more than 3 standard errors).
  Normal normal(20261201);
  const double true_sd = 0.15;
  std::vector<double> values, noise_sd;
  for (int i = 0; i < 2000; ++i) {
    const double e = 0.05 + 0.10 * (i % 11) / 10.0;
    values.push_back(std::log(20e3) + true_sd * normal() + e * normal());
    noise_sd.push_back(e);
  }
  const auto s = photolot::summarize(values, noise_sd);
  EXPECT_NEAR(s.sd_without_fit_noise, true_sd, 0.012);
  EXPECT_GT(s.sd, true_sd + 0.02);  // the observed spread is visibly inflated by the noise
}

TEST(Summary, FloorsTheSpreadWithoutFitNoiseAtZero) {
  // Noise larger than the whole observed spread: variance difference negative -> 0, not NaN.
  const std::vector<double> values = {1.0, 1.1, 0.9, 1.05, 0.95};
  const std::vector<double> noise(5, 1.0);
  EXPECT_EQ(photolot::summarize(values, noise).sd_without_fit_noise, 0.0);
}

TEST(Capability, MatchesTheNistHandbookWorkedExample) {
  // NIST/SEMATECH e-Handbook of Statistical Methods, section 6.1.6 (from memory): USL 20,
  // LSL 8, mean 16, s 2 -> Cp = 12 / 12 = 1.0, Cpk = min(4 / 6, 8 / 6) = 0.667.
  const auto c = photolot::capability(16, 2, 2, Limits{8, 20});
  EXPECT_NEAR(c.cp, 1.0, 1e-12);
  EXPECT_NEAR(c.cpk, 2.0 / 3.0, 1e-12);
  EXPECT_NEAR(c.pp, 1.0, 1e-12);
  EXPECT_NEAR(c.ppk, 2.0 / 3.0, 1e-12);
  // Expected fraction outside under normality: P(Z > 2) + P(Z < -4), GSL's normal tails.
  EXPECT_NEAR(c.ppm_above, 1e6 * gsl_cdf_ugaussian_Q(2.0), 1e-6);
  EXPECT_NEAR(c.ppm_below, 1e6 * gsl_cdf_ugaussian_P(-4.0), 1e-6);
}

TEST(Capability, UsesTheOneSidedIndexWhereOnlyOneLimitExists) {
  // By hand: Cpk with an upper limit only = (USL - mean) / (3 s) = (13 - 10) / (3 * 0.5) = 2.
  const auto c = photolot::capability(10, 0.5, 1.0, Limits{photolot::kNaN, 13});
  EXPECT_TRUE(std::isnan(c.cp));
  EXPECT_NEAR(c.cpk, 2.0, 1e-12);
  EXPECT_NEAR(c.ppk, 1.0, 1e-12);  // (13 - 10) / (3 * 1)
  EXPECT_EQ(c.ppm_below, 0.0);
  EXPECT_NEAR(c.ppm_above, 1e6 * gsl_cdf_ugaussian_Q(3.0), 1e-6);  // GSL normal tail
}

TEST(ModifiedZ, FlagsOnlyTheFarValueInAHandComputedSet) {
  // By hand (Iglewicz and Hoaglin, M = 0.6745 (x - median) / MAD): median 2.3; absolute
  // deviations 0.2 0.1 0.1 0 0 0.1 2.7 have median 0.1; M(5.0) = 0.6745 * 2.7 / 0.1 = 18.2115,
  // M(2.1) = 0.6745 * -0.2 / 0.1 = -1.349.
  const std::vector<double> x = {2.1, 2.2, 2.2, 2.3, 2.3, 2.4, 5.0};
  const auto z = photolot::modified_z_scores(x);
  EXPECT_NEAR(z[6], 18.2115, 1e-9);
  EXPECT_NEAR(z[0], -1.349, 1e-9);
  EXPECT_NEAR(z[3], 0.0, 1e-12);
  int flagged = 0;
  for (double v : z) flagged += std::abs(v) > 3.5 ? 1 : 0;
  EXPECT_EQ(flagged, 1);
}

TEST(ModifiedZ, IsUndefinedWhenHalfTheValuesAreEqual) {
  // MAD = 0: the rule cannot scale deviations, so no unit is flagged.
  const auto z = photolot::modified_z_scores(std::vector<double>{1, 1, 1, 2});
  for (double v : z) EXPECT_TRUE(std::isnan(v));
}

TEST(LotStatistics, SummarisesLnR10AndFlagsTheOutlierUnit) {
  LotFit fit;
  const double gammas[] = {0.74, 0.75, 0.76, 0.75, 0.73, 0.77, 0.75};
  const double r10s[] = {19e3, 20e3, 21e3, 20.5e3, 19.5e3, 20e3, 60e3};
  for (int i = 0; i < 7; ++i)
    fit.units.push_back(fitted(std::string(1, 'U').append(std::to_string(i)), r10s[i], gammas[i]));
  UnitFit failed;
  failed.id = "U7";
  failed.status = photolot::FitStatus::too_few_levels;
  fit.units.push_back(failed);

  photolot::Spec spec;
  spec.r10_ohm = {15e3, 25e3};
  spec.gamma = {0.65, 0.85};
  const auto st = photolot::lot_statistics(fit, {}, &spec);
  EXPECT_EQ(st.units_total, 8u);
  EXPECT_EQ(st.units_fitted, 7u);
  std::vector<double> ln;
  for (double r : r10s) ln.push_back(std::log(r));
  EXPECT_NEAR(st.ln_r10.mean, gsl_stats_mean(ln.data(), 1, ln.size()), 1e-12);  // GSL
  std::vector<double> g(std::begin(gammas), std::end(gammas));
  EXPECT_NEAR(st.correlation_ln_r10_gamma, gsl_stats_correlation(ln.data(), 1, g.data(), 1, 7),
              1e-12);  // GSL's Pearson correlation
  ASSERT_EQ(st.outliers.size(), 1u);
  EXPECT_EQ(st.outliers[0].id, "U6");
  EXPECT_EQ(st.outliers[0].characteristic, photolot::Characteristic::r10);
  ASSERT_TRUE(st.r10_capability.has_value());
  // Ppk on ln R10 (by the formula): min(ln 25k - mean, mean - ln 15k) / (3 s).
  const double s = st.ln_r10.sd, m = st.ln_r10.mean;
  EXPECT_NEAR(st.r10_capability->ppk, std::min(std::log(25e3) - m, m - std::log(15e3)) / (3 * s),
              1e-12);
  EXPECT_TRUE(st.gamma_capability.has_value());
}

TEST(LotStatisticsJson, ReportsR10OnTheGeometricScaleAndGammaAsIs) {
  LotFit fit;
  const double r10s[] = {18e3, 20e3, 22e3, 19e3, 21e3};
  const double gammas[] = {0.74, 0.75, 0.76, 0.73, 0.77};
  for (int i = 0; i < 5; ++i)
    fit.units.push_back(fitted(std::string("U").append(std::to_string(i)), r10s[i], gammas[i]));
  photolot::StatisticsOptions options;
  options.exact_tolerance_factor = true;
  const auto st = photolot::lot_statistics(fit, options);
  const auto j = photolot::lot_statistics_json(st);
  // Geometric mean = exp(mean ln R10) = (prod R10)^(1/n), by the definition.
  double prod = 1;
  for (double r : r10s) prod *= r;
  EXPECT_NEAR(j["r10_ohm"]["mean"].get<double>(), std::pow(prod, 1.0 / 5), 1e-6);
  EXPECT_NEAR(j["r10_ohm"]["median"].get<double>(), 20e3, 1e-6);  // middle of five values
  EXPECT_NEAR(j["r10_ohm"]["spread_factor"].get<double>(), std::exp(st.ln_r10.sd), 1e-12);
  EXPECT_NEAR(j["gamma"]["median"].get<double>(), 0.75, 1e-12);
  EXPECT_TRUE(j["gamma"]["percentiles"].contains("p1"));
  EXPECT_TRUE(j["gamma"]["percentiles"].contains("p99"));
  EXPECT_EQ(j["tolerance_method"], "exact");
  EXPECT_NEAR(st.gamma.tolerance_factor, photolot::tolerance_factor_exact(5, 0.99, 0.95), 1e-12);
  EXPECT_EQ(j["r10_ohm"]["tolerance_interval"].size(), 2u);
  EXPECT_FALSE(j["r10_ohm"].contains("capability"));  // no spec, no limits
}
