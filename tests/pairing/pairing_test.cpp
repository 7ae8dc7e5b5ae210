// The pairing against brute force, planted answers and the definitions of the two measures.
#include "photolot/pairing.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <functional>
#include <random>
#include <set>
#include <string>
#include <vector>

#include "pairing_support.h"
#include "test_seams.h"

using photolot::LotFit;
using photolot::Pairing;
using photolot::PairOptions;
using photolot::ProofStatus;
using photolot::TrackingMode;
using photolot::test::dense_error_pct;
using photolot::test::unit_from;
using photolot::test::unit_through;

namespace {

const double kLnR = std::log(100e3);    // a plane origin: 100 kOhm at 1 lx ...
const double kLnRHi = std::log(500.0);  // ... and 500 ohm at 1000 lx (gamma about 0.77)

// The best pairing by enumerating every matching of the graph of pairs within tolerance:
// largest number of pairs, then smallest total error. Errors from the definition (range ends
// for power laws, where d(E) is linear in ln E).
struct Best {
  int pairs = 0;
  double total = 0;
  std::size_t within = 0;  // pairs within tolerance (brute_force only)
};
// Exhaustive search over matchings of the graph with err[i][j] >= 0 for pairs within tolerance.
Best best_matching(const std::vector<std::vector<double>>& err) {
  const int n = int(err.size());
  Best best;
  std::vector<char> used(n, 0);
  std::function<void(int, int, double)> go = [&](int from, int pairs, double total) {
    int v = from;
    while (v < n && used[v]) ++v;
    if (v >= n) {
      if (pairs > best.pairs || (pairs == best.pairs && total < best.total)) best = {pairs, total};
      return;
    }
    used[v] = 1;
    go(v + 1, pairs, total);  // v stays single
    for (int w = v + 1; w < n; ++w)
      if (!used[w] && err[v][w] >= 0) {
        used[w] = 1;
        go(v + 1, pairs + 1, total + err[v][w]);
        used[w] = 0;
      }
    used[v] = 0;
  };
  go(0, 0, 0.0);
  return best;
}

Best brute_force(const LotFit& fit, const PairOptions& o) {
  const int n = int(fit.units.size());
  std::vector<std::vector<double>> err(n, std::vector<double>(n, -1));
  for (int i = 0; i < n; ++i)
    for (int j = i + 1; j < n; ++j) {
      const auto& a = fit.units[i].curve;
      const auto& b = fit.units[j].curve;
      const double dlo = a.ln_ohm(o.lux_lo) - b.ln_ohm(o.lux_lo);
      const double dhi = a.ln_ohm(o.lux_hi) - b.ln_ohm(o.lux_hi);
      const double ln_e = o.mode == TrackingMode::absolute ? std::max(std::abs(dlo), std::abs(dhi))
                                                           : std::abs(dhi - dlo);
      const double pct = 100 * std::expm1(ln_e);
      if (pct <= o.tolerance_pct) err[i][j] = err[j][i] = pct;
    }
  Best best = best_matching(err);
  for (int i = 0; i < n; ++i)
    for (int j = i + 1; j < n; ++j) best.within += err[i][j] >= 0;
  return best;
}

LotFit random_plane_lot(std::mt19937_64& rng, int n, double side_ln) {
  std::uniform_real_distribution<double> u(0, side_ln);
  LotFit fit;
  for (int i = 0; i < n; ++i)
    fit.units.push_back(unit_through("U" + std::to_string(i), kLnR + u(rng), kLnRHi + u(rng)));
  return fit;
}

bool is_matching(const Pairing& p, std::size_t n) {
  std::set<std::size_t> seen;
  for (const auto& pr : p.pairs)
    if (!seen.insert(pr.a).second || !seen.insert(pr.b).second) return false;
  for (const auto& u : p.unpaired)
    if (!seen.insert(u.index).second) return false;
  return seen.size() == n;
}

// The pairing of `fit` under `o` against exhaustive enumeration of all matchings (the
// definition of the objective): a matching of the lot, as many pairs, the same total within
// rounding, proved optimal, every pair within tolerance.
void expect_brute_force_result(const Pairing& p, const LotFit& fit, const PairOptions& o,
                               int seed) {
  const std::size_t n = fit.units.size();
  const Best best = brute_force(fit, o);
  ASSERT_TRUE(is_matching(p, n));
  EXPECT_EQ(int(p.pairs.size()), best.pairs) << "seed " << seed << " n " << n;
  EXPECT_NEAR(p.total_error_pct, best.total, p.total_error_rounding_bound_pct + 1e-9)
      << "seed " << seed << " n " << n;
  EXPECT_EQ(p.proof, ProofStatus::proved_optimal) << p.proof_detail;
  EXPECT_EQ(p.counts.tolerance_edges, best.within) << "seed " << seed << " n " << n;
  for (const auto& pr : p.pairs) EXPECT_LE(pr.tracking_error_pct, o.tolerance_pct);
}

}  // namespace

