// The per-unit power-law fit: ln R = ln R10 - gamma * ln(E / 10 lx), least squares in log
// space with a robust loss, solved by Ceres's TinySolver from a resistant start. The
// method, with its formulas, is written out in docs/fitting.md; the comments here name which
// formula each step implements.
#include <ceres/tiny_solver.h>
#include <fmt/format.h>

#include <Eigen/Core>
#include <algorithm>
#include <boost/math/distributions/students_t.hpp>
#include <cmath>
#include <optional>

#include "photolot/fitting/fit.h"
#include "photolot/fitting/models.h"
#include "robust_loss.h"
#include "unit_points.h"

namespace photolot::fitting {
namespace {

using detail::fold;
using detail::Folded;
using detail::loss_terms;
using detail::LossTerms;
using detail::median_in_place;

constexpr int kParameters = 2;  // ln R10, gamma
constexpr int kMaxIterations = 100;
// The loss's corner is at least this many observed standard deviations of the unit's scatter.
constexpr double kScatterCorner = 3.0;

// The meter's loss scale in ln R: a reading within the meter's accuracy is a residual of at
// most one scale unit.
double meter_scale(const FitOptions& o) { return std::log1p(o.meter_accuracy_pct / 100.0); }

// Theil's abbreviated line (Theil 1950; from memory): with the points in order of
// illuminance, the median of the slopes between point i and point i + n/2, then the median
// intercept. Each wild point spoils one slope of n/2, so a decade slip moves neither the
// robust fit's start nor the scatter read about it; n/2 slopes cost far less than the
// n(n - 1)/2 of the full Theil-Sen line. Returns {ln R10, gamma}; nullopt when every pair
// shares a level.
std::optional<std::array<double, 2>> abbreviated_theil_line(const detail::UnitPoints& pts) {
  const std::size_t n = pts.size();
  std::vector<std::size_t> order(n);
  for (std::size_t i = 0; i < n; ++i) order[i] = i;
  std::sort(order.begin(), order.end(),
            [&](std::size_t a, std::size_t b) { return pts.x[a] < pts.x[b]; });
  const std::size_t half = n / 2, offset = (n + 1) / 2;  // odd n: the middle point sits out
  std::vector<double> v;
  v.reserve(n);
  for (std::size_t k = 0; k < half; ++k) {
    const std::size_t i = order[k], j = order[k + offset];
    const double dx = pts.x[j] - pts.x[i];
    if (dx > 1e-9) v.push_back((pts.y[j] - pts.y[i]) / dx);
  }
  if (v.empty()) return std::nullopt;
  const double slope = median_in_place(v);
  v.resize(n);
  for (std::size_t i = 0; i < n; ++i) v[i] = pts.y[i] - slope * pts.x[i];
  return std::array<double, 2>{median_in_place(v), -slope};
}

// The unit's observed scatter in ln R, robustly: 1.4826 x the median absolute residual (the
// normal-consistent MAD about the fitted line), times sqrt(n / (n - p)) for the fitted
// parameters. One decade slip among ten points leaves it almost unchanged.
double observed_scatter(const detail::UnitPoints& pts, const std::array<double, 2>& params) {
  const std::size_t n = pts.size();
  std::vector<double> a(n);
  for (std::size_t i = 0; i < n; ++i)
    a[i] = std::abs(pts.y[i] - (params[0] - params[1] * pts.x[i]));
  return 1.4826 * median_in_place(a) *
         std::sqrt(static_cast<double>(n) / static_cast<double>(n - kParameters));
}

// The whitened, folded residuals of the power law for TinySolver, with their Jacobian
// (column-major, residuals x parameters).
struct PowerLawResiduals {
  using Scalar = double;
  enum { NUM_RESIDUALS = Eigen::Dynamic, NUM_PARAMETERS = kParameters };

  const std::vector<double>* x;
  const std::vector<double>* y;
  double inv_scale;
  Loss loss;

  int NumResiduals() const { return static_cast<int>(x->size()); }

