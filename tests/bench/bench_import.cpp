// Import speed on an in-memory bench log of 10,000 units x 12 levels (about 120,000 rows), in
// both dialects the generator writes. Target on the 2-core development machine: 150 MB/s or
// more. Two baselines measured in the same run give ratios that do not depend on the
// machine's load: a memchr line count (the floor: touching every byte once) and the naive
// std::getline + std::stod reader.
//
//   build/tests/bench/bench_import --benchmark_repetitions=5 --benchmark_report_aggregates_only
#include <benchmark/benchmark.h>

#include <cstring>
#include <sstream>
#include <string>

#include "photolot/import.h"
#include "photolot/synth.h"

namespace {

const std::string& log_text(photolot::synth::Dialect dialect) {
  static const auto make = [](photolot::synth::Dialect d) {
    photolot::synth::LotSpec spec;
    spec.seed = 7;
    spec.units = 10000;
    spec.lux_levels = {0.5, 1, 2, 5, 10, 20, 50, 100, 200, 500, 1000, 2000};
    spec.temp_span_c = 2.0;
    return photolot::synth::to_csv(photolot::synth::simulate(spec).lot, d);
  };
  static const std::string comma = make(photolot::synth::Dialect::comma);
  static const std::string semicolon = make(photolot::synth::Dialect::semicolon);
  return dialect == photolot::synth::Dialect::comma ? comma : semicolon;
}

void BM_Import(benchmark::State& state, photolot::synth::Dialect dialect) {
  const std::string& text = log_text(dialect);
  const std::vector<std::pair<std::string, std::string>> input = {{"bench.csv", text}};
  std::size_t readings = 0;
  for (auto _ : state) {
    auto result = photolot::import_buffers(input);
    readings = result.lot.counts.rows_used;
    benchmark::DoNotOptimize(result);
  }
  state.SetBytesProcessed(static_cast<std::int64_t>(state.iterations() * text.size()));
  state.counters["rows"] = static_cast<double>(readings);
  state.counters["MB"] = static_cast<double>(text.size()) / 1e6;
}

// The floor: find every line end once.
void BM_BaselineLineCount(benchmark::State& state) {
  const std::string& text = log_text(photolot::synth::Dialect::comma);
  for (auto _ : state) {
    std::size_t lines = 0;
    const char* p = text.data();
    const char* end = p + text.size();
    while ((p = static_cast<const char*>(std::memchr(p, '\n', end - p))) != nullptr) {
      ++lines;
      ++p;
    }
    benchmark::DoNotOptimize(lines);
  }
  state.SetBytesProcessed(static_cast<std::int64_t>(state.iterations() * text.size()));
}

// The naive reader: a stream, getline per line and per field, std::stod (locale-dependent).
void BM_BaselineGetlineStod(benchmark::State& state) {
  const std::string& text = log_text(photolot::synth::Dialect::comma);
  for (auto _ : state) {
    std::istringstream in(text);
    std::string line, field;
    double sum = 0;
    std::getline(in, line);  // header
    while (std::getline(in, line)) {
      std::istringstream fields(line);
      int column = 0;
      while (std::getline(fields, field, ',')) {
        if (column == 1 || column == 2) sum += std::stod(field);
        ++column;
      }
    }
    benchmark::DoNotOptimize(sum);
  }
  state.SetBytesProcessed(static_cast<std::int64_t>(state.iterations() * text.size()));
}

BENCHMARK_CAPTURE(BM_Import, comma, photolot::synth::Dialect::comma)->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(BM_Import, semicolon, photolot::synth::Dialect::semicolon)
    ->Unit(benchmark::kMillisecond);
BENCHMARK(BM_BaselineLineCount)->Unit(benchmark::kMillisecond);
BENCHMARK(BM_BaselineGetlineStod)->Unit(benchmark::kMillisecond);

}  // namespace

BENCHMARK_MAIN();