TEST(Pairing, MatchesBruteForceOnSmallLotsInBothModes) {
  // Reference: exhaustive enumeration of all matchings (the definition of the objective).
  std::mt19937_64 rng(20261201);
  for (int seed = 0; seed < 150; ++seed) {
    const int n = 2 + seed % 11;  // 2 ... 12 units
    const LotFit fit = random_plane_lot(rng, n, 0.06);
    for (TrackingMode mode : {TrackingMode::absolute, TrackingMode::trimmable}) {
      PairOptions o;
      o.mode = mode;
      o.tolerance_pct = 2.0;
      const Pairing p = photolot::pair_units(fit, o);
      expect_brute_force_result(p, fit, o, seed);
    }
  }
}

TEST(Pairing, RepairsACandidateCapThatMissesImprovingPairs) {
  // With one candidate per unit the capped graph often lacks the pairs the optimum needs; the
  // dual check must find them, so the result still equals brute force (exhaustive reference).
  std::mt19937_64 rng(77);
  std::size_t repaired = 0;
  for (int seed = 0; seed < 120; ++seed) {
    const int n = 4 + seed % 9;
    const LotFit fit = random_plane_lot(rng, n, 0.05);
    PairOptions o;
    o.candidate_cap_per_unit = 1;
    const Pairing p = photolot::pair_units(fit, o);
    const Best best = brute_force(fit, o);
    EXPECT_EQ(int(p.pairs.size()), best.pairs) << "seed " << seed;
    EXPECT_NEAR(p.total_error_pct, best.total, p.total_error_rounding_bound_pct + 1e-9);
    EXPECT_EQ(p.proof, ProofStatus::proved_optimal) << p.proof_detail;
    repaired += p.counts.repaired_edges;
  }
  EXPECT_GT(repaired, 0u) << "no lot exercised the repair";
}

TEST(Pairing, WarmRepairRoundsMatchBruteForceAndTheColdRepair) {
  // One or two candidates per unit, so that the warm repair (the matching run on from its
  // last state) runs in most lots, often several rounds; reference: exhaustive enumeration
  // of all matchings, and the same lot with every round solved from scratch.
  std::mt19937_64 rng(424242);
  std::size_t warm_rounds = 0, several = 0;
  for (int seed = 0; seed < 200; ++seed) {
    const int n = 4 + seed % 9;  // 4 ... 12 units
    const LotFit fit = random_plane_lot(rng, n, seed % 2 ? 0.04 : 0.07);
    for (TrackingMode mode : {TrackingMode::absolute, TrackingMode::trimmable}) {
      PairOptions o;
      o.mode = mode;
      o.tolerance_pct = 2.0;
      o.candidate_cap_per_unit = 1 + seed % 2;
      const Pairing p = photolot::pair_units(fit, o);
      PairOptions cold = o;
      cold.warm_repair = false;
      const Pairing q = photolot::pair_units(fit, cold);
      expect_brute_force_result(p, fit, o, seed);
      EXPECT_EQ(p.pairs.size(), q.pairs.size()) << "seed " << seed;
      EXPECT_NEAR(p.total_error_pct, q.total_error_pct, 2 * p.total_error_rounding_bound_pct);
      EXPECT_EQ(q.counts.warm_rounds, 0u);
      EXPECT_EQ(p.counts.warm_fallbacks, 0u) << "seed " << seed;
      warm_rounds += p.counts.warm_rounds;
      several += p.counts.warm_rounds >= 2;
    }
  }
  EXPECT_GT(warm_rounds, 50u) << "too few lots exercised the warm repair";
  EXPECT_GT(several, 0u) << "no lot needed two warm repair rounds";
}

