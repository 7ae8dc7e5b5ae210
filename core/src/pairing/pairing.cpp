// Pairing units whose curves track each other. docs/pairing.md gives the measures, the
// objective, why the candidate search misses no pair within tolerance and what the optimality
// certificate checks; the comments here point at the steps.
#include "photolot/pairing.h"

#include <fmt/format.h>
#include <lemon/matching.h>
#include <lemon/smart_graph.h>

#include <algorithm>
#include <cassert>
#include <cmath>
#include <cstdint>
#include <limits>
#include <memory>
#include <numeric>
#include <tuple>
#include <utility>

#include "blossom_sums.h"
#include "chunks.h"
#include "lemon_cxx20.h"
#include "test_seams.h"
#include "warm_matching.h"

namespace photolot {
namespace {

using Wide = detail::WideSum;  // sums of dual values, beyond int64 for large lots

// Lux values of the evaluation grid: log-spaced, both ends included exactly.
std::vector<double> grid_lux(const PairOptions& o) {
  const double decades = std::log10(o.lux_hi / o.lux_lo);
  const int steps = std::max(1, static_cast<int>(std::ceil(decades * o.grid_points_per_decade)));
  std::vector<double> lux(static_cast<std::size_t>(steps) + 1);
  for (int k = 0; k <= steps; ++k)
    lux[static_cast<std::size_t>(k)] = o.lux_lo * std::pow(o.lux_hi / o.lux_lo, double(k) / steps);
  lux.front() = o.lux_lo;
  lux.back() = o.lux_hi;
  return lux;
}

double to_pct(double ln_error) { return 100.0 * std::expm1(ln_error); }

// Variance of [ln R(e1) - ln R(e2)] for one curve (e2 <= 0: of ln R(e1) alone); NaN when the
// covariance is unknown.
double ln_diff_variance(const Curve& c, double e1, double e2) {
  const std::size_t n = c.params.size();
  if (c.covariance.size() != n * n || n == 0) return kNaN;
  std::vector<double> g = c.gradient(e1);
  if (e2 > 0) {
    const std::vector<double> g2 = c.gradient(e2);
    for (std::size_t i = 0; i < n; ++i) g[i] -= g2[i];
  }
  double var = 0;
  for (std::size_t i = 0; i < n; ++i)
    for (std::size_t j = 0; j < n; ++j) var += g[i] * c.covariance[i * n + j] * g[j];
  return std::max(var, 0.0);
}

// ---------------------------------------------------------------------------------------------
// The participating units, reduced to what the search needs.
struct Nodes {
  TrackingMode mode = TrackingMode::absolute;
  std::vector<std::size_t> unit;  // node -> index into LotFit::units
  std::vector<const Curve*> curve;
  std::vector<double> x, y;         // plane point: absolute (ln R_lo, ln R_hi); trimmable (u, 0)
  std::vector<std::int32_t> row;    // node -> row of grid_values, -1 for a power law
  std::vector<double> grid_values;  // ln R on the grid, rows of grid size
  std::size_t grid_size = 0;

  std::size_t size() const { return unit.size(); }

  // The tracking error in ln units. For two power laws the plane points give it exactly
  // (Chebyshev distance, or |du|); otherwise the grid does, and the plane distance is a lower
  // bound of it because both range ends are grid points.
  double exact_ln(std::size_t i, std::size_t j) const {
    if (row[i] < 0 && row[j] < 0) return std::max(std::abs(x[i] - x[j]), std::abs(y[i] - y[j]));
    const double* a = grid_values.data() + (row[i] < 0 ? 0 : row[i] * grid_size);
    const double* b = grid_values.data() + (row[j] < 0 ? 0 : row[j] * grid_size);
    double lo = std::numeric_limits<double>::infinity(), hi = -lo, peak = 0;
    for (std::size_t k = 0; k < grid_size; ++k) {
      const double d = value(i, a, k) - value(j, b, k);
      lo = std::min(lo, d);
      hi = std::max(hi, d);
      peak = std::max(peak, std::abs(d));
    }
    return mode == TrackingMode::absolute ? peak : hi - lo;
  }
  double lower_bound_ln(std::size_t i, std::size_t j) const {
    return std::max(std::abs(x[i] - x[j]), std::abs(y[i] - y[j]));
  }
  std::size_t work(std::size_t i, std::size_t j) const {
    return row[i] < 0 && row[j] < 0 ? 1 : grid_size;
  }

  std::vector<double> grid_x;  // ln(E / 10 lx) at the grid points
 private:
  double value(std::size_t node, const double* rowp, std::size_t k) const {
    if (row[node] >= 0) return rowp[k];
    const Curve& c = *curve[node];
    return c.params[0] - c.params[1] * grid_x[k];
  }
};

Nodes make_nodes(const LotFit& fit, const std::vector<std::size_t>& fitted, const PairOptions& o) {
  Nodes n;
  n.mode = o.mode;
  const std::vector<double> lux = grid_lux(o);
  n.grid_size = lux.size();
  n.grid_x.resize(lux.size());
  for (std::size_t k = 0; k < lux.size(); ++k) n.grid_x[k] = std::log(lux[k] / kReferenceLux);
  for (std::size_t u : fitted) {
    const Curve& c = fit.units[u].curve;
    const bool power_law = c.model == ModelKind::power_law;
    n.unit.push_back(u);
    n.curve.push_back(&c);
    const double lo = c.ln_ohm(o.lux_lo), hi = c.ln_ohm(o.lux_hi);
    if (o.mode == TrackingMode::absolute) {
      n.x.push_back(lo);
      n.y.push_back(hi);
    } else {
      n.x.push_back(hi - lo);
      n.y.push_back(0.0);
    }
    if (power_law) {
      n.row.push_back(-1);
    } else {
      n.row.push_back(static_cast<std::int32_t>(n.grid_values.size() / n.grid_size));
      for (double e : lux) n.grid_values.push_back(c.ln_ohm(e));
    }
  }
  return n;
}

// ---------------------------------------------------------------------------------------------
// A uniform grid over the plane with cells no smaller than the tolerance: two points within
// the tolerance (Chebyshev) lie in the same or adjacent cells.
class CellGrid {
 public:
  CellGrid(const Nodes& nodes, double cell) : nodes_(nodes), cell_(cell) {
    const std::size_t n = nodes.size();
    std::vector<Key> keys(n);
    for (std::size_t i = 0; i < n; ++i)
      keys[i] = {static_cast<std::int64_t>(std::floor(nodes.x[i] / cell)),
                 static_cast<std::int64_t>(std::floor(nodes.y[i] / cell)),
                 static_cast<std::uint32_t>(i)};
    std::sort(keys.begin(), keys.end(), [](const Key& a, const Key& b) {
      return std::tie(a.cx, a.cy, a.node) < std::tie(b.cx, b.cy, b.node);
    });
    order_.resize(n);
    for (std::size_t i = 0; i < n; ++i) {
      order_[i] = keys[i].node;
      if (cells_.empty() || cells_.back().cx != keys[i].cx || cells_.back().cy != keys[i].cy)
        cells_.push_back({keys[i].cx, keys[i].cy, static_cast<std::uint32_t>(i), 0});
      cells_.back().end = static_cast<std::uint32_t>(i + 1);
    }
  }

  // Calls f(i, j) for every unordered pair of nodes in the same or adjacent cells, once.
  // Returns false when stopped.
  template <class F>
  bool for_each_near_pair(F&& f, const std::stop_token& stop) const {
    return for_each_near_slot_pair(
        [&](std::uint32_t p, std::uint32_t q) { f(order_[p], order_[q]); }, stop);
  }

