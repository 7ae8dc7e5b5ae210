#include "curve_series.h"

#include <algorithm>
#include <boost/math/distributions/normal.hpp>
#include <boost/math/distributions/students_t.hpp>
#include <cmath>

namespace photolot::workbench {
namespace {

// The two-sided quantile for the band: Student t on the fit's degrees of freedom (the same
// intervals the fit reports), the normal quantile when they are unknown.
double band_quantile(double confidence, int dof) {
  const double p = 0.5 + confidence / 2;
  if (dof >= 1) return boost::math::quantile(boost::math::students_t(dof), p);
  return boost::math::quantile(boost::math::normal(), p);
}

}  // namespace

std::vector<UnitSeries> build_curve_series(const Lot& lot, const LotFit* fit,
                                           const std::vector<int>& units,
                                           const CurveSeriesOptions& options) {
  std::vector<UnitSeries> out;
  out.reserve(units.size());
  for (int index : units) {
    if (index < 0 || index >= static_cast<int>(lot.units.size())) continue;
    const Unit& unit = lot.units[static_cast<std::size_t>(index)];
    const UnitFit* unit_fit = fit && fit->units.size() == lot.units.size()
                                  ? &fit->units[static_cast<std::size_t>(index)]
                                  : nullptr;
    UnitSeries s;
    s.unit = index;
    s.id = QString::fromStdString(unit.id);

    std::vector<char> is_outlier(unit.readings.size(), 0);
    if (unit_fit) {
      for (const auto& p : unit_fit->residuals) {
        if (p.reading_index >= unit.readings.size()) continue;
        if (p.outlier) {
          is_outlier[p.reading_index] = 1;
          s.outlier_residual_lux.push_back(p.lux);
          s.outlier_residual_ln.push_back(p.residual_ln);
        } else {
          s.residual_lux.push_back(p.lux);
          s.residual_ln.push_back(p.residual_ln);
        }
      }
    }

    double lux_min = INFINITY, lux_max = 0;
    for (std::size_t i = 0; i < unit.readings.size(); ++i) {
      const Reading& r = unit.readings[i];
      if (!(r.lux > 0)) continue;  // dark readings have no place on a log axis
      if (r.kind == ReadingKind::censored) {
        // A lower bound only: drawn, but the fitted line spans the readings the fit used.
        if (std::isfinite(r.ohm) && r.ohm > 0) {
          s.censored_lux.push_back(r.lux);
          s.censored_ohm.push_back(r.ohm);
        }
        continue;
      } else if (std::isfinite(r.ohm) && r.ohm > 0) {
        (is_outlier[i] ? s.outlier_lux : s.normal_lux).push_back(r.lux);
        (is_outlier[i] ? s.outlier_ohm : s.normal_ohm).push_back(r.ohm);
      } else {
        continue;
      }
      lux_min = std::min(lux_min, r.lux);
      lux_max = std::max(lux_max, r.lux);
    }

    if (unit_fit && unit_fit->ok() && lux_max > 0) {
      const Curve& curve = unit_fit->curve;
      // At 25 degC (where the view draws) the temperature term is nil: a power law is straight.
      const bool straight = curve.model == ModelKind::power_law;
      s.straight = straight;
      const bool band = options.bands && !curve.covariance.empty();
      const int samples = straight && !band ? 2 : std::max(2, options.line_samples);
      const double t = band ? band_quantile(options.confidence, unit_fit->dof) : 0;
      const double a = std::log(lux_min), b = std::log(lux_max);
      for (int k = 0; k < samples; ++k) {
        const double lux = std::exp(a + (b - a) * k / (samples - 1));
        const double ln_r = curve.ln_ohm(lux);
        s.line_lux.push_back(lux);
        s.line_ohm.push_back(std::exp(ln_r));
        if (band) {
          const double half = t * curve.ln_ohm_sd(lux);
          s.band_low_ohm.push_back(std::exp(ln_r - half));
          s.band_high_ohm.push_back(std::exp(ln_r + half));
        }
      }
    }
    out.push_back(std::move(s));
  }
  return out;
}

std::vector<UnitSeries> build_all_curve_series(const Lot& lot, const LotFit* fit,
                                               const CurveSeriesOptions& options) {
  std::vector<int> all(lot.units.size());
  for (std::size_t i = 0; i < all.size(); ++i) all[i] = static_cast<int>(i);
  return build_curve_series(lot, fit, all, options);
}

}  // namespace photolot::workbench
