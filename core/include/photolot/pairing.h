// Pairing: matched pairs of units whose curves track each other over a working range of
// illuminance, found exactly (maximum number of pairs, then the smallest total error) with a
// checked optimality certificate. The method and its proofs are in docs/pairing.md.
//
// For units a and b and d(E) = ln(R_a(E) / R_b(E)) over [lux_lo, lux_hi]:
//   absolute error  = 100 * (exp(max |d(E)|) - 1)          percent (equal resistances needed)
//   trimmable error = 100 * (exp(max d(E) - min d(E)) - 1)  percent (a constant ratio trims out)
// For two power laws d is linear in ln E, so both extremes lie at the range ends; other models
// are evaluated on a log-spaced grid that includes both ends.
#pragma once

#include <cstddef>
#include <cstdint>
#include <nlohmann/json_fwd.hpp>
#include <optional>
#include <stop_token>
#include <string>
#include <string_view>
#include <vector>

#include "photolot/curve.h"
#include "photolot/fit_result.h"
#include "photolot/progress.h"

namespace photolot {

enum class TrackingMode : std::uint8_t {
  absolute,   // the resistances must be equal
  trimmable,  // a constant ratio is trimmed out; only its drift over the range counts
};
std::string_view to_string(TrackingMode mode);  // "absolute", "trimmable"
std::optional<TrackingMode> parse_tracking_mode(std::string_view text);

struct PairOptions {
  double lux_lo = 1.0;  // working range of the circuit, lx
  double lux_hi = 1000.0;
  double tolerance_pct = 2.0;  // a pair qualifies when its tracking error is at most this
  TrackingMode mode = TrackingMode::absolute;
  // The matching runs on each unit's nearest candidates (0: every pair within tolerance); the
  // result is then checked against every pair within tolerance and repaired where needed.
  int candidate_cap_per_unit = 16;
  int grid_points_per_decade = 40;  // for curves other than the power law
  int max_repair_rounds = 25;       // solve-check rounds before giving up on the proof
  // The matching sees the units in Z-order over the plane (for memory locality) rather than
  // in lot order; the result is exact either way.
  bool spatial_order = true;
  // A repair round lets the matching run on from its last state (blossoms and dual kept) with
  // the new edges, instead of solving the component again from scratch; the check after it
  // is the same, and a repair that cannot go on falls back to the solve from scratch.
  bool warm_repair = true;
  // With a cap, each round first checks the pairs near each unit only (a few times as far as
  // its farthest candidate), where the pairs the cap missed lie, and checks every pair within
  // tolerance (the proof) only when that finds nothing; the result is the same either way.
  bool near_check = true;
  // Worker threads for the candidate search and the certificate check (0: one per core); the
  // matching itself runs on one. The result is the same on any number.
  int threads = 0;

  // Empty when valid; otherwise names the field, its value and the rule.
  std::string validate() const;
};

// The tracking error of two curves under the options' range and mode.
struct TrackingError {
  double error_pct = kNaN;
  double sigma_pct = kNaN;  // delta-method standard deviation; NaN when a covariance is unknown
  double worst_lux = kNaN;  // where |d| peaks (absolute) or where d peaks (trimmable)
  double other_lux = kNaN;  // trimmable: where d is lowest; absolute: NaN
};
TrackingError tracking_error(const Curve& a, const Curve& b, const PairOptions& options);

struct UnitPair {
  std::size_t a = 0, b = 0;  // indices into LotFit::units, a < b
  std::string a_id, b_id;
  double tracking_error_pct = kNaN;
  double tracking_error_sigma_pct = kNaN;
  double worst_lux = kNaN;
};

struct UnpairedUnit {
  std::size_t index = 0;  // into LotFit::units
  std::string id;
  std::string reason;                  // one line, e.g. "no unit within tolerance"
  std::optional<std::size_t> nearest;  // the closest eligible unit, when one was found
  std::string nearest_id;
  double nearest_error_pct = kNaN;
};

enum class ProofStatus : std::uint8_t { proved_optimal, not_proved };
std::string_view to_string(ProofStatus status);  // "proved optimal", "not proved"

struct PairingCounts {
  std::size_t eligible = 0;  // indices given
  std::size_t fitted = 0;    // of those, with a fitted curve
  std::size_t pairs = 0;
  std::size_t unpaired = 0;
  std::size_t tolerance_edges = 0;    // pairs within tolerance (the whole candidate graph)
  std::size_t matched_edges = 0;      // edges the matching ran on (after the cap and repairs)
  std::size_t components = 0;         // connected components of that graph with an edge
  std::size_t largest_component = 0;  // units in the largest
  std::size_t rounds = 0;             // solve-and-check rounds
  std::size_t repaired_edges = 0;     // edges added because the check found them improving
  std::size_t warm_rounds = 0;        // repair rounds run on from the last state
  std::size_t near_checks = 0;        // rounds checked first near each unit only
  std::size_t full_checks = 0;        // passes over every pair within tolerance
  std::size_t warm_fallbacks = 0;     // warm repairs that could not go on (solved from scratch)
};

struct Pairing {
  PairOptions options;
  std::vector<UnitPair> pairs;         // sorted by tracking error, then ids
  std::vector<UnpairedUnit> unpaired;  // in index order
  ProofStatus proof = ProofStatus::not_proved;
  std::string proof_detail;    // why it is proved, or why not
  double total_error_pct = 0;  // sum of the pairs' errors
  // The total is within this of the smallest total among maximum-size pairings (integer
  // weights in the matching; docs/pairing.md).
  double total_error_rounding_bound_pct = 0;
  PairingCounts counts;
  bool cancelled = false;  // stopped by the stop token: pairs are empty
};

// Pairs the fitted units among `eligible` (indices into fit.units; units that are not fitted
// are listed as unpaired). Options must be valid (assert).
Pairing pair_units(const LotFit& fit, const std::vector<std::size_t>& eligible,
                   const PairOptions& options = {}, const ProgressFn& progress = {},
                   std::stop_token stop = {});
// Every fitted unit of the lot takes part.
Pairing pair_units(const LotFit& fit, const PairOptions& options = {},
                   const ProgressFn& progress = {}, std::stop_token stop = {});

// The results-document section: {"pairing": {mode, range, tolerance_pct, proof, ...},
// "pairs": [{a, b, tracking_error_pct, tracking_error_sigma_pct, ...}], "unpaired": [{id,
// reason, ...}]}.
nlohmann::json pairing_json(const Pairing& pairing);

// The pick list for the bench: pair number, the two ids, the error. Text cells that a
// spreadsheet would read as a formula are neutralised (OWASP CSV injection guidance).
std::string pick_list_csv(const Pairing& pairing);
// Writes it through a temporary file beside `path` and a rename. Empty when written;
// otherwise a message naming the file and what went wrong.
std::string write_pick_list_csv(const Pairing& pairing, const std::string& path);

}  // namespace photolot
