// The spec the acceptance form saves must read back through the spec loader unchanged.
#include "spec_toml.h"

#include <gtest/gtest.h>

#include "test_support.h"

namespace photolot::workbench {
namespace {

TEST(SpecToml, WrittenSpecReadsBackThroughTheLoader) {
  const auto loaded = load_spec(photolot::test::source_path("sample-data/demo-spec.toml").string());
  ASSERT_TRUE(loaded.ok());
  const Spec& a = *loaded.spec;
  const auto again = parse_spec(spec_to_toml(a), "written");
  ASSERT_TRUE(again.ok()) << (again.errors.empty() ? "" : to_string(again.errors[0]));
  const Spec& b = *again.spec;
  EXPECT_EQ(b.part_number, a.part_number);
  EXPECT_EQ(b.description, a.description);
  EXPECT_EQ(b.r10_ohm.min, a.r10_ohm.min);
  EXPECT_EQ(b.r10_ohm.max, a.r10_ohm.max);
  EXPECT_EQ(b.gamma.min, a.gamma.min);
  EXPECT_EQ(b.gamma.max, a.gamma.max);
  EXPECT_EQ(b.dark_min_ohm, a.dark_min_ohm);
  EXPECT_EQ(b.max_rms_log_residual, a.max_rms_log_residual);
  EXPECT_EQ(b.inspection.mode, a.inspection.mode);
  EXPECT_EQ(b.inspection.level, a.inspection.level);
  EXPECT_EQ(b.inspection.aql_pct, a.inspection.aql_pct);
  EXPECT_EQ(b.inspection.lot_size, a.inspection.lot_size);
  EXPECT_EQ(b.tolerance_coverage, a.tolerance_coverage);
  EXPECT_EQ(b.tolerance_confidence, a.tolerance_confidence);
}

TEST(SpecToml, EscapesQuotesInText) {
  Spec s;
  s.part_number = "LDR \"A\" \\ 1";
  s.r10_ohm.min = 1e4;
  const auto again = parse_spec(spec_to_toml(s), "written");
  ASSERT_TRUE(again.ok()) << (again.errors.empty() ? "" : to_string(again.errors[0]));
  EXPECT_EQ(again.spec->part_number, s.part_number);
}

}  // namespace
}  // namespace photolot::workbench
