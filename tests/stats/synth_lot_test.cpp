// Lot statistics on lots from the synthetic-lot generator, whose true spread is known: a
// least-squares line per unit (written out here, so the test needs no solver) gives each unit's
// ln R10, gamma and their standard errors, as the fit would.
#include <gtest/gtest.h>

#include <cmath>

#include "photolot/statistics.h"
#include "photolot/synth.h"

namespace {

// Ordinary least squares of ln R on x = ln(E / 10 lx): ln R = a - gamma x. Standard errors
// from the textbook formulas: s^2 = SSE / (n - 2), se(a) at x = 0 is s sqrt(1/n + xbar^2 / Sxx),
// se(slope) = s / sqrt(Sxx) (e.g. NIST/SEMATECH e-Handbook, section 4.1.4.1, from memory).
photolot::UnitFit least_squares(const photolot::Unit& unit) {
  double sx = 0, sy = 0;
  int n = 0;
  for (const auto& r : unit.readings) {
    if (r.kind != photolot::ReadingKind::normal) continue;
    sx += std::log(r.lux / 10);
    sy += std::log(r.ohm);
    ++n;
  }
  const double xbar = sx / n, ybar = sy / n;
  double sxx = 0, sxy = 0;
  for (const auto& r : unit.readings) {
    if (r.kind != photolot::ReadingKind::normal) continue;
    const double dx = std::log(r.lux / 10) - xbar;
    sxx += dx * dx;
    sxy += dx * (std::log(r.ohm) - ybar);
  }
  const double slope = sxy / sxx, a = ybar - slope * xbar;
  double sse = 0;
  for (const auto& r : unit.readings) {
    if (r.kind != photolot::ReadingKind::normal) continue;
    const double e = std::log(r.ohm) - (a + slope * std::log(r.lux / 10));
    sse += e * e;
  }
  const double s = std::sqrt(sse / (n - 2));
  photolot::UnitFit u;
  u.id = unit.id;
  u.status = photolot::FitStatus::fitted;
  u.r10_ohm = std::exp(a);
  u.gamma = -slope;
  u.ln_r10_sd = s * std::sqrt(1.0 / n + xbar * xbar / sxx);
  u.gamma_sd = s / std::sqrt(sxx);
  return u;
}

}  // namespace

TEST(SynthLotStatistics, RecoversTheTrueGammaSpreadUnderHeavyReadingNoise) {
  // 5 % reading noise on four levels makes each unit's gamma uncertain by about 0.015, close to
  // the lot's true spread of 0.02: the observed sd is inflated to about 0.025, and removing the
  // mean fit variance must give back 0.02 (tolerance 0.0025, about four standard errors of an
  // sd from 2000 units), and the drawn units' own sd more closely (0.0015).
  photolot::synth::LotSpec spec;
  spec.seed = 2859;
  spec.units = 2000;
  spec.lux_levels = {2, 10, 50, 200};
  spec.gamma_sd = 0.02;
  spec.ln_r10_sd = 0.15;
  spec.noise_pct = 5.0;
  const auto sim = photolot::synth::simulate(spec);
  photolot::LotFit fit;
  for (const auto& unit : sim.lot.units) fit.units.push_back(least_squares(unit));

  // The drawn units' own spread (sampling noise of the truth taken out of the comparison).
  double mean = 0, var = 0;
  for (const auto& t : sim.truth) mean += t.gamma;
  mean /= static_cast<double>(sim.truth.size());
  for (const auto& t : sim.truth) var += (t.gamma - mean) * (t.gamma - mean);
  const double truth_sd = std::sqrt(var / static_cast<double>(sim.truth.size() - 1));

  const auto st = photolot::lot_statistics(fit);
  EXPECT_EQ(st.units_fitted, 2000u);
  EXPECT_NEAR(st.gamma.sd_without_fit_noise, 0.02, 0.0025);
  EXPECT_NEAR(st.gamma.sd_without_fit_noise, truth_sd, 0.0015);
  EXPECT_GT(st.gamma.sd, 0.023);
  EXPECT_NEAR(st.gamma.mean, spec.gamma_mean, 0.003);  // 0.025 / sqrt(2000) = 0.0006 per sd
  // ln R10: true sd 0.15, fit noise about 0.025; the sd of 2000 values is within 0.01 of it.
  EXPECT_NEAR(st.ln_r10.sd_without_fit_noise, 0.15, 0.01);
  EXPECT_NEAR(std::exp(st.ln_r10.median), spec.r10_median_ohm, 0.03 * spec.r10_median_ohm);
  // No decade slips were simulated, so no unit is an outlier at |M| > 3.5 by more than chance:
  // for normal data P(|Z| > 3.5) = 4.7e-4 (normal tables), about one unit in 2000.
  EXPECT_LE(st.outliers.size(), 6u);
}