TEST(Pairing, WarmRepairOnLargerLotsAgreesWithTheColdRepair) {
  // 200-600 units with one or two candidates each: many blossoms, many violated pairs per
  // round. Reference: the same lot with every round solved from scratch by LEMON's own
  // matching (both must be proved by the certificate; pairs equal, totals within rounding).
  std::mt19937_64 rng(9001);
  std::size_t warm_rounds = 0;
  for (int seed = 0; seed < 12; ++seed) {
    const int n = 200 + 40 * seed;
    const LotFit fit = random_plane_lot(rng, n, 0.2);
    PairOptions o;
    o.mode = seed % 3 == 2 ? TrackingMode::trimmable : TrackingMode::absolute;
    o.tolerance_pct = o.mode == TrackingMode::absolute ? 2.0 : 0.5;
    o.candidate_cap_per_unit = 1 + seed % 2;
    const Pairing p = photolot::pair_units(fit, o);
    PairOptions cold = o;
    cold.warm_repair = false;
    const Pairing q = photolot::pair_units(fit, cold);
    ASSERT_TRUE(is_matching(p, fit.units.size()));
    EXPECT_EQ(p.proof, ProofStatus::proved_optimal) << p.proof_detail;
    EXPECT_EQ(q.proof, ProofStatus::proved_optimal) << q.proof_detail;
    EXPECT_EQ(p.pairs.size(), q.pairs.size()) << "seed " << seed;
    EXPECT_NEAR(p.total_error_pct, q.total_error_pct, 2 * p.total_error_rounding_bound_pct + 1e-9)
        << "seed " << seed;
    EXPECT_EQ(p.counts.warm_fallbacks, 0u) << "seed " << seed;
    warm_rounds += p.counts.warm_rounds;
  }
  EXPECT_GT(warm_rounds, 6u) << "too few lots exercised the warm repair";
}

TEST(Pairing, GivesTheSameResultOnAnyNumberOfThreads) {
  // The candidate search and the certificate check share their passes among threads; every
  // other test here runs them on one per core, against brute force, networkx and the cold
  // repair. Here the same lot on 1, 2, 3 and 5 threads must give the same result to the last
  // bit: pairs, errors, reasons, counts and the proof's wording. One candidate per unit makes
  // many violated pairs, so the check's findings from several ranges are merged each round.
  std::mt19937_64 rng(4242);
  for (int seed = 0; seed < 4; ++seed) {
    const int n = 500 + 500 * seed;
    const LotFit fit = random_plane_lot(rng, n, 0.3);
    PairOptions o;
    o.mode = seed % 2 ? TrackingMode::trimmable : TrackingMode::absolute;
    o.tolerance_pct = o.mode == TrackingMode::absolute ? 2.0 : 0.5;
    o.candidate_cap_per_unit = 1;
    o.threads = 1;
    const Pairing one = photolot::pair_units(fit, o);
    ASSERT_EQ(one.proof, ProofStatus::proved_optimal) << one.proof_detail;
    EXPECT_GT(one.counts.repaired_edges, 0u) << "seed " << seed << ": no repair to merge";
    for (int threads : {2, 3, 5}) {
      o.threads = threads;
      const Pairing p = photolot::pair_units(fit, o);
      SCOPED_TRACE("seed " + std::to_string(seed) + ", " + std::to_string(threads) + " threads");
      ASSERT_EQ(p.pairs.size(), one.pairs.size());
      for (std::size_t k = 0; k < p.pairs.size(); ++k) {
        EXPECT_EQ(p.pairs[k].a, one.pairs[k].a);
        EXPECT_EQ(p.pairs[k].b, one.pairs[k].b);
        EXPECT_EQ(p.pairs[k].tracking_error_pct, one.pairs[k].tracking_error_pct);
      }
      ASSERT_EQ(p.unpaired.size(), one.unpaired.size());
      for (std::size_t k = 0; k < p.unpaired.size(); ++k) {
        EXPECT_EQ(p.unpaired[k].index, one.unpaired[k].index);
        EXPECT_EQ(p.unpaired[k].reason, one.unpaired[k].reason);
      }
      EXPECT_EQ(p.total_error_pct, one.total_error_pct);
      EXPECT_EQ(p.counts.tolerance_edges, one.counts.tolerance_edges);
      EXPECT_EQ(p.counts.repaired_edges, one.counts.repaired_edges);
      EXPECT_EQ(p.counts.rounds, one.counts.rounds);
      EXPECT_EQ(p.counts.matched_edges, one.counts.matched_edges);
      EXPECT_EQ(p.proof_detail, one.proof_detail);
    }
  }
}

