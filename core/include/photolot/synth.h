// Synthetic lots with known truth: the demo data, the tests' recovery checks and the
// benchmarks all come from here. Deterministic for a given seed on every platform (our own
// generator and transforms; no std:: distributions, whose output differs between libraries).
#pragma once

#include <cstdint>
#include <string>
#include <vector>

#include "photolot/lot.h"

namespace photolot::synth {

struct LotSpec {
  std::uint64_t seed = 1;
  std::size_t units = 40;
  std::string id_prefix = "U";           // ids U0001, U0002, ...
  std::vector<double> lux_levels = {1, 2, 5, 10, 20, 50, 100, 200, 500, 1000};

  // The lot's truth: ln R10 ~ Normal(ln r10_median_ohm, ln_r10_sd), gamma ~ Normal(gamma_mean,
  // gamma_sd), correlation rho between them.
  double r10_median_ohm = 20e3;
  double ln_r10_sd = 0.15;
  double gamma_mean = 0.75;
  double gamma_sd = 0.03;
  double rho = 0.0;

  double noise_pct = 0.5;          // multiplicative reading noise, sd in percent of reading
  double outlier_fraction = 0.0;   // chance a reading is a decade slip (x10 or /10)
  double dark_conductance_s = 0.0; // per-unit G_dark median (0: pure power law)
  double dark_ohm_median = 5e6;    // dark reading (0 lx) median, when dark_readings
  bool dark_readings = false;      // add one 0 lx reading per unit
  double meter_max_ohm = 0;        // > 0: readings above it are logged as over range
  double temp_c = 25.0;            // bench temperature
  double temp_span_c = 0.0;        // readings spread uniformly over temp_c +- span/2
  double temp_coeff_pct_per_c = 0.0;  // true coefficient at 10 lx, %/degC
};

// The truth behind each simulated unit.
struct UnitTruth {
  std::string id;
  double r10_ohm = 0;
  double gamma = 0;
  double dark_conductance_s = 0;
};

struct SimulatedLot {
  Lot lot;
  std::vector<UnitTruth> truth;  // same order as lot.units
};

SimulatedLot simulate(const LotSpec& spec);

enum class Dialect : std::uint8_t {
  comma,      // "unit,lux,ohm,temp_c" with '.' decimals
  semicolon,  // ';' delimited with ',' decimals, "kohm" column
};

// A bench log for the lot in the given dialect (over-range readings written as "OL" or
// ">bound", dark readings at 0 lx), ready for import.
std::string to_csv(const Lot& lot, Dialect dialect = Dialect::comma);

}  // namespace photolot::synth
