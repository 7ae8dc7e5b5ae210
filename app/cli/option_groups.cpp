// Import and fit option groups of photolot-cli.
#include "option_groups.h"

#include <cmath>

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
      .add_option("--threads", o.threads, "Worker threads (0: all cores); results do not change")
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
