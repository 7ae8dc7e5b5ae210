// Fit throughput: 10,000 simulated units x 12 levels (invented lot, fixed seed). The closed
// form (least squares in log space, the baseline) against the robust fit with its covariance,
// single-threaded, the whole-lot fit on 1 and 2 threads, and the per-unit fits of the
// extended models (fitting/models.h): the dark-conductance model alone and the AICc choice
// between it and the power law. Figures in docs/performance.md.
#include <benchmark/benchmark.h>

#include "photolot/fitting/fit.h"
#include "photolot/fitting/models.h"
#include "photolot/synth.h"

namespace {

const photolot::Lot& lot(bool slips) {
  auto make = [](double outlier_fraction) {
    photolot::synth::LotSpec spec;
    spec.seed = 2026;
    spec.units = 10000;
    spec.lux_levels = {0.5, 1, 2, 5, 10, 20, 50, 100, 200, 500, 1000, 2000};
    spec.noise_pct = 0.5;
    spec.outlier_fraction = outlier_fraction;
    return photolot::synth::simulate(spec).lot;
  };
  static const photolot::Lot clean = make(0.0);
  static const photolot::Lot slipped = make(0.02);  // about one unit in four has a decade slip
  return slips ? slipped : clean;
}

template <photolot::UnitFit (*Fit)(const photolot::Unit&, const photolot::fitting::FitOptions&)>
void BM_FitUnits(benchmark::State& state) {
  const photolot::Lot& l = lot(state.range(0) != 0);
  const photolot::fitting::FitOptions options;
  for (auto _ : state) {
    for (const auto& unit : l.units) benchmark::DoNotOptimize(Fit(unit, options));
  }
  state.SetItemsProcessed(static_cast<std::int64_t>(state.iterations() * l.units.size()));
}

void BM_FitLot(benchmark::State& state) {
  const photolot::Lot& l = lot(false);
  photolot::fitting::FitOptions options;
  options.threads = static_cast<int>(state.range(0));
  for (auto _ : state) benchmark::DoNotOptimize(photolot::fitting::fit_lot(l, options));
  state.SetItemsProcessed(static_cast<std::int64_t>(state.iterations() * l.units.size()));
}

// The extended per-unit fit with the given model, temperature off and no bench profile: what
// `analyze --model ...` runs per unit on a lot logged at one temperature.
template <photolot::fitting::ModelChoice Model>
void BM_FitUnitsExtended(benchmark::State& state) {
  const photolot::Lot& l = lot(state.range(0) != 0);
  const photolot::fitting::FitOptions options;
  photolot::fitting::ExtendedFitOptions ext;
  ext.model = Model;
  ext.temperature = photolot::fitting::TemperatureMode::off;
  for (auto _ : state) {
    for (const auto& unit : l.units)
      benchmark::DoNotOptimize(photolot::fitting::fit_unit_extended(unit, options, ext));
  }
  state.SetItemsProcessed(static_cast<std::int64_t>(state.iterations() * l.units.size()));
}

}  // namespace

// Arg: 0 = clean lot, 1 = lot with decade slips.
BENCHMARK(BM_FitUnits<photolot::fitting::fit_unit_closed_form>)
    ->Name("closed_form")
    ->Arg(0)
    ->Unit(benchmark::kMillisecond);
BENCHMARK(BM_FitUnits<photolot::fitting::fit_unit>)
    ->Name("robust_with_covariance")
    ->Arg(0)
    ->Arg(1)
    ->Unit(benchmark::kMillisecond);
BENCHMARK(BM_FitUnitsExtended<photolot::fitting::ModelChoice::power_law>)
    ->Name("extended_power_law")
    ->Arg(0)
    ->Unit(benchmark::kMillisecond);
BENCHMARK(BM_FitUnitsExtended<photolot::fitting::ModelChoice::dark_conductance>)
    ->Name("extended_dark_conductance")
    ->Arg(0)
    ->Unit(benchmark::kMillisecond);
BENCHMARK(BM_FitUnitsExtended<photolot::fitting::ModelChoice::choose>)
    ->Name("extended_choose")
    ->Arg(0)
    ->Arg(1)
    ->Unit(benchmark::kMillisecond);
BENCHMARK(BM_FitLot)
    ->Name("fit_lot_threads")
    ->Arg(1)
    ->Arg(2)
    ->Unit(benchmark::kMillisecond)
    ->UseRealTime();

BENCHMARK_MAIN();
