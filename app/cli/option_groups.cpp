// Import and fit option groups of photolot-cli.
#include "option_groups.h"

#include <fmt/format.h>

#include <charconv>
#include <cmath>
#include <optional>

#include "photolot/units.h"

namespace photolot::cli {

namespace {
results::Json char_json(char c) {
  return c ? results::Json(std::string(1, c)) : results::Json(nullptr);
}
results::Json text_or_null(const std::string& s) {
  return s.empty() ? results::Json(nullptr) : results::Json(s);
}
}  // namespace

void add_import_options(CLI::App& command, ImportArgs& args) {
  const char* group = "Reading the bench logs (detected when not given)";
  command.add_option("--delimiter", args.delimiter, "Field separator")
      ->check(CLI::IsMember({"comma", "semicolon", "tab"}))
      ->group(group);
  command
      .add_option("--decimal", args.decimal,
                  "Decimal mark (default: comma when the delimiter is ';', else point)")
      ->check(CLI::IsMember({"point", "comma"}))
      ->group(group);
  auto& o = args.options;
  command
      .add_option("--id-column", o.id_column, "Unit id column, by header name or 1-based number")
      ->group(group);
  command.add_option("--lux-column", o.lux_column, "Illuminance column")->group(group);
  command.add_option("--ohm-column", o.ohm_column, "Resistance column")->group(group);
  command.add_option("--temp-column", o.temp_column, "Temperature column")->group(group);
  command.add_option("--lux-unit", o.lux_unit, "Illuminance unit: lx or fc")->group(group);
  command.add_option("--ohm-unit", o.ohm_unit, "Resistance unit: ohm, kohm or Mohm")->group(group);
  command.add_option("--temp-unit", o.temp_unit, "Temperature unit: degC or K")->group(group);
  command
      .add_option("--overload", args.overload,
                  "Meter's upper range for over-range readings logged without a value "
                  "(ohm; SI prefix allowed, e.g. 20M)")
      ->group(group);
  command
      .add_option("--unit-id", o.default_unit_id,
                  "Unit id for a log of a single unit that has no id column")
      ->group(group);
}

std::string ImportArgs::apply() {
  if (delimiter == "comma") options.delimiter = ',';
  if (delimiter == "semicolon") options.delimiter = ';';
  if (delimiter == "tab") options.delimiter = '\t';
  if (decimal == "point") options.decimal = '.';
  if (decimal == "comma") options.decimal = ',';
  if (!overload.empty()) {
    auto value = parse_resistance(overload, '.');
    if (!value || !(*value > 0))
      return "--overload: '" + overload + "' is not a positive resistance (e.g. 20M or 20000000)";
    options.overload_ohm = *value;
  }
  if (auto why = options.validate(); !why.empty()) return "import options: " + why;
  return {};
}

results::Json import_options_json(const ImportOptions& o) {
  results::Json j = results::Json::object();
  j["delimiter"] = char_json(o.delimiter);
  j["decimal"] = char_json(o.decimal);
  j["id_column"] = text_or_null(o.id_column);
  j["lux_column"] = text_or_null(o.lux_column);
  j["ohm_column"] = text_or_null(o.ohm_column);
  j["temp_column"] = text_or_null(o.temp_column);
  j["lux_unit"] = text_or_null(o.lux_unit);
  j["ohm_unit"] = text_or_null(o.ohm_unit);
  j["temp_unit"] = text_or_null(o.temp_unit);
  j["overload_ohm"] = std::isfinite(o.overload_ohm) ? results::Json(o.overload_ohm) : nullptr;
  j["default_unit_id"] = text_or_null(o.default_unit_id);
  return j;
}

void add_fit_options(CLI::App& command, fitting::FitOptions& o) {
  const char* group = "Fitting each unit's curve";
  // CLI11 stores the name; the callback sets the enum (a bad name is a usage error).
  command
      .add_option_function<std::string>(
          "--loss",
          [&o](const std::string& name) {
            for (auto loss : {fitting::Loss::huber, fitting::Loss::cauchy, fitting::Loss::none})
              if (fitting::to_string(loss) == name) o.loss = loss;
          },
          "Robust loss: huber, cauchy or none (least squares); default huber")
      ->check(CLI::IsMember({"huber", "cauchy", "none"}))
      ->group(group);
  command
      .add_option("--meter-accuracy", o.meter_accuracy_pct,
                  "Resistance meter accuracy, percent of reading (sets the loss scale)")
      ->capture_default_str()
      ->group(group);
  command
      .add_option("--outlier-threshold", o.outlier_threshold,
                  "Flag a point beyond this many loss scales as an outlier")
      ->capture_default_str()
      ->group(group);
  command.add_option("--min-levels", o.min_levels, "Distinct illuminance levels a fit needs")
      ->capture_default_str()
      ->group(group);
  command
      .add_option("--min-span", o.min_span_decades, "Decades of illuminance the levels must span")
      ->capture_default_str()
      ->group(group);
  command
      .add_option("--threads", o.threads,
                  "Worker threads for the fits and the pairing's searches (0: all cores); results "
                  "do not change")
      ->capture_default_str()
      ->group(group);
}

results::Json fit_options_json(const fitting::FitOptions& o) {
  results::Json j = results::Json::object();
  j["loss"] = std::string(fitting::to_string(o.loss));
  j["meter_accuracy_pct"] = o.meter_accuracy_pct;
  j["outlier_threshold"] = o.outlier_threshold;
  j["min_levels"] = o.min_levels;
  j["min_span_decades"] = o.min_span_decades;
  j["confidence"] = o.confidence;
  // threads is left out on purpose: it does not change the results, and the document's bytes
  // should not depend on it.
  return j;
}

}  // namespace photolot::cli

