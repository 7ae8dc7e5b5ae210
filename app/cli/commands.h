// photolot-cli's commands. Each command has a config struct filled by CLI11, a function that
// adds the command to the program, and a run function returning the exit code (exit_codes.h).
#pragma once

#include <CLI/CLI.hpp>
#include <cstddef>
#include <string>
#include <vector>

#include "option_groups.h"
#include "photolot/synth.h"

namespace photolot::cli {

struct AnalyzeConfig {
  std::vector<std::string> files;
  ImportArgs import;
  fitting::FitOptions fit;

  std::string json_path;        // --json
  std::string units_csv_path;   // --units-csv
  bool with_residuals = false;  // --residuals
  std::string lot_name;         // --lot-name (default: import's, the first file's stem)
  bool quiet = false;           // --quiet: counts only, no table
  bool ascii = false;           // --ascii
  std::size_t max_messages = 20;
};
CLI::App* add_analyze_command(CLI::App& app, AnalyzeConfig& config);
int run_analyze(AnalyzeConfig& config);

struct SimulateConfig {
  synth::LotSpec spec;
  std::string dialect = "comma";
  std::string r10 = "20k", censor_above, dark_median = "5M";
  std::vector<double> levels;
  std::string out_path;    // --out
  std::string truth_path;  // --truth
  // A second session: the first `session2_units` units re-measured at `session2_levels`
  // (which are added to the simulated levels), written in the other dialect.
  std::string session2_path;
  std::vector<double> session2_levels;
  std::size_t session2_units = 0;
};
CLI::App* add_simulate_command(CLI::App& app, SimulateConfig& config);
int run_simulate(SimulateConfig& config);

}  // namespace photolot::cli
