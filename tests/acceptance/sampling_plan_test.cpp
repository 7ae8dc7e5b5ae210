// ISO 2859-1 single sampling plans (normal inspection) against the standard's tables.
#include <gtest/gtest.h>

#include <string>

#include "photolot/acceptance.h"

using photolot::code_letter;
using photolot::InspectionLevel;
using photolot::sample_size_for_letter;
using photolot::single_sampling_plan;

namespace {
constexpr InspectionLevel kI = InspectionLevel::level_i;
constexpr InspectionLevel kII = InspectionLevel::level_ii;
constexpr InspectionLevel kIII = InspectionLevel::level_iii;
}  // namespace

TEST(CodeLetter, MatchesIso2859Table1AtBothEndsOfEveryLotSizeBand) {
  // ISO 2859-1 Table I (same as ANSI/ASQ Z1.4 Table I): lot-size band -> letters for the
  // general inspection levels I / II / III.
  struct Band {
    std::size_t lo, hi;
    const char* letters;
  };
  const Band bands[] = {
      {2, 8, "AAB"},          {9, 15, "ABC"},          {16, 25, "BCD"},
      {26, 50, "CDE"},        {51, 90, "CEF"},         {91, 150, "DFG"},
      {151, 280, "EGH"},      {281, 500, "FHJ"},       {501, 1200, "GJK"},
      {1201, 3200, "HKL"},    {3201, 10000, "JLM"},    {10001, 35000, "KMN"},
      {35001, 150000, "LNP"}, {150001, 500000, "MPQ"}, {500001, 5000000, "NQR"},
  };
  for (const auto& b : bands) {
    for (std::size_t lot : {b.lo, b.hi}) {
      EXPECT_EQ(code_letter(lot, kI), b.letters[0]) << "lot " << lot;
      EXPECT_EQ(code_letter(lot, kII), b.letters[1]) << "lot " << lot;
      EXPECT_EQ(code_letter(lot, kIII), b.letters[2]) << "lot " << lot;
    }
  }
  EXPECT_FALSE(code_letter(1, kII).has_value());
  EXPECT_FALSE(code_letter(0, kII).has_value());
}

TEST(CodeLetter, SampleSizesFollowTheStandardsSeries) {
  // ISO 2859-1 Table II-A sample sizes; there is no letter I (or O).
  const std::string letters = "ABCDEFGHJKLMNPQR";
  const std::size_t sizes[] = {2, 3, 5, 8, 13, 20, 32, 50, 80, 125, 200, 315, 500, 800, 1250, 2000};
  for (std::size_t i = 0; i < letters.size(); ++i)
    EXPECT_EQ(sample_size_for_letter(letters[i]), sizes[i]) << letters[i];
  EXPECT_EQ(sample_size_for_letter('I'), 0u);
}

TEST(SamplingPlan, FollowsTheStandardsWorkedCases) {
  // Worked cases read from ISO 2859-1 Tables I and II-A (level II, normal inspection).
  auto p = single_sampling_plan(1000, kII, 1.0);  // J, n 80, Ac 2 / Re 3
  EXPECT_EQ(p.code_letter, 'J');
  EXPECT_EQ(p.plan_letter, 'J');
  EXPECT_EQ(p.sample_size, 80u);
  EXPECT_EQ(p.accept_number, 2);
  EXPECT_EQ(p.reject_number, 3);
  EXPECT_FALSE(p.full_inspection);

  p = single_sampling_plan(500, kII, 0.65);  // H, arrow down to J: n 80, 1/2
  EXPECT_EQ(p.code_letter, 'H');
  EXPECT_EQ(p.plan_letter, 'J');
  EXPECT_EQ(p.sample_size, 80u);
  EXPECT_EQ(p.accept_number, 1);
  EXPECT_EQ(p.reject_number, 2);

  p = single_sampling_plan(200, kII, 0.65);  // G, arrow up to F: n 20, 0/1
  EXPECT_EQ(p.code_letter, 'G');
  EXPECT_EQ(p.plan_letter, 'F');
  EXPECT_EQ(p.sample_size, 20u);
  EXPECT_EQ(p.accept_number, 0);
  EXPECT_EQ(p.reject_number, 1);

  p = single_sampling_plan(5, kII, 0.65);  // A, down to F, n 20 >= lot: 100 % inspection
  EXPECT_EQ(p.code_letter, 'A');
  EXPECT_EQ(p.plan_letter, 'F');
  EXPECT_EQ(p.sample_size, 20u);
  EXPECT_TRUE(p.full_inspection);
  EXPECT_EQ(p.accept_number, 0);
}