  // The same by slots: the nodes' places in the grid's cell order (node_at(slot) is the node),
  // so that a caller keeping its per-node values in that order reads them nearly in sequence.
  template <class F>
  bool for_each_near_slot_pair(F&& f, const std::stop_token& stop) const {
    return for_each_near_slot_pair_from(0, cells_.size(), f, stop);
  }

  // The same for the pairs whose first slot lies in cells [first, last) of the grid's cells
  // (each pair is found from one cell only, so ranges of cells share out the pairs).
  template <class F>
  bool for_each_near_slot_pair_from(std::size_t first, std::size_t last, F&& f,
                                    const std::stop_token& stop) const {
    static constexpr std::int64_t kForward[4][2] = {{0, 1}, {1, -1}, {1, 0}, {1, 1}};
    for (std::size_t c = first; c < last; ++c) {
      if (((c - first) & 1023) == 0 && stop.stop_requested()) return false;
      const Cell& a = cells_[c];
      for (std::uint32_t p = a.begin; p < a.end; ++p)
        for (std::uint32_t q = p + 1; q < a.end; ++q) f(p, q);
      for (const auto& d : kForward) {
        const Cell* b = find(a.cx + d[0], a.cy + d[1]);
        if (b == nullptr) continue;
        for (std::uint32_t p = a.begin; p < a.end; ++p)
          for (std::uint32_t q = b->begin; q < b->end; ++q) f(p, q);
      }
    }
    return true;
  }

  std::uint32_t node_at(std::uint32_t slot) const { return order_[slot]; }
  std::size_t slots() const { return order_.size(); }
  std::size_t cells() const { return cells_.size(); }

  // Calls f(w) for every other node w in the cell of `node` or the eight around it.
  template <class F>
  void for_each_near(std::uint32_t node, F&& f) const {
    const auto cx = static_cast<std::int64_t>(std::floor(nodes_.x[node] / cell_));
    const auto cy = static_cast<std::int64_t>(std::floor(nodes_.y[node] / cell_));
    for (std::int64_t dx = -1; dx <= 1; ++dx)
      for (std::int64_t dy = -1; dy <= 1; ++dy) {
        const Cell* b = find(cx + dx, cy + dy);
        if (b == nullptr) continue;
        for (std::uint32_t q = b->begin; q < b->end; ++q)
          if (order_[q] != node) f(order_[q]);
      }
  }

 private:
  struct Key {
    std::int64_t cx, cy;
    std::uint32_t node;
  };
  struct Cell {
    std::int64_t cx, cy;
    std::uint32_t begin, end;
  };
  const Cell* find(std::int64_t cx, std::int64_t cy) const {
    auto it = std::lower_bound(cells_.begin(), cells_.end(), std::pair{cx, cy},
                               [](const Cell& c, const std::pair<std::int64_t, std::int64_t>& k) {
                                 return std::tie(c.cx, c.cy) < std::tie(k.first, k.second);
                               });
    return it != cells_.end() && it->cx == cx && it->cy == cy ? &*it : nullptr;
  }

  const Nodes& nodes_;
  double cell_;
  std::vector<std::uint32_t> order_;
  std::vector<Cell> cells_;
};

// Every pair within tolerance, exactly: f(i, j, error_pct) with i, j nodes.
template <class F>
bool for_each_tolerance_edge(const Nodes& nodes, const CellGrid& grid, double tol_ln,
                             double tol_pct, F&& f, const std::stop_token& stop) {
  return grid.for_each_near_pair(
      [&](std::uint32_t i, std::uint32_t j) {
        if (nodes.lower_bound_ln(i, j) > tol_ln) return;
        const double err = to_pct(nodes.exact_ln(i, j));
        if (err <= tol_pct) f(std::min(i, j), std::max(i, j), err);
      },
      stop);
}

// A grid over the plane about as fine as the lot is dense (about two cells a node over the
// lot's bounding box), for searches that read a few cells around a node however many pairs
// lie within tolerance: the candidate search and the near check.
class FineGrid {
 public:
  FineGrid(const Nodes& nodes, double tol_ln) {
    const std::size_t n = nodes.size();
    if (n == 0) return;
    const auto [x_lo, x_hi] = std::minmax_element(nodes.x.begin(), nodes.x.end());
    const auto [y_lo, y_hi] = std::minmax_element(nodes.y.begin(), nodes.y.end());
    x0_ = *x_lo, y0_ = *y_lo;
    const double w = *x_hi - x0_, h = *y_hi - y0_;
    // Cell width c with (w / c + 1) (h / c + 1) about 2n cells.
    const double target = 2.0 * double(n);
    double inv = 0;
    if (w > 0 && h > 0) {
      const double a = w * h, b = w + h;
      inv = (-b + std::sqrt(b * b + 4 * a * (target - 1))) / (2 * a);
    } else if (w + h > 0) {
      inv = (target - 1) / (w + h);
    }
    cell_ = inv > 0 ? 1.0 / inv : std::max(tol_ln, 1e-9);
    if (!(cell_ > 0) || !std::isfinite(cell_)) cell_ = std::max(tol_ln, 1e-9);
    nx_ = static_cast<std::int64_t>(std::floor(w / cell_)) + 1;
    ny_ = static_cast<std::int64_t>(std::floor(h / cell_)) + 1;
    // Nodes by cell, row-major (compressed: start_[c] .. start_[c + 1]).
    cell_of_.resize(n);
    start_.assign(std::size_t(nx_ * ny_) + 1, 0);
    by_cell_.resize(n);
    for (std::uint32_t v = 0; v < n; ++v) {
      cell_of_[v] = static_cast<std::uint32_t>(index(nodes.y[v], y0_, ny_) * nx_ +
                                               index(nodes.x[v], x0_, nx_));
      ++start_[cell_of_[v] + 1];
    }
    for (std::size_t c = 1; c < start_.size(); ++c) start_[c] += start_[c - 1];
    std::vector<std::uint32_t> fill(start_.begin(), start_.end() - 1);
    for (std::uint32_t v = 0; v < n; ++v) by_cell_[fill[cell_of_[v]]++] = v;
  }

  // The nodes cell by cell (row-major): an order in which neighbours lie near in memory.
  std::uint32_t node_in_order(std::size_t k) const { return by_cell_[k]; }

  // Below r cell widths by a margin far above the rounding of the cell indices: a node
  // outside the rings 0..r-1 around another lies at least this far from it on one axis.
  double reach(std::int64_t r) const { return double(r) * cell_ * (1 - 1e-9); }

  // Calls f(u) for every node u in the cells of ring r around node v's cell (ring 0 is the
  // cell itself). Returns false when the ring lies wholly outside the grid.
  template <class F>
  bool for_each_in_ring(std::uint32_t v, std::int64_t r, F&& f) const {
    const std::int64_t cx = cell_of_[v] % nx_, cy = cell_of_[v] / nx_;
    if (r > std::max({cx, nx_ - 1 - cx, cy, ny_ - 1 - cy})) return false;
    auto visit_cell = [&](std::int64_t xx, std::int64_t yy) {
      const std::size_t c = std::size_t(yy * nx_ + xx);
      for (std::uint32_t k = start_[c]; k < start_[c + 1]; ++k) f(by_cell_[k]);
    };
    const std::int64_t xa = std::max<std::int64_t>(cx - r, 0), xb = std::min(cx + r, nx_ - 1);
    if (r == 0) {
      visit_cell(cx, cy);
      return true;
    }
    for (std::int64_t yy : {cy - r, cy + r})
      if (yy >= 0 && yy < ny_)
        for (std::int64_t xx = xa; xx <= xb; ++xx) visit_cell(xx, yy);
    for (std::int64_t xx : {cx - r, cx + r})
      if (xx >= 0 && xx < nx_)
        for (std::int64_t yy = std::max<std::int64_t>(cy - r + 1, 0);
             yy <= std::min(cy + r - 1, ny_ - 1); ++yy)
          visit_cell(xx, yy);
    return true;
  }

