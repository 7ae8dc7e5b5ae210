// Lots of hand-placed curves for the pairing tests (no solver): a unit is given by its point in
// the plane (ln R at 1 lx, ln R at 1000 lx), the default working range, or by R10 and gamma.
#pragma once

#include <cmath>
#include <string>

#include "photolot/curve.h"
#include "photolot/fit_result.h"

namespace photolot::test {

// A fitted power-law unit through ln R(lux_lo) = ln_lo and ln R(lux_hi) = ln_hi.
inline UnitFit unit_through(const std::string& id, double ln_lo, double ln_hi, double lux_lo = 1.0,
                            double lux_hi = 1000.0) {
  const double gamma = (ln_lo - ln_hi) / std::log(lux_hi / lux_lo);
  const double ln_r10 = ln_lo - gamma * std::log(kReferenceLux / lux_lo);
  UnitFit u;
  u.id = id;
  u.status = FitStatus::fitted;
  u.curve = make_power_law(std::exp(ln_r10), gamma);
  u.r10_ohm = std::exp(ln_r10);
  u.gamma = gamma;
  return u;
}

inline UnitFit unit_from(const std::string& id, const Curve& curve) {
  UnitFit u;
  u.id = id;
  u.status = FitStatus::fitted;
  u.curve = curve;
  return u;
}

// The tracking error of two curves evaluated directly from the definition on n log-spaced
// points (including both ends), independent of the pairing code.
inline double dense_error_pct(const Curve& a, const Curve& b, bool trimmable, int n = 20001,
                              double lux_lo = 1.0, double lux_hi = 1000.0) {
  double lo = 1e300, hi = -1e300, peak = 0;
  for (int k = 0; k < n; ++k) {
    const double e = lux_lo * std::pow(lux_hi / lux_lo, double(k) / (n - 1));
    const double d = a.ln_ohm(e) - b.ln_ohm(e);
    lo = std::min(lo, d);
    hi = std::max(hi, d);
    peak = std::max(peak, std::abs(d));
  }
  return 100.0 * (std::exp(trimmable ? hi - lo : peak) - 1.0);
}

}  // namespace photolot::test
