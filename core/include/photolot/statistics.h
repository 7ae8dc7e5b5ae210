// Lot statistics over the fitted units: location, spread, percentiles, tolerance intervals,
// the spread with each unit's fit noise removed, process performance against the spec, and
// robust outliers. Formulas and sources: docs/statistics.md.
//
// R10 is summarised on the log scale (spreads multiply): the summary of ln R10 is kept in
// `ln_r10`; geometric mean = exp(mean), spread factor = exp(sd), percentiles and intervals
// map back to ohm through exp().
#pragma once

#include <array>
#include <cstddef>
#include <nlohmann/json_fwd.hpp>
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "photolot/fit_result.h"
#include "photolot/spec.h"

namespace photolot {

// Percentile levels reported for every characteristic, in percent.
inline constexpr std::array<double, 5> kPercentileLevels = {1, 5, 50, 95, 99};

struct StatisticsOptions {
  double coverage = 0.99;    // fraction of units a tolerance interval covers
  double confidence = 0.95;  // confidence that it does
  // Howe's approximation (false) or the exact two-sided factor by numerical integration (true).
  bool exact_tolerance_factor = false;
  double outlier_z = 3.5;  // |modified z| above this flags a unit (Iglewicz and Hoaglin)

  std::string validate() const;  // empty when valid
};

// One characteristic over the fitted units.
struct Summary {
  std::size_t n = 0;
  double mean = kNaN;
  double median = kNaN;
  double sd = kNaN;  // sample standard deviation (n - 1)
  double min = kNaN;
  double max = kNaN;
  std::array<double, 5> percentiles{kNaN, kNaN, kNaN, kNaN, kNaN};  // at kPercentileLevels
  double tolerance_factor = kNaN;                                   // k2
  std::array<double, 2> tolerance_interval{kNaN, kNaN};             // mean -+ k2 sd
  double mean_fit_variance = kNaN;     // mean of the units' squared standard errors
  double sd_without_fit_noise = kNaN;  // sqrt(max(0, sd^2 - mean_fit_variance))
};

// Process performance against limits on one characteristic (on ln R10 for R10). NaN where a
// limit is missing; with one limit only the one-sided index is set and Cp/Pp stay NaN.
//   Pp  = (USL - LSL) / (6 s),  Ppk = min(USL - mean, mean - LSL) / (3 s), s the observed sd
//   Cp, Cpk: the same with the spread of the parts themselves (fit noise removed)
struct Capability {
  bool has_lower = false;
  bool has_upper = false;
  double cp = kNaN;
  double cpk = kNaN;
  double pp = kNaN;
  double ppk = kNaN;
  // Expected fraction outside the limits under normality (observed sd), parts per million.
  double ppm_below = kNaN;
  double ppm_above = kNaN;
  double ppm_total = kNaN;
};

enum class Characteristic : std::uint8_t { r10, gamma, dark, rms_log_residual, fit };
std::string_view to_string(Characteristic c);  // "r10", "gamma", "dark", "rms_log_residual", "fit"

struct Outlier {
  std::string id;
  Characteristic characteristic = Characteristic::r10;
  double value = kNaN;       // R10 in ohm or gamma
  double modified_z = kNaN;  // 0.6745 (x - median) / MAD, on ln R10 for R10
};

struct LotStatistics {
  std::size_t units_total = 0;
  std::size_t units_fitted = 0;
  double coverage = 0.99;
  double confidence = 0.95;
  std::string tolerance_method;  // "Howe" or "exact"

  Summary ln_r10;  // of ln(R10 / 1 ohm)
  Summary gamma;
  double correlation_ln_r10_gamma = kNaN;  // Pearson

  std::optional<Capability> r10_capability;    // when the spec limits R10
  std::optional<Capability> gamma_capability;  // when the spec limits gamma

  std::vector<Outlier> outliers;  // in unit order, R10 before gamma
};

// --- building blocks (exposed for tests and the workbench) ---

// Hyndman and Fan type 7 (linear interpolation between order statistics, h = (n - 1) p + 1):
// the default of R and of GSL's gsl_stats_quantile_from_sorted_data. `sorted` ascending,
// non-empty; p in [0, 1].
double quantile_type7(std::span<const double> sorted, double p);

// Two-sided normal tolerance factor k2 for n values: mean +- k2 s covers `coverage` of the
// population with `confidence`. Howe's approximation (NIST/SEMATECH e-Handbook 7.2.6.3) and the
// exact factor by numerical integration (ISO 16269-6). NaN when n < 2.
double tolerance_factor_howe(std::size_t n, double coverage, double confidence);
double tolerance_factor_exact(std::size_t n, double coverage, double confidence);

// Summary of values; fit_sd (same size, or empty) are the per-unit standard errors whose mean
// square is removed from the observed variance.
Summary summarize(std::span<const double> values, std::span<const double> fit_sd,
                  const StatisticsOptions& options = {});

// Modified z-scores 0.6745 (x - median) / MAD; all NaN when MAD is 0 or fewer than 3 values.
std::vector<double> modified_z_scores(std::span<const double> values);

// Capability of a characteristic with mean, parts' sd (within) and observed sd (overall).
Capability capability(double mean, double sd_within, double sd_overall, const Limits& limits);

// Everything above over a fitted lot. The spec (optional) gives the limits for capability;
// coverage and confidence come from the options (callers copy the spec's in when wanted).
LotStatistics lot_statistics(const LotFit& fit, const StatisticsOptions& options = {},
                             const Spec* spec = nullptr);

// The results document's `lot_statistics` section (layout in docs/statistics.md).
nlohmann::json lot_statistics_json(const LotStatistics& stats);

}  // namespace photolot
