// The generator must produce lots whose spread is the one asked for, and the same lot for the
// same seed; tests elsewhere rely on both.
#include <gtest/gtest.h>

#include <cmath>
#include <numeric>
#include <vector>

#include "photolot/synth.h"

namespace {

double mean(const std::vector<double>& v) { return std::accumulate(v.begin(), v.end(), 0.0) / v.size(); }
double sd(const std::vector<double>& v) {
  const double m = mean(v);
  double s = 0;
  for (double x : v) s += (x - m) * (x - m);
  return std::sqrt(s / (v.size() - 1));
}

}  // namespace

TEST(Synth, SameSeedGivesTheSameLotByteForByte) {
  photolot::synth::LotSpec spec;
  spec.units = 50;
  spec.outlier_fraction = 0.05;
  spec.dark_readings = true;
  const auto a = photolot::synth::to_csv(photolot::synth::simulate(spec).lot);
  const auto b = photolot::synth::to_csv(photolot::synth::simulate(spec).lot);
  EXPECT_EQ(a, b);
  spec.seed = 2;
  EXPECT_NE(a, photolot::synth::to_csv(photolot::synth::simulate(spec).lot));
}

TEST(Synth, TruthHasTheRequestedSpreadAndCorrelation) {
  // With 20,000 units the sample mean of ln R10 has a standard error of 0.15 / sqrt(20000)
  // ~ 0.001 and the sample sd ~ 0.15 / sqrt(40000) ~ 0.00075; tolerances are about 5 of those.
  photolot::synth::LotSpec spec;
  spec.units = 20000;
  spec.rho = -0.6;
  spec.lux_levels = {10};
  const auto sim = photolot::synth::simulate(spec);
  std::vector<double> ln_r10, gamma;
  for (const auto& t : sim.truth) {
    ln_r10.push_back(std::log(t.r10_ohm));
    gamma.push_back(t.gamma);
  }
  EXPECT_NEAR(mean(ln_r10), std::log(spec.r10_median_ohm), 0.005);
  EXPECT_NEAR(sd(ln_r10), spec.ln_r10_sd, 0.004);
  EXPECT_NEAR(mean(gamma), spec.gamma_mean, 0.001);
  EXPECT_NEAR(sd(gamma), spec.gamma_sd, 0.001);
  double cov = 0;
  const double ma = mean(ln_r10), mb = mean(gamma);
  for (std::size_t i = 0; i < ln_r10.size(); ++i) cov += (ln_r10[i] - ma) * (gamma[i] - mb);
  cov /= ln_r10.size() - 1;
  EXPECT_NEAR(cov / (sd(ln_r10) * sd(gamma)), spec.rho, 0.02);
}

TEST(Synth, ReadingsFollowThePowerLawWithoutNoise) {
  photolot::synth::LotSpec spec;
  spec.units = 3;
  spec.noise_pct = 0;
  const auto sim = photolot::synth::simulate(spec);
  for (std::size_t i = 0; i < sim.truth.size(); ++i) {
    for (const auto& r : sim.lot.units[i].readings) {
      const double expected = sim.truth[i].r10_ohm * std::pow(r.lux / 10.0, -sim.truth[i].gamma);
      EXPECT_NEAR(r.ohm / expected, 1.0, 1e-12);
    }
  }
}

TEST(Synth, OverRangeReadingsBecomeCensoredAtTheMeterBound) {
  photolot::synth::LotSpec spec;
  spec.units = 20;
  spec.lux_levels = {0.01, 1, 10, 100};  // at 0.01 lx R is ~ 20 kOhm * 1000^0.75 ~ 3.6 MOhm
  spec.meter_max_ohm = 2e6;
  const auto sim = photolot::synth::simulate(spec);
  std::size_t censored = 0;
  for (const auto& u : sim.lot.units)
    for (const auto& r : u.readings)
      if (r.kind == photolot::ReadingKind::censored) {
        ++censored;
        EXPECT_EQ(r.ohm, 2e6);
      }
  EXPECT_GT(censored, 10u);
  EXPECT_EQ(sim.lot.counts.censored, censored);
  const auto csv = photolot::synth::to_csv(sim.lot);
  EXPECT_NE(csv.find(",>2e+06,"), std::string::npos);
}

TEST(Synth, SemicolonDialectWritesDecimalCommasInKiloohm) {
  photolot::synth::LotSpec spec;
  spec.units = 1;
  spec.lux_levels = {10};
  spec.noise_pct = 0;
  spec.ln_r10_sd = 0;
  const auto csv = photolot::synth::to_csv(photolot::synth::simulate(spec).lot,
                                           photolot::synth::Dialect::semicolon);
  EXPECT_EQ(csv, "Serial;Illuminance [lx];Resistance [kΩ];Temperature [°C]\nU0001;10;20;25,00\n");
}
