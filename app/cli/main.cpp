// photolot-cli: the command line. Exit codes in exit_codes.h.
#include <CLI/CLI.hpp>

#include "commands.h"
#include "exit_codes.h"

int main(int argc, char** argv) {
  using namespace photolot::cli;
  CLI::App app{"photolot-cli: photoresistor (LDR) lot analysis from bench logs"};
  app.set_version_flag("--version", std::string("photolot-cli ") + PHOTOLOT_VERSION);
  app.require_subcommand(1, 1);
  app.footer(
      "Exit codes: 0 done (rows may have been skipped; said on stderr), 1 a file could not be\n"
      "read or written (no output written), 2 a bad option.\n\n"
      "Caution: CdS cells contain cadmium. Do not cut, grind or burn them; wash hands after\n"
      "handling broken ones; dispose of rejects as hazardous electronic waste per local rules.\n"
      "Never measure cells fitted in a mains-connected control: bench fixtures run at\n"
      "extra-low voltage. Local codes and licensed practice come first.");

  AnalyzeConfig analyze;
  SimulateConfig simulate;
  CLI::App* analyze_cmd = add_analyze_command(app, analyze);
  CLI::App* simulate_cmd = add_simulate_command(app, simulate);

  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    // --help and --version end here with code 0; every other parse error is a usage error.
    return app.exit(e) == 0 ? kExitDone : kExitUsageError;
  }
  if (analyze_cmd->parsed()) return run_analyze(analyze);
  if (simulate_cmd->parsed()) return run_simulate(simulate);
  return kExitUsageError;
}