TEST(SamplingPlan, ReadsEveryEntryOfTable2AForTheTabulatedAqls) {
  // ISO 2859-1 Table II-A, normal inspection, AQL 0.65 / 1.0 / 1.5 / 2.5 / 4.0 / 6.5: for each
  // code letter the plan finally used, as "letter Ac" after following the arrows ("v" down, "^"
  // up). Read off the table by hand: e.g. letter C at 4.0 is "^" -> B's 0/1; C at 6.5 is "v" ->
  // D's 1/2.
  const char* expected[16][6] = {
      {"F0", "E0", "D0", "C0", "B0", "A0"},        // A
      {"F0", "E0", "D0", "C0", "B0", "A0"},        // B (6.5 "^" -> A)
      {"F0", "E0", "D0", "C0", "B0", "D1"},        // C
      {"F0", "E0", "D0", "C0", "E1", "D1"},        // D
      {"F0", "E0", "D0", "F1", "E1", "E2"},        // E
      {"F0", "E0", "G1", "F1", "F2", "F3"},        // F
      {"F0", "H1", "G1", "G2", "G3", "G5"},        // G
      {"J1", "H1", "H2", "H3", "H5", "H7"},        // H
      {"J1", "J2", "J3", "J5", "J7", "J10"},       // J
      {"K2", "K3", "K5", "K7", "K10", "K14"},      // K
      {"L3", "L5", "L7", "L10", "L14", "L21"},     // L
      {"M5", "M7", "M10", "M14", "M21", "L21"},    // M
      {"N7", "N10", "N14", "N21", "M21", "L21"},   // N
      {"P10", "P14", "P21", "N21", "M21", "L21"},  // P
      {"Q14", "Q21", "P21", "N21", "M21", "L21"},  // Q
      {"R21", "Q21", "P21", "N21", "M21", "L21"},  // R
  };
  const double aqls[] = {0.65, 1.0, 1.5, 2.5, 4.0, 6.5};
  const std::string letters = "ABCDEFGHJKLMNPQR";
  // Level II lot sizes whose Table I letter is each of A..R (lower end of a band).
  const std::size_t lots[] = {2,   9,    16,   26,    51,    91,     151,    281,
                              501, 1201, 3201, 10001, 35001, 150001, 500001, 0};
  for (std::size_t i = 0; i < 16; ++i) {
    for (std::size_t c = 0; c < 6; ++c) {
      // Letter R is not reached at level II; use level III's 500001-and-over band for it.
      const auto plan = lots[i] ? single_sampling_plan(lots[i], kII, aqls[c])
                                : single_sampling_plan(500001, kIII, aqls[c]);
      ASSERT_EQ(plan.code_letter, letters[i]);
      const std::string got =
          std::string(1, plan.plan_letter).append(std::to_string(plan.accept_number));
      EXPECT_EQ(got, expected[i][c]) << "letter " << letters[i] << " AQL " << aqls[c];
      EXPECT_EQ(plan.reject_number, plan.accept_number + 1);  // single sampling: Re = Ac + 1
      EXPECT_EQ(plan.sample_size, sample_size_for_letter(plan.plan_letter));
    }
  }
}

TEST(SamplingPlan, KnowsTheSmallerAqlColumns) {
  // From memory of ISO 2859-1 Table II-A (not checked against the standard's text): at AQL
  // 0.40 letter J reads "v" and K reads 1/2 (n 125); the first 0/1 plan of AQL 0.10 is at
  // letter K (n 125).
  auto p = single_sampling_plan(1000, kII, 0.40);
  EXPECT_EQ(p.plan_letter, 'K');
  EXPECT_EQ(p.sample_size, 125u);
  EXPECT_EQ(p.accept_number, 1);
  p = single_sampling_plan(2000, kII, 0.10);  // level II, 1201-3200 -> K
  EXPECT_EQ(p.code_letter, 'K');
  EXPECT_EQ(p.plan_letter, 'K');
  EXPECT_EQ(p.accept_number, 0);
  EXPECT_EQ(p.sample_size, 125u);
  EXPECT_FALSE(photolot::is_tabulated_aql(0.5));
  EXPECT_FALSE(photolot::is_tabulated_aql(10.0));
}

TEST(SamplingPlan, InspectsALotOfOneUnitInFull) {
  const auto p = single_sampling_plan(1, kII, 1.0);
  EXPECT_TRUE(p.full_inspection);
  EXPECT_EQ(p.sample_size, 1u);
  EXPECT_EQ(p.accept_number, 0);
}