namespace photolot::cli {

void add_model_options(CLI::App& command, ModelArgs& args) {
  const char* group = "Curve model, over-range readings, bench and temperature";
  command
      .add_option("--model", args.model,
                  "Curve per unit: power-law (R10 (E/10 lx)^-gamma), dark (with a dark "
                  "conductance in parallel), or choose (both, keep the lower AICc)")
      ->check(CLI::IsMember({"power-law", "dark", "choose"}))
      ->capture_default_str()
      ->group(group);
  command
      .add_option("--bench", args.bench_path,
                  "Bench profile (TOML): the meters' accuracies, to weight each reading")
      ->group(group);
  command
      .add_option("--temperature", args.temperature,
                  "auto: fit the temperature coefficient where the readings' spread allows, else "
                  "apply the spec's; off: curves describe R at the bench's temperature")
      ->check(CLI::IsMember({"auto", "off"}))
      ->capture_default_str()
      ->group(group);
  command
      .add_flag("!--no-over-range-bounds", args.options.censored_terms,
                "Leave over-range readings out of the curve instead of using each as a "
                "one-sided bound")
      ->group(group);
}

void ModelArgs::apply() {
  if (model == "power-law") options.model = fitting::ModelChoice::power_law;
  if (model == "dark") options.model = fitting::ModelChoice::dark_conductance;
  if (model == "choose") options.model = fitting::ModelChoice::choose;
  options.temperature =
      temperature == "off" ? fitting::TemperatureMode::off : fitting::TemperatureMode::fit;
}

results::Json model_options_json(const ModelArgs& args) {
  const auto& o = args.options;
  results::Json j = results::Json::object();
  j["model"] = std::string(fitting::to_string(o.model));
  j["over_range_bounds"] = o.censored_terms;
  j["use_dark_readings"] = o.use_dark_readings;
  j["temperature"] = std::string(fitting::to_string(o.temperature));
  j["spec_tc10_pct_per_c"] =
      std::isfinite(o.spec_tc10_pct_per_c) ? results::Json(o.spec_tc10_pct_per_c) : nullptr;
  j["bench_profile"] = text_or_null(args.bench_path);
  if (o.bench) j["bench"] = bench_profile_json(*o.bench);
  return j;
}

void add_pair_options(CLI::App& command, PairArgs& args) {
  const char* group = "Pairing units whose curves track each other";
  CLI::Option* pair =
      command
          .add_flag("--pair", args.enabled,
                    "Pair units (those that conform to the spec when one is given, else every "
                    "fitted unit): most pairs, then the smallest total tracking error")
          ->group(group);
  auto& o = args.options;
  command
      .add_option("--pair-range", args.range,
                  fmt::format("Working range of the circuit, LO:HI in lx (default {:g}:{:g})",
                              o.lux_lo, o.lux_hi))
      ->needs(pair)
      ->group(group);
  command
      .add_option("--pair-tolerance", o.tolerance_pct,
                  "Largest tracking error of a pair over the range, percent")
      ->capture_default_str()
      ->needs(pair)
      ->group(group);
  command
      .add_option("--pair-mode", args.mode,
                  "absolute: equal resistances; trimmable: a constant ratio is trimmed out, only "
                  "its drift over the range counts (default absolute)")
      ->check(CLI::IsMember({"absolute", "trimmable"}))
      ->needs(pair)
      ->group(group);
  command
      .add_option(
          "--pairs-csv", args.pairs_csv_path,
          "Write the pick list (pair number, the two ids, the error and its sd) as CSV here")
      ->needs(pair)
      ->group(group);
}

std::string PairArgs::apply() {
  if (!range.empty()) {
    const auto colon = range.find(':');
    auto number = [](std::string_view text) -> std::optional<double> {
      double v = 0;
      auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), v);
      if (ec != std::errc() || end != text.data() + text.size()) return std::nullopt;
      return v;
    };
    std::optional<double> lo, hi;
    if (colon != std::string::npos) {
      lo = number(std::string_view(range).substr(0, colon));
      hi = number(std::string_view(range).substr(colon + 1));
    }
    if (!lo || !hi || !(*lo > 0) || !(*hi > *lo))
      return "--pair-range: '" + range + "' is not LO:HI in lx with 0 < LO < HI (e.g. 1:1000)";
    options.lux_lo = *lo;
    options.lux_hi = *hi;
  }
  if (!mode.empty()) options.mode = *parse_tracking_mode(mode);  // checked by CLI11
  if (auto why = options.validate(); !why.empty()) return "pairing options: " + why;
  return {};
}

