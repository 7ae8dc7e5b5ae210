// photolot-cli's option groups. Each group is a pair of functions: one adds the group's
// options to a command and binds them to the step's options struct, one records the values
// used in the results document (inputs.options.<group>). A new step (spec, pairing, ...) adds
// its own pair here and calls them from analyze.cpp.
#pragma once

#include <CLI/CLI.hpp>
#include <string>

#include "photolot/fitting/fit.h"
#include "photolot/import.h"
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

}  // namespace photolot::cli
