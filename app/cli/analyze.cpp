// photolot-cli analyze: import the bench logs, fit every unit, print the table and the lot's
// counts, write the results document and the unit table.
//
// Adding a step (spec and acceptance, statistics, pairing): put its options struct in
// AnalyzeConfig, add its option group (option_groups.h) in add_analyze_command, run it after
// the fit in run_analyze, put its section in doc.sections["<key>"] and print its lines after
// the lot's counts.
#include <fmt/format.h>
#include <unistd.h>

#include <atomic>
#include <cstdio>

#include "commands.h"
#include "exit_codes.h"
#include "photolot/atomic_file.h"
#include "photolot/results.h"
#include "table.h"

namespace photolot::cli {

CLI::App* add_analyze_command(CLI::App& app, AnalyzeConfig& config) {
  CLI::App* cmd = app.add_subcommand(
      "analyze", "Import bench logs, fit each unit's R(E) = R10 (E/10 lx)^-gamma, print a table");
  cmd->add_option("FILE", config.files, "Bench logs (CSV); units in several files are merged")
      ->required();  // a missing file is an input error (exit 1) reported by import, not a usage
                     // error
  const char* out = "Output";
  cmd->add_option("--json", config.json_path, "Write the results document (JSON) here")->group(out);
  cmd->add_option("--units-csv", config.units_csv_path, "Write the unit table (CSV) here")
      ->group(out);
  cmd->add_flag("--residuals", config.with_residuals,
                "Put each unit's per-point residuals in the results document")
      ->group(out);
  cmd->add_option("--lot-name", config.lot_name, "Lot label (default: the first file's name)")
      ->group(out);
  cmd->add_flag("--quiet,-q", config.quiet, "Print the lot's counts only, not the table")
      ->group(out);
  cmd->add_flag("--ascii", config.ascii, "Plain ASCII output (\"kohm\" for \"kΩ\")")->group(out);
  cmd->add_option("--max-messages", config.max_messages,
                  "Input messages to show on stderr (0: all)")
      ->capture_default_str()
      ->group(out);
  add_import_options(*cmd, config.import);
  add_fit_options(*cmd, config.fit);
  return cmd;
}

namespace {

void print_err(const std::string& text) { std::fwrite(text.data(), 1, text.size(), stderr); }
void print_out(const std::string& text) { std::fwrite(text.data(), 1, text.size(), stdout); }

// "fitting 4000/10000" on a terminal, for large lots only; called from worker threads.
ProgressFn terminal_progress(std::size_t units) {
  if (units < 2000 || !::isatty(STDERR_FILENO)) return {};
  auto last = std::make_shared<std::atomic<std::size_t>>(0);
  return [last, units](std::size_t done, std::size_t total) {
    std::size_t step = units / 20;
    std::size_t prev = last->load();
    if (done < prev + step && done != total) return;
    if (!last->compare_exchange_strong(prev, done)) return;
    std::fprintf(stderr, "\rfitting %zu/%zu%s", done, total, done == total ? "\r\x1b[K" : "");
  };
}

}  // namespace

int run_analyze(AnalyzeConfig& config) {
  if (auto why = config.import.apply(); !why.empty()) {
    print_err(fmt::format("photolot-cli analyze: {}\n", why));
    return kExitUsageError;
  }
  if (auto why = config.fit.validate(); !why.empty()) {
    print_err(fmt::format("photolot-cli analyze: fit options: {}\n", why));
    return kExitUsageError;
  }

  ImportResult imported = import_files(config.files, config.import.options);
  if (!imported.ok()) {
    for (const auto& e : imported.errors)
      print_err(diagnostic_line(e.file, e.line, e.column, "error", e.message));
    print_err("photolot-cli analyze: no output written\n");
    return kExitInputError;
  }
  Lot& lot = imported.lot;
  if (!config.lot_name.empty()) lot.name = config.lot_name;
  print_err(diagnostic_lines(lot.diagnostics, config.max_messages, config.json_path));

  LotFit fit = fitting::fit_lot(lot, config.fit, terminal_progress(lot.units.size()));

  results::ResultsDocument doc = results::make_document(lot, fit);
  doc.with_residuals = config.with_residuals;
  for (const auto& path : config.files) {
    if (auto f = results::describe_file(path)) doc.files.push_back(*f);
  }
  doc.options["import"] = import_options_json(config.import.options);
  doc.options["fit"] = fit_options_json(config.fit);

  // Build every output before writing any, then write each to a temporary file and rename it.
  std::vector<std::pair<std::string, std::string>> outputs;
  if (!config.json_path.empty()) outputs.emplace_back(config.json_path, results::to_json_text(doc));
  if (!config.units_csv_path.empty())
    outputs.emplace_back(config.units_csv_path, results::units_csv(fit.units));
  for (const auto& [path, text] : outputs) {
    if (auto err = write_file_atomically(path, text)) {
      print_err(fmt::format("{}: error: cannot write: {}\n", err->path, err->message));
      return kExitInputError;
    }
  }

  TextStyle style{.unicode = !config.ascii && environment_is_utf8()};
  std::string text;
  if (!config.quiet) text += unit_table(fit.units, style) + "\n";
  text += lot_summary(lot, fit);
  if (!config.json_path.empty()) text += fmt::format("results document: {}\n", config.json_path);
  if (!config.units_csv_path.empty())
    text += fmt::format("unit table: {}\n", config.units_csv_path);
  print_out(text);
  return kExitDone;
}

}  // namespace photolot::cli