TEST(Pairing, TheNearCheckChangesTheWorkNotTheResult) {
  // With a cap, a round first checks the pairs near each unit only, and the full check (the
  // proof) runs when that finds nothing. Against the same lots with every round checked in
  // full: both proved, the same number of pairs and the same total to rounding. Across the
  // lots, the near check must both save full checks and, at least once, leave to the full
  // check a violated pair beyond its reach (then one more round), so that both paths run.
  std::mt19937_64 rng(777);
  std::size_t saved = 0, caught_by_full = 0;
  for (int seed = 0; seed < 16; ++seed) {
    const int n = 150 + 50 * seed;
    const LotFit fit = random_plane_lot(rng, n, 0.2);
    PairOptions o;
    o.mode = seed % 4 == 3 ? TrackingMode::trimmable : TrackingMode::absolute;
    o.tolerance_pct = o.mode == TrackingMode::absolute ? 2.0 : 0.5;
    o.candidate_cap_per_unit = 1 + seed % 3;
    o.warm_repair = seed % 5 != 4;
    const Pairing near = photolot::pair_units(fit, o);
    PairOptions full = o;
    full.near_check = false;
    const Pairing every = photolot::pair_units(fit, full);
    SCOPED_TRACE("seed " + std::to_string(seed));
    ASSERT_TRUE(is_matching(near, fit.units.size()));
    EXPECT_EQ(near.proof, ProofStatus::proved_optimal) << near.proof_detail;
    EXPECT_EQ(every.proof, ProofStatus::proved_optimal) << every.proof_detail;
    EXPECT_EQ(near.pairs.size(), every.pairs.size());
    EXPECT_NEAR(near.total_error_pct, every.total_error_pct,
                2 * near.total_error_rounding_bound_pct + 1e-9);
    EXPECT_EQ(near.counts.tolerance_edges, every.counts.tolerance_edges);
    EXPECT_EQ(every.counts.near_checks, 0u);
    EXPECT_EQ(every.counts.full_checks, every.counts.rounds);
    EXPECT_EQ(near.counts.near_checks, near.counts.rounds);
    EXPECT_GE(near.counts.full_checks, 1u);
    saved += near.counts.full_checks < every.counts.full_checks;
    caught_by_full += near.counts.full_checks > 1;
  }
  EXPECT_GT(saved, 0u) << "no lot saved a full check";
  EXPECT_GT(caught_by_full, 0u) << "no lot had a violated pair beyond the near check's reach";
}

TEST(Pairing, AWarmRepairThatGivesUpFallsBackToSolvingFromScratch) {
  // The fallback path (a warm repair that finds the matching's state other than expected):
  // a test seam makes the first or second warm repair give up half way, after it has
  // already changed the matching's state. The result must still be proved optimal and agree
  // with exhaustive enumeration (small lots) and with the cold repair (larger lots).
  std::mt19937_64 rng(77);
  std::size_t fallbacks = 0;
  for (int seed = 0; seed < 60; ++seed) {
    const int n = seed < 40 ? 6 + seed % 7 : 200 + 10 * (seed - 40);
    const LotFit fit = random_plane_lot(rng, n, seed < 40 ? 0.07 : 0.2);
    PairOptions o;
    o.mode = seed % 2 ? TrackingMode::trimmable : TrackingMode::absolute;
    o.tolerance_pct = o.mode == TrackingMode::absolute ? 2.0 : (seed < 40 ? 2.0 : 0.5);
    o.candidate_cap_per_unit = 1;
    PairOptions cold = o;
    cold.warm_repair = false;
    const Pairing q = photolot::pair_units(fit, cold);
    photolot::detail::fail_warm_repairs_for_tests = 1 + seed % 2;
    const Pairing p = photolot::pair_units(fit, o);
    const int left = photolot::detail::fail_warm_repairs_for_tests.exchange(0);
    if (q.counts.rounds < 2) continue;  // nothing to repair: the seam never fired
    ASSERT_TRUE(is_matching(p, fit.units.size()));
    EXPECT_EQ(p.proof, ProofStatus::proved_optimal) << p.proof_detail << " seed " << seed;
    EXPECT_EQ(p.pairs.size(), q.pairs.size()) << "seed " << seed;
    EXPECT_NEAR(p.total_error_pct, q.total_error_pct, 2 * p.total_error_rounding_bound_pct + 1e-9)
        << "seed " << seed;
    if (seed < 40) expect_brute_force_result(p, fit, o, seed);
    if (p.counts.warm_fallbacks > 0) {
      EXPECT_EQ(p.counts.warm_fallbacks, 1u) << "seed " << seed;
      EXPECT_LT(left, 1 + seed % 2) << "a fallback without the seam firing, seed " << seed;
      ++fallbacks;
    }
  }
  EXPECT_GT(fallbacks, 10u) << "too few lots reached the fallback";
}

