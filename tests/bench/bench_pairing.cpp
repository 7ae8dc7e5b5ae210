// Pairing speed on whole reels: 1,000 / 10,000 / 100,000 power-law units spread like a batch
// (ln R10 sd 0.15, gamma 0.75 sd 0.03; invented lots), default options (2 %, 1-1000 lx,
// 16 candidates per unit, certificate checked on every pair within tolerance).
// Targets (docs/performance.md, "Pairing"): 10,000 units under 1 s, 100,000 under 20 s,
// peak memory under 1 GB, cost close to linear.
#include <benchmark/benchmark.h>
#include <sys/resource.h>

#include <cmath>
#include <cstdint>
#include <string>

#include "bench_lot.h"
#include "photolot/pairing.h"

namespace {

photolot::LotFit make_lot(std::size_t n) {
  const auto draws = photolot::bench::draw_lot(n);
  photolot::LotFit fit;
  fit.units.resize(n);
  for (std::size_t i = 0; i < n; ++i) {
    auto& u = fit.units[i];
    u.id = "U" + std::to_string(i + 1);
    u.status = photolot::FitStatus::fitted;
    u.curve =
        photolot::make_power_law(std::exp(draws[i].ln_r10), draws[i].gamma, {1e-4, 0, 0, 1e-5});
  }
  return fit;
}

double peak_rss_mb() {
  rusage r{};
  getrusage(RUSAGE_SELF, &r);
  return double(r.ru_maxrss) / 1024.0;  // ru_maxrss is in KiB on Linux
}

void run(benchmark::State& state, photolot::TrackingMode mode, double tolerance_pct,
         int cap = photolot::PairOptions{}.candidate_cap_per_unit, bool spatial_order = true,
         bool warm_repair = true, int threads = 0, bool near_check = true) {
  const photolot::LotFit fit = make_lot(static_cast<std::size_t>(state.range(0)));
  photolot::PairOptions o;
  o.mode = mode;
  o.tolerance_pct = tolerance_pct;
  o.candidate_cap_per_unit = cap;
  o.spatial_order = spatial_order;
  o.warm_repair = warm_repair;
  o.threads = threads;
  o.near_check = near_check;
  photolot::Pairing p;
  for (auto _ : state) {
    p = photolot::pair_units(fit, o);
    benchmark::DoNotOptimize(p.pairs.data());
  }
  state.counters["pairs"] = double(p.pairs.size());
  // The sum of the pairs' errors: with --benchmark_format=json, a fingerprint of the result
  // for comparing two builds.
  state.counters["total_error_pct"] = p.total_error_pct;
  state.counters["tolerance_edges"] = double(p.counts.tolerance_edges);
  state.counters["matched_edges"] = double(p.counts.matched_edges);
  state.counters["largest_component"] = double(p.counts.largest_component);
  state.counters["rounds"] = double(p.counts.rounds);
  state.counters["repaired"] = double(p.counts.repaired_edges);
  state.counters["warm_rounds"] = double(p.counts.warm_rounds);
  state.counters["warm_fallbacks"] = double(p.counts.warm_fallbacks);
  state.counters["full_checks"] = double(p.counts.full_checks);
  state.counters["proved"] = p.proof == photolot::ProofStatus::proved_optimal ? 1 : 0;
  state.counters["peak_rss_MB"] = peak_rss_mb();
  state.SetComplexityN(state.range(0));
}

void BM_PairAbsolute2pct(benchmark::State& state) {
  run(state, photolot::TrackingMode::absolute, 2.0);
}
void BM_PairAbsolute3pct(benchmark::State& state) {
  run(state, photolot::TrackingMode::absolute, 3.0);
}
void BM_PairTrimmable05pct(benchmark::State& state) {
  run(state, photolot::TrackingMode::trimmable, 0.5);
}
// The units in lot order instead of Z-order over the plane, for comparison in one run.
void BM_PairAbsolute2pctLotOrder(benchmark::State& state) {
  run(state, photolot::TrackingMode::absolute, 2.0, photolot::PairOptions{}.candidate_cap_per_unit,
      false);
}
// Every repair round solved from scratch (the warm repair off), for comparison in one run.
void BM_PairAbsolute2pctCold(benchmark::State& state) {
  run(state, photolot::TrackingMode::absolute, 2.0, photolot::PairOptions{}.candidate_cap_per_unit,
      true, false);
}
// The candidate cap's trade-off: a smaller first graph against more repair.
void BM_PairAbsolute2pctCap(benchmark::State& state) {
  run(state, photolot::TrackingMode::absolute, 2.0, static_cast<int>(state.range(1)));
}

// The candidate search and the certificate check on 1 or 2 threads (wall time: the matching
// itself stays on one).
void BM_PairThreads(benchmark::State& state) {
  run(state, photolot::TrackingMode::absolute, 2.0, photolot::PairOptions{}.candidate_cap_per_unit,
      true, true, static_cast<int>(state.range(1)));
}

// Every round checked in full (no near check first), on 1 thread, against BM_PairThreads/N/1
// in the same run.
void BM_PairFullChecks(benchmark::State& state) {
  run(state, photolot::TrackingMode::absolute, 2.0, photolot::PairOptions{}.candidate_cap_per_unit,
      true, true, 1, false);
}

}  // namespace

