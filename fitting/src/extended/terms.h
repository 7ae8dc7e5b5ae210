// The terms of an extended fit, private to fitting/src/extended/. Each usable reading of a
// unit becomes one residual term in ln R, scaled by its standard uncertainty:
//   point (a normal reading under light):  r = (ln R - ln R_model) / sd
//   bound (an over-range reading, R > B):   r = sqrt(-2 ln Phi((ln R_model - ln B) / sd)),
//                                           a smooth hinge (the censored-normal likelihood)
//   dark point / dark bound (0 lx):         the same with ln R_model = -ln G_dark
// Temperature enters every term under light through ln(1 + tc(E) / 100 * (T - 25 degC)).
#pragma once

#include <array>
#include <cstddef>
#include <string>
#include <vector>

#include "photolot/bench_profile.h"
#include "photolot/fit_result.h"
#include "photolot/fitting/fit.h"
#include "photolot/fitting/models.h"
#include "photolot/lot.h"

namespace photolot::fitting::extended {

struct Term {
  std::size_t reading_index = 0;
  bool bound = false;  // one-sided: the model must not fall below y
  bool dark = false;   // at 0 lx: depends on the dark conductance only
  double lux = 0;
  double x = 0;        // ln(E / 10 lx); unused when dark
  double log10_e = 0;  // log10(E / 10 lx), for tc(E)
  double temp_c = kNaN;
  double dt_c = 0;  // T - 25 degC when temperature is used, else 0
  double ohm = 0;   // the reading (or the bound)
  double y = 0;     // ln of it
  double sd = 1;    // standard uncertainty of ln R at it
};

struct UnitData {
  std::vector<Term> terms;  // lit points first (reading order), then bounds, then dark terms
  int points = 0;           // lit normal points
  int levels = 0;           // distinct illuminance levels among them
  double lux_min = 0, lux_max = 0;
  int censored = 0;            // over-range readings under light (used as bounds or not)
  int censored_unbounded = 0;  // over-range readings with no known bound (cannot be used)
  int dark = 0;
  int skipped = 0;
  std::vector<double> dark_ohm;
  std::vector<bool> dark_censored;
  double temp_min_c = kNaN, temp_max_c = kNaN;  // over the lit readings with a temperature
  // Every term's sd is the stated one (meter accuracy or bench profile) times this: above 1
  // where the unit's scatter shows the stated uncertainties to be too small.
  double sd_scale = 1;

  double temp_span_c() const;
  int lit_terms() const;  // points + bounds under light: the data both candidates explain
};

UnitData collect(const Unit& unit, const ExtendedFitOptions& ext);

// Sets each term's sd for the given local slope gamma at each term's illuminance (one value per
// term; ignored without a bench profile).
void set_uncertainties(UnitData& data, const FitOptions& options, const ExtendedFitOptions& ext,
                       const std::vector<double>& local_gamma);

// How the temperature coefficient enters a unit's fit.
struct TempSetting {
  bool used = false;        // false: no temperature term (dt = 0)
  bool free_tc10 = false;   // fitted
  bool free_slope = false;  // fitted
  double tc10_pct_per_c = 0;
  double slope_pct_per_c_per_decade = 0;
};

// One fitted candidate model.
struct Candidate {
  ModelKind model = ModelKind::power_law;
  bool converged = false;
  std::string solver_report;
  int iterations = 0;
  double cost = kNaN;              // final robust cost (Ceres convention: 1/2 sum rho)
  std::vector<double> theta;       // solver parameters: power law [ln_r10, gamma];
                                   // dark [ln_g10, gamma, ln_g_dark]
  std::array<double, 2> tc{0, 0};  // [tc10, slope]
  std::vector<double> residual;    // per term, unloss-ed, in sd units
  std::vector<double> weight;      // per term, robust weight rho'(r^2)
  std::vector<double> covariance;  // of the free parameters [theta, free tc...], row-major
  int free_parameters = 0;
  double variance_factor = 1;  // the covariance's scale (docs/models.md)
  double aicc = kNaN;
  int dof = 0;
  std::vector<double> information;  // J^T W J of the free parameters (unscaled)
  double chi2 = 0;                  // sum of w r^2
  int point_terms = 0;              // terms that are points (not bounds)
};

// The candidate's residuals, weights and information at given parameters, without solving.
Candidate evaluate_candidate(const UnitData& data, ModelKind model, const TempSetting& temp,
                             const FitOptions& options, bool meter_floor,
                             std::vector<double> theta);

// The lot's joint temperature problem: one block per unit (its model and weights as given by
// `fits`), one shared block [tc10, slope] with the free parts of `temp`.
struct JointResult {
  bool converged = false;
  int iterations = 0;
  std::string report;
  std::array<double, 2> tc{0, 0};
  std::array<double, 2> tc_sd{kNaN, kNaN};  // standard errors (NaN where not free or singular)
  std::vector<std::vector<double>> theta;   // per unit, at the joint optimum
};
JointResult fit_joint_temperature(const std::vector<const UnitData*>& data,
                                  const std::vector<const Candidate*>& fits,
                                  const TempSetting& temp, const FitOptions& options,
                                  const ExtendedFitOptions& ext);

// Fits one candidate from a starting theta (tc values from `temp`).
Candidate fit_candidate(const UnitData& data, ModelKind model, const TempSetting& temp,
                        const FitOptions& options, const ExtendedFitOptions& ext);

// Starting values for each model from a weighted straight-line fit; several for the dark model.
std::vector<std::vector<double>> starts(const UnitData& data, ModelKind model);

// ln R of a candidate's curve at a term (25 degC, or with the temperature term when used).
double model_ln_ohm(const Candidate& c, const Term& t, bool with_temperature);

// The curve (params at 25 degC, covariance in the Curve parameterisation) of a candidate.
Curve to_curve(const Candidate& c, const TempSetting& temp);

// The whole per-unit job with a fixed temperature setting: candidates, choice, UnitFit.
// `data` gets the uncertainties the fit used; `chosen` (when given) the chosen candidate.
// `check_scatter`: scale the stated uncertainties up where the unit's scatter shows them too
// small (docs/models.md); off for the first pass of a lot's joint temperature fit, whose
// scatter still holds the temperature effect the joint problem is about to fit.
UnitFit fit_unit_with(const Unit& unit, UnitData& data, const TempSetting& temp,
                      const FitOptions& options, const ExtendedFitOptions& ext,
                      Candidate* chosen = nullptr, bool check_scatter = true);

// Free-parameter count of the temperature block.
inline int temp_free(const TempSetting& t) {
  return (t.free_tc10 ? 1 : 0) + (t.free_slope ? 1 : 0);
}

// Two-sided Student-t quantile for the confidence level (1 - (1-c)/2) with dof degrees.
double t_quantile(double confidence, int dof);

}  // namespace photolot::fitting::extended
