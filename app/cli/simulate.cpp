// photolot-cli simulate: a synthetic lot with known truth written as a bench log, so the
// sample data and the benchmark lots can be made again from the command line.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "commands.h"
#include "exit_codes.h"
#include "photolot/atomic_file.h"
#include "photolot/results.h"
#include "photolot/units.h"

namespace photolot::cli {

CLI::App* add_simulate_command(CLI::App& app, SimulateConfig& c) {
  CLI::App* cmd = app.add_subcommand(
      "simulate", "Write a synthetic lot with known truth as a bench log (invented data)");
  auto& s = c.spec;
  cmd->add_option("--out", c.out_path, "The bench log to write (CSV)")->required();
  cmd->add_option("--truth", c.truth_path, "Also write each unit's true R10 and gamma here (CSV)");
  cmd->add_option("--units", s.units, "Number of units")->capture_default_str();
  cmd->add_option("--seed", s.seed, "Random seed; the same seed gives the same file")
      ->capture_default_str();
  cmd->add_option("--dialect", c.dialect,
                  "comma: ',' and '.' decimals; semicolon: ';', ',' decimals, kohm")
      ->check(CLI::IsMember({"comma", "semicolon"}))
      ->capture_default_str();
  cmd->add_option("--id-prefix", s.id_prefix, "Unit ids are this prefix and a number")
      ->capture_default_str();
  cmd->add_option("--levels", c.levels, "Illuminance levels, lx (default 1 2 5 10 ... 1000)")
      ->delimiter(',');
  const char* session = "A second session (to show merging)";
  cmd->add_option("--session2-out", c.session2_path,
                  "Write a second session's log here, in the other dialect")
      ->group(session);
  cmd->add_option("--session2-levels", c.session2_levels,
                  "Levels measured in the second session only, lx")
      ->delimiter(',')
      ->group(session);
  cmd->add_option("--session2-units", c.session2_units,
                  "The first this many units are in the second session (default: all)")
      ->group(session);
  const char* truth = "The lot's truth";
  cmd->add_option("--r10", c.r10, "Median R10, ohm (SI prefix allowed)")
      ->capture_default_str()
      ->group(truth);
  cmd->add_option("--r10-spread", s.ln_r10_sd, "Standard deviation of ln R10")
      ->capture_default_str()
      ->group(truth);
  cmd->add_option("--gamma", s.gamma_mean, "Mean gamma")->capture_default_str()->group(truth);
  cmd->add_option("--gamma-sd", s.gamma_sd, "Standard deviation of gamma")
      ->capture_default_str()
      ->group(truth);
  cmd->add_option("--rho", s.rho, "Correlation of ln R10 and gamma")
      ->capture_default_str()
      ->group(truth);
  cmd->add_option("--dark-conductance", s.dark_conductance_s,
                  "Median dark conductance in parallel, S (0: pure power law)")
      ->capture_default_str()
      ->group(truth);
  const char* bench = "The bench";
  cmd->add_option("--noise", s.noise_pct, "Reading noise, percent of reading (sd)")
      ->capture_default_str()
      ->group(bench);
  cmd->add_option("--outliers", s.outlier_fraction,
                  "Chance that a reading is a decade slip (x10 or /10)")
      ->capture_default_str()
      ->group(bench);
  cmd->add_option("--censor-above", c.censor_above,
                  "Meter's range, ohm: readings above it are logged as over range")
      ->group(bench);
  cmd->add_flag("--dark", s.dark_readings, "Add one dark (0 lx) reading per unit")->group(bench);
  cmd->add_option("--dark-median", c.dark_median, "Median dark resistance, ohm")
      ->capture_default_str()
      ->group(bench);
  cmd->add_option("--temp", s.temp_c, "Bench temperature, degC")
      ->capture_default_str()
      ->group(bench);
  cmd->add_option("--temp-span", s.temp_span_c,
                  "Readings spread uniformly over temp +- span/2, degC")
      ->capture_default_str()
      ->group(bench);
  cmd->add_option("--temp-coeff", s.temp_coeff_pct_per_c,
                  "True temperature coefficient at 10 lx, %/degC")
      ->capture_default_str()
      ->group(bench);
  return cmd;
}

namespace {

std::string check_spec(SimulateConfig& c) {
  auto& s = c.spec;
  auto ohm = [](const std::string& name, const std::string& text, double& out) -> std::string {
    auto v = parse_resistance(text, '.');
    if (!v || !(*v > 0) || !std::isfinite(*v))
      return fmt::format("{}: '{}' is not a positive resistance (e.g. 20k or 20000)", name, text);
    out = *v;
    return {};
  };
  if (auto e = ohm("--r10", c.r10, s.r10_median_ohm); !e.empty()) return e;
  if (auto e = ohm("--dark-median", c.dark_median, s.dark_ohm_median); !e.empty()) return e;
  if (!c.censor_above.empty())
    if (auto e = ohm("--censor-above", c.censor_above, s.meter_max_ohm); !e.empty()) return e;
  if (!c.levels.empty()) s.lux_levels = c.levels;
  if (s.units < 1) return "--units must be at least 1";
  if (c.session2_path.empty() != c.session2_levels.empty())
    return "--session2-out and --session2-levels go together";
  for (double lux : c.session2_levels) s.lux_levels.push_back(lux);
  for (double lux : s.lux_levels)
    if (!(lux > 0) || !std::isfinite(lux))
      return fmt::format("--levels: {} is not a positive illuminance", lux);
  if (!(s.outlier_fraction >= 0 && s.outlier_fraction <= 1))
    return fmt::format("--outliers = {} must lie between 0 and 1", s.outlier_fraction);
  if (!(s.noise_pct >= 0)) return fmt::format("--noise = {} must not be negative", s.noise_pct);
  if (!(s.ln_r10_sd >= 0))
    return fmt::format("--r10-spread = {} must not be negative", s.ln_r10_sd);
  if (!(s.gamma_sd >= 0)) return fmt::format("--gamma-sd = {} must not be negative", s.gamma_sd);
  if (!(s.rho >= -1 && s.rho <= 1)) return fmt::format("--rho = {} must lie in [-1, 1]", s.rho);
  if (!(s.temp_span_c >= 0))
    return fmt::format("--temp-span = {} must not be negative", s.temp_span_c);
  if (!(s.dark_conductance_s >= 0))
    return fmt::format("--dark-conductance = {} must not be negative", s.dark_conductance_s);
  return {};
}

std::string truth_csv(const std::vector<synth::UnitTruth>& truth) {
  std::string out = "id,r10_ohm,gamma,dark_conductance_s\n";
  for (const auto& t : truth)
    out += fmt::format("{},{},{},{}\n", results::csv_text_cell(t.id),
                       results::csv_number_cell(t.r10_ohm), results::csv_number_cell(t.gamma),
                       results::csv_number_cell(t.dark_conductance_s));
  return out;
}

// Moves the readings at the second session's levels of the first `units` units into a lot of
// their own; the other units lose them (they were never measured there).
Lot split_second_session(Lot& lot, const std::vector<double>& levels, std::size_t units) {
  Lot second;
  second.name = lot.name + "-session2";
  for (std::size_t i = 0; i < lot.units.size(); ++i) {
    Unit& u = lot.units[i];
    Unit moved{u.id, {}};
    std::vector<Reading> kept;
    for (const auto& r : u.readings) {
      bool in_second = std::find(levels.begin(), levels.end(), r.lux) != levels.end();
      if (!in_second)
        kept.push_back(r);
      else if (units == 0 || i < units)
        moved.readings.push_back(r);
    }
    u.readings = std::move(kept);
    if (!moved.readings.empty()) second.units.push_back(std::move(moved));
  }
  return second;
}

}  // namespace

int run_simulate(SimulateConfig& c) {
  if (auto why = check_spec(c); !why.empty()) {
    std::fputs(fmt::format("photolot-cli simulate: {}\n", why).c_str(), stderr);
    return kExitUsageError;
  }
  synth::SimulatedLot sim = synth::simulate(c.spec);
  auto dialect = c.dialect == "semicolon" ? synth::Dialect::semicolon : synth::Dialect::comma;
  std::vector<std::pair<std::string, std::string>> outputs;
  if (!c.session2_path.empty()) {
    Lot second = split_second_session(sim.lot, c.session2_levels, c.session2_units);
    auto other =
        dialect == synth::Dialect::comma ? synth::Dialect::semicolon : synth::Dialect::comma;
    outputs.emplace_back(c.session2_path, synth::to_csv(second, other));
  }
  outputs.emplace(outputs.begin(), c.out_path, synth::to_csv(sim.lot, dialect));
  if (!c.truth_path.empty()) outputs.emplace_back(c.truth_path, truth_csv(sim.truth));
  for (const auto& [path, text] : outputs) {
    if (auto err = write_file_atomically(path, text)) {
      std::fputs(fmt::format("{}: error: cannot write: {}\n", err->path, err->message).c_str(),
                 stderr);
      return kExitInputError;
    }
  }
  std::size_t readings = 0;
  for (const auto& u : sim.lot.units) readings += u.readings.size();
  std::fputs(fmt::format("simulated {} units, {} readings (seed {}): {}\n", sim.lot.units.size(),
                         readings, c.spec.seed, c.out_path)
                 .c_str(),
             stdout);
  return kExitDone;
}

}  // namespace photolot::cli
