// Speed of the extended fits on synthetic lots (photolot/synth.h, invented data).
// Targets (one core, Release): the per-unit model choice under 2 ms per unit; the whole-lot fit
// with the joint temperature problem under 5 ms per unit. Run:
//   build/tests/bench/bench_extended_fit --benchmark_min_time=1
#include <benchmark/benchmark.h>

#include "photolot/fitting/models.h"
#include "photolot/synth.h"

namespace {

photolot::synth::LotSpec lot_spec(std::size_t units, double temp_span_c) {
  photolot::synth::LotSpec s;
  s.seed = 5;
  s.units = units;
  s.lux_levels = {0.1, 0.2, 0.5, 1, 2, 5, 10, 20, 50, 100};
  s.dark_conductance_s = 1e-7;
  s.dark_readings = true;
  s.meter_max_ohm = 550e3;
  s.temp_span_c = temp_span_c;
  s.temp_coeff_pct_per_c = 0.3;
  return s;
}

void BM_ModelChoicePerUnit(benchmark::State& state) {
  const auto sim = photolot::synth::simulate(lot_spec(64, 0));
  photolot::fitting::ExtendedFitOptions ext;
  ext.temperature = photolot::fitting::TemperatureMode::off;
  std::size_t i = 0;
  for (auto _ : state) {
    auto f = photolot::fitting::fit_unit_extended(sim.lot.units[i++ % 64], {}, ext);
    benchmark::DoNotOptimize(f);
  }
  state.SetItemsProcessed(state.iterations());
}
BENCHMARK(BM_ModelChoicePerUnit)->Unit(benchmark::kMillisecond);

void BM_LotWithJointTemperature(benchmark::State& state) {
  const auto units = static_cast<std::size_t>(state.range(0));
  const auto sim = photolot::synth::simulate(lot_spec(units, 10));
  photolot::fitting::FitOptions o;
  o.threads = 1;
  for (auto _ : state) {
    auto f = photolot::fitting::fit_lot_extended(sim.lot, o, {});
    benchmark::DoNotOptimize(f);
  }
  state.SetItemsProcessed(state.iterations() * static_cast<std::int64_t>(units));
}
BENCHMARK(BM_LotWithJointTemperature)->Arg(100)->Unit(benchmark::kMillisecond);

}  // namespace

BENCHMARK_MAIN();
