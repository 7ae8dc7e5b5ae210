// Two-sided normal tolerance factors against published values.
#include <gtest/gtest.h>

#include "photolot/statistics.h"

using photolot::tolerance_factor_exact;
using photolot::tolerance_factor_howe;

TEST(ToleranceFactor, HoweMatchesTheNistHandbookExample) {
  // NIST/SEMATECH e-Handbook of Statistical Methods, section 7.2.6.3: N = 43, p = 0.90,
  // confidence 0.99 -> k2 = 2.2173159.
  EXPECT_NEAR(tolerance_factor_howe(43, 0.90, 0.99), 2.2173159, 5e-8);
}

struct TabulatedFactor {
  std::size_t n;
  double coverage;
  double howe;
  double exact;
};

// Factors at 95 % confidence, Howe and exact, to three decimals: exact values as tabulated for
// ISO 16269-6 two-sided intervals, which to two decimals match Berthouex and Brown, Statistics
// for Environmental Engineers, Table 21.1; Howe's from the formula of NIST/SEMATECH 7.2.6.3.
const TabulatedFactor kTable[] = {
    {10, 0.90, 2.838, 2.856}, {10, 0.95, 3.382, 3.393}, {10, 0.99, 4.445, 4.437},
    {20, 0.90, 2.310, 2.319}, {20, 0.95, 2.752, 2.760}, {20, 0.99, 3.617, 3.621},
    {50, 0.95, 2.379, 2.382}, {50, 0.99, 3.126, 3.129},
};

TEST(ToleranceFactor, HoweMatchesTabulatedFactorsToThreeDecimals) {
  for (const auto& t : kTable) {
    EXPECT_NEAR(tolerance_factor_howe(t.n, t.coverage, 0.95), t.howe, 5e-4)
        << "n " << t.n << " p " << t.coverage;
  }
}

TEST(ToleranceFactor, ExactMatchesTabulatedFactorsToThreeDecimals) {
  for (const auto& t : kTable) {
    EXPECT_NEAR(tolerance_factor_exact(t.n, t.coverage, 0.95), t.exact, 5e-4)
        << "n " << t.n << " p " << t.coverage;
  }
}

TEST(ToleranceFactor, IsUndefinedForFewerThanTwoValuesOrImpossibleLevels) {
  EXPECT_TRUE(std::isnan(tolerance_factor_howe(1, 0.99, 0.95)));
  EXPECT_TRUE(std::isnan(tolerance_factor_exact(1, 0.99, 0.95)));
  EXPECT_TRUE(std::isnan(tolerance_factor_howe(10, 1.0, 0.95)));
  EXPECT_TRUE(std::isnan(tolerance_factor_howe(10, 0.99, 0.0)));
}
