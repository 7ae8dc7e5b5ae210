#include "geometry.h"

#include <algorithm>
#include <cassert>
#include <cmath>
#include <numbers>

namespace photolot::report {

std::optional<Bivariate> sample_bivariate(std::span<const double> x, std::span<const double> y) {
  assert(x.size() == y.size());
  const std::size_t n = x.size();
  if (n < 3) return std::nullopt;
  Bivariate b;
  for (std::size_t i = 0; i < n; ++i) {
    b.mean_x += x[i];
    b.mean_y += y[i];
  }
  b.mean_x /= static_cast<double>(n);
  b.mean_y /= static_cast<double>(n);
  double sxx = 0, syy = 0, sxy = 0;
  for (std::size_t i = 0; i < n; ++i) {
    const double dx = x[i] - b.mean_x;
    const double dy = y[i] - b.mean_y;
    sxx += dx * dx;
    syy += dy * dy;
    sxy += dx * dy;
  }
  if (!(sxx > 0) || !(syy > 0)) return std::nullopt;
  b.sd_x = std::sqrt(sxx / static_cast<double>(n - 1));
  b.sd_y = std::sqrt(syy / static_cast<double>(n - 1));
  b.rho = sxy / std::sqrt(sxx * syy);
  return b;
}

double chi_square_2dof_quantile(double coverage) {
  assert(coverage > 0 && coverage < 1);
  return -2.0 * std::log1p(-coverage);
}

std::vector<std::pair<double, double>> tolerance_ellipse(const Bivariate& b, double q,
                                                         std::size_t points) {
  assert(points >= 3 && q > 0);
  const double r = std::sqrt(q);
  const double rho = std::clamp(b.rho, -1.0, 1.0);
  const double rho_c = std::sqrt(1.0 - rho * rho);
  std::vector<std::pair<double, double>> out;
  out.reserve(points + 1);
  for (std::size_t i = 0; i < points; ++i) {
    const double t = 2.0 * std::numbers::pi * static_cast<double>(i) / static_cast<double>(points);
    out.emplace_back(b.mean_x + r * b.sd_x * std::cos(t),
                     b.mean_y + r * b.sd_y * (rho * std::cos(t) + rho_c * std::sin(t)));
  }
  out.push_back(out.front());
  return out;
}

Histogram make_histogram(std::span<const double> values, double lo, double hi) {
  Histogram h;
  const std::size_t n = std::max<std::size_t>(values.size(), 1);
  const auto bins = static_cast<std::size_t>(
      std::clamp(std::ceil(std::log2(static_cast<double>(n))) + 1.0, 5.0, 30.0));
  if (!(hi > lo)) {
    const double pad = std::max(std::abs(lo) * 0.05, 1e-9);
    lo -= pad;
    hi += pad;
  }
  h.lo = lo;
  h.width = (hi - lo) / static_cast<double>(bins);
  h.counts.assign(bins, 0);
  for (double v : values) {
    if (!std::isfinite(v)) continue;
    auto k = static_cast<std::ptrdiff_t>(std::floor((v - lo) / h.width));
    k = std::clamp<std::ptrdiff_t>(k, 0, static_cast<std::ptrdiff_t>(bins) - 1);
    ++h.counts[static_cast<std::size_t>(k)];
  }
  return h;
}

}  // namespace photolot::report
