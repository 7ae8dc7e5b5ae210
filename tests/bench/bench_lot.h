// The invented lot of the pairing benchmarks: power-law units spread like a batch (ln R10 sd
// 0.15 around 20 kOhm, gamma 0.75 sd 0.03), the same on every platform. Shared by
// bench_pairing.cpp and bench_matching_growth.cpp, so that both measure the same lots.
// bench_matching_growth.cpp also draws two flat lots of the same units (draw_flat_lot), to see
// whether the growth comes from the batch's thin edges.
#pragma once

#include <cmath>
#include <cstdint>
#include <vector>

namespace photolot::bench {

// A small portable generator (splitmix64 + Box-Muller).
struct Stream {
  std::uint64_t s;
  double uniform() {
    std::uint64_t z = (s += 0x9E3779B97F4A7C15ull);
    z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ull;
    z = (z ^ (z >> 27)) * 0x94D049BB133111EBull;
    return double((z ^ (z >> 31)) >> 11) * 0x1.0p-53;
  }
  double normal() {
    const double u = 1.0 - uniform(), v = uniform();
    return std::sqrt(-2.0 * std::log(u)) * std::cos(6.283185307179586 * v);
  }
};

struct UnitDraw {
  double ln_r10;
  double gamma;
};

inline std::vector<UnitDraw> draw_lot(std::size_t n) {
  Stream rng{12345};
  std::vector<UnitDraw> out(n);
  for (auto& u : out) {
    u.ln_r10 = std::log(20e3) + 0.15 * rng.normal();
    u.gamma = 0.75 + 0.03 * rng.normal();
  }
  return out;
}

// Flat lots: ln R10 and gamma uniform over a box instead of the batch's bell. With
// fixed_density false the box is the batch's +-2 sd (ln R10 +-0.30, gamma +-0.06) whatever the
// lot size, so a larger lot is denser, as a larger batch is; with fixed_density true the box's
// sides grow as sqrt(n / 10,000) from that size, so every lot has the density of 10,000 units.
inline std::vector<UnitDraw> draw_flat_lot(std::size_t n, bool fixed_density) {
  Stream rng{12345};
  const double scale = fixed_density ? std::sqrt(double(n) / 10000.0) : 1.0;
  std::vector<UnitDraw> out(n);
  for (auto& u : out) {
    u.ln_r10 = std::log(20e3) + scale * 0.30 * (2.0 * rng.uniform() - 1.0);
    u.gamma = 0.75 + scale * 0.06 * (2.0 * rng.uniform() - 1.0);
  }
  return out;
}

}  // namespace photolot::bench
