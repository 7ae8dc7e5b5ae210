// The lot disposition from verdicts under ISO 2859-1 single sampling or 100 % inspection.
#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

#include "photolot/acceptance.h"

using photolot::decide;
using photolot::Disposition;
using photolot::InspectionMode;
using photolot::Spec;
using photolot::UnitVerdict;
using photolot::Verdict;

namespace {

Spec spec_for(double aql, std::optional<std::size_t> lot) {
  Spec s;
  s.part_number = "TEST-1";
  s.r10_ohm = {15e3, 25e3};
  s.inspection.aql_pct = aql;
  s.inspection.lot_size = lot;
  return s;
}

std::vector<UnitVerdict> verdicts(std::size_t measured, std::size_t nonconforming) {
  std::vector<UnitVerdict> v(measured);
  for (std::size_t i = 0; i < measured; ++i) {
    v[i].id = std::string("U").append(std::to_string(i + 1));
    v[i].verdict = i < nonconforming ? Verdict::nonconforming : Verdict::conforming;
  }
  return v;
}

}  // namespace

TEST(Disposition, AcceptsAtAcAndRejectsAtRe) {
  // ISO 2859-1: lot 1000, level II, AQL 1.0 -> J, n 80, Ac 2, Re 3.
  const Spec s = spec_for(1.0, 1000);
  auto a = decide(s, verdicts(80, 2));
  EXPECT_EQ(a.disposition, Disposition::accept);
  ASSERT_TRUE(a.plan.has_value());
  EXPECT_EQ(a.plan->sample_size, 80u);
  EXPECT_NE(a.rule.find("Ac = 2"), std::string::npos);
  a = decide(s, verdicts(80, 3));
  EXPECT_EQ(a.disposition, Disposition::reject);
  EXPECT_EQ(a.rejected_units.size(), 3u);
}

TEST(Disposition, IsUndecidedWithFewerUnitsThanThePlanNeeds) {
  const auto a = decide(spec_for(1.0, 1000), verdicts(60, 1));
  EXPECT_EQ(a.disposition, Disposition::undecided);
  EXPECT_NE(a.reason.find("60 of 80"), std::string::npos);
}

TEST(Disposition, RejectsEarlyOnceReIsReached) {
  // Re nonconforming units cannot become fewer by measuring more: reject with 40 of 80.
  const auto a = decide(spec_for(1.0, 1000), verdicts(40, 3));
  EXPECT_EQ(a.disposition, Disposition::reject);
}

TEST(Disposition, IsUndecidedWhenTheLotSizeIsUnknown) {
  const auto a = decide(spec_for(1.0, std::nullopt), verdicts(80, 0));
  EXPECT_EQ(a.disposition, Disposition::undecided);
  EXPECT_FALSE(a.plan.has_value());
  // The command line's lot size takes over.
  EXPECT_EQ(decide(spec_for(1.0, std::nullopt), verdicts(80, 0), 1000).disposition,
            Disposition::accept);
}

TEST(Disposition, SmallLotNeedsEveryUnitWhenThePlanCoversIt) {
  // ISO 2859-1: lot 5, AQL 0.65 -> down to F (n 20) >= lot: all 5 inspected, Ac 0.
  const Spec s = spec_for(0.65, 5);
  EXPECT_EQ(decide(s, verdicts(4, 0)).disposition, Disposition::undecided);
  EXPECT_EQ(decide(s, verdicts(5, 0)).disposition, Disposition::accept);
  EXPECT_EQ(decide(s, verdicts(5, 1)).disposition, Disposition::reject);
}

TEST(Disposition, FullInspectionSortsTheLot) {
  Spec s = spec_for(1.0, 60);
  s.inspection.mode = InspectionMode::full;
  auto a = decide(s, verdicts(60, 3));
  EXPECT_EQ(a.disposition, Disposition::accept);
  EXPECT_EQ(a.rejected_units.size(), 3u);
  EXPECT_NE(a.reason.find("57 units conforming accepted"), std::string::npos);
  a = decide(s, verdicts(50, 0));
  EXPECT_EQ(a.disposition, Disposition::undecided);
}

TEST(Disposition, JsonCarriesThePlanActuallyUsed) {
  // ISO 2859-1: lot 500, level II, AQL 0.65 -> H, arrow down to J: n 80, 1/2.
  const auto a = decide(spec_for(0.65, 500), verdicts(80, 1));
  const auto j = photolot::acceptance_json(a);
  EXPECT_EQ(j["code_letter"], "H");
  EXPECT_EQ(j["plan_letter"], "J");
  EXPECT_EQ(j["sample_size"], 80);
  EXPECT_EQ(j["accept_number"], 1);
  EXPECT_EQ(j["reject_number"], 2);
  EXPECT_EQ(j["inspection_level"], "II");
  EXPECT_EQ(j["aql"], 0.65);
  EXPECT_EQ(j["disposition"], "accept");
  EXPECT_EQ(j["measured"], 80);
  EXPECT_EQ(j["nonconforming"], 1);
  EXPECT_TRUE(j["rule"].is_string());
}
