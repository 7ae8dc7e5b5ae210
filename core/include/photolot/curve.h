// A fitted resistance-illuminance curve and its uncertainty, as plain data that core/ can
// evaluate without the solver (statistics, pairing, the report and the workbench all read it).
//
// Models, with x = ln(E / 10 lx):
//   power_law:        ln R = ln_r10 - gamma * x                       params [ln_r10, gamma]
//   dark_conductance: 1/R = g_dark_s + exp(ln_g10) * exp(gamma * x)   params [ln_g10, gamma, g_dark_s]
//                     (a dark conductance in parallel with the photoconductance; G in siemens)
// Temperature (optional): ln R(E, T) = ln R_25(E) + ln(1 + tc(E) / 100 * (T - 25 degC)), with the
// coefficient tc(E) = tc10_pct_per_c + tc_slope_pct_per_c_per_decade * log10(E / 10 lx) in
// percent per degC. A curve's params always describe R at 25 degC when `temperature_handled`.
#pragma once

#include <array>
#include <cstdint>
#include <string_view>
#include <vector>

namespace photolot {

enum class ModelKind : std::uint8_t { power_law, dark_conductance };
std::string_view to_string(ModelKind kind);

inline constexpr double kReferenceLux = 10.0;    // R10 is read at 10 lx
inline constexpr double kReferenceTempC = 25.0;  // results are stated at 25 degC

struct Curve {
  ModelKind model = ModelKind::power_law;
  std::vector<double> params;      // see the table above
  std::vector<double> covariance;  // row-major, params.size()^2; empty when unknown

  bool temperature_handled = false;
  double tc10_pct_per_c = 0;                  // temperature coefficient at 10 lx, %/degC
  double tc_slope_pct_per_c_per_decade = 0;   // its change per decade of illuminance

  // ln R at illuminance lux (> 0) and temperature temp_c (25 degC by default).
  double ln_ohm(double lux, double temp_c = kReferenceTempC) const;
  double ohm(double lux, double temp_c = kReferenceTempC) const;
  // d ln R / d params at lux (25 degC), for error propagation.
  std::vector<double> gradient(double lux) const;
  // Standard deviation of ln R at lux from the parameter covariance (0 when unknown).
  double ln_ohm_sd(double lux) const;
  // Local log-log slope -d ln R / d ln E at lux (equals gamma everywhere for the power law).
  double local_gamma(double lux) const;
  // Two-point gamma between lux_a and lux_b: ln(R_a / R_b) / ln(E_b / E_a).
  double two_point_gamma(double lux_a, double lux_b) const;
};

// A power-law curve from R10 and gamma, with an optional covariance of (ln R10, gamma).
Curve make_power_law(double r10_ohm, double gamma, std::array<double, 4> covariance = {});

}  // namespace photolot
