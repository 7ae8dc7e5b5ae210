// fit_lot: the same answers whatever the thread count, progress reports, and stopping.
#include <gtest/gtest.h>

#include <atomic>
#include <bit>
#include <cstdint>
#include <stop_token>
#include <vector>

#include "photolot/fitting/fit.h"
#include "photolot/synth.h"

namespace {

using photolot::FitStatus;
using photolot::LotFit;
using photolot::UnitFit;
using photolot::fitting::FitOptions;

photolot::synth::SimulatedLot noisy_lot(std::size_t units) {
  photolot::synth::LotSpec spec;
  spec.seed = 31;
  spec.units = units;
  spec.noise_pct = 1.0;
  spec.outlier_fraction = 0.05;  // decade slips, so the robust path and outlier flags run
  spec.dark_readings = true;
  spec.meter_max_ohm = 2e6;  // some over-range readings at low light
  return photolot::synth::simulate(spec);
}

// Bit patterns, so that -0.0 vs 0.0 or two NaNs count as they are stored.
std::vector<std::uint64_t> bits(const UnitFit& f) {
  std::vector<double> v = {f.r10_ohm,          f.gamma,         f.gamma_10_100,
                           f.ln_r10_sd,        f.gamma_sd,      f.r10_ci95_ohm[0],
                           f.r10_ci95_ohm[1],  f.gamma_ci95[0], f.gamma_ci95[1],
                           f.rms_log_residual, f.cost};
  v.insert(v.end(), f.curve.params.begin(), f.curve.params.end());
  v.insert(v.end(), f.curve.covariance.begin(), f.curve.covariance.end());
  for (const auto& p : f.residuals) {
    v.push_back(p.residual_ln);
    v.push_back(p.weight);
  }
  std::vector<std::uint64_t> out;
  for (double d : v) out.push_back(std::bit_cast<std::uint64_t>(d));
  return out;
}

TEST(FitLot, GivesBitIdenticalResultsOnOneTwoAndFourThreads) {
  const auto sim = noisy_lot(300);
  std::vector<LotFit> fits;
  for (int threads : {1, 2, 4}) {
    FitOptions o;
    o.threads = threads;
    fits.push_back(photolot::fitting::fit_lot(sim.lot, o));
  }
  ASSERT_EQ(fits[0].units.size(), 300u);
  EXPECT_GT(fits[0].fitted_count(), 250u);
  for (std::size_t k = 1; k < fits.size(); ++k) {
    for (std::size_t i = 0; i < fits[0].units.size(); ++i) {
      const UnitFit& a = fits[0].units[i];
      const UnitFit& b = fits[k].units[i];
      EXPECT_EQ(a.id, b.id);
      EXPECT_EQ(a.status, b.status);
      EXPECT_EQ(a.message, b.message);
      EXPECT_EQ(a.flags, b.flags);
      EXPECT_EQ(a.iterations, b.iterations);
      EXPECT_EQ(bits(a), bits(b)) << a.id;
    }
    EXPECT_EQ(fits[0].method, fits[k].method);
  }
}

TEST(FitLot, KeepsUnitsInLotOrderAndMatchesFittingEachUnitAlone) {
  const auto sim = noisy_lot(40);
  FitOptions o;
  o.threads = 2;
  const LotFit lot = photolot::fitting::fit_lot(sim.lot, o);
  for (std::size_t i = 0; i < sim.lot.units.size(); ++i) {
    EXPECT_EQ(lot.units[i].id, sim.lot.units[i].id);
    EXPECT_EQ(bits(lot.units[i]), bits(photolot::fitting::fit_unit(sim.lot.units[i], o)));
  }
}

TEST(FitLot, ReportsProgressUpToTheTotal) {
  const auto sim = noisy_lot(500);
  std::atomic<std::size_t> calls{0}, last_done{0}, last_total{0};
  FitOptions o;
  o.threads = 2;
  photolot::fitting::fit_lot(sim.lot, o, [&](std::size_t done, std::size_t total) {
    ++calls;
    last_done = done;
    last_total = total;
  });
  EXPECT_GE(calls.load(), 1u);
  EXPECT_EQ(last_done.load(), 500u);
  EXPECT_EQ(last_total.load(), 500u);
}

TEST(FitLot, MarksUnitsNotReachedAsStoppedWhenAskedToStop) {
  const auto sim = noisy_lot(2000);
  std::stop_source stop;
  FitOptions o;
  o.threads = 2;
  // Ask to stop from the first progress report (sent after the first unit); each worker
  // finishes the unit in hand, so almost all of the lot is left unfitted.
  const LotFit lot = photolot::fitting::fit_lot(
      sim.lot, o, [&](std::size_t, std::size_t) { stop.request_stop(); }, stop.get_token());
  std::size_t stopped = 0;
  for (const UnitFit& f : lot.units) {
    if (f.message == "stopped") {
      ++stopped;
      EXPECT_EQ(f.status, FitStatus::solver_failed);
      EXPECT_FALSE(f.id.empty());
    }
  }
  EXPECT_GT(stopped, 1900u);

  std::stop_source already;
  already.request_stop();
  const LotFit none = photolot::fitting::fit_lot(sim.lot, o, {}, already.get_token());
  EXPECT_EQ(none.fitted_count(), 0u);
  EXPECT_EQ(none.units.size(), sim.lot.units.size());
}

TEST(FitLot, DescribesItsMethodInOneLine) {
  const LotFit lot = photolot::fitting::fit_lot(noisy_lot(3).lot);
  EXPECT_NE(lot.method.find("huber"), std::string::npos) << lot.method;
  EXPECT_NE(lot.method.find("Student t"), std::string::npos);
  EXPECT_EQ(lot.method.find('\n'), std::string::npos);
}

}  // namespace
