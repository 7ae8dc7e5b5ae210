// The certificate check's sum of blossom values shared by two nodes, against its definition
// (the sum of z over every blossom whose range holds both positions) on random nested
// families like the matching's: blossoms inside blossoms, side by side, deep onions, and
// values large enough to need the wide cells.
#include "blossom_sums.h"

#include <gtest/gtest.h>

#include <cstdint>
#include <random>
#include <vector>

namespace {

using photolot::detail::BlossomSums;
using photolot::detail::WideSum;

// A random laminar family of odd ranges over [begin, end): split the range into pieces, each
// piece at least 3 long may become a blossom, and recurse into it.
void grow(std::mt19937_64& rng, std::uint64_t begin, std::uint64_t end, int depth,
          std::int64_t max_value, std::vector<BlossomSums::Blossom>& out) {
  if (end - begin < 3 || depth > 40) return;
  std::uniform_int_distribution<int> coin(0, 3);
  std::uint64_t at = begin;
  while (at < end) {
    std::uniform_int_distribution<std::uint64_t> len(1, end - at);
    std::uint64_t piece = len(rng);
    if (piece % 2 == 0) --piece;
    if (piece == 0) piece = 1;
    if (piece >= 3 && coin(rng) != 0) {
      std::uniform_int_distribution<std::int64_t> value(0, max_value);
      out.push_back({at, at + piece, coin(rng) == 0 ? 0 : value(rng)});
      grow(rng, at, at + piece, depth + 1, max_value, out);
    }
    at += piece;
  }
}

WideSum by_definition(const std::vector<BlossomSums::Blossom>& bl, std::uint64_t p,
                      std::uint64_t q) {
  WideSum s = 0;
  for (const auto& b : bl)
    if (b.begin <= p && p < b.end && b.begin <= q && q < b.end) s += b.value;
  return s;
}

void expect_matches_definition(std::uint64_t positions,
                               const std::vector<BlossomSums::Blossom>& bl) {
  const BlossomSums sums(positions, bl);
  for (std::uint64_t p = 0; p < positions; ++p)
    for (std::uint64_t q = 0; q < positions; ++q) {
      if (p == q) continue;
      ASSERT_TRUE(sums.shared(p, q) == by_definition(bl, p, q))
          << "positions " << p << " and " << q << " of " << positions;
    }
}

TEST(BlossomSums, MatchesTheDefinitionOnRandomNestedFamilies) {
  std::mt19937_64 rng(20261202);
  for (int trial = 0; trial < 300; ++trial) {
    std::uniform_int_distribution<std::uint64_t> size(1, 90);
    const std::uint64_t positions = size(rng);
    std::vector<BlossomSums::Blossom> bl;
    grow(rng, 0, positions, 0, 1000, bl);
    expect_matches_definition(positions, bl);
  }
}

TEST(BlossomSums, MatchesTheDefinitionOnAnOnionAndSideBySideBlossoms) {
  // An onion (each blossom two positions larger than the one inside), as the matching leaves
  // in a large component, next to two disjoint blossoms and a stretch outside every blossom.
  std::vector<BlossomSums::Blossom> bl;
  for (std::uint64_t k = 0; k < 30; ++k) bl.push_back({30 - k, 33 + k, std::int64_t(7 * k + 1)});
  bl.push_back({64, 67, 5});
  bl.push_back({67, 72, 9});
  bl.push_back({68, 71, 2});
  expect_matches_definition(80, bl);
}

TEST(BlossomSums, UsesWideCellsWhenTheSumsWouldNotFitInt64) {
  std::vector<BlossomSums::Blossom> bl;
  const std::int64_t huge = std::int64_t(1) << 61;
  for (std::uint64_t k = 0; k < 6; ++k) bl.push_back({6 - k, 9 + k, huge + std::int64_t(k)});
  expect_matches_definition(16, bl);
  const BlossomSums sums(16, bl);
  EXPECT_TRUE(sums.shared(6, 8) == 6 * WideSum(huge) + 15);  // inside all six
}

}  // namespace
