// Plot geometry for the summary that is plain arithmetic: the lot's tolerance ellipse and the
// histogram bins. Kept free of Qt so tests check it against outside references.
#pragma once

#include <cstddef>
#include <optional>
#include <span>
#include <utility>
#include <vector>

namespace photolot::report {

// Mean, standard deviations and correlation of two characteristics.
struct Bivariate {
  double mean_x = 0;
  double mean_y = 0;
  double sd_x = 0;
  double sd_y = 0;
  double rho = 0;
};

// Sample moments (n - 1 in the variances, Pearson correlation) of paired values; nullopt with
// fewer than 3 pairs or a zero spread.
std::optional<Bivariate> sample_bivariate(std::span<const double> x, std::span<const double> y);

// The upper quantile of chi-square with 2 degrees of freedom, -2 ln(1 - coverage); coverage in
// (0, 1). For 2 dof the chi-square CDF is 1 - exp(-q / 2), so the quantile has this closed form.
double chi_square_2dof_quantile(double coverage);

// Points of the ellipse {(x, y) : d' S^-1 d = q}, d = (x - mean_x, y - mean_y), S the covariance
// of `b`: x = mean_x + sqrt(q) sd_x cos t, y = mean_y + sqrt(q) sd_y (rho cos t +
// sqrt(1 - rho^2) sin t), t over [0, 2 pi]; the first point is repeated at the end to close it.
std::vector<std::pair<double, double>> tolerance_ellipse(const Bivariate& b, double q,
                                                         std::size_t points = 181);

// Equal-width bins over [lo, hi]: Sturges' rule ceil(log2 n) + 1 bins, at least 5, at most 30.
struct Histogram {
  double lo = 0;
  double width = 0;
  std::vector<std::size_t> counts;
};
Histogram make_histogram(std::span<const double> values, double lo, double hi);

}  // namespace photolot::report
