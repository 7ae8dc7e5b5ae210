// Two-sided normal tolerance factors.
//
// Howe's approximation (NIST/SEMATECH e-Handbook of Statistical Methods, section 7.2.6.3):
//   k2 = sqrt( nu (1 + 1/N) z^2_{(1-p)/2} / chi^2_{1-gamma, nu} ),  nu = N - 1,
// z the upper (1-p)/2 normal quantile, chi^2_{1-gamma, nu} the lower 1-gamma quantile.
//
// The exact factor (tabulated in ISO 16269-6; the integral below is written from memory and
// checked in the tests against the standard's tabulated factors) is the k solving
//   gamma = sqrt(2N / pi) * Integral_0^inf P(chi^2_nu > nu r(z)^2 / k^2) exp(-N z^2 / 2) dz,
// where r(z) solves Phi(z + r) - Phi(z - r) = p: the probability, over the sample mean's
// standardised offset z and the sample sd, that mean +- k s covers at least p of the population.
#include <boost/math/distributions/chi_squared.hpp>
#include <boost/math/distributions/normal.hpp>
#include <boost/math/quadrature/gauss_kronrod.hpp>
#include <boost/math/tools/roots.hpp>
#include <cmath>
#include <cstdint>
#include <numbers>

#include "photolot/statistics.h"

namespace photolot {

namespace {

using boost::math::cdf;
using boost::math::complement;
using boost::math::quantile;

// r with Phi(z + r) - Phi(z - r) = p, for z >= 0: Newton's method with bisection safeguard
// (Boost.Math), derivative phi(z + r) + phi(z - r). The root lies in [zp, z + zp] with zp the
// two-sided normal quantile: at r = zp the coverage is at most p (the interval is centred best
// at z = 0), and Phi(2z + zp) - Phi(-zp) >= p.
double coverage_half_width(double z, double p, double zp) {
  const boost::math::normal normal;
  auto f = [&](double r) {
    return std::pair{cdf(normal, z + r) - cdf(normal, z - r) - p,
                     pdf(normal, z + r) + pdf(normal, z - r)};
  };
  std::uintmax_t iterations = 100;
  return boost::math::tools::newton_raphson_iterate(f, std::sqrt(zp * zp + z * z), zp, z + zp, 40,
                                                    iterations);
}

// The confidence that mean +- k s covers p of a normal population, from N values.
double exact_confidence(double k, std::size_t n, double p) {
  const double nu = static_cast<double>(n - 1);
  const double nd = static_cast<double>(n);
  const boost::math::chi_squared chi2(nu);
  const double zp = quantile(boost::math::normal(), 0.5 * (1 + p));
  auto integrand = [&](double z) {
    const double r = coverage_half_width(z, p, zp);
    const double t = nu * r * r / (k * k);
    return cdf(complement(chi2, t)) * std::exp(-nd * z * z / 2);
  };
  // exp(-N z^2 / 2) is below 1e-40 past z = 14 / sqrt(N).
  const double upper = 14.0 / std::sqrt(nd);
  const double integral = boost::math::quadrature::gauss_kronrod<double, 61>::integrate(
      integrand, 0.0, upper, 8, 1e-12);
  return std::sqrt(2 * nd / std::numbers::pi) * integral;
}

}  // namespace

double tolerance_factor_howe(std::size_t n, double coverage, double confidence) {
  if (n < 2 || !(coverage > 0 && coverage < 1) || !(confidence > 0 && confidence < 1)) return kNaN;
  const double nd = static_cast<double>(n);
  const double nu = nd - 1;
  const double z = quantile(boost::math::normal(), 0.5 * (1 + coverage));
  const double chi2 = quantile(boost::math::chi_squared(nu), 1 - confidence);
  return std::sqrt(nu * (1 + 1 / nd) * z * z / chi2);
}

double tolerance_factor_exact(std::size_t n, double coverage, double confidence) {
  if (n < 2 || !(coverage > 0 && coverage < 1) || !(confidence > 0 && confidence < 1)) return kNaN;
  // The confidence rises with k; Howe's factor is within a few percent of the exact one for
  // n >= 2, so bracket around it.
  const double howe = tolerance_factor_howe(n, coverage, confidence);
  auto f = [&](double k) { return exact_confidence(k, n, coverage) - confidence; };
  double lo = 0.5 * howe, hi = 2.0 * howe;
  while (f(lo) > 0 && lo > 1e-6) lo *= 0.5;
  while (f(hi) < 0 && hi < 1e6) hi *= 2;
  std::uintmax_t iterations = 100;
  const auto [a, b] = boost::math::tools::toms748_solve(
      f, lo, hi, boost::math::tools::eps_tolerance<double>(40), iterations);
  return 0.5 * (a + b);
}

}  // namespace photolot
