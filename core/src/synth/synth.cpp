// Synthetic lots with known truth (see synth.h).
//
// Randomness: splitmix64 for seeding and xoshiro256** for the stream, normal deviates by the
// Box-Muller transform. Both are defined bit for bit, so a seed gives the same lot with any
// standard library (std::normal_distribution is not specified that tightly).
#include "photolot/synth.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <numbers>
#include <string>

namespace photolot::synth {
namespace {

std::uint64_t splitmix64(std::uint64_t& state) {
  std::uint64_t z = (state += 0x9E3779B97F4A7C15ull);
  z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ull;
  z = (z ^ (z >> 27)) * 0x94D049BB133111EBull;
  return z ^ (z >> 31);
}

class Rng {
 public:
  explicit Rng(std::uint64_t seed) {
    for (auto& word : s_) word = splitmix64(seed);
  }
  std::uint64_t next() {
    const std::uint64_t result = rotl(s_[1] * 5, 7) * 9;
    const std::uint64_t t = s_[1] << 17;
    s_[2] ^= s_[0];
    s_[3] ^= s_[1];
    s_[1] ^= s_[2];
    s_[0] ^= s_[3];
    s_[2] ^= t;
    s_[3] = rotl(s_[3], 45);
    return result;
  }
  // Uniform on (0, 1): never 0, so log() is safe.
  double uniform() { return (static_cast<double>(next() >> 11) + 0.5) * 0x1.0p-53; }
  double normal() {
    if (has_spare_) {
      has_spare_ = false;
      return spare_;
    }
    const double u1 = uniform(), u2 = uniform();
    const double r = std::sqrt(-2.0 * std::log(u1));
    spare_ = r * std::sin(2.0 * std::numbers::pi * u2);
    has_spare_ = true;
    return r * std::cos(2.0 * std::numbers::pi * u2);
  }

 private:
  static std::uint64_t rotl(std::uint64_t x, int k) { return (x << k) | (x >> (64 - k)); }
  std::uint64_t s_[4]{};
  double spare_ = 0;
  bool has_spare_ = false;
};

}  // namespace

SimulatedLot simulate(const LotSpec& spec) {
  SimulatedLot out;
  Rng rng(spec.seed);
  out.lot.name = fmt::format("simulated-{}-units-seed-{}", spec.units, spec.seed);
  out.lot.source_files = {"simulated.csv"};
  out.lot.units.reserve(spec.units);
  out.truth.reserve(spec.units);
  std::uint32_t line = 1;  // the header of to_csv() is line 1
  const double rho = std::clamp(spec.rho, -1.0, 1.0);

  for (std::size_t i = 0; i < spec.units; ++i) {
    const double z1 = rng.normal(), z2 = rng.normal(), z3 = rng.normal();
    UnitTruth truth;
    truth.id = fmt::format("{}{:04d}", spec.id_prefix, i + 1);
    truth.r10_ohm = spec.r10_median_ohm * std::exp(spec.ln_r10_sd * z1);
    truth.gamma = spec.gamma_mean + spec.gamma_sd * (rho * z1 + std::sqrt(1 - rho * rho) * z2);
    truth.dark_conductance_s = spec.dark_conductance_s > 0 ? spec.dark_conductance_s * std::exp(0.3 * z3) : 0.0;

    Unit unit;
    unit.id = truth.id;
    auto temperature = [&] {
      return spec.temp_span_c > 0 ? spec.temp_c + spec.temp_span_c * (rng.uniform() - 0.5) : spec.temp_c;
    };
    auto temp_factor = [&](double temp_c) {
      return 1.0 + spec.temp_coeff_pct_per_c / 100.0 * (temp_c - 25.0);
    };
    auto add = [&](double lux, double ohm, double temp_c) {
      Reading r;
      r.lux = lux;
      r.temp_c = temp_c;
      r.source = {0, ++line};
      if (spec.meter_max_ohm > 0 && ohm > spec.meter_max_ohm) {
        r.kind = ReadingKind::censored;
        r.ohm = spec.meter_max_ohm;
      } else {
        r.kind = lux > 0 ? ReadingKind::normal : ReadingKind::dark;
        r.ohm = ohm;
      }
      unit.readings.push_back(r);
    };

    for (const double lux : spec.lux_levels) {
      const double g_photo = std::pow(lux / 10.0, truth.gamma) / truth.r10_ohm;
      double ohm = 1.0 / (g_photo + truth.dark_conductance_s);
      const double temp_c = temperature();
      ohm *= temp_factor(temp_c);
      ohm *= std::exp(spec.noise_pct / 100.0 * rng.normal());
      if (spec.outlier_fraction > 0 && rng.uniform() < spec.outlier_fraction)
        ohm *= rng.uniform() < 0.5 ? 10.0 : 0.1;  // a decade slip
      add(lux, ohm, temp_c);
    }
    if (spec.dark_readings) {
      const double dark_ohm = truth.dark_conductance_s > 0
                                  ? 1.0 / truth.dark_conductance_s * std::exp(0.02 * rng.normal())
                                  : spec.dark_ohm_median * std::exp(0.3 * rng.normal());
      add(0.0, dark_ohm, temperature());
    }
    out.lot.units.push_back(std::move(unit));
    out.truth.push_back(std::move(truth));
  }
  for (const auto& u : out.lot.units)
    for (const auto& r : u.readings) {
      ++out.lot.counts.rows_read;
      ++out.lot.counts.rows_used;
      out.lot.counts.censored += r.kind == ReadingKind::censored;
      out.lot.counts.dark += r.kind == ReadingKind::dark;
    }
  return out;
}

std::string to_csv(const Lot& lot, Dialect dialect) {
  std::string out;
  std::size_t rows = 0;
  for (const auto& u : lot.units) rows += u.readings.size();
  out.reserve(64 + rows * 40);
  const bool semi = dialect == Dialect::semicolon;
  out += semi ? "Serial;Illuminance [lx];Resistance [kΩ];Temperature [°C]\n" : "unit,lux,ohm,temp_c\n";
  const char sep = semi ? ';' : ',';
  auto decimal = [semi](std::string s) {
    if (semi) std::replace(s.begin(), s.end(), '.', ',');
    return s;
  };
  for (const auto& u : lot.units) {
    for (const auto& r : u.readings) {
      out += u.id;
      out += sep;
      out += decimal(fmt::format("{:g}", r.lux));
      out += sep;
      const double value = semi ? r.ohm / 1e3 : r.ohm;
      if (r.kind == ReadingKind::censored && std::isnan(r.ohm)) {
        out += "OL";
      } else {
        if (r.kind == ReadingKind::censored) out += '>';
        out += decimal(fmt::format("{:.6g}", value));
      }
      out += sep;
      if (!std::isnan(r.temp_c)) out += decimal(fmt::format("{:.2f}", r.temp_c));
      out += '\n';
    }
  }
  return out;
}

}  // namespace photolot::synth
