// The per-unit extended fit: the power law and the dark-conductance model solved by TinySolver
// (autodiff Jets), with one-sided terms for over-range readings, meter weights and an optional
// temperature term; covariance from the Jacobian at the optimum; the AICc choice; and the lot's
// joint temperature problem, the one full ceres::Problem. Formulas in docs/models.md.
#include <ceres/ceres.h>
#include <ceres/tiny_solver.h>
#include <fmt/format.h>

#include <Eigen/Dense>
#include <algorithm>
#include <cmath>
#include <memory>

#include "../robust_loss.h"
#include "../unit_points.h"
#include "terms.h"

namespace photolot::fitting::extended {
namespace {

// G_dark is solved for as ln G_dark, kept between 1e-15 S (1 Pohm: no bench meter reads that)
// and 1 S, so it stays positive without a hinge at zero.
constexpr double kLnGDarkMin = -34.538776394910684;  // ln(1e-15)
constexpr double kLnGDarkMax = 0.0;

template <typename T>
T ln_model_at(ModelKind model, const Term& t, double dt_c, const T* theta, const T* tc) {
  if (t.dark) return -theta[2];
  T ln_r;
  if (model == ModelKind::power_law) {
    ln_r = theta[0] - theta[1] * t.x;
  } else {
    // ln R = -ln(exp(b) + exp(a)), a = ln G10 + gamma x, b = ln G_dark: log-sum-exp form.
    const T a = theta[0] + theta[1] * t.x;
    const T& b = theta[2];
    const T m = a > b ? a : b;
    ln_r = -(m + log(exp(a - m) + exp(b - m)));
  }
  if (dt_c != 0.0) ln_r += log(T(1.0) + (tc[0] + tc[1] * t.log10_e) * (dt_c / 100.0));
  return ln_r;
}

// The one-sided term of an over-range reading R > B, as a residual r with r^2 / 2 the negative
// log-likelihood of a censored normal reading (docs/models.md):
//   z = (ln R_model - ln B) / sd,   r^2 = -2 ln Phi(z)
// A smooth hinge: about z^2 when the model falls well below the bound (like a point at the
// bound), and zero when it lies well above (no pull at all). For z < -8 the asymptotic series
// of Phi is used, Phi(z) ~ phi(z) / -z * (1 - 1/z^2 + 3/z^4), where erfc underflows; above 8
// the cost is below 1e-15 and is taken as 0.
template <typename T>
T censored_residual(const T& z) {
  using std::log, std::sqrt, std::erfc, std::log1p;
  constexpr double kSqrt2 = 1.4142135623730951;
  constexpr double kLn2Pi = 1.8378770664093453;
  if (z > T(8.0)) return T(0.0);
  T neg_ln_phi;
  if (z < T(-8.0)) {
    const T iz2 = T(1.0) / (z * z);
    neg_ln_phi = 0.5 * z * z + 0.5 * kLn2Pi + log(-z) - log(T(1.0) - iz2 + 3.0 * iz2 * iz2);
  } else if (z > T(0.0)) {
    neg_ln_phi = -log1p(-0.5 * erfc(z / kSqrt2));
  } else {
    neg_ln_phi = -log(0.5 * erfc(-z / kSqrt2));
  }
  return sqrt(2.0 * neg_ln_phi);
}

struct TermCost {
  ModelKind model;
  Term term;
  double dt_c;
  template <typename T>
  bool operator()(const T* theta, const T* tc, T* residual) const {
    if (dt_c != 0.0 && !term.dark) {
      const T arg = T(1.0) + (tc[0] + tc[1] * term.log10_e) * (dt_c / 100.0);
      if (!(arg > T(0.0))) return false;
    }
    const T diff = T(term.y) - ln_model_at(model, term, dt_c, theta, tc);
    if (term.bound)
      residual[0] = censored_residual(-diff / term.sd);
    else
      residual[0] = diff / term.sd;
    return true;
  }
};

double term_dt(const Term& t, const TempSetting& temp) {
  if (!temp.used || t.dark || !std::isfinite(t.temp_c)) return 0.0;
  return t.temp_c - kReferenceTempC;
}

std::unique_ptr<ceres::LossFunction> make_loss(Loss loss) {
  switch (loss) {
    case Loss::huber:
      return std::make_unique<ceres::HuberLoss>(1.0);
    case Loss::cauchy:
      return std::make_unique<ceres::CauchyLoss>(1.0);
    case Loss::none:
      return nullptr;
  }
  return nullptr;
}

// One term's residual block (autodiff), added to the problem; the problem owns the cost.
ceres::CostFunction* add_term(ceres::Problem& problem, ModelKind model, const Term& t, double dt_c,
                              ceres::LossFunction* loss, double* theta, double* tc) {
  auto* functor = new TermCost{model, t, dt_c};
  ceres::CostFunction* cost = model == ModelKind::power_law
                                  ? static_cast<ceres::CostFunction*>(
                                        new ceres::AutoDiffCostFunction<TermCost, 1, 2, 2>(functor))
                                  : new ceres::AutoDiffCostFunction<TermCost, 1, 3, 2>(functor);
  problem.AddResidualBlock(cost, loss, theta, tc);
  return cost;
}

// Levenberg-Marquardt on one thread (the lot is parallel over units), silent, with `tol` for
// the function and gradient tests and 100 x tol for the parameter test.
ceres::Solver::Options solver_options(ceres::LinearSolverType linear_solver, double tol) {
  ceres::Solver::Options so;
  so.linear_solver_type = linear_solver;
  so.max_num_iterations = 200;
  so.function_tolerance = tol;
  so.gradient_tolerance = tol;
  so.parameter_tolerance = 100 * tol;
  so.num_threads = 1;
  so.logging_type = ceres::SILENT;
  return so;
}

bool uses_term(ModelKind model, const Term& t) {
  return !(t.dark && model == ModelKind::power_law);
}

// Where a candidate's parameters sit in the solver's vector: theta first, then the free parts
// of the temperature block; the fixed parts keep the setting's values.
struct Layout {
  ModelKind model;
  int n_theta;
  bool free_tc10, free_slope;
  std::array<double, 2> tc_fixed;
  int size() const { return n_theta + (free_tc10 ? 1 : 0) + (free_slope ? 1 : 0); }
};

// One term's whitened residual (not yet through the loss) as a Jet: its value and its
// derivatives by every solver parameter. Ceres's forward-mode autodiff on the same TermCost the
// joint problem uses, so both fits see one model. `clamp` holds ln G_dark to its bounds (a step
// beyond a bound sees the bound, with no pull further out), the way Ceres's bounded problem
// projects onto them; false when the temperature factor is not positive.
template <int N>
bool jet_residual(const Layout& l, const Term& t, double dt_c, const double* p, bool clamp,
                  ceres::Jet<double, N>& r) {
  using J = ceres::Jet<double, N>;
  std::array<J, 3> theta;
  for (int k = 0; k < l.n_theta; ++k) theta[static_cast<std::size_t>(k)] = J(p[k], k);
  if (clamp && l.model == ModelKind::dark_conductance) {
    if (p[2] < kLnGDarkMin) theta[2] = J(kLnGDarkMin);
    if (p[2] > kLnGDarkMax) theta[2] = J(kLnGDarkMax);
  }
  int k = l.n_theta;
  std::array<J, 2> tc{J(l.tc_fixed[0]), J(l.tc_fixed[1])};
  if (l.free_tc10) tc[0] = J(p[k], k), ++k;
  if (l.free_slope) tc[1] = J(p[k], k);
  return TermCost{l.model, t, dt_c}(theta.data(), tc.data(), &r);
}

// The candidate's folded residuals for TinySolver (robust loss folded in as in
// power_law_fit.cpp, so that 1/2 sum f^2 is the robust cost), Jacobian column-major.
template <int N>
struct CandidateResiduals {
  using Scalar = double;
  enum { NUM_RESIDUALS = Eigen::Dynamic, NUM_PARAMETERS = N };
  // A residual where the temperature factor is not positive: large enough that no step there
  // is accepted, and flat.
  static constexpr double kOutside = 1e6;

