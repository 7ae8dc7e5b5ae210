// Where the pairing's growth comes from, measured on LEMON's own algorithms (not photolot's
// copy): the same invented lots as bench_pairing.cpp, each unit's 16 nearest within 2 % as
// edges (built here with a plain grid, not photolot's search), weights BIG - cost as in
// docs/pairing.md. Three benchmarks, each over the lot sizes (docs/performance.md, "Seventh
// round"):
//   BM_LemonWeighted    MaxWeightedMatching, the exact solve photolot's first round starts from;
//   BM_LemonFractional  MaxWeightedFractionalMatching alone (no blossoms; its start);
//   BM_LemonCoreOnly    MaxMatching's Gallai-Edmonds decomposition, then the units every
//                       maximum matching covers (set C) paired by MaxWeightedPerfectMatching on
//                       costs alone: the cardinality question taken out of the weighted solve.
//   BM_LemonWeightedFlat  MaxWeightedMatching again on flat lots (bench_lot.h, draw_flat_lot):
//                       second argument 0 for a fixed box (denser as it grows), 1 for a fixed
//                       density (the box grows): whether the batch's thin edges make the growth.
// The counters say how large each part of the decomposition is.
#include <benchmark/benchmark.h>
#include <lemon/smart_graph.h>
// clang-format off
#include "lemon_cxx20.h"  // after smart_graph.h, before matching.h
// clang-format on
#include <lemon/fractional_matching.h>
#include <lemon/matching.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdint>
#include <unordered_map>
#include <utility>
#include <vector>

#include "bench_lot.h"

