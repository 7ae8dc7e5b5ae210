// Lot statistics, verdicts and the disposition on large lots, and the exact tolerance factor.
// Targets (on one core of an ordinary desktop): statistics and verdicts for a 100 000-unit lot
// under 100 ms; an exact tolerance factor under 50 ms for any n up to 100 000, so the workbench
// can recompute on every change of coverage or confidence.
#include <benchmark/benchmark.h>

#include <cmath>
#include <cstdint>
#include <random>

#include "photolot/acceptance.h"
#include "photolot/statistics.h"

namespace {

photolot::LotFit make_lot(std::size_t n) {
  std::mt19937_64 engine(42);
  std::normal_distribution<double> normal;  // timing only: exact values do not matter
  photolot::LotFit fit;
  fit.units.reserve(n);
  for (std::size_t i = 0; i < n; ++i) {
    photolot::UnitFit u;
    u.id = std::to_string(i);
    u.status = photolot::FitStatus::fitted;
    u.r10_ohm = 20e3 * std::exp(0.15 * normal(engine));
    u.gamma = 0.75 + 0.03 * normal(engine);
    u.ln_r10_sd = 0.01;
    u.gamma_sd = 0.005;
    u.rms_log_residual = 0.01;
    u.dark_ohm = {5e6};
    u.dark_censored = {false};
    fit.units.push_back(std::move(u));
  }
  return fit;
}

photolot::Spec make_spec() {
  photolot::Spec s;
  s.part_number = "BENCH";
  s.r10_ohm = {15e3, 27e3};
  s.gamma = {0.66, 0.84};
  s.dark_min_ohm = 1e6;
  s.inspection.aql_pct = 1.0;
  return s;
}

void BM_LotStatistics(benchmark::State& state) {
  const auto fit = make_lot(static_cast<std::size_t>(state.range(0)));
  const auto spec = make_spec();
  for (auto _ : state) benchmark::DoNotOptimize(photolot::lot_statistics(fit, {}, &spec));
  state.SetItemsProcessed(state.iterations() * state.range(0));
}
BENCHMARK(BM_LotStatistics)->Arg(60)->Arg(10'000)->Arg(100'000)->Unit(benchmark::kMillisecond);

void BM_JudgeAndDecide(benchmark::State& state) {
  const auto fit = make_lot(static_cast<std::size_t>(state.range(0)));
  const auto spec = make_spec();
  for (auto _ : state) {
    const auto verdicts = photolot::judge(fit, spec);
    benchmark::DoNotOptimize(photolot::decide(spec, verdicts, fit.units.size() * 4));
  }
  state.SetItemsProcessed(state.iterations() * state.range(0));
}
BENCHMARK(BM_JudgeAndDecide)->Arg(60)->Arg(100'000)->Unit(benchmark::kMillisecond);

void BM_ExactToleranceFactor(benchmark::State& state) {
  const auto n = static_cast<std::size_t>(state.range(0));
  for (auto _ : state) benchmark::DoNotOptimize(photolot::tolerance_factor_exact(n, 0.99, 0.95));
}
BENCHMARK(BM_ExactToleranceFactor)
    ->Arg(10)
    ->Arg(60)
    ->Arg(1000)
    ->Arg(100'000)
    ->Unit(benchmark::kMillisecond);

}  // namespace

BENCHMARK_MAIN();
