// The lot: what the bench logs hold once imported. Plain data owned by value; every step after
// import (fitting, statistics, acceptance, pairing) reads a Lot and never changes it.
//
// Units: illuminance in lux (lx), resistance in ohm, temperature in degrees Celsius.
#pragma once

#include <cmath>
#include <cstdint>
#include <limits>
#include <string>
#include <string_view>
#include <vector>

namespace photolot {

inline constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// What a reading says about the resistance.
enum class ReadingKind : std::uint8_t {
  normal,    // a resistance read under light (lux > 0)
  dark,      // a reading at 0 lx: kept apart from the curve, judged against the dark limit
  censored,  // over the meter's range: the resistance is above `ohm` (NaN when the bound is unknown)
};
std::string_view to_string(ReadingKind kind);

// Where a row came from: index into Lot::source_files and the 1-based line number.
struct SourceRef {
  std::uint32_t file_index = 0;
  std::uint32_t line = 0;
};

struct Reading {
  double lux = 0;        // illuminance, lx; 0 for a dark reading
  double ohm = kNaN;     // resistance, ohm; for a censored reading the lower bound (or NaN)
  double temp_c = kNaN;  // temperature at the reading, degC; NaN when not logged
  ReadingKind kind = ReadingKind::normal;
  SourceRef source;
};

struct Unit {
  std::string id;
  std::vector<Reading> readings;  // in file order; a unit in several files is merged here
};

enum class Severity : std::uint8_t { note, warning, error };
std::string_view to_string(Severity severity);

// A message about the input, pinned to a place in it. line and column are 1-based; 0 means
// "the whole file" (or "the whole line" for column).
struct Diagnostic {
  std::string file;
  std::uint32_t line = 0;
  std::uint32_t column = 0;
  Severity severity = Severity::warning;
  std::string message;
};

// Counts over all files of the lot, for the summary line and the JSON.
struct ImportCounts {
  std::size_t rows_read = 0;        // data rows seen (not blank, not comments, not headers)
  std::size_t rows_used = 0;        // rows that became readings
  std::size_t rows_skipped = 0;     // rows with a diagnostic that were not used
  std::size_t duplicates_dropped = 0;  // exact repeats of a row already read
  std::size_t conflicts = 0;        // same unit and illuminance with a different resistance
  std::size_t censored = 0;
  std::size_t dark = 0;
};

struct Lot {
  std::string name;                       // a label for reports; defaults to the first file's stem
  std::vector<std::string> source_files;  // as given by the user
  std::vector<Unit> units;                // in order of first appearance
  std::vector<Diagnostic> diagnostics;
  ImportCounts counts;
};

}  // namespace photolot
