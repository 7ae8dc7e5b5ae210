// photolot-cli analyze: import the bench logs, fit every unit, print the table and the lot's
// counts, write the results document, the unit table, the pick list and the printed summary.
//
// Adding a step (spec and acceptance, statistics, pairing): put its options struct in
// AnalyzeConfig, add its option group (option_groups.h) in add_analyze_command, run it after
// the fit in run_analyze, put its section in doc.sections["<key>"] and print its lines after
// the lot's counts.
#include <fmt/format.h>
#include <unistd.h>

#include <atomic>
#include <cmath>
#include <cstdio>
#include <optional>

#include "acceptance_text.h"
#include "commands.h"
#include "exit_codes.h"
#include "photolot/acceptance.h"
#include "photolot/atomic_file.h"
#include "photolot/bench_profile.h"
#include "photolot/pairing.h"
#include "photolot/results.h"
#include "report_output.h"
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
  const char* acc = "Spec and acceptance";
  cmd->add_option("--spec", config.spec_path,
                  "Judge each unit and the lot against this purchase spec (TOML, "
                  "docs/spec-format.md)")
      ->group(acc);
  cmd->add_option("--lot-size", config.lot_size,
                  "Units in the lot, for the ISO 2859-1 sampling plan (overrides the spec's "
                  "inspection.lot_size)")
      ->check(CLI::PositiveNumber)
      ->group(acc);
  add_pair_options(*cmd, config.pair);
  add_report_options(*cmd, config.report);
  add_import_options(*cmd, config.import);
  add_fit_options(*cmd, config.fit);
  add_model_options(*cmd, config.model);
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
  if (auto why = config.pair.apply(); !why.empty()) {
    print_err(fmt::format("photolot-cli analyze: {}\n", why));
    return kExitUsageError;
  }
  if (!config.report.path.empty() && !report_supported()) {
    print_err(
        "photolot-cli analyze: --report: this build of photolot-cli has no PDF support (it was "
        "built without the Qt parts, PHOTOLOT_BUILD_GUI=OFF); no output written\n");
    return kExitUsageError;
  }
  config.model.apply();

  // The spec is read first: nothing is analysed against a spec that did not load.
  std::optional<Spec> spec;
  if (config.lot_size != 0 && config.spec_path.empty()) {
    print_err(
        "photolot-cli analyze: --lot-size needs --spec (the plan comes from the spec's AQL "
        "and inspection level)\n");
    return kExitUsageError;
  }
  if (!config.spec_path.empty()) {
    SpecLoadResult loaded = load_spec(config.spec_path);
    if (!loaded.ok()) {
      for (const auto& e : loaded.errors)
        print_err(diagnostic_line(e.file, e.line, e.column, "error", e.message));
      print_err("photolot-cli analyze: the spec did not load; no output written\n");
      return kExitInputError;
    }
    spec = std::move(loaded.spec);
  }
  // The spec's temperature coefficient is applied where the readings do not identify one.
  if (spec && std::isfinite(spec->temp_coeff_pct_per_c))
    config.model.options.spec_tc10_pct_per_c = spec->temp_coeff_pct_per_c;
  if (!config.model.bench_path.empty()) {
    BenchProfileResult bench = load_bench_profile(config.model.bench_path);
    if (!bench.ok()) {
      const FileError& e = *bench.error;
      print_err(diagnostic_line(e.file, e.line, e.column, "error", e.message));
      print_err("photolot-cli analyze: the bench profile did not load; no output written\n");
      return kExitInputError;
    }
    config.model.options.bench = std::move(bench.profile);
  }
  if (auto why = config.model.options.validate(); !why.empty()) {
    print_err(fmt::format("photolot-cli analyze: model options: {}\n", why));
    return kExitUsageError;
  }

  // The results document fingerprints the bytes imported, not a second read of the files.
  std::vector<results::InputFile> read_files;
  ImportResult imported = import_files(
      config.files, config.import.options, [&](const std::string& path, std::string_view content) {
        read_files.push_back(results::describe_content(path, content));
      });
  if (!imported.ok()) {
    for (const auto& e : imported.errors)
      print_err(diagnostic_line(e.file, e.line, e.column, "error", e.message));
    print_err("photolot-cli analyze: no output written\n");
    return kExitInputError;
  }
  Lot& lot = imported.lot;
  if (!config.lot_name.empty()) lot.name = config.lot_name;
  print_err(diagnostic_lines(lot.diagnostics, config.max_messages, config.json_path));

  // Over-range readings enter as one-sided bounds unless --no-over-range-bounds.
  config.fit.over_range_bounds = config.model.options.censored_terms;
  LotFit fit = fitting::fit_lot_extended(lot, config.fit, config.model.options,
                                         terminal_progress(lot.units.size()));

  results::ResultsDocument doc = results::make_document(lot, fit);
  doc.with_residuals = config.with_residuals;
  doc.files = std::move(read_files);
  doc.options["import"] = import_options_json(config.import.options);
  doc.options["fit"] = fit_options_json(config.fit);
  doc.options["model"] = model_options_json(config.model);

  // Lot statistics always; verdicts and the disposition with a spec.
  StatisticsOptions stats_options;
  if (spec) {
    stats_options.coverage = spec->tolerance_coverage;
    stats_options.confidence = spec->tolerance_confidence;
  }
  const LotStatistics stats = lot_statistics(fit, stats_options, spec ? &*spec : nullptr);
  doc.sections["lot_statistics"] = results::Json(lot_statistics_json(stats));
  std::vector<UnitVerdict> verdicts;
  std::optional<Acceptance> acceptance;
  if (spec) {
    verdicts = judge(fit, *spec);
    acceptance =
        decide(*spec, verdicts,
               config.lot_size ? std::optional<std::size_t>(config.lot_size) : std::nullopt);
    doc.options["spec"] = results::Json(spec_json(*spec));
    doc.sections["acceptance"] = results::Json(acceptance_json(*acceptance));
    // Each unit's verdict, reasons and notes go into its own element of "units".
    doc.unit_sections.reserve(verdicts.size());
    for (const auto& v : verdicts) {
      const nlohmann::json full = verdict_json(v);
      results::Json j = results::Json::object();
      for (const char* key : {"verdict", "reasons", "notes"}) j[key] = results::Json(full.at(key));
      doc.unit_sections.push_back(std::move(j));
    }
  }

  // Pairing among the units that conform (with a spec), else among every fitted unit.
  std::optional<Pairing> pairing;
  if (config.pair.enabled) {
    std::vector<std::size_t> eligible;
    for (std::size_t i = 0; i < fit.units.size(); ++i) {
      const bool ok = spec ? verdicts[i].verdict == Verdict::conforming : fit.units[i].ok();
      if (ok) eligible.push_back(i);
    }
    PairOptions pair_options = config.pair.options;
    pair_options.threads = config.fit.threads;  // one --threads for every pass that shares out
    pairing = pair_units(fit, eligible, pair_options);
    results::Json options = pair_options_json(config.pair.options);
    options["eligible"] = spec ? "conforming to the spec" : "fitted";
    doc.options["pairing"] = options;
    const results::Json section = results::Json(pairing_json(*pairing));
    for (const char* key : {"pairing", "pairs", "unpaired"})
      if (section.contains(key)) doc.sections[key] = section.at(key);
  }

  // Build every output before writing any, then write each to a temporary file and rename it.
  std::vector<std::pair<std::string, std::string>> outputs;
  if (!config.json_path.empty()) outputs.emplace_back(config.json_path, results::to_json_text(doc));
  if (!config.units_csv_path.empty())
    outputs.emplace_back(config.units_csv_path, results::units_csv(fit.units));
  if (pairing && !config.pair.pairs_csv_path.empty())
    outputs.emplace_back(config.pair.pairs_csv_path, pick_list_csv(*pairing));
  // The summary first: it is the output most likely to fail (fonts, Qt), and then nothing
  // else is written either.
  if (!config.report.path.empty()) {
    ReportContent content{&lot,
                          &fit,
                          spec ? &*spec : nullptr,
                          &stats,
                          acceptance ? &*acceptance : nullptr,
                          spec ? &verdicts : nullptr,
                          pairing ? &*pairing : nullptr,
                          config.model.options.bench ? &*config.model.options.bench : nullptr,
                          config.model.bench_path};
    if (auto err = write_report(config.report, content); !err.empty()) {
      print_err(err + "\n");
      return kExitInputError;
    }
  }

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
  text += statistics_lines(stats, style);
  if (spec) text += acceptance_lines(*spec, verdicts, *acceptance, config.max_messages, style);
  if (pairing) text += pairing_lines(*pairing, style);
  if (!config.json_path.empty()) text += fmt::format("results document: {}\n", config.json_path);
  if (!config.units_csv_path.empty())
    text += fmt::format("unit table: {}\n", config.units_csv_path);
  if (pairing && !config.pair.pairs_csv_path.empty())
    text += fmt::format("pick list: {}\n", config.pair.pairs_csv_path);
  if (!config.report.path.empty())
    text += fmt::format("lot acceptance summary: {}\n", config.report.path);
  print_out(text);
  return kExitDone;
}

}  // namespace photolot::cli