 private:
  std::int64_t index(double v, double origin, std::int64_t cells) const {
    const auto k = static_cast<std::int64_t>(std::floor((v - origin) / cell_));
    return std::clamp<std::int64_t>(k, 0, cells - 1);
  }

  double x0_ = 0, y0_ = 0, cell_ = 1;
  std::int64_t nx_ = 1, ny_ = 1;
  std::vector<std::uint32_t> cell_of_, start_, by_cell_;
};

// Each node's `cap` nearest other nodes within tolerance, by (error in percent, node), as
// lists sorted best first: list v is near[v * cap .. v * cap + count[v]). The search walks
// rings of the fine grid's cells outward from the node's cell. A node outside the rings read
// so far lies more than r cells away on one axis, so its error is at least r cell widths: the
// walk stops once the list is full and its worst entry is below that, or r cell widths exceed
// the tolerance. Returns false when stopped.
bool nearest_within_tolerance(const Nodes& nodes, const FineGrid& grid, double tol_ln,
                              double tol_pct, std::size_t cap, int threads,
                              std::vector<std::pair<double, std::uint32_t>>& near,
                              std::vector<std::uint32_t>& count, const std::stop_token& stop) {
  const std::size_t n = nodes.size();
  near.assign(n * cap, {});
  count.assign(n, 0);
  if (n < 2 || cap == 0) return true;
  // Each node's list is its own: ranges of nodes go to the workers as they come.
  auto search = [&](std::uint32_t v) {
    auto* list = near.data() + std::size_t(v) * cap;
    std::uint32_t size = 0;
    auto visit = [&](std::uint32_t u) {
      if (u == v || nodes.lower_bound_ln(v, u) > tol_ln) return;
      const double err = to_pct(nodes.exact_ln(v, u));
      if (err > tol_pct) return;
      const std::pair<double, std::uint32_t> item{err, u};
      if (size < cap) {
        list[size++] = item;
        std::push_heap(list, list + size);
      } else if (item < list[0]) {
        std::pop_heap(list, list + cap);
        list[cap - 1] = item;
        std::push_heap(list, list + cap);
      }
    };
    for (std::int64_t r = 0; grid.for_each_in_ring(v, r, visit); ++r) {
      const double bound = grid.reach(r);
      if (bound > tol_ln) break;
      if (size == cap && list[0].first < to_pct(bound)) break;
    }
    std::sort_heap(list, list + size);
    count[v] = size;
  };
  return detail::for_each_range(n, 64, threads, stop,
                                [&](std::size_t begin, std::size_t end, std::size_t) {
                                  for (std::size_t v = begin; v < end; ++v) {
                                    if (((v - begin) & 1023) == 0 && stop.stop_requested())
                                      return false;
                                    search(static_cast<std::uint32_t>(v));
                                  }
                                  return true;
                                });
}

// ---------------------------------------------------------------------------------------------
struct Edge {
  std::uint32_t i, j;  // i < j
  double error_pct;
  std::int64_t cost;  // error_pct in integer steps of the cost quantum
};

std::uint64_t edge_key(std::uint32_t i, std::uint32_t j) { return (std::uint64_t(i) << 32) | j; }

struct DisjointSets {
  std::vector<std::uint32_t> parent;
  explicit DisjointSets(std::size_t n) : parent(n) { std::iota(parent.begin(), parent.end(), 0u); }
  std::uint32_t find(std::uint32_t a) {
    while (parent[a] != a) a = parent[a] = parent[parent[a]];
    return a;
  }
  void unite(std::uint32_t a, std::uint32_t b) {
    a = find(a);
    b = find(b);
    if (a != b) parent[std::max(a, b)] = std::min(a, b);
  }
};

// The matching and its dual (LEMON's, scaled by 4 for integer weights), per node of the lot.
// Blossoms (odd sets with a dual value z_B) nest; LEMON lists each one as a range of one node
// list, so a blossom is kept as a range [begin, end) of positions given to the nodes.
struct Solution {
  std::vector<std::int64_t> mate;       // node or -1
  std::vector<std::int64_t> potential;  // y_u
  std::vector<std::uint64_t> position;  // node -> position, for nodes in some blossom
  std::vector<char> has_position;
  std::uint64_t next_position = 0;
  struct Blossom {
    std::int64_t value;  // z_B
    std::uint64_t begin, end;
    std::uint32_t some_member;  // names the component, for dropping it when solved again
  };
  std::vector<Blossom> blossoms;
};

using Graph = lemon::SmartGraph;
using Matcher = lemon::MaxWeightedMatching<Graph, Graph::EdgeMap<std::int64_t>>;
using WarmMatcher = detail::WarmWeightedMatching<Graph, Graph::EdgeMap<std::int64_t>>;
static_assert(Matcher::dualScale == WarmMatcher::dualScale);

// Copies a solved matching of graph g (node k of g is node nodes[k] of the lot) into `sol`.
template <class M>
void read_solution(const M& m, const Graph& g, const std::vector<std::uint32_t>& nodes,
                   Solution& sol) {
  for (std::size_t k = 0; k < nodes.size(); ++k) {
    const Graph::Node h = g.nodeFromId(static_cast<int>(k));
    const Graph::Node mate = m.mate(h);
    sol.mate[nodes[k]] = mate == lemon::INVALID ? -1 : std::int64_t(nodes[g.id(mate)]);
    sol.potential[nodes[k]] = m.nodeValue(h);
    sol.has_position[nodes[k]] = 0;
  }
  // Blossoms come inner first (post-order). Walking them outer first, a blossom whose first
  // node has no position yet is outermost: its nodes get consecutive positions in LEMON's
  // order, and every blossom inside it is then the range from its first node's position.
  // Only outermost blossoms are walked node by node, so this is linear in the component.
  for (int b = m.blossomNum() - 1; b >= 0; --b) {
    typename M::BlossomIt it(m, b);
    const std::uint32_t first = nodes[g.id(Graph::Node(it))];
    const auto size = static_cast<std::uint64_t>(m.blossomSize(b));
    if (!sol.has_position[first]) {
      for (; it != lemon::INVALID; ++it) {
        const std::uint32_t v = nodes[g.id(Graph::Node(it))];
        sol.position[v] = sol.next_position++;
        sol.has_position[v] = 1;
      }
    }
    const std::uint64_t begin = sol.position[first];
    sol.blossoms.push_back({m.blossomValue(b), begin, begin + size, first});
  }
}

// Solves one connected component (its nodes in the order the matching is to see them, the
// edges among them) into `sol`.
void solve_component(const std::vector<std::uint32_t>& nodes, std::vector<const Edge*> edges,
                     std::int64_t big, std::vector<std::uint32_t>& local, Solution& sol) {
  Graph g;
  g.reserveNode(static_cast<int>(nodes.size()));
  g.reserveEdge(static_cast<int>(edges.size()));
  std::vector<Graph::Node> handle(nodes.size());
  for (std::size_t k = 0; k < nodes.size(); ++k) {
    handle[k] = g.addNode();
    local[nodes[k]] = static_cast<std::uint32_t>(k);
  }
  // Edges in the nodes' order, so that the edge arrays follow the node arrays.
  std::sort(edges.begin(), edges.end(), [&](const Edge* a, const Edge* b) {
    const std::pair<std::uint32_t, std::uint32_t> ka = std::minmax(local[a->i], local[a->j]);
    const std::pair<std::uint32_t, std::uint32_t> kb = std::minmax(local[b->i], local[b->j]);
    return ka < kb;
  });
  Graph::EdgeMap<std::int64_t> weight(g);
  for (const Edge* e : edges) {
    const Graph::Edge ge = g.addEdge(handle[local[e->i]], handle[local[e->j]]);
    weight[ge] = big - e->cost;  // positive; more pairs always outweigh lower costs
  }
  Matcher m(g, weight);
  m.run();
  read_solution(m, g, nodes, sol);
}

// The warm path (docs/pairing.md, "repair"): one matching over all the lot's nodes, kept
// between rounds. The first round solves from scratch; a repair round adds the new edges to
// the same graph and lets the matching cover the violated constraints and run on from its
// last state instead of solving again.
class WarmRun {
 public:
  // `order`: the lot's nodes in the order the matching sees them.
  WarmRun(const std::vector<std::uint32_t>& order, std::size_t n) : order_(order), local_(n) {
    g_.reserveNode(static_cast<int>(order.size()));
    for (std::size_t k = 0; k < order.size(); ++k) {
      g_.addNode();
      local_[order[k]] = static_cast<std::uint32_t>(k);
    }
    weight_ = std::make_unique<Graph::EdgeMap<std::int64_t>>(g_);
    m_ = std::make_unique<WarmMatcher>(g_, *weight_);
  }