namespace {

using Graph = lemon::SmartGraph;
using Weights = Graph::EdgeMap<std::int64_t>;

struct Candidates {
  std::size_t n = 0;
  std::vector<std::pair<int, int>> edges;
  std::vector<std::int64_t> cost;  // 2^20 steps over the tolerance
  std::int64_t max_cost = std::int64_t(1) << 20;
  std::int64_t big() const { return (std::int64_t(n / 2) + 1) * max_cost + 1; }
};

// Each unit's 16 nearest within 2 % (Chebyshev distance of ln R at 1 and 1000 lx, the
// absolute error of two power laws), each pair once.
// shape: 0 the batch (draw_lot), 1 a flat fixed box, 2 a flat lot of fixed density.
Candidates make_candidates(std::size_t n, int shape = 0) {
  const auto lot =
      shape == 0 ? photolot::bench::draw_lot(n) : photolot::bench::draw_flat_lot(n, shape == 2);
  const double tol_pct = 2.0, tol = std::log1p(tol_pct / 100);
  std::vector<double> x(n), y(n);
  for (std::size_t i = 0; i < n; ++i) {
    x[i] = lot[i].ln_r10 + lot[i].gamma * std::log(10.0);
    y[i] = lot[i].ln_r10 - lot[i].gamma * std::log(100.0);
  }
  auto key = [](std::int64_t a, std::int64_t b) { return (a << 32) ^ (b & 0xffffffff); };
  std::unordered_map<std::int64_t, std::vector<int>> cells;
  for (std::size_t i = 0; i < n; ++i)
    cells[key(std::int64_t(std::floor(x[i] / tol)), std::int64_t(std::floor(y[i] / tol)))]
        .push_back(int(i));
  Candidates c;
  c.n = n;
  std::vector<std::pair<double, int>> near;
  for (std::size_t i = 0; i < n; ++i) {
    near.clear();
    const auto cx = std::int64_t(std::floor(x[i] / tol)), cy = std::int64_t(std::floor(y[i] / tol));
    for (std::int64_t a = -1; a <= 1; ++a)
      for (std::int64_t b = -1; b <= 1; ++b) {
        auto it = cells.find(key(cx + a, cy + b));
        if (it == cells.end()) continue;
        for (int j : it->second) {
          if (j == int(i)) continue;
          const double d = std::max(std::abs(x[i] - x[j]), std::abs(y[i] - y[j]));
          if (d <= tol) near.push_back({d, j});
        }
      }
    std::sort(near.begin(), near.end());
    if (near.size() > 16) near.resize(16);
    for (auto [d, j] : near) c.edges.push_back(std::minmax(int(i), j));
  }
  std::sort(c.edges.begin(), c.edges.end());
  c.edges.erase(std::unique(c.edges.begin(), c.edges.end()), c.edges.end());
  for (auto [i, j] : c.edges) {
    const double d = std::max(std::abs(x[i] - x[j]), std::abs(y[i] - y[j]));
    c.cost.push_back(std::llround(100.0 * std::expm1(d) / tol_pct * double(c.max_cost)));
  }
  return c;
}

void build(const Candidates& c, Graph& g, Weights& w, std::int64_t offset) {
  g.reserveNode(int(c.n));
  for (std::size_t i = 0; i < c.n; ++i) g.addNode();
  for (std::size_t k = 0; k < c.edges.size(); ++k)
    w.set(g.addEdge(g.nodeFromId(c.edges[k].first), g.nodeFromId(c.edges[k].second)),
          offset - c.cost[k]);
}

// MaxWeightedMatching on the lot of the given shape (make_candidates).
void run_weighted(benchmark::State& state, int shape) {
  const Candidates c = make_candidates(std::size_t(state.range(0)), shape);
  Graph g;
  Weights w(g);
  build(c, g, w, c.big());
  int pairs = 0;
  for (auto _ : state) {
    lemon::MaxWeightedMatching<Graph, Weights> m(g, w);
    m.run();
    pairs = m.matchingSize();
    state.counters["blossoms"] = double(m.blossomNum());
  }
  state.counters["pairs"] = double(pairs);
  state.counters["edges"] = double(c.edges.size());
}

void BM_LemonWeighted(benchmark::State& state) { run_weighted(state, 0); }

void BM_LemonWeightedFlat(benchmark::State& state) { run_weighted(state, 1 + int(state.range(1))); }

void BM_LemonFractional(benchmark::State& state) {
  const Candidates c = make_candidates(std::size_t(state.range(0)));
  Graph g;
  Weights w(g);
  build(c, g, w, c.big());
  for (auto _ : state) {
    lemon::MaxWeightedFractionalMatching<Graph, Weights> m(g, w, false);
    m.run();
    // Units on the odd cycles of the half-integral optimum: the defects the exact solve
    // must still pair off.
    int on_cycles = 0;
    for (Graph::NodeIt v(g); v != lemon::INVALID; ++v) {
      const Graph::Arc a = m.matching(v);
      if (a == lemon::INVALID) continue;
      const Graph::Arc back = m.matching(g.target(a));
      if (back == lemon::INVALID || g.target(back) != v) ++on_cycles;
    }
    state.counters["on_odd_cycles"] = on_cycles;
  }
}

void BM_LemonCoreOnly(benchmark::State& state) {
  const Candidates c = make_candidates(std::size_t(state.range(0)));
  Graph g;
  Weights w(g);
  build(c, g, w, 0);
  for (auto _ : state) {
    const auto t0 = std::chrono::steady_clock::now();
    lemon::MaxMatching<Graph> mm(g);
    mm.run();
    std::vector<int> local(c.n, -1);
    int d = 0, a = 0, core = 0;
    for (std::size_t i = 0; i < c.n; ++i) {
      const auto s = mm.status(g.nodeFromId(int(i)));
      if (s == lemon::MaxMatching<Graph>::EVEN)
        ++d;
      else if (s == lemon::MaxMatching<Graph>::ODD)
        ++a;
      else
        local[i] = core++;
    }
    const auto t1 = std::chrono::steady_clock::now();
    Graph h;
    Weights hw(h);
    for (int k = 0; k < core; ++k) h.addNode();
    for (std::size_t k = 0; k < c.edges.size(); ++k) {
      const int u = local[c.edges[k].first], v = local[c.edges[k].second];
      if (u >= 0 && v >= 0)
        hw.set(h.addEdge(h.nodeFromId(u), h.nodeFromId(v)), c.max_cost - c.cost[k]);
    }
    lemon::MaxWeightedPerfectMatching<Graph, Weights> pm(h, hw);
    const bool perfect = pm.run();
    const auto t2 = std::chrono::steady_clock::now();
    state.counters["D"] = d;
    state.counters["A"] = a;
    state.counters["C"] = core;
    state.counters["perfect"] = perfect ? 1 : 0;
    state.counters["decomposition_s"] = std::chrono::duration<double>(t1 - t0).count();
    state.counters["core_solve_s"] = std::chrono::duration<double>(t2 - t1).count();
  }
}

}  // namespace

BENCHMARK(BM_LemonWeighted)
    ->Arg(10000)
    ->Arg(31623)
    ->Arg(100000)
    ->Arg(316228)
    ->Unit(benchmark::kMillisecond)
    ->Iterations(1)
    ->MeasureProcessCPUTime();
BENCHMARK(BM_LemonWeightedFlat)
    ->ArgsProduct({{10000, 31623, 100000, 316228}, {0, 1}})
    ->Unit(benchmark::kMillisecond)
    ->Iterations(1)
    ->MeasureProcessCPUTime();
BENCHMARK(BM_LemonFractional)
    ->Arg(10000)
    ->Arg(31623)
    ->Arg(100000)
    ->Arg(316228)
    ->Unit(benchmark::kMillisecond)
    ->Iterations(1)
    ->MeasureProcessCPUTime();
BENCHMARK(BM_LemonCoreOnly)
    ->Arg(10000)
    ->Arg(31622)
    ->Arg(31623)
    ->Arg(100000)
    ->Unit(benchmark::kMillisecond)
    ->Iterations(1)
    ->MeasureProcessCPUTime();

BENCHMARK_MAIN();
