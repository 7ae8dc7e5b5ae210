// The analysis session: background steps, and rerunning only what changed.
#include "session.h"

#include <gtest/gtest.h>

#include <cmath>

#include "workbench_fixtures.h"

namespace photolot::workbench {
namespace {

std::vector<SourceFile> synthetic_sources(const synth::LotSpec& spec) {
  SourceFile s;
  s.path = "synthetic.csv";
  s.content = synth::to_csv(synth::simulate(spec).lot);
  s.sha256_hex = sha256_hex(s.content);
  return {s};
}

TEST(AnalysisSession, ImportsAndFitsInTheBackgroundAndRecoversTheTruth) {
  const auto spec = test::small_lot_spec();
  const auto truth = synth::simulate(spec).truth;
  AnalysisSession session;
  session.setSources(synthetic_sources(spec));
  session.run();
  EXPECT_TRUE(session.busy());
  ASSERT_TRUE(test::wait_idle(session));
  ASSERT_NE(session.lotFit(), nullptr);
  const LotFit& fit = *session.lotFit();
  ASSERT_EQ(fit.units.size(), truth.size());
  for (std::size_t i = 0; i < truth.size(); ++i) {
    ASSERT_TRUE(fit.units[i].ok()) << fit.units[i].message;
    // 0.5 % reading noise over 10 levels: R10 within 1 % and gamma within 0.01 of the truth.
    EXPECT_NEAR(fit.units[i].r10_ohm / truth[i].r10_ohm, 1.0, 0.01) << truth[i].id;
    EXPECT_NEAR(fit.units[i].gamma, truth[i].gamma, 0.01) << truth[i].id;
  }
  ASSERT_NE(session.analysis(), nullptr);
  EXPECT_EQ(session.analysis()->statistics.units_fitted, truth.size());
}

TEST(AnalysisSession, ASpecChangeRerunsTheJudgementButNotTheFit) {
  AnalysisSession session;
  session.setSources(synthetic_sources(test::small_lot_spec()));
  session.run();
  ASSERT_TRUE(test::wait_idle(session));
  ASSERT_EQ(session.fitRuns(), 1);
  Spec spec;
  spec.part_number = "TEST";
  spec.r10_ohm = {1e3, 1e4};  // every unit (R10 near 20 kohm) lies above
  spec.inspection.mode = InspectionMode::full;
  session.setSpec(spec);
  session.run();
  ASSERT_TRUE(test::wait_idle(session));
  EXPECT_EQ(session.importRuns(), 1);
  EXPECT_EQ(session.fitRuns(), 1);
  EXPECT_EQ(session.analysisRuns(), 2);
  ASSERT_TRUE(session.analysis()->acceptance.has_value());
  EXPECT_EQ(session.analysis()->acceptance->nonconforming, 12u);
  // 100 % inspection sorts the lot: every nonconforming unit is rejected on its own.
  EXPECT_EQ(session.analysis()->acceptance->rejected_units.size(), 12u);
}

TEST(AnalysisSession, AnImportChoiceRerunsImportAndFit) {
  AnalysisSession session;
  session.setSources(synthetic_sources(test::small_lot_spec()));
  session.run();
  ASSERT_TRUE(test::wait_idle(session));
  const double r10_ohm = session.lotFit()->units[0].r10_ohm;
  ImportOptions options;
  options.ohm_unit = "kohm";  // read the ohm column as kilohm: 1 kohm = 1000 ohm (SI prefix k)
  session.setImportOptions(options);
  session.run();
  ASSERT_TRUE(test::wait_idle(session));
  EXPECT_EQ(session.importRuns(), 2);
  EXPECT_EQ(session.fitRuns(), 2);
  EXPECT_NEAR(session.lotFit()->units[0].r10_ohm / r10_ohm, 1000.0, 1e-6);
}

TEST(AnalysisSession, CancelStopsTheRunAndDropsItsResult) {
  auto spec = test::small_lot_spec();
  spec.units = 3000;
  AnalysisSession session;
  session.setSources(synthetic_sources(spec));
  session.run();
  session.cancel();
  EXPECT_FALSE(session.busy());
  ASSERT_TRUE(test::wait_idle(session));
  EXPECT_EQ(session.lotFit(), nullptr);
  EXPECT_TRUE(session.fitStale());
}

TEST(AnalysisSession, TakesOverASavedFitForTheSameUnits) {
  AnalysisSession first;
  first.setSources(synthetic_sources(test::small_lot_spec()));
  first.run();
  ASSERT_TRUE(test::wait_idle(first));
  AnalysisSession second;
  second.setSources(synthetic_sources(test::small_lot_spec()));
  second.offerSavedFit(first.lotFit());
  second.run();
  ASSERT_TRUE(test::wait_idle(second));
  EXPECT_EQ(second.fitRuns(), 0);
  EXPECT_EQ(second.lotFit(), first.lotFit());
}

}  // namespace
}  // namespace photolot::workbench