  void solve(std::vector<const Edge*> edges, std::int64_t big, Solution& sol) {
    std::sort(edges.begin(), edges.end(), [&](const Edge* a, const Edge* b) {
      return std::minmax(local_[a->i], local_[a->j]) < std::minmax(local_[b->i], local_[b->j]);
    });
    g_.reserveEdge(static_cast<int>(edges.size()));
    for (const Edge* e : edges) add(*e, big);
    m_->run();
    read(sol);
  }

  // Adds `added` (edges within tolerance not in the graph yet, the violating ones among
  // them) and repairs. False when the repair found the state other than expected.
  bool repair(const std::vector<Edge>& added, const std::vector<Edge>& violations, std::int64_t big,
              Solution& sol) {
    std::vector<std::pair<std::uint64_t, Graph::Edge>> made;
    made.reserve(added.size());
    for (const Edge& e : added) made.push_back({edge_key(e.i, e.j), add(e, big)});
    std::sort(made.begin(), made.end(),
              [](const auto& a, const auto& b) { return a.first < b.first; });
    m_->beginRepair();
    for (const Edge& e : violations) {
      const std::uint64_t key = edge_key(e.i, e.j);
      auto it = std::lower_bound(made.begin(), made.end(), key,
                                 [](const auto& a, std::uint64_t k) { return a.first < k; });
      if (it == made.end() || it->first != key) return false;
      if (!m_->admit(it->second)) return false;
      // Tests only: give up half way, the matching's state already changed.
      if (detail::fail_warm_repairs_for_tests.load() > 0) {
        --detail::fail_warm_repairs_for_tests;
        return false;
      }
    }
    if (!m_->resume()) return false;
    read(sol);
    return true;
  }

 private:
  Graph::Edge add(const Edge& e, std::int64_t big) {
    const Graph::Edge ge = g_.addEdge(g_.nodeFromId(static_cast<int>(local_[e.i])),
                                      g_.nodeFromId(static_cast<int>(local_[e.j])));
    (*weight_)[ge] = big - e.cost;
    return ge;
  }
  void read(Solution& sol) {
    sol.blossoms.clear();
    sol.next_position = 0;
    read_solution(*m_, g_, order_, sol);
  }

  std::vector<std::uint32_t> order_;
  std::vector<std::uint32_t> local_;
  Graph g_;
  std::unique_ptr<Graph::EdgeMap<std::int64_t>> weight_;
  std::unique_ptr<WarmMatcher> m_;
};

// Whether sol.mate is a matching on the given edges (each node's mate names it back and the
// two are joined by an edge): the certificate's equality of weights proves optimality only
// for a matching.
bool is_matching(const Solution& sol, const std::vector<Edge>& edges) {
  const std::size_t n = sol.mate.size();
  std::size_t matched = 0;
  for (std::size_t v = 0; v < n; ++v) {
    const std::int64_t w = sol.mate[v];
    if (w < 0) continue;
    if (std::size_t(w) >= n || sol.mate[std::size_t(w)] != std::int64_t(v) || std::size_t(w) == v)
      return false;
    ++matched;
  }
  std::size_t on_edges = 0;
  for (const Edge& e : edges)
    if (sol.mate[e.i] == std::int64_t(e.j)) on_edges += 2;
  return on_edges == matched;
}

// The sum of z_B over the blossoms holding two nodes (blossom_sums.h); a node outside every
// blossom has no position and shares none.
class BlossomForest {
 public:
  explicit BlossomForest(const Solution& sol) : sol_(sol), sums_(sol.next_position, ranges(sol)) {}

  static constexpr std::uint64_t kNone = ~std::uint64_t(0);
  std::uint64_t position_of(std::uint32_t v) const {
    return sol_.has_position[v] ? sol_.position[v] : kNone;
  }
  Wide shared_at(std::uint64_t pu, std::uint64_t pv) const {
    return pu == kNone || pv == kNone ? Wide(0) : sums_.shared(pu, pv);
  }