TEST(Pairing, HandBuiltStarIsRepairedIntoTwoPairs) {
  // Plane offsets in units of 0.01 (ln): A (0, 0), B (0.1, 0.1), C (-0.5, 0), D (0.05, -0.52).
  // Nearest candidates: A-B for A and B, A for C (0.50) and for D (0.52), so with one candidate
  // per unit the graph is a star on A plus B: one pair at most. Within a 0.65 tolerance C-D
  // (0.55) exists, and A-B + C-D (0.10 + 0.55) is the optimum of two pairs (by hand).
  auto at = [](const std::string& id, double dx, double dy) {
    return unit_through(id, kLnR + 0.01 * dx, kLnRHi + 0.01 * dy);
  };
  LotFit fit;
  fit.units = {at("A", 0, 0), at("B", 0.1, 0.1), at("C", -0.5, 0), at("D", 0.05, -0.52)};
  PairOptions o;
  o.tolerance_pct = 100 * std::expm1(0.0065);
  o.candidate_cap_per_unit = 1;
  const Pairing p = photolot::pair_units(fit, o);
  ASSERT_EQ(p.pairs.size(), 2u);
  EXPECT_GT(p.counts.repaired_edges, 0u);
  EXPECT_EQ(p.proof, ProofStatus::proved_optimal);
  std::set<std::pair<std::string, std::string>> got;
  for (const auto& pr : p.pairs) got.insert({pr.a_id, pr.b_id});
  EXPECT_EQ(got, (std::set<std::pair<std::string, std::string>>{{"A", "B"}, {"C", "D"}}));
  EXPECT_NEAR(p.total_error_pct, 100 * std::expm1(0.001) + 100 * std::expm1(0.0055), 1e-6);
}

TEST(Pairing, PairsShuffledPlantedTwinsBackTogether) {
  // A lot of 300 twins (a second unit within 0.05 % of the first) spread like a real batch
  // (R10 spread 15 % in ln, gamma 0.03): the twins are the unique best pairing.
  std::mt19937_64 rng(5);
  std::normal_distribution<double> ln_r10(std::log(20e3), 0.15), gamma(0.75, 0.03);
  std::uniform_real_distribution<double> wiggle(-2.5e-4, 2.5e-4);
  LotFit fit;
  for (int t = 0; t < 300; ++t) {
    const double r = ln_r10(rng), g = gamma(rng);
    for (int k = 0; k < 2; ++k)
      fit.units.push_back(
          unit_from("T" + std::to_string(t) + (k ? "b" : "a"),
                    photolot::make_power_law(std::exp(r + wiggle(rng)), g + wiggle(rng) / 10)));
  }
  std::shuffle(fit.units.begin(), fit.units.end(), rng);
  const Pairing p = photolot::pair_units(fit, PairOptions{});
  ASSERT_EQ(p.pairs.size(), 300u);
  EXPECT_TRUE(p.unpaired.empty());
  EXPECT_EQ(p.proof, ProofStatus::proved_optimal) << p.proof_detail;
  for (const auto& pr : p.pairs) {
    EXPECT_EQ(pr.a_id.substr(0, pr.a_id.size() - 1), pr.b_id.substr(0, pr.b_id.size() - 1))
        << pr.a_id << " with " << pr.b_id;
  }
}

TEST(TrackingError, AbsoluteErrorOfPowerLawsIsTheChebyshevDistanceOfTheEndPoints) {
  // Reference: max |d(E)| evaluated on 20001 points over the range (the definition).
  std::mt19937_64 rng(11);
  std::normal_distribution<double> ln_r10(std::log(20e3), 0.2), gamma(0.75, 0.05);
  for (int k = 0; k < 200; ++k) {
    const auto a = photolot::make_power_law(std::exp(ln_r10(rng)), gamma(rng));
    const auto b = photolot::make_power_law(std::exp(ln_r10(rng)), gamma(rng));
    for (TrackingMode mode : {TrackingMode::absolute, TrackingMode::trimmable}) {
      PairOptions o;
      o.mode = mode;
      const double ours = photolot::tracking_error(a, b, o).error_pct;
      const double dense = dense_error_pct(a, b, mode == TrackingMode::trimmable);
      EXPECT_NEAR(ours, dense, 1e-9 * std::max(1.0, dense));
    }
    // And the Chebyshev form itself.
    const double cheb =
        std::max(std::abs(a.ln_ohm(1) - b.ln_ohm(1)), std::abs(a.ln_ohm(1000) - b.ln_ohm(1000)));
    EXPECT_NEAR(photolot::tracking_error(a, b, PairOptions{}).error_pct, 100 * std::expm1(cheb),
                1e-9);
  }
}