  bool operator()(const double* p, double* residuals, double* jacobian) const {
    const int n = NumResiduals();
    for (int i = 0; i < n; ++i) {
      const double xi = (*x)[i];
      const double r = ((*y)[i] - p[0] + p[1] * xi) * inv_scale;
      const Folded f = fold(loss, r);
      residuals[i] = f.f;
      if (jacobian) {
        jacobian[i] = -f.dfdr * inv_scale;          // d f / d ln R10
        jacobian[n + i] = f.dfdr * xi * inv_scale;  // d f / d gamma
      }
    }
    return true;
  }
};

// Ordinary least squares of y on x, centred for accuracy; returns {ln R10, gamma}.
std::array<double, 2> closed_form(const std::vector<double>& x, const std::vector<double>& y,
                                  double* sxx_out, double* x_mean_out) {
  const double n = static_cast<double>(x.size());
  double xm = 0, ym = 0;
  for (std::size_t i = 0; i < x.size(); ++i) {
    xm += x[i];
    ym += y[i];
  }
  xm /= n;
  ym /= n;
  double sxx = 0, sxy = 0;
  for (std::size_t i = 0; i < x.size(); ++i) {
    const double dx = x[i] - xm;
    sxx += dx * dx;
    sxy += dx * (y[i] - ym);
  }
  const double slope = sxy / sxx;
  *sxx_out = sxx;
  *x_mean_out = xm;
  return {ym - slope * xm, -slope};
}

double t_quantile(int dof, double confidence) {
  // Boost's quantile costs microseconds, more than a unit's fit: keep the small-dof ones of
  // the last confidence level per thread.
  constexpr int kCached = 64;
  thread_local double cached_confidence = kNaN;
  thread_local std::array<double, kCached> cached{};
  if (confidence != cached_confidence) {
    cached.fill(kNaN);
    cached_confidence = confidence;
  }
  if (dof < kCached && !std::isnan(cached[dof])) return cached[dof];
  const boost::math::students_t dist(static_cast<double>(dof));
  const double t = boost::math::quantile(boost::math::complement(dist, (1.0 - confidence) / 2.0));
  if (dof < kCached) cached[dof] = t;
  return t;
}

// Fills everything that follows from the parameters: residuals, weights, outliers, the
// covariance, intervals, the curve and the message.
void finish(UnitFit& f, const detail::UnitPoints& pts, std::array<double, 2> params, Loss loss,
            const FitOptions& o, double scale, double scatter, double sxx, double x_mean) {
  const std::size_t n = pts.size();
  const double ln_r10 = params[0];
  const double gamma = params[1];

  // Residuals and the sums for Huber's covariance estimate.
  f.residuals.resize(n);
  double cost = 0, sum_psi2 = 0, sum_dpsi = 0, sum_dpsi2 = 0, sum_weight = 0, sum_in2 = 0;
  int inside = 0;
  for (std::size_t i = 0; i < n; ++i) {
    PointFit& p = f.residuals[i];
    p.reading_index = pts.reading_index[i];
    p.lux = pts.lux[i];
    p.ohm = pts.ohm[i];
    p.residual_ln = pts.y[i] - (ln_r10 - gamma * pts.x[i]);
    const double r = p.residual_ln / scale;
    const LossTerms t = loss_terms(loss, r);
    p.weight = t.weight;
    p.outlier = std::abs(p.residual_ln) > o.outlier_threshold * scatter && t.weight < 1.0;
    cost += 0.5 * t.rho;
    sum_psi2 += t.psi * t.psi;
    sum_dpsi += t.dpsi;
    sum_dpsi2 += t.dpsi * t.dpsi;
    sum_weight += t.weight;
    if (std::abs(r) <= 1.0) ++inside;
    if (p.outlier) {
      ++f.outlier_points;
    } else {
      sum_in2 += p.residual_ln * p.residual_ln;
    }
  }
  const int kept = static_cast<int>(n) - f.outlier_points;
  f.rms_log_residual = kept > 0 ? std::sqrt(sum_in2 / kept) : kNaN;
  f.cost = cost;

  // Covariance of (ln R10, gamma): Huber's estimate (H1),
  //   C = K^2 * [sum psi^2 / (n - p)] / m^2 * scale^2 * (X'X)^-1,
  //   m = mean psi', K = 1 + (p / n) var(psi') / m^2,
  // which for Loss::none is s^2 (X'X)^-1 with s^2 = sum r^2 / (n - p), the textbook
  // least-squares covariance. (X'X)^-1 for rows [1, -x]: var ln R10 = 1/n + x_mean^2 / Sxx,
  // var gamma = 1 / Sxx, cov = x_mean / Sxx.
  std::array<double, 4> cov{kNaN, kNaN, kNaN, kNaN};
  if (f.dof > 0) {
    const double nn = static_cast<double>(n);
    double m = sum_dpsi / nn;
    double k = 1.0 + kParameters / nn * std::max(0.0, sum_dpsi2 / nn - m * m) / (m * m);
    if (inside < kParameters + 1 && loss != Loss::none) {
      // Almost every point lies beyond the loss's corner (rare: the corner follows the
      // observed scatter), so psi' no longer measures the points' pull. Use the mean robust
      // weight instead (approximate; flagged).
      m = sum_weight / nn;
      k = 1.0;
      f.flags.emplace_back("approximate-covariance");
    }
    const double factor = k * k * (sum_psi2 / (nn - kParameters)) / (m * m) * scale * scale;
    cov = {factor * (1.0 / nn + x_mean * x_mean / sxx), factor * x_mean / sxx,
           factor * x_mean / sxx, factor / sxx};
  }
  f.curve = make_power_law(std::exp(ln_r10), gamma, cov);
  f.r10_ohm = std::exp(ln_r10);
  f.gamma = gamma;
  f.gamma_10_100 = f.curve.two_point_gamma(10.0, 100.0);
  if (f.dof > 0) {
    f.ln_r10_sd = std::sqrt(cov[0]);
    f.gamma_sd = std::sqrt(cov[3]);
    const double t = t_quantile(f.dof, o.confidence);
    f.r10_ci95_ohm = {std::exp(ln_r10 - t * f.ln_r10_sd), std::exp(ln_r10 + t * f.ln_r10_sd)};
    f.gamma_ci95 = {gamma - t * f.gamma_sd, gamma + t * f.gamma_sd};
  } else {
    f.curve.covariance.clear();
  }

  if (f.outlier_points > 0) f.flags.emplace_back("outliers");
  if (f.dof < 3) f.flags.emplace_back("few-points");

  f.message = fmt::format("fitted {} points over {:.1f} decades; rms {:.2f} %", n, pts.span_decades,
                          100.0 * std::expm1(f.rms_log_residual));
  if (f.outlier_points > 0)
    f.message += fmt::format("; {} outlier{}", f.outlier_points, f.outlier_points == 1 ? "" : "s");
  if (f.censored_points > 0) f.message += fmt::format("; {} over range", f.censored_points);
  if (f.dof == 0) f.message += "; no scatter left to estimate intervals";
  const double meter = meter_scale(o);
  if (loss != Loss::none && scatter > meter) {
    f.flags.emplace_back("scatter-above-meter-accuracy");
    f.message += fmt::format("; scatter {:.2f} % exceeds the meter's {:g} %",
                             100.0 * std::expm1(scatter), o.meter_accuracy_pct);
  }
}

// Runs TinySolver on the folded residuals from `start`; false when it did not converge.
bool solve(const detail::UnitPoints& pts, Loss loss, double scale, std::array<double, 2>& params,
           int& iterations, std::string& why) {
  const PowerLawResiduals fn{&pts.x, &pts.y, 1.0 / scale, loss};
  ceres::TinySolver<PowerLawResiduals> solver;
  // TinySolver's stopping tests are absolute; on residuals whitened by the corner a cost
  // change of 1e-12 means parameter steps of about 1e-6 of the corner, far below any
  // standard error.
  solver.options.max_num_iterations = kMaxIterations;
  solver.options.gradient_tolerance = 1e-12;
  solver.options.function_tolerance = 1e-12;
  solver.options.parameter_tolerance = 1e-12;
  Eigen::Vector2d p(params[0], params[1]);
  const auto& summary = solver.Solve(fn, &p);
  iterations += summary.iterations;
  if (!std::isfinite(p[0]) || !std::isfinite(p[1])) {
    why = "the solver left the finite numbers";
    return false;
  }
  if (summary.status == ceres::TinySolver<PowerLawResiduals>::HIT_MAX_ITERATIONS) {
    why = fmt::format("the solver did not converge in {} iterations", kMaxIterations);
    return false;
  }
  params = {p[0], p[1]};
  return true;
}

UnitFit fit(const Unit& unit, const FitOptions& options, bool robust) {
  const std::string invalid = options.validate();
  if (!invalid.empty()) return detail::invalid_options_fit(unit, invalid);
  const detail::UnitPoints pts = detail::collect_points(unit);
  UnitFit f = detail::start_unit_fit(unit, pts, options, kParameters);
  if (!f.ok()) return f;

  double sxx = 0, x_mean = 0;
  std::array<double, 2> params = closed_form(pts.x, pts.y, &sxx, &x_mean);
  const Loss loss = robust ? options.loss : Loss::none;
  double scale = meter_scale(options);
  double scatter = scale;
  if (loss != Loss::none && f.dof > 0) {
    std::string why;
    // Start from a line that outliers cannot move (Theil's abbreviated line), and put the
    // loss's corner at the larger of the meter's accuracy and 3 x the unit's observed scatter
    // about that line: a bench noisier than its meter (light-source ripple, creep) would
    // otherwise put most points beyond the corner, flag good points as outliers, make the
    // solver crawl and the intervals too narrow (measured by simulation: docs/fitting.md).
    std::array<double, 2> start = abbreviated_theil_line(pts).value_or(params);
    const double sigma = observed_scatter(pts, start);
    scatter = std::max(scale, sigma);
    scale = std::max(scale, kScatterCorner * sigma);
    bool ok = solve(pts, Loss::huber, scale, start, f.iterations, why);
    // Cauchy's loss is not convex: it starts from the Huber minimum so that a decade slip
    // cannot trap it near the least-squares line.
    if (ok && loss == Loss::cauchy) ok = solve(pts, loss, scale, start, f.iterations, why);
    params = start;
    if (!ok) {
      f.status = FitStatus::solver_failed;
      f.message = "not fitted: " + why;
      return f;
    }
  }
  finish(f, pts, params, loss, options, scale, scatter, sxx, x_mean);
  return f;
}

}  // namespace

UnitFit fit_unit(const Unit& unit, const FitOptions& options) {
  // Over-range readings as one-sided terms need the extended fit (models.h).
  if (options.over_range_bounds && needs_extended_fit(unit))
    return fit_unit_extended(unit, options, power_law_with_bounds());
  return fit(unit, options, true);
}

UnitFit fit_unit_closed_form(const Unit& unit, const FitOptions& options) {
  return fit(unit, options, false);
}

OhmInterval interval_at(const UnitFit& unit_fit, double lux, double confidence) {
  OhmInterval out;
  if (!unit_fit.ok() || !(lux > 0)) return out;
  const double ln_r = unit_fit.curve.ln_ohm(lux);
  out.ohm = std::exp(ln_r);
  if (unit_fit.dof <= 0 || unit_fit.curve.covariance.empty() || !(confidence > 0 && confidence < 1))
    return out;
  const double half = t_quantile(unit_fit.dof, confidence) * unit_fit.curve.ln_ohm_sd(lux);
  out.lo_ohm = std::exp(ln_r - half);
  out.hi_ohm = std::exp(ln_r + half);
  return out;
}

}  // namespace photolot::fitting