results::Json pair_options_json(const PairOptions& o) {
  results::Json j = results::Json::object();
  j["lux_lo"] = o.lux_lo;
  j["lux_hi"] = o.lux_hi;
  j["tolerance_pct"] = o.tolerance_pct;
  j["mode"] = std::string(to_string(o.mode));
  j["candidate_cap_per_unit"] = o.candidate_cap_per_unit;
  return j;
}

void add_report_options(CLI::App& command, ReportArgs& args) {
  const char* group = "Printed lot acceptance summary (PDF)";
  CLI::Option* report =
      command.add_option("--report", args.path, "Write the lot acceptance summary (PDF) here")
          ->group(group);
  command.add_option("--paper", args.paper, "Paper size: a4 or letter")
      ->check(CLI::IsMember({"a4", "letter"}))
      ->capture_default_str()
      ->needs(report)
      ->group(group);
  const char* blank = " (blank: a line to fill in by hand)";
  command.add_option("--part", args.part, std::string("Part number as ordered") + blank)
      ->needs(report)
      ->group(group);
  command.add_option("--lot-id", args.lot_id, std::string("Supplier's lot or date code") + blank)
      ->needs(report)
      ->group(group);
  command.add_option("--supplier", args.supplier, std::string("Supplier") + blank)
      ->needs(report)
      ->group(group);
  command.add_option("--inspector", args.inspector, std::string("Inspector") + blank)
      ->needs(report)
      ->group(group);
  command.add_option("--date", args.date, std::string("Date of inspection") + blank)
      ->needs(report)
      ->group(group);
}

}  // namespace photolot::cli
