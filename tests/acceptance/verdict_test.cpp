// Per-unit verdicts against a spec: each limit broken is a reason with value, limit and excess.
#include <gtest/gtest.h>

#include <cmath>
#include <nlohmann/json.hpp>

#include "photolot/acceptance.h"

using photolot::Characteristic;
using photolot::FitStatus;
using photolot::judge_unit;
using photolot::Spec;
using photolot::UnitFit;
using photolot::Verdict;

namespace {

Spec demo_spec() {
  Spec s;
  s.part_number = "TEST-1";
  s.r10_ohm = {15e3, 23e3};
  s.gamma = {0.65, 0.85};
  s.dark_min_ohm = 1e6;
  s.max_rms_log_residual = 0.05;
  return s;
}

UnitFit unit(double r10_ohm, double gamma) {
  UnitFit u;
  u.id = "U1";
  u.status = FitStatus::fitted;
  u.r10_ohm = r10_ohm;
  u.gamma = gamma;
  u.rms_log_residual = 0.01;
  u.dark_ohm = {5e6};
  u.dark_censored = {false};
  return u;
}

}  // namespace

TEST(Verdict, ConformsInsideEveryLimit) {
  const auto v = judge_unit(unit(20e3, 0.75), demo_spec());
  EXPECT_EQ(v.verdict, Verdict::conforming);
  EXPECT_TRUE(v.reasons.empty());
  EXPECT_TRUE(v.notes.empty());
}

TEST(Verdict, SaysWhichLimitAndByHowMuch) {
  // By hand: (24.1 k - 23 k) / 23 k = 4.78 %.
  const auto v = judge_unit(unit(24.1e3, 0.75), demo_spec());
  EXPECT_EQ(v.verdict, Verdict::nonconforming);
  ASSERT_EQ(v.reasons.size(), 1u);
  EXPECT_EQ(v.reasons[0].characteristic, Characteristic::r10);
  EXPECT_EQ(v.reasons[0].limit, "max");
  EXPECT_NEAR(v.reasons[0].excess_pct, 100.0 * 1.1 / 23, 1e-9);
  EXPECT_EQ(v.reasons[0].text, "R10 24.1 k\u03a9 above max 23 k\u03a9 by 4.8 %");
}

TEST(Verdict, ListsEveryLimitBroken) {
  auto u = unit(14e3, 0.90);
  u.rms_log_residual = 0.08;
  u.dark_ohm = {0.5e6};
  const auto v = judge_unit(u, demo_spec());
  ASSERT_EQ(v.reasons.size(), 4u);
  EXPECT_EQ(v.reasons[0].characteristic, Characteristic::r10);
  EXPECT_EQ(v.reasons[0].limit, "min");
  EXPECT_EQ(v.reasons[1].characteristic, Characteristic::gamma);
  EXPECT_EQ(v.reasons[1].limit, "max");
  EXPECT_EQ(v.reasons[2].characteristic, Characteristic::rms_log_residual);
  EXPECT_EQ(v.reasons[3].characteristic, Characteristic::dark);
  EXPECT_NEAR(v.reasons[3].excess_pct, 50.0, 1e-9);  // (1 M - 0.5 M) / 1 M
}

TEST(Verdict, UnfittedUnitIsNonconformingWithItsReason) {
  UnitFit u;
  u.id = "U9";
  u.status = FitStatus::too_few_levels;
  u.message = "2 levels, 3 needed";
  const auto v = judge_unit(u, demo_spec());
  EXPECT_EQ(v.verdict, Verdict::nonconforming);
  ASSERT_GE(v.reasons.size(), 1u);
  EXPECT_EQ(v.reasons[0].characteristic, Characteristic::fit);
  EXPECT_NE(v.reasons[0].text.find("too_few_levels"), std::string::npos);
  EXPECT_NE(v.reasons[0].text.find("2 levels, 3 needed"), std::string::npos);
}

TEST(Verdict, CensoredDarkReadingAboveTheLimitConforms) {
  auto u = unit(20e3, 0.75);
  u.dark_ohm = {2e6};  // over range: the resistance is above 2 Mohm >= 1 Mohm
  u.dark_censored = {true};
  const auto v = judge_unit(u, demo_spec());
  EXPECT_EQ(v.verdict, Verdict::conforming);
  EXPECT_TRUE(v.notes.empty());
}

TEST(Verdict, CensoredDarkReadingBelowTheLimitIsNotJudgedAndSaysSo) {
  auto u = unit(20e3, 0.75);
  u.dark_ohm = {0.5e6};  // above 0.5 Mohm says nothing about the 1 Mohm minimum
  u.dark_censored = {true};
  const auto v = judge_unit(u, demo_spec());
  EXPECT_EQ(v.verdict, Verdict::conforming);
  ASSERT_EQ(v.notes.size(), 1u);
  EXPECT_NE(v.notes[0].find("not judged"), std::string::npos);
}

TEST(Verdict, MissingDarkReadingIsNotedWhenADarkLimitExists) {
  auto u = unit(20e3, 0.75);
  u.dark_ohm.clear();
  u.dark_censored.clear();
  const auto v = judge_unit(u, demo_spec());
  EXPECT_EQ(v.verdict, Verdict::conforming);
  ASSERT_EQ(v.notes.size(), 1u);
  EXPECT_NE(v.notes[0].find("no dark reading"), std::string::npos);
}

TEST(Verdict, JsonListsReasonsAndNotes) {
  auto u = unit(24.1e3, 0.75);
  u.dark_ohm.clear();
  u.dark_censored.clear();
  const auto j = photolot::verdict_json(judge_unit(u, demo_spec()));
  EXPECT_EQ(j["verdict"], "nonconforming");
  ASSERT_EQ(j["reasons"].size(), 1u);
  EXPECT_EQ(j["reasons"][0]["characteristic"], "r10");
  EXPECT_EQ(j["reasons"][0]["limit"], "max");
  EXPECT_DOUBLE_EQ(j["reasons"][0]["limit_value"].get<double>(), 23e3);
  EXPECT_EQ(j["notes"].size(), 1u);  // no dark reading
}

TEST(Verdict, JudgesTheResistanceWindowAtTheSpecsReferenceIlluminance) {
  // A spec written for 100 lx: the power law gives R(100 lx) = R10 / 10^gamma
  // (gamma = log10(R10 / R100), the two-point definition common across photoresistor
  // datasheets: common practice).
  auto u = unit(20e3, 0.75);
  u.curve = photolot::make_power_law(20e3, 0.75);
  Spec s = demo_spec();
  s.conditions.reference_lux = 100;
  s.r10_ohm = {2e3, 3e3};  // 20 k / 10^0.75 = 3.56 k: above max
  const auto v = judge_unit(u, s);
  ASSERT_EQ(v.reasons.size(), 1u);
  EXPECT_NEAR(v.reasons[0].measured, 20e3 / std::pow(10.0, 0.75), 1e-6);
  EXPECT_EQ(v.reasons[0].text.rfind("R at 100 lx 3.56 k\u03a9 above max 3 k\u03a9", 0), 0u)
      << v.reasons[0].text;
}