  Layout layout;
  const std::vector<const Term*>* terms;
  const std::vector<double>* dt;
  Loss loss;

  int NumResiduals() const { return static_cast<int>(terms->size()); }

  bool operator()(const double* p, double* residuals, double* jacobian) const {
    const int n = NumResiduals();
    for (int i = 0; i < n; ++i) {
      const auto ui = static_cast<std::size_t>(i);
      ceres::Jet<double, N> r;
      const bool inside = jet_residual<N>(layout, *(*terms)[ui], (*dt)[ui], p, true, r);
      const detail::Folded f = inside ? detail::fold(loss, r.a) : detail::Folded{kOutside, 0.0};
      residuals[i] = f.f;
      if (jacobian)
        for (int j = 0; j < N; ++j) jacobian[j * n + i] = inside ? f.dfdr * r.v[j] : 0.0;
    }
    return true;
  }
};

constexpr int kMaxIterations = 200;

// Levenberg-Marquardt by TinySolver from p (the layout's parameters); p gets the result.
// TinySolver's stopping tests are absolute: on whitened residuals a cost change of 1e-12 is
// far below anything the intervals could show (as in power_law_fit.cpp).
template <int N>
void tiny_solve(const CandidateResiduals<N>& fn, std::vector<double>& p, Candidate& c) {
  ceres::TinySolver<CandidateResiduals<N>> solver;
  solver.options.max_num_iterations = kMaxIterations;
  solver.options.gradient_tolerance = 1e-12;
  solver.options.function_tolerance = 1e-12;
  solver.options.parameter_tolerance = 1e-12;
  Eigen::Matrix<double, N, 1> x;
  for (int k = 0; k < N; ++k) x[k] = p[static_cast<std::size_t>(k)];
  const auto& summary = solver.Solve(fn, &x);
  bool finite = true;
  for (int k = 0; k < N; ++k) finite = finite && std::isfinite(x[k]);
  c.iterations = summary.iterations;
  c.converged = finite && summary.status != decltype(solver)::HIT_MAX_ITERATIONS;
  c.solver_report = fmt::format(
      "TinySolver: {} iterations, cost {:.6g} -> {:.6g}, {}", summary.iterations,
      summary.initial_cost, summary.final_cost,
      finite ? (c.converged ? "converged" : "iteration limit reached") : "left the finite numbers");
  if (finite)
    for (int k = 0; k < N; ++k) p[static_cast<std::size_t>(k)] = x[k];
}

Candidate solve_once(const UnitData& data, ModelKind model, const TempSetting& temp,
                     const FitOptions& options, bool meter_floor, std::vector<double> theta0,
                     bool solve = true) {
  Candidate c;
  c.model = model;
  c.theta = std::move(theta0);
  c.tc = {temp.tc10_pct_per_c, temp.slope_pct_per_c_per_decade};
  const int n_theta = static_cast<int>(c.theta.size());
  const Layout layout{model, n_theta, temp.free_tc10, temp.free_slope, c.tc};
  const int n_free = layout.size();
  if (model == ModelKind::dark_conductance)
    c.theta[2] = std::clamp(c.theta[2], kLnGDarkMin, kLnGDarkMax);

  // The terms this model uses, and their temperature offsets.
  std::vector<const Term*> used;
  std::vector<double> dts;
  std::vector<std::size_t> used_index;
  used.reserve(data.terms.size());
  for (std::size_t i = 0; i < data.terms.size(); ++i) {
    const Term& t = data.terms[i];
    if (!uses_term(model, t)) continue;
    used.push_back(&t);
    dts.push_back(term_dt(t, temp));
    used_index.push_back(i);
  }

  std::vector<double> p(c.theta);
  if (temp.free_tc10) p.push_back(c.tc[0]);
  if (temp.free_slope) p.push_back(c.tc[1]);
  if (solve) {
    // One fixed-size solver per parameter count: 2 or 3 curve parameters, 0 to 2 temperature.
    switch (n_free) {
      case 2:
        tiny_solve<2>({layout, &used, &dts, options.loss}, p, c);
        break;
      case 3:
        tiny_solve<3>({layout, &used, &dts, options.loss}, p, c);
        break;
      case 4:
        tiny_solve<4>({layout, &used, &dts, options.loss}, p, c);
        break;
      default:
        tiny_solve<5>({layout, &used, &dts, options.loss}, p, c);
        break;
    }
    for (int k = 0; k < n_theta; ++k)
      c.theta[static_cast<std::size_t>(k)] = p[static_cast<std::size_t>(k)];
    if (model == ModelKind::dark_conductance)
      c.theta[2] = std::clamp(c.theta[2], kLnGDarkMin, kLnGDarkMax);
    int k = n_theta;
    if (temp.free_tc10) c.tc[0] = p[static_cast<std::size_t>(k++)];
    if (temp.free_slope) c.tc[1] = p[static_cast<std::size_t>(k)];
    p.assign(c.theta.begin(), c.theta.end());
    if (temp.free_tc10) p.push_back(c.tc[0]);
    if (temp.free_slope) p.push_back(c.tc[1]);
  } else {
    c.converged = true;
  }

  // Residuals, robust weights and the Jacobian of the free parameters at the optimum, from the
  // same Jets the solver used (no clamp: the parameters are within their bounds here). The
  // information J^T W J is what ceres::Covariance would invert for these terms (checked
  // against it in tests/models).
  c.free_parameters = n_free;
  const std::size_t n = data.terms.size();
  c.residual.assign(n, 0.0);
  c.weight.assign(n, 1.0);
  Eigen::Matrix<double, 5, 5> h5 = Eigen::Matrix<double, 5, 5>::Zero();
  double chi2 = 0, robust = 0, lit_rss = 0;
  int point_terms = 0, lit = 0;
  for (std::size_t u = 0; u < used.size(); ++u) {
    const std::size_t i = used_index[u];
    ceres::Jet<double, 5> rj;
    jet_residual<5>(layout, *used[u], dts[u], p.data(), false, rj);
    const double r = rj.a;
    const detail::LossTerms lt = detail::loss_terms(options.loss, r);
    c.residual[i] = r;
    c.weight[i] = lt.weight;
    robust += lt.rho;
    chi2 += lt.weight * r * r;
    if (!data.terms[i].bound) ++point_terms;
    if (!data.terms[i].dark) {
      ++lit;
      lit_rss += lt.rho;
    }
    h5.noalias() += lt.weight * rj.v * rj.v.transpose();
  }
  const Eigen::MatrixXd h = h5.topLeftCorner(n_free, n_free);
  c.cost = 0.5 * robust;
  c.dof = point_terms - n_free;
  // Scale: the scatter about the curve (chi2 / dof). With a bench profile the meter's stated
  // uncertainty is a floor: the intervals never claim more than the meters allow.
  if (c.dof > 0) c.variance_factor = chi2 / c.dof;
  if (meter_floor) c.variance_factor = std::max(1.0, c.variance_factor);
  c.information.assign(h.data(), h.data() + h.size());
  c.chi2 = chi2;
  c.point_terms = point_terms;
  Eigen::FullPivLU<Eigen::MatrixXd> lu(h);
  if (lu.isInvertible()) {
    const Eigen::MatrixXd cov = lu.inverse();
    c.covariance.assign(cov.data(), cov.data() + cov.size());  // symmetric: order irrelevant
  }
  // AICc over the readings under light, the data both candidates explain (docs/models.md).
  const int k = n_free;
  if (lit - k - 1 > 0) {
    const double rss = std::max(lit_rss, 1e-300);
    c.aicc = lit * std::log(rss / lit) + 2.0 * k + 2.0 * k * (k + 1.0) / (lit - k - 1.0);
  }
  return c;
}

// Weighted straight line y = a - gamma x through the lit points with x >= x_floor.
bool line_fit(const UnitData& d, double x_floor, double& a, double& gamma) {
  double sw = 0, sx = 0, sy = 0, sxx = 0, sxy = 0;
  int n = 0;
  for (const Term& t : d.terms) {
    if (t.dark || t.bound || t.x < x_floor) continue;
    const double w = 1.0 / (t.sd * t.sd);
    sw += w, sx += w * t.x, sy += w * t.y, sxx += w * t.x * t.x, sxy += w * t.x * t.y;
    ++n;
  }
  const double det = sw * sxx - sx * sx;
  if (n < 2 || !(det > 0)) return false;
  const double slope = (sw * sxy - sx * sy) / det;
  a = (sy - slope * sx) / sw;
  gamma = -slope;
  return true;
}

}  // namespace

std::vector<std::vector<double>> starts(const UnitData& data, ModelKind model) {
  double a = 0, gamma = 0.7;
  line_fit(data, -1e300, a, gamma);
  if (model == ModelKind::power_law) return {{a, gamma}};
  std::vector<std::vector<double>> out;
  const double x_min = std::log(data.lux_min / kReferenceLux);
  // 1: the straight line, with a dark conductance of a tenth of the conductance at the lowest
  // level.
  out.push_back({-a, gamma, std::log(0.1) - (a - gamma * x_min)});
  // 2: the line through the upper half of the levels (less bent by G_dark); G_dark from what
  // the lowest level has in excess of it.
  std::vector<double> xs;
  for (const Term& t : data.terms)
    if (!t.dark && !t.bound) xs.push_back(t.x);
  std::sort(xs.begin(), xs.end());
  double a2 = a, gamma2 = gamma;
  if (!xs.empty() && line_fit(data, xs[xs.size() / 2], a2, gamma2)) {
    double g_low = 0;
    for (const Term& t : data.terms)
      if (!t.dark && !t.bound && t.x == xs.front()) g_low = std::exp(-t.y);
    const double excess = g_low - std::exp(-(a2 - gamma2 * x_min));
    const double ln_gd = excess > 0 ? std::log(excess) : std::log(0.01) - (a2 - gamma2 * x_min);
    out.push_back({-a2, gamma2, ln_gd});
  }
  // 3: G_dark from a dark reading.
  for (const Term& t : data.terms)
    if (t.dark && !t.bound) {
      out.push_back({-a2, gamma2, -t.y});
      break;
    }
  return out;
}

Candidate fit_candidate(const UnitData& data, ModelKind model, const TempSetting& temp,
                        const FitOptions& options, const ExtendedFitOptions& ext) {
  Candidate best;
  for (auto& s : starts(data, model)) {
    Candidate c = solve_once(data, model, temp, options, ext.bench.has_value(), std::move(s));
    const bool better = !best.theta.size() || (c.converged && !best.converged) ||
                        (c.converged == best.converged && c.cost < best.cost);
    if (better) best = std::move(c);
  }
  return best;
}

double model_ln_ohm(const Candidate& c, const Term& t, bool with_temperature) {
  TempSetting temp;
  temp.used = with_temperature;
  return ln_model_at<double>(c.model, t, term_dt(t, temp), c.theta.data(), c.tc.data());
}

Curve to_curve(const Candidate& c, const TempSetting& temp) {
  Curve curve;
  curve.model = c.model;
  const std::size_t p = c.theta.size();
  curve.params = c.theta;
  std::vector<double> d(p, 1.0);  // d curve param / d solver param
  if (c.model == ModelKind::dark_conductance) {
    curve.params[2] = std::exp(c.theta[2]);
    d[2] = curve.params[2];
  }
  if (!c.covariance.empty()) {
    const std::size_t nf = static_cast<std::size_t>(c.free_parameters);
    curve.covariance.resize(p * p);
    for (std::size_t i = 0; i < p; ++i)
      for (std::size_t j = 0; j < p; ++j)
        curve.covariance[i * p + j] = d[i] * d[j] * c.covariance[i * nf + j] * c.variance_factor;
  }
  curve.temperature_handled = temp.used;
  if (temp.used) {
    curve.tc10_pct_per_c = c.tc[0];
    curve.tc_slope_pct_per_c_per_decade = c.tc[1];
  }
  return curve;
}

namespace {

std::vector<double> local_gammas(const UnitData& data, const Candidate* c, double fallback) {
  std::vector<double> g(data.terms.size(), fallback);
  if (c == nullptr) return g;
  Curve curve = to_curve(*c, TempSetting{});
  for (std::size_t i = 0; i < data.terms.size(); ++i)
    if (!data.terms[i].dark) g[i] = curve.local_gamma(data.terms[i].lux);
  return g;
}

// The scatter of the lit points about a candidate's curve in units of their stated sd: the
// normal-consistent median absolute whitened residual (1.4826 x MAD) over the points, leaving
// out the p smallest, which a fit with p parameters can make as small as it likes (a fit whose
// points are nearly all beyond the loss's corner runs through p of them, as least absolute
// deviations does, and the plain MAD would then read the scatter low). A few wild points
// barely move it. NaN when there are no dof.
double whitened_scatter(const UnitData& data, const Candidate& c) {
  std::vector<double> a;
  for (std::size_t i = 0; i < data.terms.size() && i < c.residual.size(); ++i)
    if (!data.terms[i].dark && !data.terms[i].bound) a.push_back(std::abs(c.residual[i]));
  const auto p = static_cast<std::size_t>(std::max(0, c.free_parameters));
  if (a.size() <= p) return kNaN;
  std::sort(a.begin(), a.end());
  a.erase(a.begin(), a.begin() + static_cast<std::ptrdiff_t>(p));
  return 1.4826 * detail::median_in_place(a) * data.sd_scale;
}

// Scatter beyond this many stated sds means the stated uncertainties are too small. Leaving
// out the p smallest residuals reads an honest unit's scatter about a quarter high (for ten
// points and two parameters: the median of the other eight sits at the 60th percentile), so
// this triggers from about 1.6 times the stated sd.
constexpr double kUnderstated = 2.0;

}  // namespace

UnitFit fit_unit_with(const Unit& unit, UnitData& data, const TempSetting& temp,
                      const FitOptions& options, const ExtendedFitOptions& ext,
                      Candidate* chosen_out, bool check_scatter) {
  // Counts, flags and the can-it-be-fitted checks are the plain fit's (unit_points.h), so a
  // unit gets the same status and message whichever fit runs.
  const detail::UnitPoints pts = detail::collect_points(unit);
  UnitFit f = detail::start_unit_fit(unit, pts, options, 2);
  if (!f.ok()) return f;

  // The dark model needs a fourth level to be told from the line, and dof for its AICc.
  const bool try_pl = ext.model != ModelChoice::dark_conductance;
  const bool dark_possible = data.levels >= 4;
  const bool try_dc = ext.model != ModelChoice::power_law && dark_possible;
  if (ext.model == ModelChoice::dark_conductance && !dark_possible) {
    f.status = FitStatus::too_few_levels;
    f.message = fmt::format(
        "not fitted: the dark-conductance model needs 4 distinct levels, "
        "the unit has {}",
        data.levels);
    return f;
  }

  Candidate pl, dc;
  std::vector<double> gammas;
  data.sd_scale = 1;
  {
    double a = 0, g = 0.7;
    set_uncertainties(data, options, ext, std::vector<double>(data.terms.size(), g));
    line_fit(data, -1e300, a, g);
    gammas.assign(data.terms.size(), g);
  }
  const Candidate* chosen = nullptr;
  auto choose_with_weights = [&] {
    for (int pass = 0; pass < ext.weight_passes; ++pass) {
      set_uncertainties(data, options, ext, gammas);
      if (try_pl) pl = fit_candidate(data, ModelKind::power_law, temp, options, ext);
      if (try_dc) dc = fit_candidate(data, ModelKind::dark_conductance, temp, options, ext);
      if (!try_dc)
        chosen = &pl;
      else if (!try_pl)
        chosen = &dc;
      else if (std::isfinite(dc.aicc) && dc.converged && (!pl.converged || dc.aicc < pl.aicc))
        chosen = &dc;
      else
        chosen = &pl;
      if (!ext.bench || ext.bench->lux_pct == 0) break;  // weights do not depend on gamma
      gammas = local_gammas(data, chosen, 0.7);
    }
  };
  choose_with_weights();
  // A bench noisier than its stated uncertainties (a profile that claims 0.1 % on readings
  // scattered by 0.5 %) would put nearly every point beyond the loss's corner: the fit turns
  // into a least-absolute-deviations crawl, good points are flagged as outliers and the
  // intervals claim the profile's precision. Where the scatter is more than kUnderstated times
  // the stated sd, every sd is scaled up to the scatter seen and the choice is made again
  // (docs/models.md); the unit says so.
  const double scatter = check_scatter ? whitened_scatter(data, *chosen) : kNaN;
  const bool understated = scatter > kUnderstated;
  if (understated) {
    data.sd_scale = scatter;
    choose_with_weights();
  }
  const Candidate& c = *chosen;
  if (chosen_out != nullptr) *chosen_out = c;

  f.aicc_power_law = try_pl ? pl.aicc : kNaN;
  f.aicc_dark_conductance = try_dc ? dc.aicc : kNaN;
  f.iterations = c.iterations;
  f.cost = c.cost;
  f.dof = std::max(0, c.dof);
  if (!c.converged && c.iterations >= kMaxIterations) {
    f.status = FitStatus::solver_failed;
    f.message = "not fitted: the solver did not converge (" + c.solver_report + ")";
    return f;
  }
  f.status = FitStatus::fitted;
  f.curve = to_curve(c, temp);
  f.r10_ohm = f.curve.ohm(kReferenceLux);
  f.gamma = c.theta[1];
  f.gamma_10_100 = f.curve.two_point_gamma(10.0, 100.0);
  const std::size_t p = f.curve.params.size();
  if (f.curve.covariance.size() == p * p) {
    f.ln_r10_sd = f.curve.ln_ohm_sd(kReferenceLux);
    f.gamma_sd = std::sqrt(std::max(0.0, f.curve.covariance[1 * p + 1]));
    const OhmInterval r10 = interval_at(f, kReferenceLux, options.confidence);
    f.r10_ci95_ohm = {r10.lo_ohm, r10.hi_ohm};
    const double t = t_quantile(options.confidence, f.dof);
    if (std::isfinite(t)) f.gamma_ci95 = {f.gamma - t * f.gamma_sd, f.gamma + t * f.gamma_sd};
  }
  if (c.model == ModelKind::dark_conductance) {
    f.dark_conductance_s = f.curve.params[2];
    f.flags.emplace_back("dark-conductance");
  }

  double ss = 0;
  int n_in = 0;
  for (std::size_t i = 0; i < data.terms.size(); ++i) {
    const Term& t = data.terms[i];
    if (t.dark || t.bound) continue;
    PointFit pf;
    pf.reading_index = t.reading_index;
    pf.lux = t.lux;
    pf.ohm = t.ohm;
    pf.residual_ln = t.y - model_ln_ohm(c, t, temp.used);
    pf.weight = c.weight[i];
    pf.outlier = std::abs(c.residual[i]) > options.outlier_threshold && pf.weight < 1.0;
    if (pf.outlier) {
      ++f.outlier_points;
    } else {
      ss += pf.residual_ln * pf.residual_ln;
      ++n_in;
    }
    f.residuals.push_back(pf);
  }
  f.rms_log_residual = n_in > 0 ? std::sqrt(ss / n_in) : kNaN;
  if (f.outlier_points > 0) f.flags.emplace_back("outlier-points");

  int bounds_used = 0;
  for (const Term& t : data.terms) bounds_used += (t.bound && !t.dark) ? 1 : 0;
  std::string choice;
  if (try_pl && try_dc)
    choice =
        fmt::format("{} by AICc (power law {:.2f}, dark conductance {:.2f}, difference {:.2f})",
                    to_string(c.model), pl.aicc, dc.aicc, pl.aicc - dc.aicc);
  else
    choice = fmt::format(
        "{} (as asked{})", to_string(c.model),
        try_dc || ext.model == ModelChoice::power_law ? "" : "; dark conductance needs 4 levels");
  f.message = fmt::format("fitted {}; {} points on {} levels", choice, data.points, data.levels);
  if (bounds_used > 0)
    f.message += fmt::format(", {} over-range bound{}", bounds_used, bounds_used == 1 ? "" : "s");
  if (data.censored - bounds_used > 0)
    f.message += fmt::format(", {} over-range readings not used", data.censored - bounds_used);
  if (understated) {
    f.flags.emplace_back(ext.bench ? "scatter-above-bench-profile"
                                   : "scatter-above-meter-accuracy");
    f.message += fmt::format(
        "; scatter {:.3g} x the {} states, so its uncertainties were scaled up to the scatter "
        "seen",
        scatter, ext.bench ? "bench profile" : "meter accuracy");
  }
  return f;
}

}  // namespace photolot::fitting::extended