 private:
  static std::vector<detail::BlossomSums::Blossom> ranges(const Solution& sol) {
    std::vector<detail::BlossomSums::Blossom> r;
    r.reserve(sol.blossoms.size());
    for (const auto& b : sol.blossoms) r.push_back({b.begin, b.end, b.value});
    return r;
  }
  const Solution& sol_;
  detail::BlossomSums sums_;
};

// The certificate check (docs/pairing.md): y >= 0, z >= 0 on odd sets, dual objective equal to
// the matching's weight, and y_u + y_v + sum z_B (B holding u and v) >= 4 w_uv on every edge
// within tolerance. Violating edges are returned; `problem` says what else failed.
struct CheckResult {
  std::size_t within = 0;  // pairs within tolerance, every one of them checked
  std::vector<Edge> violations;
  std::string problem;
  bool stopped = false;
};

struct Costing {
  double quantum_pct = 0;  // one integer step of cost
  std::int64_t max_cost = 0;
  std::int64_t big = 1;
  std::int64_t cost(double error_pct) const {
    if (quantum_pct <= 0) return 0;
    return std::clamp<std::int64_t>(std::llround(error_pct / quantum_pct), 0, max_cost);
  }
};

// Whether the dual leaves pair (a, b) of integer cost c uncovered: y_a + y_b + the z_B of the
// blossoms holding both below 4 (big - c).
bool uncovered(const Solution& sol, const BlossomForest& forest, const Costing& costing,
               std::uint32_t a, std::uint32_t b, std::int64_t c) {
  const Wide cover = Wide(sol.potential[a]) + sol.potential[b] +
                     forest.shared_at(forest.position_of(a), forest.position_of(b));
  return cover < Wide(Matcher::dualScale) * (costing.big - c);
}

CheckResult check_certificate(const Nodes& nodes, const CellGrid& grid, const PairOptions& o,
                              double tol_ln, const Costing& costing, const Solution& sol,
                              const BlossomForest& forest, const std::vector<Edge>& edges,
                              const std::stop_token& stop) {
  CheckResult r;
  const std::size_t n = nodes.size();
  Wide dual = 0, primal = 0;
  for (std::size_t v = 0; v < n; ++v) {
    if (sol.potential[v] < 0 && r.problem.empty())
      r.problem = fmt::format("negative node potential at unit index {}", nodes.unit[v]);
    dual += sol.potential[v];
  }
  for (const auto& b : sol.blossoms) {
    const std::uint64_t size = b.end - b.begin;
    if ((b.value < 0 || size % 2 == 0) && r.problem.empty())
      r.problem = "a blossom of the dual is not an odd set with a non-negative value";
    dual += Wide(b.value) * std::int64_t(size / 2);
  }
  for (const Edge& e : edges)
    if (sol.mate[e.i] == std::int64_t(e.j)) primal += costing.big - e.cost;
  if (dual != primal * Matcher::dualScale && r.problem.empty())
    r.problem = "the dual objective differs from the matching's weight";

  // Cost steps per unit of expm1(ln error), for the lower bound of a pair's cost below.
  const double per_quantum = costing.quantum_pct > 0 ? 100.0 / costing.quantum_pct : 0;
  const Wide full_need = Wide(Matcher::dualScale) * costing.big;  // the need at cost zero
  const double surely_within = tol_ln * (1 - 1e-12);
  // What the pass reads of every node, in the grid's cell order: most pairs are then read
  // from nearby memory, not from all over the lot's arrays.
  const std::size_t slots = grid.slots();
  std::vector<double> sx(slots), sy(slots);
  std::vector<std::int64_t> spot(slots);
  std::vector<char> spower(slots);
  std::vector<std::uint64_t> sposition(slots);
  for (std::uint32_t p = 0; p < slots; ++p) {
    const std::uint32_t v = grid.node_at(p);
    sposition[p] = forest.position_of(v);
    sx[p] = nodes.x[v];
    sy[p] = nodes.y[v];
    spot[p] = sol.potential[v];
    spower[p] = nodes.row[v] < 0;
  }
  // Ranges of cells shared among the workers; each keeps its count and violations by range,
  // merged in range order below, so the result is the same on any number of threads.
  struct Found {
    std::size_t within = 0;
    std::vector<Edge> violations;
  };
  const std::size_t ranges = std::min<std::size_t>(grid.cells(), 64);
  std::vector<Found> found(std::max<std::size_t>(ranges, 1));
  auto pass = [&](std::uint32_t p, std::uint32_t q, Found& out) {
    const double lb = std::max(std::abs(sx[p] - sx[q]), std::abs(sy[p] - sy[q]));
    if (lb > tol_ln) return;
    // Within tolerance? For two power laws lb is the error itself, and clearly inside the
    // tolerance needs no expm1; otherwise (and near the limit) the exact error decides.
    const bool power = spower[p] && spower[q];
    const std::uint32_t a = grid.node_at(p), b = grid.node_at(q);
    auto error_pct = [&]() { return to_pct(power ? lb : nodes.exact_ln(a, b)); };
    double err = kNaN;
    if (power && lb < surely_within) {
      ++out.within;
    } else {
      err = error_pct();
      if (err > o.tolerance_pct) return;
      ++out.within;
    }
    // Covered by the node values and the blossom values the two share, even at the least
    // cost the pair can have? From x = the plane's lower bound of the ln error (exact for
    // two power laws), x + x^2/2 + x^3/6 + x^4/24 is below expm1(x); covered when
    // 4 (big - c) <= cover, i.e. c >= big - floor(cover / 4). The margin of 1e-3 quanta
    // is far above the rounding of these few operations. Only pairs close to tight (the
    // matched ones among them) need their exact cost.
    const Wide nodes_cover = Wide(spot[p]) + spot[q];
    if (nodes_cover >= full_need) return;
    const Wide cover = nodes_cover + forest.shared_at(sposition[p], sposition[q]);
    if (cover >= full_need) return;
    if (per_quantum > 0 && cover >= 0) {
      const Wide c_needed = Wide(costing.big) - cover / Matcher::dualScale;
      const double x = lb;
      const double below_expm1 = x * (1 + x * (0.5 + x * (1.0 / 6 + x / 24)));
      if (c_needed <= costing.max_cost &&
          below_expm1 * per_quantum >= double(c_needed) + 0.5 + 1e-3)
        return;
    }
    if (std::isnan(err)) err = error_pct();
    const std::int64_t c = costing.cost(err);
    const Wide need = Wide(Matcher::dualScale) * (costing.big - c);
    if (cover < need) out.violations.push_back({std::min(a, b), std::max(a, b), err, c});
  };
  const bool ok = detail::for_each_range(
      grid.cells(), ranges, o.threads, stop,
      [&](std::size_t first, std::size_t last, std::size_t k) {
        return grid.for_each_near_slot_pair_from(
            first, last, [&](std::uint32_t p, std::uint32_t q) { pass(p, q, found[k]); }, stop);
      });
  for (Found& f : found) {
    r.within += f.within;
    r.violations.insert(r.violations.end(), f.violations.begin(), f.violations.end());
  }
  r.stopped = !ok;
  return r;
}

// The near check (docs/pairing.md, "The near check"): the certificate's test on the pairs
// within radius[v] of each unit v only (a few times the distance of its farthest candidate,
// where the pairs a capped graph misses and the dual violates lie), to find them at a small
// part of the full check's cost. It proves nothing: a round whose near check finds nothing
// runs the full check. Violations are the full check's (the same test, exact costs).
CheckResult check_near(const Nodes& nodes, const FineGrid& fine, const std::vector<double>& radius,
                       const PairOptions& o, double tol_ln, const Costing& costing,
                       const Solution& sol, const BlossomForest& forest,
                       const std::stop_token& stop) {
  CheckResult r;
  const std::size_t n = nodes.size();
  std::vector<std::vector<Edge>> found(std::max<std::size_t>(std::min<std::size_t>(n, 64), 1));
  auto visit_unit = [&](std::uint32_t v, std::vector<Edge>& out) {
    const double rv = radius[v];
    if (!(rv > 0)) return;
    auto visit = [&](std::uint32_t u) {
      if (u == v) return;
      const double lb = nodes.lower_bound_ln(v, u);
      if (lb > rv || lb > tol_ln) return;
      if (u < v && radius[u] >= lb) return;  // found from u's side
      const double err = to_pct(nodes.exact_ln(v, u));
      if (err > o.tolerance_pct) return;
      const std::int64_t c = costing.cost(err);
      if (uncovered(sol, forest, costing, u, v, c))
        out.push_back({std::min(u, v), std::max(u, v), err, c});
    };
    for (std::int64_t ring = 0; fine.for_each_in_ring(v, ring, visit); ++ring)
      if (fine.reach(ring) > rv) break;
  };
  const bool ok = detail::for_each_range(n, found.size(), o.threads, stop,
                                         [&](std::size_t begin, std::size_t end, std::size_t k) {
                                           for (std::size_t v = begin; v < end; ++v) {
                                             if (((v - begin) & 1023) == 0 && stop.stop_requested())
                                               return false;
                                             visit_unit(fine.node_in_order(v), found[k]);
                                           }
                                           return true;
                                         });
  for (const auto& f : found) r.violations.insert(r.violations.end(), f.begin(), f.end());
  r.stopped = !ok;
  return r;
}

std::string fmt_pct(double v) { return fmt::format("{:.3f} %", v); }

}  // namespace

// ---------------------------------------------------------------------------------------------
std::string_view to_string(TrackingMode mode) {
  switch (mode) {
    case TrackingMode::absolute:
      return "absolute";
    case TrackingMode::trimmable:
      return "trimmable";
  }
  return "?";
}

std::optional<TrackingMode> parse_tracking_mode(std::string_view text) {
  if (text == "absolute") return TrackingMode::absolute;
  if (text == "trimmable") return TrackingMode::trimmable;
  return std::nullopt;
}

std::string_view to_string(ProofStatus status) {
  switch (status) {
    case ProofStatus::proved_optimal:
      return "proved optimal";
    case ProofStatus::not_proved:
      return "not proved";
  }
  return "?";
}

std::string PairOptions::validate() const {
  if (!(std::isfinite(lux_lo) && lux_lo > 0))
    return fmt::format("lux_lo = {} must be a finite illuminance above 0 lx", lux_lo);
  if (!(std::isfinite(lux_hi) && lux_hi > lux_lo))
    return fmt::format("lux_hi = {} must be finite and above lux_lo = {}", lux_hi, lux_lo);
  if (!(std::isfinite(tolerance_pct) && tolerance_pct >= 0 && tolerance_pct <= 100))
    return fmt::format("tolerance_pct = {} must be between 0 and 100", tolerance_pct);
  if (mode != TrackingMode::absolute && mode != TrackingMode::trimmable)
    return fmt::format("mode = {} must be absolute or trimmable", int(mode));
  if (candidate_cap_per_unit < 0)
    return fmt::format("candidate_cap_per_unit = {} must be 0 (no cap) or more",
                       candidate_cap_per_unit);
  if (grid_points_per_decade < 2 || grid_points_per_decade > 10000)
    return fmt::format("grid_points_per_decade = {} must be between 2 and 10000",
                       grid_points_per_decade);
  if (max_repair_rounds < 1)
    return fmt::format("max_repair_rounds = {} must be at least 1", max_repair_rounds);
  if (threads < 0) return fmt::format("threads = {} must be 0 (one per core) or more", threads);
  return {};
}

TrackingError tracking_error(const Curve& a, const Curve& b, const PairOptions& o) {
  const bool closed_form = a.model == ModelKind::power_law && b.model == ModelKind::power_law;
  const std::vector<double> lux =
      closed_form ? std::vector<double>{o.lux_lo, o.lux_hi} : grid_lux(o);
  std::size_t k_peak = 0, k_hi = lux.size() - 1, k_lo = 0;
  double peak = -1, hi = -std::numeric_limits<double>::infinity(), lo = -hi;
  for (std::size_t k = 0; k < lux.size(); ++k) {
    const double d = a.ln_ohm(lux[k]) - b.ln_ohm(lux[k]);
    if (std::abs(d) > peak) peak = std::abs(d), k_peak = k;
    if (d > hi) hi = d, k_hi = k;
    if (d < lo) lo = d, k_lo = k;
  }
  TrackingError r;
  double ln_error = 0, var = 0;
  if (o.mode == TrackingMode::absolute) {
    ln_error = peak;
    r.worst_lux = lux[k_peak];
    var = ln_diff_variance(a, r.worst_lux, 0) + ln_diff_variance(b, r.worst_lux, 0);
  } else {
    // A flat d has no extreme points of its own: its drift is read between the range ends.
    if (k_hi == k_lo) k_hi = lux.size() - 1, k_lo = 0;
    ln_error = hi - lo;
    r.worst_lux = lux[k_hi];
    r.other_lux = lux[k_lo];
    var = ln_diff_variance(a, r.worst_lux, r.other_lux) +
          ln_diff_variance(b, r.worst_lux, r.other_lux);
  }
  r.error_pct = to_pct(ln_error);
  // f = 100 (exp(D) - 1): df/dD = 100 exp(D)
  r.sigma_pct = 100.0 * std::exp(ln_error) * std::sqrt(var);
  return r;
}

Pairing pair_units(const LotFit& fit, const PairOptions& options, const ProgressFn& progress,
                   std::stop_token stop) {
  std::vector<std::size_t> all;
  for (std::size_t u = 0; u < fit.units.size(); ++u)
    if (fit.units[u].ok()) all.push_back(u);
  return pair_units(fit, all, options, progress, std::move(stop));
}

Pairing pair_units(const LotFit& fit, const std::vector<std::size_t>& eligible,
                   const PairOptions& o, const ProgressFn& progress, std::stop_token stop) {
  assert(o.validate().empty());
  Pairing out;
  out.options = o;
  out.counts.eligible = eligible.size();

  std::vector<std::size_t> chosen = eligible;
  std::sort(chosen.begin(), chosen.end());
  chosen.erase(std::unique(chosen.begin(), chosen.end()), chosen.end());
  std::vector<std::size_t> fitted;
  for (std::size_t u : chosen) {
    assert(u < fit.units.size());
    const UnitFit& f = fit.units[u];
    if (f.ok()) {
      fitted.push_back(u);
    } else {
      out.unpaired.push_back({u,
                              f.id,
                              fmt::format("no fitted curve ({})", to_string(f.status)),
                              std::nullopt,
                              {},
                              kNaN});
    }
  }
  out.counts.fitted = fitted.size();
  const Nodes nodes = make_nodes(fit, fitted, o);
  const std::size_t n = nodes.size();
  const std::size_t total_work = 3 * n + 1;
  std::size_t reported = 0;  // never goes back, though a repair round solves again
  auto report = [&](std::size_t done) {
    reported = std::max(reported, std::min(done, total_work));
    if (progress) progress(reported, total_work);
  };
  auto cancelled = [&]() {
    Pairing c;
    c.options = o;
    c.counts.eligible = eligible.size();
    c.counts.fitted = fitted.size();
    c.cancelled = true;
    c.proof_detail = "cancelled before the pairing was complete";
    return c;
  };

  // 1. Candidates within tolerance, from a grid over the plane (docs/pairing.md, "search").
  const double tol_ln = std::log1p(o.tolerance_pct / 100.0);
  const CellGrid grid(nodes, std::max(tol_ln, 1e-9) * (1 + 1e-9));

  // Integer costs: the tolerance in 2^20 steps, fewer if the weights would overflow.
  Costing costing;
  {
    std::int64_t steps = std::int64_t(1) << 20;
    const double half = double(n / 2 + 1);
    while (steps > 1 && 8.0 * half * half * double(steps) > 4e18) steps /= 2;
    costing.quantum_pct = o.tolerance_pct > 0 ? o.tolerance_pct / double(steps) : 0;
    costing.max_cost = o.tolerance_pct > 0 ? steps : 0;
    // BIG above (N/2 + 1) x the largest cost: one more pair always outweighs any total cost.
    costing.big = (std::int64_t(n / 2) + 1) * costing.max_cost + 1;
  }

  const std::size_t cap = static_cast<std::size_t>(o.candidate_cap_per_unit);
  // The fine grid serves the capped search and the near check; every pair is an edge without
  // a cap, and neither runs.
  std::optional<FineGrid> fine;
  if (cap > 0) fine.emplace(nodes, tol_ln);
  // Per unit, how far the near check reads (0: every pair within tolerance at it is an edge).
  std::vector<double> near_radius(n, 0.0);
  constexpr double kNearReach = 1.5;
  std::vector<Edge> edges;
  std::vector<double> nearest_err(n, kNaN);
  std::vector<std::int64_t> nearest(n, -1);
  auto note_nearest = [&](std::uint32_t v, std::uint32_t other, double err) {
    if (nearest[v] < 0 || err < nearest_err[v] ||
        (err == nearest_err[v] && std::int64_t(other) < nearest[v]))
      nearest[v] = other, nearest_err[v] = err;
  };
  if (cap == 0) {
    // Every pair within tolerance is a candidate.
    if (!for_each_tolerance_edge(
            nodes, grid, tol_ln, o.tolerance_pct,
            [&](std::uint32_t i, std::uint32_t j, double err) {
              note_nearest(i, j, err);
              note_nearest(j, i, err);
              edges.push_back({i, j, err, costing.cost(err)});
            },
            stop))
      return cancelled();
  } else {
    std::vector<std::pair<double, std::uint32_t>> near;
    std::vector<std::uint32_t> count;
    if (!nearest_within_tolerance(nodes, *fine, tol_ln, o.tolerance_pct, cap, o.threads, near,
                                  count, stop))
      return cancelled();
    for (std::uint32_t v = 0; v < n; ++v) {
      const auto* list = near.data() + std::size_t(v) * cap;
      if (count[v] > 0) note_nearest(v, list[0].second, list[0].first);
      // A full list may leave out pairs within tolerance: the near check reads 1.5 times as
      // far as its farthest entry (the violated pairs measured lay within 1.4 times; a pair
      // farther out is left to the full check; docs/pairing.md).
      if (count[v] == cap)
        near_radius[v] = std::min(tol_ln, kNearReach * std::log1p(list[cap - 1].first / 100.0));
      for (std::uint32_t k = 0; k < count[v]; ++k) {
        const auto [err, other] = list[k];
        if (v < other) {
          edges.push_back({v, other, err, costing.cost(err)});
        } else {
          // Kept once: by the lower node, unless the lower node's own list dropped it.
          const auto* h = near.data() + std::size_t(other) * cap;
          const bool kept_by_other =
              std::find(h, h + count[other], std::pair{err, v}) != h + count[other];
          if (!kept_by_other) edges.push_back({other, v, err, costing.cost(err)});
        }
      }
    }
  }
  report(n);

  // 2. Solve per connected component, check the certificate on every edge within tolerance,
  //    add the edges that violate it and solve the touched components again.
  // The order the matching sees the units in: along a Z-order curve over the grid's cells,
  // so that units near in the plane (the only ones joined by edges) are near in LEMON's
  // arrays; or the lot order.
  std::vector<std::uint32_t> solve_order(n);
  std::iota(solve_order.begin(), solve_order.end(), 0u);
  if (o.spatial_order && n > 1) {
    const double cell = std::max(tol_ln, 1e-9) * (1 + 1e-9);
    std::vector<std::int64_t> cx(n), cy(n);
    for (std::uint32_t v = 0; v < n; ++v) {
      cx[v] = static_cast<std::int64_t>(std::floor(nodes.x[v] / cell));
      cy[v] = static_cast<std::int64_t>(std::floor(nodes.y[v] / cell));
    }
    const std::int64_t x0 = *std::min_element(cx.begin(), cx.end());
    const std::int64_t y0 = *std::min_element(cy.begin(), cy.end());
    auto spread = [](std::uint64_t a) {  // bits of a at the even positions
      std::uint64_t r = 0;
      for (int b = 0; b < 32; ++b) r |= ((a >> b) & 1u) << (2 * b);
      return r;
    };
    std::vector<std::uint64_t> key(n);
    for (std::uint32_t v = 0; v < n; ++v)
      key[v] = spread(std::uint64_t(cx[v] - x0) & 0xffffffffu) |
               (spread(std::uint64_t(cy[v] - y0) & 0xffffffffu) << 1);
    std::sort(solve_order.begin(), solve_order.end(), [&](std::uint32_t a, std::uint32_t b) {
      return std::tie(key[a], a) < std::tie(key[b], b);
    });
  }

  Solution sol;
  sol.mate.assign(n, -1);
  sol.potential.assign(n, 0);
  sol.position.assign(n, 0);
  sol.has_position.assign(n, 0);
  std::vector<std::uint32_t> local(n);
  std::vector<std::uint32_t> touched(n);  // endpoints of edges added since the last solve
  std::iota(touched.begin(), touched.end(), 0u);
  std::vector<std::uint64_t> keys;
  // The warm path until a repair fails, then the cold one (every touched component solved
  // from scratch); either way the certificate check decides.
  bool warm = o.warm_repair;
  std::unique_ptr<WarmRun> warm_run;
  std::vector<Edge> added, violations;
  bool proved = false;
  std::string why_not;
  std::size_t round = 0;
  for (; round < std::size_t(o.max_repair_rounds); ++round) {
    std::sort(edges.begin(), edges.end(),
              [](const Edge& a, const Edge& b) { return std::tie(a.i, a.j) < std::tie(b.i, b.j); });
    DisjointSets sets(n);
    for (const Edge& e : edges) sets.unite(e.i, e.j);
    std::vector<std::vector<std::uint32_t>> members(n);
    for (std::uint32_t v : solve_order) members[sets.find(v)].push_back(v);
    std::vector<std::vector<const Edge*>> comp_edges(n);
    for (const Edge& e : edges) comp_edges[sets.find(e.i)].push_back(&e);
    // Edges are only ever added, so a component without a new edge is one solved before.
    std::vector<char> dirty(n, 0);
    for (std::uint32_t v : touched) dirty[sets.find(v)] = 1;
    std::erase_if(sol.blossoms,
                  [&](const Solution::Blossom& b) { return dirty[sets.find(b.some_member)]; });

    bool solved_warm = false;
    if (warm) {
      if (stop.stop_requested()) return cancelled();
      if (!warm_run) {
        warm_run = std::make_unique<WarmRun>(solve_order, n);
        std::vector<const Edge*> all(edges.size());
        for (std::size_t k = 0; k < edges.size(); ++k) all[k] = &edges[k];
        warm_run->solve(std::move(all), costing.big, sol);
        solved_warm = true;
      } else {
        solved_warm =
            warm_run->repair(added, violations, costing.big, sol) && is_matching(sol, edges);
        if (solved_warm) ++out.counts.warm_rounds;
      }
      if (!solved_warm) {
        // Fall back to solving every component from scratch.
        warm = false;
        warm_run.reset();
        ++out.counts.warm_fallbacks;
        std::fill(dirty.begin(), dirty.end(), 1);
        sol.blossoms.clear();
        sol.next_position = 0;
        std::fill(sol.mate.begin(), sol.mate.end(), -1);
        std::fill(sol.potential.begin(), sol.potential.end(), 0);
      } else {
        report(2 * n);
      }
    }

    std::size_t components = 0, largest = 0, solved = 0;
    for (std::uint32_t root = 0; root < n; ++root) {
      if (comp_edges[root].empty()) continue;
      ++components;
      largest = std::max(largest, members[root].size());
      if (!dirty[root] || solved_warm) continue;
      if (stop.stop_requested()) return cancelled();
      solve_component(members[root], comp_edges[root], costing.big, local, sol);
      solved += members[root].size();
      report(n + std::min(solved, n));
    }
    out.counts.components = components;
    out.counts.largest_component = largest;

    // The near check first when the graph was capped; the full check, which alone proves,
    // when the near check finds nothing (or is off).
    CheckResult check;
    const bool near_first = o.near_check && cap > 0;
    bool check_was_full = false;
    // The blossom sums of this round's dual, built once for both checks and the test of the
    // added pairs below.
    const BlossomForest forest(sol);
    if (near_first) {
      check = check_near(nodes, *fine, near_radius, o, tol_ln, costing, sol, forest, stop);
      if (check.stopped) return cancelled();
      ++out.counts.near_checks;
    }
    if (!near_first || check.violations.empty()) {
      check = check_certificate(nodes, grid, o, tol_ln, costing, sol, forest, edges, stop);
      if (check.stopped) return cancelled();
      ++out.counts.full_checks;
      check_was_full = true;
      out.counts.tolerance_edges = check.within;
    }
    report(3 * n);
    if (!check.problem.empty()) {
      why_not = check.problem;
      break;
    }
    if (check.violations.empty()) {
      proved = true;
      break;
    }
    keys.clear();
    for (const Edge& e : edges) keys.push_back(edge_key(e.i, e.j));
    std::sort(keys.begin(), keys.end());
    touched.clear();
    added.clear();
    violations = check.violations;
    std::vector<char> near_violation(n, 0);
    for (const Edge& e : check.violations) {
      if (std::binary_search(keys.begin(), keys.end(), edge_key(e.i, e.j))) {
        why_not = fmt::format(
            "the dual check failed on an edge the matching saw (unit indices {} and {})",
            nodes.unit[e.i], nodes.unit[e.j]);
        break;
      }
      near_violation[e.i] = near_violation[e.j] = 1;
    }
    if (!why_not.empty()) break;
    // Add more than the violating pairs: every pair within tolerance at their units, which
    // makes a further round rare. Found from the grid cells around those units alone.
    const std::size_t before = edges.size();
    std::vector<std::uint64_t> near_pairs;
    for (std::uint32_t v = 0; v < n; ++v) {
      if (!near_violation[v]) continue;
      if ((v & 1023) == 0 && stop.stop_requested()) return cancelled();
      grid.for_each_near(v, [&](std::uint32_t w) {
        if (near_violation[w] && w < v) return;  // found from w's side
        if (nodes.lower_bound_ln(v, w) > tol_ln) return;
        const std::uint64_t key = edge_key(std::min(v, w), std::max(v, w));
        if (!std::binary_search(keys.begin(), keys.end(), key)) near_pairs.push_back(key);
      });
    }
    std::sort(near_pairs.begin(), near_pairs.end());
    for (std::uint64_t key : near_pairs) {
      const auto i = static_cast<std::uint32_t>(key >> 32);
      const auto j = static_cast<std::uint32_t>(key & 0xffffffffu);
      const double err = to_pct(nodes.exact_ln(i, j));
      if (err > o.tolerance_pct) continue;
      edges.push_back({i, j, err, costing.cost(err)});
      added.push_back(edges.back());
      touched.push_back(i);
      touched.push_back(j);
    }
    out.counts.repaired_edges += edges.size() - before;
    // The warm repair must be told every added edge the dual leaves uncovered; after a near
    // check, which did not test the farther ones, they are tested here.
    if (!check_was_full) {
      violations.clear();
      for (const Edge& e : added)
        if (uncovered(sol, forest, costing, e.i, e.j, e.cost)) violations.push_back(e);
    }
  }
  out.counts.rounds = std::min<std::size_t>(round + 1, std::size_t(o.max_repair_rounds));
  out.counts.matched_edges = edges.size();
  if (proved) {
    out.proof = ProofStatus::proved_optimal;
    const std::string warm_note =
        out.counts.warm_rounds == 0
            ? std::string()
            : fmt::format(", {} of them run on from the last solve", out.counts.warm_rounds);
    out.proof_detail = fmt::format(
        "dual certificate checked on all {} pairs within tolerance ({} solve round{}{}, {} "
        "edge{} added by the check)",
        out.counts.tolerance_edges, out.counts.rounds, out.counts.rounds == 1 ? "" : "s", warm_note,
        out.counts.repaired_edges, out.counts.repaired_edges == 1 ? "" : "s");
  } else {
    out.proof = ProofStatus::not_proved;
    out.proof_detail =
        why_not.empty()
            ? fmt::format("improving pairs remained after {} repair rounds", o.max_repair_rounds)
            : why_not;
  }

  // 3. The result.
  std::size_t pairs = 0;
  for (std::uint32_t v = 0; v < n; ++v) {
    if (sol.mate[v] < 0 || sol.mate[v] < std::int64_t(v)) continue;
    const auto w = static_cast<std::uint32_t>(sol.mate[v]);
    const UnitFit& a = fit.units[nodes.unit[v]];
    const UnitFit& b = fit.units[nodes.unit[w]];
    const TrackingError te = tracking_error(a.curve, b.curve, o);
    out.pairs.push_back(
        {nodes.unit[v], nodes.unit[w], a.id, b.id, te.error_pct, te.sigma_pct, te.worst_lux});
    out.total_error_pct += te.error_pct;
    ++pairs;
  }
  std::sort(out.pairs.begin(), out.pairs.end(), [](const UnitPair& x, const UnitPair& y) {
    return std::tie(x.tracking_error_pct, x.a_id, x.b_id) <
           std::tie(y.tracking_error_pct, y.a_id, y.b_id);
  });
  // Each of two matchings of k pairs is off by at most k/2 quanta after rounding.
  out.total_error_rounding_bound_pct = double(pairs) * costing.quantum_pct;

  // Unpaired: the nearest unit within tolerance (taken by another pair), or else the nearest
  // unit at all, found by walking outward along x, whose gap bounds the error from below.
  std::vector<std::uint32_t> by_x(n);
  std::iota(by_x.begin(), by_x.end(), 0u);
  std::sort(by_x.begin(), by_x.end(), [&](std::uint32_t a, std::uint32_t b) {
    return std::tie(nodes.x[a], a) < std::tie(nodes.x[b], b);
  });
  std::vector<std::uint32_t> rank(n);
  for (std::uint32_t r = 0; r < n; ++r) rank[by_x[r]] = r;
  std::size_t budget = 50'000'000;
  for (std::uint32_t v = 0; v < n; ++v) {
    if (sol.mate[v] >= 0) continue;
    UnpairedUnit u;
    u.index = nodes.unit[v];
    u.id = fit.units[u.index].id;
    if (nearest[v] >= 0) {
      const auto w = static_cast<std::uint32_t>(nearest[v]);
      u.nearest = nodes.unit[w];
      u.nearest_id = fit.units[nodes.unit[w]].id;
      u.nearest_error_pct = nearest_err[v];
      const std::string mate_id =
          sol.mate[w] >= 0 ? fit.units[nodes.unit[std::size_t(sol.mate[w])]].id : "";
      u.reason = fmt::format("every unit within tolerance is in a pair; nearest {} at {}{}",
                             u.nearest_id, fmt_pct(u.nearest_error_pct),
                             mate_id.empty() ? "" : fmt::format(", paired with {}", mate_id));
    } else if (n < 2) {
      u.reason = "no other unit to pair with";
    } else {
      double best = std::numeric_limits<double>::infinity();
      std::int64_t best_node = -1;
      std::int64_t l = std::int64_t(rank[v]) - 1, r = std::int64_t(rank[v]) + 1;
      bool exhausted = false;
      while (l >= 0 || r < std::int64_t(n)) {
        const double gl = l >= 0 ? nodes.x[v] - nodes.x[by_x[l]] : kNaN;
        const double gr = r < std::int64_t(n) ? nodes.x[by_x[r]] - nodes.x[v] : kNaN;
        const bool left = r >= std::int64_t(n) || (l >= 0 && gl <= gr);
        const double gap = left ? gl : gr;
        if (gap >= best) break;
        const std::uint32_t w = left ? by_x[l--] : by_x[r++];
        const std::size_t cost = nodes.work(v, w);
        if (budget < cost) {
          exhausted = true;
          break;
        }
        budget -= cost;
        const double d = nodes.exact_ln(v, w);
        if (d < best || (d == best && std::int64_t(w) < best_node)) best = d, best_node = w;
      }
      if (best_node >= 0 && !exhausted) {
        u.nearest = nodes.unit[std::size_t(best_node)];
        u.nearest_id = fit.units[*u.nearest].id;
        u.nearest_error_pct = to_pct(best);
        u.reason = fmt::format("no unit within tolerance; nearest {} at {}", u.nearest_id,
                               fmt_pct(u.nearest_error_pct));
      } else {
        u.reason = "no unit within tolerance";
      }
    }
    out.unpaired.push_back(std::move(u));
  }
  std::sort(out.unpaired.begin(), out.unpaired.end(),
            [](const UnpairedUnit& a, const UnpairedUnit& b) { return a.index < b.index; });
  out.counts.pairs = out.pairs.size();
  out.counts.unpaired = out.unpaired.size();
  report(total_work);
  return out;
}

}  // namespace photolot
