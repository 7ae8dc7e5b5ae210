// How the lot was fitted, in words and in the workspace's JSON.
#include "fit_handling.h"

#include <gtest/gtest.h>

#include <cmath>

namespace photolot::workbench {
namespace {

LotFit two_unit_fit() {
  LotFit fit;
  UnitFit a, b;
  a.status = b.status = FitStatus::fitted;
  a.curve.model = ModelKind::power_law;
  b.curve.model = ModelKind::dark_conductance;
  b.temp_coeff_pct_per_c = -0.4;
  fit.units = {a, b};
  return fit;
}

BenchProfile two_range_bench() {
  BenchProfile p;
  p.lux_pct = 3;
  p.ohm_ranges = {{2e3, 0.5, 2, 0.1}, {2e6, 0.8, 3, 100}};
  return p;
}

TEST(FitHandling, CountsTheUnitsOfEachModel) {
  const LotFit fit = two_unit_fit();
  FitHandling h;
  h.model.model = fitting::ModelChoice::choose;
  const QString text = describe_fit_handling(&fit, h);
  EXPECT_TRUE(text.contains(QStringLiteral("lower AICc kept"))) << text.toStdString();
  EXPECT_TRUE(text.contains(QStringLiteral("1 power law, 1 dark conductance")))
      << text.toStdString();
  EXPECT_TRUE(text.contains(QStringLiteral("1 unit(s) with their own coefficient")))
      << text.toStdString();
  EXPECT_TRUE(describe_fit_handling(nullptr, h).isEmpty());
}

TEST(FitHandling, NamesTheBenchProfileAndItsMeters) {
  const LotFit fit = two_unit_fit();
  FitHandling h;
  h.model.bench = two_range_bench();
  h.bench_profile_name = "bench-2.toml";
  const QString text = describe_fit_handling(&fit, h);
  EXPECT_TRUE(
      text.contains(QStringLiteral("bench-2.toml — lux meter 3.00 % of reading, 2 "
                                   "resistance range(s)")))
      << text.toStdString();
  EXPECT_TRUE(brief_fit_handling(fit, h).endsWith(QStringLiteral("bench profile bench-2.toml")));
}

TEST(FitHandling, SaysWhetherTemperatureWasIdentifiedAndWhatWasApplied) {
  LotFit fit = two_unit_fit();
  FitHandling h;
  fit.temperature.identifiable = true;
  fit.temperature.span_c = 18;
  fit.temperature.coefficient_pct_per_c = -0.52;
  fit.temperature.slope_pct_per_c_per_decade = 0.04;
  fit.temperature.source = "fitted";
  QString text = describe_fit_handling(&fit, h);
  EXPECT_TRUE(
      text.contains(QStringLiteral("identifiable (the readings span 18.0 °C); fitted "
                                   "across the lot: -0.520 %/°C at 10 lx, changing by "
                                   "0.040 %/°C per decade of light")))
      << text.toStdString();

  fit.temperature = {};
  fit.temperature.span_c = 1.5;
  fit.temperature.source = "spec";
  fit.temperature.coefficient_pct_per_c = -0.3;
  fit.temperature.slope_pct_per_c_per_decade = 0;
  text = describe_fit_handling(&fit, h);
  EXPECT_TRUE(
      text.contains(QStringLiteral("not identifiable (the readings span 1.50 °C); "
                                   "applied the spec's coefficient, -0.300 %/°C at 10 lx;")))
      << text.toStdString();

  // A run that applies the spec's coefficient as set never asked the readings.
  h.model.temperature = fitting::TemperatureMode::apply;
  fit.temperature.outcome = TemperatureOutcome::not_sought;
  text = describe_fit_handling(&fit, h);
  EXPECT_TRUE(text.contains(QStringLiteral("not sought")) && !text.contains("not identifiable"))
      << text.toStdString();
  EXPECT_TRUE(brief_fit_handling(fit, h).startsWith(
      QStringLiteral("temperature not sought, spec's -0.300 %/°C applied")))
      << brief_fit_handling(fit, h).toStdString();

  h.model.temperature = fitting::TemperatureMode::off;
  EXPECT_TRUE(describe_fit_handling(&fit, h).contains(QStringLiteral("<b>Temperature</b>: off")));
  EXPECT_TRUE(brief_fit_handling(fit, h).startsWith(QStringLiteral("temperature off")));
}

TEST(FitHandling, RoundTripsThroughTheWorkspaceJson) {
  FitHandling h;
  h.model.model = fitting::ModelChoice::dark_conductance;
  h.model.temperature = fitting::TemperatureMode::off;
  h.model.censored_terms = false;
  h.model.bench = two_range_bench();
  h.bench_profile_name = "bench-2.toml";
  FitHandling back;
  ASSERT_FALSE(from_json(to_json(h), back).has_value());
  EXPECT_EQ(back.model.model, fitting::ModelChoice::dark_conductance);
  EXPECT_EQ(back.model.temperature, fitting::TemperatureMode::off);
  EXPECT_FALSE(back.model.censored_terms);
  EXPECT_EQ(back.bench_profile_name, "bench-2.toml");
  ASSERT_TRUE(back.model.bench);
  EXPECT_EQ(back.model.bench->lux_pct, 3);
  ASSERT_EQ(back.model.bench->ohm_ranges.size(), 2u);
  EXPECT_EQ(back.model.bench->ohm_ranges[1].resolution_ohm, 100);
  // A workspace written before these options existed keeps the command line's defaults.
  FitHandling defaults;
  ASSERT_FALSE(from_json(nlohmann::json::object(), defaults).has_value());
  EXPECT_EQ(defaults.model.model, fitting::ModelChoice::power_law);
  EXPECT_FALSE(defaults.model.bench);
}

TEST(FitHandling, NamesTheFieldOfABadValue) {
  FitHandling h;
  const auto error = from_json(nlohmann::json{{"model", "spline"}}, h);
  ASSERT_TRUE(error.has_value());
  EXPECT_EQ(*error, "model.model = \"spline\" is not power_law, dark_conductance or choose");
  const auto bench = from_json(nlohmann::json{{"bench", {{"lux_pct", "three"}}}}, h);
  ASSERT_TRUE(bench.has_value());
  EXPECT_EQ(*bench, "model.bench: lux_pct must be a number");
}

}  // namespace
}  // namespace photolot::workbench