namespace photolot::fitting::extended {

Candidate evaluate_candidate(const UnitData& data, ModelKind model, const TempSetting& temp,
                             const FitOptions& options, bool meter_floor,
                             std::vector<double> theta) {
  return solve_once(data, model, temp, options, meter_floor, std::move(theta), false);
}

JointResult fit_joint_temperature(const std::vector<const UnitData*>& data,
                                  const std::vector<const Candidate*>& fits,
                                  const TempSetting& temp, const FitOptions& options,
                                  const ExtendedFitOptions& ext) {
  JointResult out;
  out.tc = {temp.tc10_pct_per_c, temp.slope_pct_per_c_per_decade};
  auto loss = make_loss(options.loss);
  ceres::Problem::Options popt;
  popt.loss_function_ownership = ceres::DO_NOT_TAKE_OWNERSHIP;
  ceres::Problem problem(popt);
  problem.AddParameterBlock(out.tc.data(), 2);
  auto* ordering = new ceres::ParameterBlockOrdering;
  ordering->AddElementToGroup(out.tc.data(), 1);
  // One buffer for every unit's block, in unit order: Ceres orders the blocks it eliminates by
  // address, so this keeps the arithmetic (and the result) the same from run to run.
  std::vector<std::size_t> offset(data.size() + 1, 0);
  for (std::size_t u = 0; u < data.size(); ++u) offset[u + 1] = offset[u] + fits[u]->theta.size();
  std::vector<double> all(offset.back());
  for (std::size_t u = 0; u < data.size(); ++u) {
    const Candidate& c = *fits[u];
    std::copy(c.theta.begin(), c.theta.end(), all.begin() + static_cast<std::ptrdiff_t>(offset[u]));
    double* theta = all.data() + offset[u];
    problem.AddParameterBlock(theta, static_cast<int>(c.theta.size()));
    ordering->AddElementToGroup(theta, 0);
    for (const Term& t : data[u]->terms) {
      if (!uses_term(c.model, t)) continue;
      add_term(problem, c.model, t, term_dt(t, temp), loss.get(), theta, out.tc.data());
    }
    if (c.model == ModelKind::dark_conductance) {
      problem.SetParameterLowerBound(theta, 2, kLnGDarkMin);
      problem.SetParameterUpperBound(theta, 2, kLnGDarkMax);
    }
  }
  if (!temp.free_slope) problem.SetManifold(out.tc.data(), new ceres::SubsetManifold(2, {1}));

  // Dense Schur: the units' blocks are eliminated, the shared block solved.
  ceres::Solver::Options so = solver_options(ceres::DENSE_SCHUR, 1e-12);
  so.linear_solver_ordering.reset(ordering);
  ceres::Solver::Summary summary;
  ceres::Solve(so, &problem, &summary);
  out.converged = summary.termination_type == ceres::CONVERGENCE;
  out.iterations = static_cast<int>(summary.iterations.size()) - 1;
  out.report = summary.BriefReport();
  out.theta.resize(data.size());
  for (std::size_t u = 0; u < data.size(); ++u)
    out.theta[u].assign(all.begin() + static_cast<std::ptrdiff_t>(offset[u]),
                        all.begin() + static_cast<std::ptrdiff_t>(offset[u + 1]));

  // Covariance of the shared block: the inverse of the sum over units of the Schur complements
  // S_u = H_ss - H_su H_uu^-1 H_us of each unit's information (its own parameters eliminated),
  // scaled like the per-unit covariances (docs/models.md).
  TempSetting at = temp;
  at.tc10_pct_per_c = out.tc[0];
  at.slope_pct_per_c_per_decade = out.tc[1];
  const int ns = temp_free(temp);
  Eigen::MatrixXd s = Eigen::MatrixXd::Zero(ns, ns);
  double chi2 = 0;
  int dof = -ns;
  for (std::size_t u = 0; u < data.size(); ++u) {
    const Candidate e = evaluate_candidate(*data[u], fits[u]->model, at, options,
                                           ext.bench.has_value(), out.theta[u]);
    const int nf = e.free_parameters, nu = nf - ns;
    const Eigen::Map<const Eigen::MatrixXd> h(e.information.data(), nf, nf);
    const Eigen::MatrixXd huu = h.topLeftCorner(nu, nu);
    const Eigen::MatrixXd hus = h.topRightCorner(nu, ns);
    Eigen::FullPivLU<Eigen::MatrixXd> lu(huu);
    if (!lu.isInvertible()) continue;
    s += h.bottomRightCorner(ns, ns) - hus.transpose() * lu.solve(hus);
    chi2 += e.chi2;
    dof += e.point_terms - nu;
  }
  double factor = dof > 0 ? chi2 / dof : 1.0;
  if (ext.bench) factor = std::max(1.0, factor);
  Eigen::FullPivLU<Eigen::MatrixXd> lu(s);
  if (lu.isInvertible()) {
    const Eigen::MatrixXd cov = lu.inverse() * factor;
    out.tc_sd[0] = std::sqrt(std::max(0.0, cov(0, 0)));
    if (ns == 2) out.tc_sd[1] = std::sqrt(std::max(0.0, cov(1, 1)));
  }
  return out;
}

}  // namespace photolot::fitting::extended