TEST(TrackingError, DarkConductanceCurvesAreReadOnTheGrid) {
  // d(E) is not linear here: the extremes can lie inside the range. The 40-per-decade grid
  // must agree with a 20001-point evaluation of the definition to a small fraction.
  std::mt19937_64 rng(3);
  std::uniform_real_distribution<double> g(1e-8, 3e-6), lg(std::log(1 / 25e3), std::log(1 / 15e3));
  for (int k = 0; k < 50; ++k) {
    photolot::Curve a, b;
    a.model = b.model = photolot::ModelKind::dark_conductance;
    a.params = {lg(rng), 0.8, g(rng)};
    b.params = {lg(rng), 0.75, g(rng)};
    for (bool trim : {false, true}) {
      PairOptions o;
      o.mode = trim ? TrackingMode::trimmable : TrackingMode::absolute;
      const double ours = photolot::tracking_error(a, b, o).error_pct;
      const double dense = dense_error_pct(a, b, trim);
      EXPECT_LE(ours, dense * (1 + 1e-12));
      EXPECT_NEAR(ours, dense, 2e-3 * dense + 1e-9);
    }
  }
}

TEST(Pairing, MixedModelsAreMatchedOnTheGridAgainstBruteForceOfTheDefinition) {
  // Power laws and dark-conductance curves together; brute force over matchings with errors
  // from our tracking_error (checked above against the dense definition).
  std::mt19937_64 rng(8);
  std::uniform_real_distribution<double> lg(std::log(1 / 21e3), std::log(1 / 19e3)), gm(0.74, 0.76),
      gd(0, 2e-6);
  std::size_t warm_rounds = 0;
  for (int seed = 0; seed < 30; ++seed) {
    LotFit fit;
    const int n = 4 + seed % 7;
    for (int i = 0; i < n; ++i) {
      photolot::Curve c;
      c.model = photolot::ModelKind::dark_conductance;
      c.params = {lg(rng), gm(rng), i % 2 ? gd(rng) : 0.0};
      if (i % 3 == 0) c = photolot::make_power_law(std::exp(-c.params[0]), c.params[1]);
      fit.units.push_back(unit_from("M" + std::to_string(i), c));
    }
    PairOptions o;
    o.tolerance_pct = 4;
    // brute force with tracking_error
    std::vector<std::vector<double>> err(n, std::vector<double>(n, -1));
    for (int i = 0; i < n; ++i)
      for (int j = i + 1; j < n; ++j) {
        const double e =
            photolot::tracking_error(fit.units[i].curve, fit.units[j].curve, o).error_pct;
        if (e <= o.tolerance_pct) err[i][j] = err[j][i] = e;
      }
    const Best best = best_matching(err);
    // The default cap, and one candidate per unit so that the (warm) repair runs on the grid.
    for (int cap : {16, 1}) {
      o.candidate_cap_per_unit = cap;
      const Pairing p = photolot::pair_units(fit, o);
      EXPECT_EQ(int(p.pairs.size()), best.pairs) << "seed " << seed << " cap " << cap;
      EXPECT_NEAR(p.total_error_pct, best.total, p.total_error_rounding_bound_pct + 1e-9);
      EXPECT_EQ(p.proof, ProofStatus::proved_optimal);
      EXPECT_EQ(p.counts.warm_fallbacks, 0u);
      warm_rounds += p.counts.warm_rounds;
    }
  }
  EXPECT_GT(warm_rounds, 0u) << "no lot exercised the warm repair on grid curves";
}

TEST(Pairing, ReportsEveryUnitAsUnpairedWhenNoPairIsWithinTolerance) {
  // Units 5 % apart in ln R at both ends with a 2 % tolerance.
  LotFit fit;
  for (int i = 0; i < 5; ++i)
    fit.units.push_back(unit_through("F" + std::to_string(i), kLnR + 0.05 * i, kLnRHi + 0.05 * i));
  const Pairing p = photolot::pair_units(fit, PairOptions{});
  EXPECT_TRUE(p.pairs.empty());
  ASSERT_EQ(p.unpaired.size(), 5u);
  EXPECT_EQ(p.proof, ProofStatus::proved_optimal);
  for (const auto& u : p.unpaired) {
    EXPECT_NE(u.reason.find("no unit within tolerance"), std::string::npos) << u.reason;
    ASSERT_TRUE(u.nearest.has_value());
    // The nearest is a neighbour on the line, 0.05 away in ln at both ends.
    EXPECT_NEAR(u.nearest_error_pct, 100 * std::expm1(0.05), 1e-9);
  }
}

