// Resistances with an engineering prefix. The prefixes and their factors are the SI's (BIPM, The
// International System of Units, 9th edition 2019, Table 7: m = 1e-3, k = 1e3, M = 1e6,
// G = 1e9, T = 1e12); the inputs are IEC 60063 preferred values (E12: 1.0, 1.5, 2.2, 4.7 ...)
// and their decades. Three significant figures with the prefix chosen after rounding, so that
// the number stays in [1, 1000), is common practice for meter displays and parts lists.
#include "photolot/number_format.h"

#include <gtest/gtest.h>

#include <clocale>
#include <cmath>
#include <limits>
#include <string>

namespace photolot {
namespace {

TEST(NumberFormat, PicksTheSiPrefixThatKeepsThreeFiguresBetweenOneAndAThousand) {
  EXPECT_EQ(format_ohm(4.7e3), "4.70 k\u03a9");  // E12 4.7 x 1e3 (SI k = 1e3)
  EXPECT_EQ(format_ohm(18.7e3), "18.7 k\u03a9");
  EXPECT_EQ(format_ohm(470), "470 \u03a9");
  EXPECT_EQ(format_ohm(2.2e6), "2.20 M\u03a9");  // SI M = 1e6
  EXPECT_EQ(format_ohm(1.5e9), "1.50 G\u03a9");  // SI G = 1e9
  EXPECT_EQ(format_ohm(1e12), "1.00 T\u03a9");   // SI T = 1e12
  EXPECT_EQ(format_ohm(0.47), "470 m\u03a9");    // SI m = 1e-3
  EXPECT_EQ(format_ohm(-4.7e3), "-4.70 k\u03a9");
  EXPECT_EQ(format_ohm(0), "0.00 \u03a9");
}

TEST(NumberFormat, RoundsBeforeChoosingThePrefixSoNoDisplayReadsAThousand) {
  // 999.96 to three significant figures is 1.00e3: it must read "1.00 kΩ", never "1000 Ω".
  EXPECT_EQ(format_ohm(999.96), "1.00 k\u03a9");
  EXPECT_EQ(format_ohm(999.4), "999 \u03a9");
  EXPECT_EQ(format_ohm(999.6e3), "1.00 M\u03a9");
  EXPECT_EQ(format_ohm(99.96), "100 \u03a9");  // three figures: 99.96 -> 100
  EXPECT_EQ(format_ohm(9.996e3), "10.0 k\u03a9");
  const EngineeringScale s = engineering_scale(999.96);
  EXPECT_EQ(s.factor, 1e3);
  EXPECT_EQ(s.prefix, "k");
}

TEST(NumberFormat, DropsTrailingZerosOnlyWhenAsked) {
  const OhmFormat trimmed{.keep_trailing_zeros = false};
  EXPECT_EQ(format_ohm(23e3, trimmed), "23 k\u03a9");
  EXPECT_EQ(format_ohm(24.1e3, trimmed), "24.1 k\u03a9");
  EXPECT_EQ(format_ohm(1.5e6, trimmed), "1.5 M\u03a9");
  EXPECT_EQ(format_ohm(470, trimmed), "470 \u03a9");  // no decimal point: the zero is a figure
}

TEST(NumberFormat, WritesPlainAsciiAndTheMissingMarkWhenAsked) {
  const OhmFormat ascii{.unicode = false, .missing = "-"};
  EXPECT_EQ(format_ohm(4.7e3, ascii), "4.70 kohm");
  EXPECT_EQ(format_ohm(std::nan(""), ascii), "-");
  EXPECT_EQ(format_ohm(std::numeric_limits<double>::infinity()), "\u2014");
  EXPECT_EQ(format_ohm_range(18.5e3, 18.9e3, 18.7e3, ascii), "18.5-18.9 kohm");
}

TEST(NumberFormat, WritesAnIntervalInThePrefixOfItsReference) {
  EXPECT_EQ(format_ohm_range(18.5e3, 18.9e3, 18.7e3), "18.5\u201318.9 k\u03a9");
  // An interval straddling a decade keeps the centre's prefix and decimals: 0.98-1.02 MΩ.
  EXPECT_EQ(format_ohm_range(980e3, 1.02e6, 1.0e6), "0.98\u20131.02 M\u03a9");
  // No reference: the upper end sets the prefix.
  EXPECT_EQ(format_ohm_range(4.6e3, 4.8e3, std::nan("")), "4.60\u20134.80 k\u03a9");
  EXPECT_EQ(format_ohm_range(std::nan(""), 4.8e3, 4.7e3), "\u2014");
}

TEST(NumberFormat, IgnoresTheProcessLocale) {
  // Qt sets the process locale; a comma decimal there must not reach the output.
  const char* old = std::setlocale(LC_NUMERIC, nullptr);
  const std::string saved = old ? old : "C";
  if (std::setlocale(LC_NUMERIC, "de_DE.UTF-8")) {
    EXPECT_EQ(format_ohm(4.7e3), "4.70 k\u03a9");
    std::setlocale(LC_NUMERIC, saved.c_str());
  }
}

}  // namespace
}  // namespace photolot
