// The dark-conductance fit against GNU GSL's nonlinear least squares on the same model, data and
// parameterisation (theta = [ln G10, gamma, ln G_dark], residuals (ln R - ln R_model) / sd, no
// robust loss). GSL: gsl_multifit_nlinear_alloc with gsl_multifit_nlinear_trust and
// gsl_multifit_nlinear_default_parameters (Levenberg-Marquardt trust region),
// gsl_multifit_nlinear_driver, and gsl_multifit_nlinear_covar for (J^T J)^-1, scaled by
// chi^2 / (n - p) as the GSL manual's fitting example does.
#include <gsl/gsl_blas.h>
#include <gsl/gsl_matrix.h>
#include <gsl/gsl_multifit_nlinear.h>
#include <gsl/gsl_vector.h>
#include <gtest/gtest.h>

#include <cmath>
#include <vector>

#include "photolot/fitting/models.h"
#include "simulate.h"

namespace {

using photolot::fitting::FitOptions;

struct Data {
  std::vector<double> x, y;
  double sd = 0;
};

int model_f(const gsl_vector* theta, void* params, gsl_vector* f) {
  const auto* d = static_cast<const Data*>(params);
  const double a = gsl_vector_get(theta, 0), g = gsl_vector_get(theta, 1),
               b = gsl_vector_get(theta, 2);
  for (std::size_t i = 0; i < d->x.size(); ++i) {
    const double ln_model = -std::log(std::exp(a + g * d->x[i]) + std::exp(b));
    gsl_vector_set(f, i, (d->y[i] - ln_model) / d->sd);
  }
  return GSL_SUCCESS;
}

int model_df(const gsl_vector* theta, void* params, gsl_matrix* j) {
  const auto* d = static_cast<const Data*>(params);
  const double a = gsl_vector_get(theta, 0), g = gsl_vector_get(theta, 1),
               b = gsl_vector_get(theta, 2);
  for (std::size_t i = 0; i < d->x.size(); ++i) {
    const double p = std::exp(a + g * d->x[i]), q = std::exp(b), s = p + q;
    gsl_matrix_set(j, i, 0, p / s / d->sd);
    gsl_matrix_set(j, i, 1, d->x[i] * p / s / d->sd);
    gsl_matrix_set(j, i, 2, q / s / d->sd);
  }
  return GSL_SUCCESS;
}

TEST(DarkConductanceFit, AgreesWithGslNonlinearLeastSquares) {
  photolot::test::Rng rng(20261201);
  photolot::test::UnitSim sim;
  sim.r10_ohm = 20e3;
  sim.gamma = 0.8;
  sim.dark_conductance_s = 2e-7;  // 5 Mohm in parallel: 14 % of the conductance at 0.1 lx
  sim.noise_pct = 0.5;
  const photolot::Unit unit = photolot::test::simulate_unit(sim, rng);

  const photolot::UnitFit fit = photolot::test::fit_dark_least_squares(unit);
  ASSERT_TRUE(fit.ok()) << fit.message;
  ASSERT_EQ(fit.curve.model, photolot::ModelKind::dark_conductance);

  Data d;
  d.sd = std::log1p(FitOptions{}.meter_accuracy_pct / 100.0);
  for (const photolot::Reading& r : unit.readings) {
    d.x.push_back(std::log(r.lux / 10.0));
    d.y.push_back(std::log(r.ohm));
  }
  const std::size_t n = d.x.size(), p = 3;
  gsl_multifit_nlinear_fdf fdf{};
  fdf.f = model_f;
  fdf.df = model_df;
  fdf.fvv = nullptr;
  fdf.n = n;
  fdf.p = p;
  fdf.params = &d;
  gsl_multifit_nlinear_parameters params = gsl_multifit_nlinear_default_parameters();
  gsl_multifit_nlinear_workspace* w =
      gsl_multifit_nlinear_alloc(gsl_multifit_nlinear_trust, &params, n, p);
  // GSL starts from the truth's neighbourhood, not from our solution.
  double start[3] = {-std::log(sim.r10_ohm) + 0.3, sim.gamma - 0.1,
                     std::log(sim.dark_conductance_s) + 0.5};
  gsl_vector_view x0 = gsl_vector_view_array(start, p);
  gsl_multifit_nlinear_init(&x0.vector, &fdf, w);
  int info = 0;
  ASSERT_EQ(gsl_multifit_nlinear_driver(500, 1e-14, 1e-14, 0.0, nullptr, nullptr, &info, w),
            GSL_SUCCESS);
  gsl_matrix* covar = gsl_matrix_alloc(p, p);
  gsl_multifit_nlinear_covar(gsl_multifit_nlinear_jac(w), 0.0, covar);
  double chi2 = 0;
  gsl_blas_ddot(gsl_multifit_nlinear_residual(w), gsl_multifit_nlinear_residual(w), &chi2);
  const gsl_vector* th = gsl_multifit_nlinear_position(w);
  const double g_dark = std::exp(gsl_vector_get(th, 2));

  // Parameters to 1e-6 relative (ours are stored as [ln G10, gamma, G_dark]).
  EXPECT_NEAR(fit.curve.params[0], gsl_vector_get(th, 0), 1e-6 * std::abs(gsl_vector_get(th, 0)));
  EXPECT_NEAR(fit.curve.params[1], gsl_vector_get(th, 1), 1e-6 * gsl_vector_get(th, 1));
  EXPECT_NEAR(fit.curve.params[2], g_dark, 1e-6 * g_dark);
  EXPECT_NEAR(fit.dark_conductance_s, g_dark, 1e-6 * g_dark);

  // Covariance to 1e-4 relative, after mapping GSL's ln G_dark to G_dark (d G / d ln G = G).
  const double scale = chi2 / static_cast<double>(n - p);
  const double dmap[3] = {1.0, 1.0, g_dark};
  ASSERT_EQ(fit.curve.covariance.size(), 9u);
  for (std::size_t i = 0; i < p; ++i)
    for (std::size_t j = 0; j < p; ++j) {
      const double ref = gsl_matrix_get(covar, i, j) * scale * dmap[i] * dmap[j];
      EXPECT_NEAR(fit.curve.covariance[i * p + j], ref, 1e-4 * std::abs(ref))
          << "covariance element " << i << "," << j;
    }
  gsl_matrix_free(covar);
  gsl_multifit_nlinear_free(w);
}

}  // namespace