TEST(Pairing, LeavesOneUnitOfAnOddLotWithTheReason) {
  LotFit fit;
  fit.units = {unit_through("A", kLnR, kLnRHi), unit_through("B", kLnR + 0.001, kLnRHi),
               unit_through("C", kLnR + 0.015, kLnRHi)};
  const Pairing p = photolot::pair_units(fit, PairOptions{});
  ASSERT_EQ(p.pairs.size(), 1u);
  EXPECT_EQ(p.pairs[0].a_id, "A");
  EXPECT_EQ(p.pairs[0].b_id, "B");
  ASSERT_EQ(p.unpaired.size(), 1u);
  EXPECT_EQ(p.unpaired[0].id, "C");
  EXPECT_EQ(p.unpaired[0].nearest_id, "B");
  EXPECT_NE(p.unpaired[0].reason.find("paired with A"), std::string::npos) << p.unpaired[0].reason;
}

TEST(Pairing, PairsAllIdenticalUnitsWithZeroError) {
  LotFit fit;
  for (int i = 0; i < 11; ++i)
    fit.units.push_back(unit_through("S" + std::to_string(i), kLnR, kLnRHi));
  for (double tol : {0.0, 2.0}) {
    PairOptions o;
    o.tolerance_pct = tol;
    const Pairing p = photolot::pair_units(fit, o);
    EXPECT_EQ(p.pairs.size(), 5u);
    EXPECT_EQ(p.unpaired.size(), 1u);
    EXPECT_EQ(p.total_error_pct, 0.0);
    EXPECT_EQ(p.proof, ProofStatus::proved_optimal);
  }
}

TEST(Pairing, ZeroToleranceAcceptsOnlyIdenticalCurves) {
  LotFit fit;
  fit.units = {unit_through("A", kLnR, kLnRHi), unit_through("B", kLnR + 1e-6, kLnRHi),
               unit_through("C", kLnR, kLnRHi)};
  PairOptions o;
  o.tolerance_pct = 0;
  const Pairing p = photolot::pair_units(fit, o);
  ASSERT_EQ(p.pairs.size(), 1u);
  EXPECT_EQ(p.pairs[0].a_id, "A");
  EXPECT_EQ(p.pairs[0].b_id, "C");
  EXPECT_EQ(p.unpaired[0].id, "B");
}

TEST(Pairing, TrimmableErrorIgnoresAConstantRatioThatAbsoluteErrorCounts) {
  // R_b = 1.1 R_a at every illuminance: the ratio is constant, so nothing drifts (trimmable
  // error 0) while the resistances differ by 10 % (absolute error 10 %).
  const auto a = photolot::make_power_law(20e3, 0.7);
  const auto b = photolot::make_power_law(22e3, 0.7);
  PairOptions abs_o, trim_o;
  trim_o.mode = TrackingMode::trimmable;
  EXPECT_NEAR(photolot::tracking_error(b, a, abs_o).error_pct, 10.0, 1e-9);
  EXPECT_NEAR(photolot::tracking_error(b, a, trim_o).error_pct, 0.0, 1e-9);
  LotFit fit;
  fit.units = {unit_from("A", a), unit_from("B", b)};
  EXPECT_TRUE(photolot::pair_units(fit, abs_o).pairs.empty());
  ASSERT_EQ(photolot::pair_units(fit, trim_o).pairs.size(), 1u);
}

TEST(Pairing, ListsEligibleUnitsWithoutAFitAndSkipsUnitsNotChosen) {
  LotFit fit;
  fit.units = {unit_through("A", kLnR, kLnRHi), unit_through("B", kLnR, kLnRHi),
               unit_through("C", kLnR, kLnRHi), unit_through("D", kLnR, kLnRHi)};
  fit.units[1].status = photolot::FitStatus::too_few_levels;
  const Pairing p = photolot::pair_units(fit, {0, 1, 2}, PairOptions{});
  EXPECT_EQ(p.counts.eligible, 3u);
  EXPECT_EQ(p.counts.fitted, 2u);
  ASSERT_EQ(p.pairs.size(), 1u);
  EXPECT_EQ(p.pairs[0].a_id, "A");
  EXPECT_EQ(p.pairs[0].b_id, "C");
  ASSERT_EQ(p.unpaired.size(), 1u);
  EXPECT_EQ(p.unpaired[0].id, "B");
  EXPECT_NE(p.unpaired[0].reason.find("too_few_levels"), std::string::npos);
}

