// Lot statistics over fitted units. Formulas and their sources: docs/statistics.md.
#include "photolot/statistics.h"

#include <fmt/format.h>

#include <algorithm>
#include <boost/math/distributions/normal.hpp>
#include <cmath>
#include <numeric>

namespace photolot {

std::string_view to_string(Characteristic c) {
  switch (c) {
    case Characteristic::r10:
      return "r10";
    case Characteristic::gamma:
      return "gamma";
    case Characteristic::dark:
      return "dark";
    case Characteristic::rms_log_residual:
      return "rms_log_residual";
    case Characteristic::fit:
      return "fit";
  }
  return "?";
}

std::string StatisticsOptions::validate() const {
  if (!(coverage > 0 && coverage < 1))
    return fmt::format("coverage = {} must lie strictly between 0 and 1", coverage);
  if (!(confidence > 0 && confidence < 1))
    return fmt::format("confidence = {} must lie strictly between 0 and 1", confidence);
  if (!(outlier_z > 0)) return fmt::format("outlier_z = {} must be above 0", outlier_z);
  return {};
}

double quantile_type7(std::span<const double> sorted, double p) {
  if (sorted.empty()) return kNaN;
  // Hyndman and Fan (1996) definition 7: h = (n - 1) p, x[floor h] + (h - floor h)(x[floor h + 1]
  // - x[floor h]) with 0-based indices.
  const double h = static_cast<double>(sorted.size() - 1) * std::clamp(p, 0.0, 1.0);
  const auto lo = static_cast<std::size_t>(std::floor(h));
  if (lo + 1 >= sorted.size()) return sorted.back();
  const double frac = h - static_cast<double>(lo);
  return sorted[lo] + frac * (sorted[lo + 1] - sorted[lo]);
}

namespace {

double median_of(std::vector<double> v) {
  std::sort(v.begin(), v.end());
  return quantile_type7(v, 0.5);
}

}  // namespace

Summary summarize(std::span<const double> values, std::span<const double> fit_sd,
                  const StatisticsOptions& options) {
  Summary s;
  std::vector<double> sorted;  // non-finite values are left out
  sorted.reserve(values.size());
  for (double x : values)
    if (std::isfinite(x)) sorted.push_back(x);
  std::sort(sorted.begin(), sorted.end());
  s.n = sorted.size();
  if (s.n == 0) return s;
  s.min = sorted.front();
  s.max = sorted.back();
  s.median = quantile_type7(sorted, 0.5);
  for (std::size_t i = 0; i < kPercentileLevels.size(); ++i)
    s.percentiles[i] = quantile_type7(sorted, kPercentileLevels[i] / 100);
  // Two-pass mean and variance (numerically stable for the tight spreads of gamma).
  s.mean = std::accumulate(sorted.begin(), sorted.end(), 0.0) / static_cast<double>(s.n);
  if (s.n >= 2) {
    double ss = 0;
    for (double x : sorted) ss += (x - s.mean) * (x - s.mean);
    s.sd = std::sqrt(ss / static_cast<double>(s.n - 1));
    s.tolerance_factor = options.exact_tolerance_factor
                             ? tolerance_factor_exact(s.n, options.coverage, options.confidence)
                             : tolerance_factor_howe(s.n, options.coverage, options.confidence);
    s.tolerance_interval = {s.mean - s.tolerance_factor * s.sd, s.mean + s.tolerance_factor * s.sd};
  }
  // Deconvolution: observed variance = true variance + mean fit variance (independent noise).
  double sum_var = 0;
  std::size_t n_var = 0;
  for (double e : fit_sd) {
    if (std::isfinite(e)) {
      sum_var += e * e;
      ++n_var;
    }
  }
  if (n_var > 0) {
    s.mean_fit_variance = sum_var / static_cast<double>(n_var);
    if (s.n >= 2)
      s.sd_without_fit_noise = std::sqrt(std::max(0.0, s.sd * s.sd - s.mean_fit_variance));
  }
  return s;
}

std::vector<double> modified_z_scores(std::span<const double> values) {
  std::vector<double> z(values.size(), kNaN);
  if (values.size() < 3) return z;
  const double med = median_of({values.begin(), values.end()});
  std::vector<double> dev;
  dev.reserve(values.size());
  for (double x : values) dev.push_back(std::abs(x - med));
  const double mad = median_of(std::move(dev));
  if (!(mad > 0)) return z;
  // Iglewicz and Hoaglin (1993): M = 0.6745 (x - median) / MAD; 0.6745 = 1 / 1.4826 is the
  // normal quantile at 0.75, which makes the scaled MAD consistent with sigma.
  for (std::size_t i = 0; i < values.size(); ++i) z[i] = 0.6745 * (values[i] - med) / mad;
  return z;
}

Capability capability(double mean, double sd_within, double sd_overall, const Limits& limits) {
  Capability c;
  c.has_lower = limits.has_min();
  c.has_upper = limits.has_max();
  auto index = [&](double sd, double& both, double& worst) {
    if (!(sd > 0) || !std::isfinite(mean)) return;
    double lower = kNaN, upper = kNaN;
    if (c.has_lower) lower = (mean - limits.min) / (3 * sd);
    if (c.has_upper) upper = (limits.max - mean) / (3 * sd);
    if (c.has_lower && c.has_upper) {
      both = (limits.max - limits.min) / (6 * sd);
      worst = std::min(lower, upper);
    } else {
      worst = c.has_lower ? lower : upper;
    }
  };
  index(sd_within, c.cp, c.cpk);
  index(sd_overall, c.pp, c.ppk);
  if (sd_overall > 0 && std::isfinite(mean)) {
    const boost::math::normal normal(mean, sd_overall);
    c.ppm_below = c.has_lower ? 1e6 * boost::math::cdf(normal, limits.min) : 0.0;
    c.ppm_above =
        c.has_upper ? 1e6 * boost::math::cdf(boost::math::complement(normal, limits.max)) : 0.0;
    c.ppm_total = c.ppm_below + c.ppm_above;
  }
  return c;
}

LotStatistics lot_statistics(const LotFit& fit, const StatisticsOptions& options,
                             const Spec* spec) {
  LotStatistics st;
  st.units_total = fit.units.size();
  st.coverage = options.coverage;
  st.confidence = options.confidence;
  st.tolerance_method = options.exact_tolerance_factor ? "exact" : "Howe";

  std::vector<double> ln_r10, ln_r10_sd, gamma, gamma_sd;
  std::vector<const UnitFit*> used;
  for (const auto& u : fit.units) {
    if (!u.ok() || !(u.r10_ohm > 0) || !std::isfinite(u.gamma)) continue;
    used.push_back(&u);
    ln_r10.push_back(std::log(u.r10_ohm));
    ln_r10_sd.push_back(u.ln_r10_sd);
    gamma.push_back(u.gamma);
    gamma_sd.push_back(u.gamma_sd);
  }
  st.units_fitted = used.size();
  st.ln_r10 = summarize(ln_r10, ln_r10_sd, options);
  st.gamma = summarize(gamma, gamma_sd, options);

  if (used.size() >= 3) {
    double sxy = 0, sxx = 0, syy = 0;
    for (std::size_t i = 0; i < used.size(); ++i) {
      const double dx = ln_r10[i] - st.ln_r10.mean, dy = gamma[i] - st.gamma.mean;
      sxy += dx * dy;
      sxx += dx * dx;
      syy += dy * dy;
    }
    if (sxx > 0 && syy > 0) st.correlation_ln_r10_gamma = sxy / std::sqrt(sxx * syy);
  }

  if (spec != nullptr) {
    if (spec->r10_ohm.any()) {
      Limits ln_limits;
      if (spec->r10_ohm.has_min()) ln_limits.min = std::log(spec->r10_ohm.min);
      if (spec->r10_ohm.has_max()) ln_limits.max = std::log(spec->r10_ohm.max);
      st.r10_capability =
          capability(st.ln_r10.mean, st.ln_r10.sd_without_fit_noise, st.ln_r10.sd, ln_limits);
    }
    if (spec->gamma.any())
      st.gamma_capability =
          capability(st.gamma.mean, st.gamma.sd_without_fit_noise, st.gamma.sd, spec->gamma);
  }

  const auto z_r10 = modified_z_scores(ln_r10);
  const auto z_gamma = modified_z_scores(gamma);
  for (std::size_t i = 0; i < used.size(); ++i) {
    if (std::abs(z_r10[i]) > options.outlier_z)
      st.outliers.push_back({used[i]->id, Characteristic::r10, used[i]->r10_ohm, z_r10[i]});
    if (std::abs(z_gamma[i]) > options.outlier_z)
      st.outliers.push_back({used[i]->id, Characteristic::gamma, used[i]->gamma, z_gamma[i]});
  }
  return st;
}

}  // namespace photolot
