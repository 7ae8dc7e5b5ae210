// Sums of dual values over nested blossoms, for the certificate check (pairing.cpp).
#pragma once

#include <algorithm>
#include <bit>
#include <cstddef>
#include <cstdint>
#include <optional>
#include <utility>
#include <vector>

namespace photolot::detail {

__extension__ typedef __int128 WideSum;  // sums of dual values, beyond int64 for large lots

// Least of a fixed array over any index range, in constant time (a sparse table of minima).
template <class T>
class RangeMinimum {
 public:
  explicit RangeMinimum(std::vector<T> values) {
    table_.push_back(std::move(values));
    const std::size_t n = table_[0].size();
    for (std::size_t w = 1; 2 * w <= n; w *= 2) {
      const std::vector<T>& prev = table_.back();
      std::vector<T> next(n - 2 * w + 1);
      for (std::size_t k = 0; k < next.size(); ++k) next[k] = std::min(prev[k], prev[k + w]);
      table_.push_back(std::move(next));
    }
  }
  // Least of values[lo..hi], lo <= hi < size.
  T min(std::size_t lo, std::size_t hi) const {
    const auto level = static_cast<std::size_t>(std::bit_width(hi - lo + 1) - 1);
    return std::min(table_[level][lo], table_[level][hi + 1 - (std::size_t(1) << level)]);
  }

 private:
  std::vector<std::vector<T>> table_;
};

// Blossoms are ranges [begin, end) of positions 0..positions-1 that nest (any two are disjoint
// or one holds the other), each with a value z >= 0. shared(p, q) is the sum of z over the
// blossoms holding both positions. For p < q those are exactly the blossoms holding every step
// k..k+1 between them, and their sum is the least of the step sums: at the end of the
// outermost blossom holding p but not q (or the start of the outermost holding q but not p,
// or at step p when neither exists) only the blossoms holding both remain, and every other
// step's blossoms include them. So the step sums go in a sparse table of minima.
class BlossomSums {
 public:
  struct Blossom {
    std::uint64_t begin, end;
    std::int64_t value;
  };

  BlossomSums(std::uint64_t positions, const std::vector<Blossom>& blossoms) {
    const std::size_t steps = positions > 1 ? std::size_t(positions - 1) : 0;
    std::vector<WideSum> diff(steps + 1, 0);
    WideSum total = 0;
    for (const Blossom& b : blossoms) {
      if (b.end - b.begin < 2) continue;
      diff[b.begin] += b.value;  // steps begin .. end - 2
      diff[b.end - 1] -= b.value;
      total += b.value;
    }
    // int64 cells unless the sums might not fit.
    WideSum run = 0;
    if (total >= 0 && total < (WideSum(1) << 62)) {
      std::vector<std::int64_t> step(steps);
      for (std::size_t k = 0; k < steps; ++k) step[k] = static_cast<std::int64_t>(run += diff[k]);
      narrow_.emplace(std::move(step));
    } else {
      std::vector<WideSum> step(steps);
      for (std::size_t k = 0; k < steps; ++k) step[k] = run += diff[k];
      wide_.emplace(std::move(step));
    }
  }

  // Sum of z over the blossoms holding both positions; 0 when p == q is asked (not a pair).
  WideSum shared(std::uint64_t p, std::uint64_t q) const {
    const std::uint64_t lo = std::min(p, q), hi = std::max(p, q);
    if (lo == hi) return 0;
    return narrow_ ? WideSum(narrow_->min(lo, hi - 1)) : wide_->min(lo, hi - 1);
  }

 private:
  std::optional<RangeMinimum<std::int64_t>> narrow_;
  std::optional<RangeMinimum<WideSum>> wide_;
};

}  // namespace photolot::detail
