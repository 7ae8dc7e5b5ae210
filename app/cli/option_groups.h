// photolot-cli's option groups. Each group is a pair of functions: one adds the group's
// options to a command and binds them to the step's options struct, one records the values
// used in the results document (inputs.options.<group>). A new step (spec, pairing, ...) adds
// its own pair here and calls them from analyze.cpp.
#pragma once

#include <CLI/CLI.hpp>
#include <string>

#include "photolot/fitting/fit.h"
#include "photolot/fitting/models.h"
#include "photolot/import.h"
#include "photolot/pairing.h"
#include "photolot/results.h"

namespace photolot::cli {

// Text given on the command line that is parsed after CLI11 (delimiter names, values with
// SI prefixes); apply() moves it into the options struct.
struct ImportArgs {
  ImportOptions options;
  std::string delimiter;  // "comma", "semicolon", "tab", or "" to detect
  std::string decimal;    // "point", "comma", or "" for the default
  std::string overload;   // e.g. "20M", "20000000"; "" for none
  // Fills options from the text fields; returns an error message naming the option, or "".
  std::string apply();
};
void add_import_options(CLI::App& command, ImportArgs& args);
results::Json import_options_json(const ImportOptions& options);

void add_fit_options(CLI::App& command, fitting::FitOptions& options);
results::Json fit_options_json(const fitting::FitOptions& options);

// The curve model, over-range readings, the bench profile and temperature (fitting/models.h).
struct ModelArgs {
  std::string model = "power-law";  // --model power-law|dark|choose (docs/cli.md: why this default)
  std::string temperature = "auto";  // --temperature auto|off
  std::string bench_path;            // --bench PROFILE.toml
  fitting::ExtendedFitOptions options;
  // Fills options from the text fields (the bench profile is read by the caller).
  void apply();
};
void add_model_options(CLI::App& command, ModelArgs& args);
results::Json model_options_json(const ModelArgs& args);

// Pairing (pairing.h). `--pair` turns it on; the other options need it.
struct PairArgs {
  bool enabled = false;         // --pair
  std::string range;            // --pair-range LO:HI (lx); "" for the default
  std::string mode;             // --pair-mode absolute|trimmable
  std::string pairs_csv_path;   // --pairs-csv
  PairOptions options;
  // Fills options from the text fields; returns an error message naming the option, or "".
  std::string apply();
};
void add_pair_options(CLI::App& command, PairArgs& args);
results::Json pair_options_json(const PairOptions& options);

// The printed lot acceptance summary (app/report).
struct ReportArgs {
  std::string path;           // --report OUT.pdf
  std::string paper = "a4";   // --paper a4|letter
  std::string part, lot_id, supplier, inspector, date;
};
void add_report_options(CLI::App& command, ReportArgs& args);

}  // namespace photolot::cli
