// Evaluation of fitted curves; the formulas are in curve.h.
#include "photolot/curve.h"

#include <cassert>
#include <cmath>

namespace photolot {
namespace {

double temperature_term(const Curve& c, double lux, double temp_c) {
  if (!c.temperature_handled || temp_c == kReferenceTempC) return 0.0;
  const double tc = c.tc10_pct_per_c + c.tc_slope_pct_per_c_per_decade * std::log10(lux / kReferenceLux);
  return std::log1p(tc / 100.0 * (temp_c - kReferenceTempC));
}

}  // namespace

double Curve::ln_ohm(double lux, double temp_c) const {
  const double x = std::log(lux / kReferenceLux);
  double ln_r = 0;
  switch (model) {
    case ModelKind::power_law:
      assert(params.size() >= 2);
      ln_r = params[0] - params[1] * x;
      break;
    case ModelKind::dark_conductance:
      assert(params.size() >= 3);
      ln_r = -std::log(params[2] + std::exp(params[0] + params[1] * x));
      break;
  }
  return ln_r + temperature_term(*this, lux, temp_c);
}

double Curve::ohm(double lux, double temp_c) const { return std::exp(ln_ohm(lux, temp_c)); }

std::vector<double> Curve::gradient(double lux) const {
  const double x = std::log(lux / kReferenceLux);
  switch (model) {
    case ModelKind::power_law:
      return {1.0, -x};
    case ModelKind::dark_conductance: {
      // ln R = -ln(g + exp(a + b x)); with p = exp(a + b x), s = g + p:
      // d/da = -p/s, d/db = -x p/s, d/dg = -1/s
      const double p = std::exp(params[0] + params[1] * x);
      const double s = params[2] + p;
      return {-p / s, -x * p / s, -1.0 / s};
    }
  }
  return {};
}

double Curve::ln_ohm_sd(double lux) const {
  const std::size_t n = params.size();
  if (covariance.size() != n * n) return 0.0;
  const auto g = gradient(lux);
  double var = 0;
  for (std::size_t i = 0; i < n; ++i)
    for (std::size_t j = 0; j < n; ++j) var += g[i] * covariance[i * n + j] * g[j];
  return var > 0 ? std::sqrt(var) : 0.0;
}

double Curve::local_gamma(double lux) const {
  switch (model) {
    case ModelKind::power_law:
      return params[1];
    case ModelKind::dark_conductance: {
      // -d ln R / d x = b p / (g + p)
      const double x = std::log(lux / kReferenceLux);
      const double p = std::exp(params[0] + params[1] * x);
      return params[1] * p / (params[2] + p);
    }
  }
  return std::nan("");
}

double Curve::two_point_gamma(double lux_a, double lux_b) const {
  return (ln_ohm(lux_a) - ln_ohm(lux_b)) / std::log(lux_b / lux_a);
}

Curve make_power_law(double r10_ohm, double gamma, std::array<double, 4> covariance) {
  Curve c;
  c.model = ModelKind::power_law;
  c.params = {std::log(r10_ohm), gamma};
  c.covariance.assign(covariance.begin(), covariance.end());
  return c;
}

}  // namespace photolot