BENCHMARK(BM_PairAbsolute2pct)
    ->Arg(1000)
    ->Arg(10000)
    ->Arg(100000)
    ->Unit(benchmark::kMillisecond)
    ->Iterations(1)
    ->MeasureProcessCPUTime()
    ->Complexity();
// The growth beyond the cache: every step of 3.16x in lot size, up to 316,000 units (about
// 0.9 GB), so that the exponent can be read between sizes that all outgrow the processor's
// cache (docs/performance.md, "Pairing"). Not in the default filter of the docs' rerun.
BENCHMARK(BM_PairAbsolute2pct)
    ->Name("BM_PairGrowth")
    ->Arg(10000)
    ->Arg(31623)
    ->Arg(100000)
    ->Arg(316228)
    ->Unit(benchmark::kMillisecond)
    ->Iterations(1)
    ->MeasureProcessCPUTime();
BENCHMARK(BM_PairAbsolute3pct)
    ->Arg(1000)
    ->Arg(10000)
    ->Unit(benchmark::kMillisecond)
    ->Iterations(1)
    ->MeasureProcessCPUTime();
BENCHMARK(BM_PairTrimmable05pct)
    ->Arg(1000)
    ->Arg(10000)
    ->Unit(benchmark::kMillisecond)
    ->Iterations(1)
    ->MeasureProcessCPUTime();

BENCHMARK(BM_PairAbsolute2pctLotOrder)
    ->Arg(10000)
    ->Arg(100000)
    ->Unit(benchmark::kMillisecond)
    ->Iterations(1)
    ->MeasureProcessCPUTime();

BENCHMARK(BM_PairAbsolute2pctCold)
    ->Arg(10000)
    ->Arg(100000)
    ->Unit(benchmark::kMillisecond)
    ->Iterations(1)
    ->MeasureProcessCPUTime();

BENCHMARK(BM_PairAbsolute2pctCap)
    ->ArgsProduct({{10000}, {4, 6, 8, 12, 16}})
    ->ArgsProduct({{100000}, {8, 12, 16}})
    ->Unit(benchmark::kMillisecond)
    ->Iterations(1)
    ->MeasureProcessCPUTime();

BENCHMARK(BM_PairThreads)
    ->ArgsProduct({{10000, 100000}, {1, 2, 1, 2}})
    ->Args({316228, 1})
    ->Args({316228, 2})
    ->Unit(benchmark::kMillisecond)
    ->Iterations(1)
    ->UseRealTime();

BENCHMARK(BM_PairFullChecks)
    ->Arg(10000)
    ->Arg(100000)
    ->Arg(316228)
    ->Unit(benchmark::kMillisecond)
    ->Iterations(1)
    ->UseRealTime();

BENCHMARK_MAIN();
