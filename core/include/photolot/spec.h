// The purchase spec a lot is judged against: limits on R10, gamma, dark resistance and fit
// quality, the test conditions, and the inspection (ISO 2859-1 sampling or 100 %). Read from a
// TOML file whose layout is documented in docs/spec-format.md (example:
// sample-data/demo-spec.toml). A spec that did not load is never used: load_spec returns either
// a Spec or a list of errors pinned to file, line and column.
//
// Units: resistance in ohm, illuminance in lux, time in seconds, temperature in degC.
#pragma once

#include <cmath>
#include <cstdint>
#include <nlohmann/json_fwd.hpp>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "photolot/lot.h"

namespace photolot {

// General inspection levels of ISO 2859-1 (Table I). Written "I", "II", "III".
enum class InspectionLevel : std::uint8_t { level_i, level_ii, level_iii };
std::string_view to_string(InspectionLevel level);  // "I", "II", "III"
std::optional<InspectionLevel> parse_inspection_level(std::string_view text);

// Sampling by ISO 2859-1 single sampling plans, or every unit of the lot (sorting).
enum class InspectionMode : std::uint8_t { sampling, full };
std::string_view to_string(InspectionMode mode);  // "sampling", "100%"

// A two-sided window; either side may be open (NaN).
struct Limits {
  double min = kNaN;
  double max = kNaN;
  bool has_min() const { return !std::isnan(min); }
  bool has_max() const { return !std::isnan(max); }
  bool any() const { return has_min() || has_max(); }
};

struct TestConditions {
  double reference_lux = 10.0;  // where R10 is read, lx
  double dark_dwell_s = 10.0;   // dark reading taken this long after the light is removed, s
  double temp_c = 25.0;         // bench temperature the limits apply at, degC
};

struct Inspection {
  InspectionMode mode = InspectionMode::sampling;
  InspectionLevel level = InspectionLevel::level_ii;
  double aql_pct = 1.0;                 // acceptance quality limit, percent nonconforming
  std::optional<std::size_t> lot_size;  // units in the lot, when known
};

struct Spec {
  std::string part_number;
  std::string description;

  Limits r10_ohm;                      // resistance at the reference illuminance, ohm
  Limits gamma;                        // the fitted exponent
  double dark_min_ohm = kNaN;          // minimum dark resistance, ohm (NaN: no limit)
  double max_rms_log_residual = kNaN;  // maximum RMS of ln residuals of a unit's fit

  TestConditions conditions;
  Inspection inspection;

  // Two-sided normal tolerance intervals for the lot statistics.
  double tolerance_coverage = 0.99;
  double tolerance_confidence = 0.95;

  // A temperature coefficient to apply at the reference illuminance (%/degC), NaN when none.
  double temp_coeff_pct_per_c = kNaN;

  std::string source_file;  // where it was read from ("" when built in code)

  // Empty when valid; otherwise names the field, its value and the rule broken (first problem).
  std::string validate() const;
};

// A problem with a spec file; line and column are 1-based, 0 when unknown.
struct SpecError {
  std::string file;
  std::uint32_t line = 0;
  std::uint32_t column = 0;
  std::string message;
};
std::string to_string(const SpecError& error);  // "file:line:column: message"

struct SpecLoadResult {
  std::optional<Spec> spec;  // set only when errors is empty
  std::vector<SpecError> errors;
  bool ok() const { return spec.has_value() && errors.empty(); }
};

// Reads a spec file. Every problem found is reported, not only the first.
SpecLoadResult load_spec(const std::string& path);
// The same from memory; `name` stands in for the path in errors.
SpecLoadResult parse_spec(std::string_view content, std::string_view name = "spec");

// The spec as a JSON object (the results document's `spec` section).
nlohmann::json spec_json(const Spec& spec);

}  // namespace photolot
