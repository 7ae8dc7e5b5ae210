// A small simulator of bench readings with known truth, for the extended-fit tests. Invented
// scenario: an incoming-inspection bench reading one unit per illuminance level. Deterministic
// for a seed on every platform: std::mt19937_64's output is fixed by the C++ standard, and the
// normal deviates are our own Box-Muller transform of it (std:: distributions are not portable).
#pragma once

#include <cmath>
#include <cstdint>
#include <random>
#include <string>
#include <vector>

#include "photolot/fitting/models.h"
#include "photolot/lot.h"

namespace photolot::test {

class Rng {
 public:
  explicit Rng(std::uint64_t seed) : engine_(seed) {}
  double uniform() {  // (0, 1)
    return (static_cast<double>(engine_() >> 11) + 0.5) * (1.0 / 9007199254740992.0);
  }
  double normal() {
    const double u = uniform(), v = uniform();
    return std::sqrt(-2.0 * std::log(u)) * std::cos(6.283185307179586 * v);
  }

 private:
  std::mt19937_64 engine_;
};

struct UnitSim {
  double r10_ohm = 20e3;
  double gamma = 0.8;
  double dark_conductance_s = 0;
  std::vector<double> lux = {0.1, 0.2, 0.5, 1, 2, 5, 10, 20, 50, 100};
  int repeats = 1;            // readings per level
  double noise_pct = 0.5;     // sd of the multiplicative noise, percent
  double meter_max_ohm = 0;   // > 0: readings above it are logged as over range at this bound
  double dark_ohm = 0;        // > 0: add a dark reading (0 lx) of this value
  double temp_c = 25;         // bench temperature
  double temp_span_c = 0;     // readings uniform over temp_c +- span / 2
  double tc10_pct_per_c = 0;  // true coefficient at 10 lx
  double tc_slope = 0;        // its change per decade, %/degC
};

// The true resistance at (E, T): 1/R = G_dark + G10 (E/10)^gamma, times (1 + tc(E)/100 dT).
inline double true_ohm(const UnitSim& s, double lux, double temp_c) {
  const double g = s.dark_conductance_s + std::pow(lux / 10.0, s.gamma) / s.r10_ohm;
  const double tc = s.tc10_pct_per_c + s.tc_slope * std::log10(lux / 10.0);
  return (1.0 / g) * (1.0 + tc / 100.0 * (temp_c - 25.0));
}

inline Unit simulate_unit(const UnitSim& s, Rng& rng, std::string id = "U1") {
  Unit u;
  u.id = std::move(id);
  for (int k = 0; k < s.repeats; ++k)
    for (double lux : s.lux) {
      Reading r;
      r.lux = lux;
      r.temp_c = s.temp_c + s.temp_span_c * (rng.uniform() - 0.5);
      r.ohm = true_ohm(s, lux, r.temp_c) * std::exp(s.noise_pct / 100.0 * rng.normal());
      if (s.meter_max_ohm > 0 && r.ohm > s.meter_max_ohm) {
        r.kind = ReadingKind::censored;
        r.ohm = s.meter_max_ohm;
      }
      u.readings.push_back(r);
    }
  if (s.dark_ohm > 0) {
    Reading d;
    d.lux = 0;
    d.ohm = s.dark_ohm;
    d.temp_c = s.temp_c;
    d.kind = ReadingKind::dark;
    u.readings.push_back(d);
  }
  return u;
}

// The dark-conductance model alone by plain least squares (no robust loss, no temperature), with
// every reading's sd ln(1 + meter_accuracy_pct / 100) at the default accuracy: the fit that the
// outside references (GSL, ceres::Covariance) are compared with.
inline UnitFit fit_dark_least_squares(const Unit& unit) {
  fitting::FitOptions options;
  options.loss = fitting::Loss::none;
  fitting::ExtendedFitOptions ext;
  ext.model = fitting::ModelChoice::dark_conductance;
  ext.temperature = fitting::TemperatureMode::off;
  return fitting::fit_unit_extended(unit, options, ext);
}

}  // namespace photolot::test