TEST(TrackingError, SigmaAgreesWithMonteCarloOfTheFitCovariance) {
  // Reference: the spread of the error when both curves' parameters are drawn from their
  // covariances (simulation of the definition); delta method at the arg-max, valid when the
  // arg-max does not switch ends, which holds for this clearly one-sided pair.
  const std::array<double, 4> cov_a = {4e-6, -1e-6, -1e-6, 1e-6};
  const std::array<double, 4> cov_b = {9e-6, 0, 0, 2.25e-6};
  const auto a = photolot::make_power_law(20e3, 0.75, cov_a);
  const auto b = photolot::make_power_law(20.2e3, 0.74, cov_b);
  for (TrackingMode mode : {TrackingMode::absolute, TrackingMode::trimmable}) {
    PairOptions o;
    o.mode = mode;
    const auto te = photolot::tracking_error(a, b, o);
    std::mt19937_64 rng(99);
    std::normal_distribution<double> z;
    auto draw = [&](const photolot::Curve& c, const std::array<double, 4>& cov) {
      // Cholesky of a 2 x 2 covariance.
      const double l11 = std::sqrt(cov[0]), l21 = cov[2] / l11, l22 = std::sqrt(cov[3] - l21 * l21);
      const double z1 = z(rng), z2 = z(rng);
      return photolot::make_power_law(std::exp(c.params[0] + l11 * z1),
                                      c.params[1] + l21 * z1 + l22 * z2);
    };
    double sum = 0, sum2 = 0;
    const int m = 20000;
    for (int k = 0; k < m; ++k) {
      const double e = photolot::tracking_error(draw(a, cov_a), draw(b, cov_b), o).error_pct;
      sum += e;
      sum2 += e * e;
    }
    const double sd = std::sqrt(sum2 / m - (sum / m) * (sum / m));
    EXPECT_NEAR(te.sigma_pct, sd, 0.05 * sd) << to_string(mode);
  }
}

TEST(PairOptions, ValidateNamesTheFieldTheValueAndTheRule) {
  PairOptions o;
  EXPECT_EQ(o.validate(), "");
  o.lux_hi = 0.5;
  EXPECT_NE(o.validate().find("lux_hi = 0.5"), std::string::npos) << o.validate();
  o = {};
  o.tolerance_pct = -1;
  EXPECT_NE(o.validate().find("tolerance_pct = -1"), std::string::npos);
  o = {};
  o.candidate_cap_per_unit = -3;
  EXPECT_NE(o.validate().find("candidate_cap_per_unit = -3"), std::string::npos);
  o = {};
  o.threads = -1;
  EXPECT_NE(o.validate().find("threads = -1"), std::string::npos) << o.validate();
  EXPECT_EQ(photolot::parse_tracking_mode("trimmable"), TrackingMode::trimmable);
  EXPECT_FALSE(photolot::parse_tracking_mode("ratio").has_value());
}

TEST(Pairing, StopsWhenAskedAndSaysSo) {
  std::mt19937_64 rng(1);
  const LotFit fit = random_plane_lot(rng, 200, 0.05);
  std::stop_source source;
  source.request_stop();
  const Pairing p = photolot::pair_units(fit, PairOptions{}, {}, source.get_token());
  EXPECT_TRUE(p.cancelled);
  EXPECT_TRUE(p.pairs.empty());
  EXPECT_EQ(p.proof, ProofStatus::not_proved);
}

TEST(Pairing, ReportsProgressUpToItsTotal) {
  std::mt19937_64 rng(2);
  const LotFit fit = random_plane_lot(rng, 300, 0.05);
  std::size_t last_done = 0, last_total = 0, calls = 0;
  bool monotone = true;
  const Pairing p =
      photolot::pair_units(fit, PairOptions{}, [&](std::size_t done, std::size_t total) {
        monotone = monotone && done >= last_done && done <= total;
        last_done = done;
        last_total = total;
        ++calls;
      });
  EXPECT_FALSE(p.cancelled);
  EXPECT_GT(calls, 1u);
  EXPECT_TRUE(monotone);
  EXPECT_EQ(last_done, last_total);
}
