// The bench profile: how accurate the bench's meters are. It weights each reading in the
// extended fits (fitting/models.h) and so widens or narrows the reported intervals.
//
// A resistance meter states its accuracy per range as "percent of reading plus digits": on a
// range with resolution q (ohm per least significant digit) a reading R is good to
//   u_R / R = pct / 100 + digits * q / R
// The lux meter states percent of reading. Through the curve's local slope gamma an error in E
// becomes an error in ln R, so the standard uncertainty of ln R at a reading is (effective
// variance)
//   sigma^2 = (pct_R / 100 + digits * q / R)^2 + (gamma * pct_E / 100)^2
// Both percentages are taken as standard uncertainties (one sigma).
//
// File format (TOML, our own; the spec file may embed the same keys as a [bench] table):
//
//   # bench profile
//   lux_pct = 3.0                 # lux meter, percent of reading
//   [[ohm_range]]                 # one table per range, in any order
//   max_ohm = 2e3                 # the range's full scale, ohm
//   pct = 0.5                     # percent of reading
//   digits = 2                    # plus this many counts ...
//   resolution_ohm = 0.1          # ... of this size, ohm
//
// The meter autoranges: a reading uses the smallest range whose max_ohm is at least R.
#pragma once

#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "photolot/import.h"  // FileError

namespace photolot {

struct MeterRange {
  double max_ohm = 0;         // full scale of the range, ohm
  double pct = 0;             // percent of reading
  double digits = 0;          // counts of the least significant digit
  double resolution_ohm = 0;  // size of one count, ohm
};

struct BenchProfile {
  std::vector<MeterRange> ohm_ranges;  // sorted by max_ohm when loaded or validated
  double lux_pct = 0;                  // lux meter, percent of reading

  // Empty when valid; otherwise names the field, its value and the rule.
  std::string validate() const;

  // The range a reading of `ohm` uses: the smallest with max_ohm >= ohm, else the largest.
  // nullptr when there are no ranges.
  const MeterRange* range_for(double ohm) const;
  // Relative standard uncertainty of a resistance reading: pct/100 + digits*q/R (0 with no
  // ranges).
  double ohm_relative_sd(double ohm) const;
  // Standard uncertainty of ln R at a reading under light with local slope gamma (formula above).
  double ln_ohm_sd(double ohm, double gamma) const;
};

struct BenchProfileResult {
  std::optional<BenchProfile> profile;
  std::optional<FileError> error;  // file, line, column, message when it could not be used
  bool ok() const { return profile.has_value(); }
};

// Parses a bench profile from TOML text; `name` stands in for the path in errors.
BenchProfileResult parse_bench_profile(std::string_view name, std::string_view toml_text);
// Reads and parses a bench profile file.
BenchProfileResult load_bench_profile(const std::string& path);

// The profile as the results document (inputs.options.model.bench) and the saved workspace
// record it: {"lux_pct": 3, "ohm_ranges": [{"max_ohm", "pct", "digits", "resolution_ohm"}]}.
nlohmann::ordered_json bench_profile_json(const BenchProfile& profile);
// Reads that object back and validates it. Empty when `profile` was set; otherwise what is
// wrong, naming the field inside the object ("lux_pct must be a number").
std::string bench_profile_from_json(const nlohmann::ordered_json& j, BenchProfile& profile);

}  // namespace photolot
