// The robust losses on a whitened residual and the median, shared by the per-unit fits
// (power_law_fit.cpp and extended/unit_fit.cpp). Private to fitting/.
#pragma once

#include <algorithm>
#include <cmath>
#include <vector>

#include "photolot/fitting/fit.h"

namespace photolot::fitting::detail {

// The median of v (reordered); v is not empty.
inline double median_in_place(std::vector<double>& v) {
  const auto mid = v.begin() + static_cast<std::ptrdiff_t>(v.size() / 2);
  std::nth_element(v.begin(), mid, v.end());
  if (v.size() % 2 == 1) return *mid;
  return 0.5 * (*mid + *std::max_element(v.begin(), mid));
}

// Robust losses on a whitened residual r (ln R residual / scale), corner at 1, in Ceres's
// convention cost = 1/2 rho(r^2):
//   Huber:  rho(s) = s for s <= 1, 2 sqrt(s) - 1 beyond
//   Cauchy: rho(s) = ln(1 + s)
//   none:   rho(s) = s
// TinySolver minimises 1/2 sum f^2, so each residual is folded: f = sign(r) sqrt(rho(r^2)),
// which has the same minimum. fold() returns f and df/dr.
struct Folded {
  double f;
  double dfdr;
};

inline Folded fold(Loss loss, double r) {
  switch (loss) {
    case Loss::none:
      return {r, 1.0};
    case Loss::huber: {
      const double a = std::abs(r);
      if (a <= 1.0) return {r, 1.0};
      const double f = std::sqrt(2.0 * a - 1.0);
      return {std::copysign(f, r), 1.0 / f};
    }
    case Loss::cauchy: {
      const double s = r * r;
      if (s < 1e-16) return {r, 1.0};  // f = r (1 - s/4 + ...): exact to rounding here
      const double f = std::sqrt(std::log1p(s));
      return {std::copysign(f, r), std::abs(r) / ((1.0 + s) * f)};
    }
  }
  return {r, 1.0};
}

// rho(r^2), the robust weight rho'(r^2) (what iteratively reweighted least squares would use),
// psi(r) = rho'(r^2) r and psi'(r), all on the whitened residual.
struct LossTerms {
  double rho, weight, psi, dpsi;
};

inline LossTerms loss_terms(Loss loss, double r) {
  const double s = r * r;
  switch (loss) {
    case Loss::none:
      return {s, 1.0, r, 1.0};
    case Loss::huber: {
      const double a = std::abs(r);
      if (a <= 1.0) return {s, 1.0, r, 1.0};
      return {2.0 * a - 1.0, 1.0 / a, std::copysign(1.0, r), 0.0};
    }
    case Loss::cauchy: {
      const double w = 1.0 / (1.0 + s);
      return {std::log1p(s), w, w * r, (1.0 - s) * w * w};
    }
  }
  return {s, 1.0, r, 1.0};
}

}  // namespace photolot::fitting::detail
