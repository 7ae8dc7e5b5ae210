// What the curves view plots for a set of units, computed from the lot and its fit without any
// widget: the readings by kind, the fitted line, its confidence band and the residuals.
// Kept apart from the drawing so it can be tested on its own and built off the GUI thread.
#pragma once

#include <QString>
#include <vector>

#include "photolot/fit_result.h"
#include "photolot/lot.h"

namespace photolot::workbench {

struct UnitSeries {
  int unit = 0;  // index into Lot::units
  QString id;
  // Readings under light, by what the fit made of them.
  std::vector<double> normal_lux, normal_ohm;
  std::vector<double> outlier_lux, outlier_ohm;
  std::vector<double> censored_lux, censored_ohm;  // over range: ohm is the lower bound
  // The fitted curve over the unit's illuminance span (empty when not fitted), and its
  // two-sided confidence band for the curve (empty when no covariance or not asked for).
  std::vector<double> line_lux, line_ohm;
  std::vector<double> band_low_ohm, band_high_ohm;  // at line_lux
  // True when the fitted curve is a straight line on log-log axes (a power law at 25 degC):
  // its first and last samples then draw it exactly, whatever line_lux holds.
  bool straight = false;
  // Residuals ln R_measured - ln R_fitted at the readings the fit used.
  std::vector<double> residual_lux, residual_ln;
  std::vector<double> outlier_residual_lux, outlier_residual_ln;
};

struct CurveSeriesOptions {
  bool bands = true;
  double confidence = 0.95;
  int line_samples = 32;  // for curved models; a power law is a straight line: 2 points
};

std::vector<UnitSeries> build_curve_series(const Lot& lot, const LotFit* fit,
                                           const std::vector<int>& units,
                                           const CurveSeriesOptions& options = {});
// Every unit of the lot, in lot order (the session builds these on its worker with the fit, so
// the curves view only picks from them).
std::vector<UnitSeries> build_all_curve_series(const Lot& lot, const LotFit* fit,
                                               const CurveSeriesOptions& options = {});

}  // namespace photolot::workbench
