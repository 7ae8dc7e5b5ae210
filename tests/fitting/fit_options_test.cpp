// FitOptions::validate: each rule names its field and value.
#include <gtest/gtest.h>

#include "photolot/fitting/fit.h"

namespace {

using photolot::fitting::FitOptions;

TEST(FitOptions, DefaultsAreValid) { EXPECT_EQ(FitOptions{}.validate(), ""); }

TEST(FitOptions, NamesTheFieldAndValueOfEachBrokenRule) {
  auto message = [](auto change) {
    FitOptions o;
    change(o);
    return o.validate();
  };
  EXPECT_NE(message([](FitOptions& o) { o.meter_accuracy_pct = -1; }).find("meter_accuracy_pct"),
            std::string::npos);
  EXPECT_NE(message([](FitOptions& o) { o.confidence = 1.0; }).find("confidence"),
            std::string::npos);
  EXPECT_NE(message([](FitOptions& o) { o.min_levels = 1; }).find("min_levels = 1"),
            std::string::npos);
  EXPECT_NE(message([](FitOptions& o) { o.threads = -2; }).find("threads = -2"), std::string::npos);
  EXPECT_NE(message([](FitOptions& o) { o.outlier_threshold = 0; }).find("outlier_threshold"),
            std::string::npos);
  EXPECT_NE(message([](FitOptions& o) { o.min_span_decades = -0.5; }).find("min_span_decades"),
            std::string::npos);
}

}  // namespace
