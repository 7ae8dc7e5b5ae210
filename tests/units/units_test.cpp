// Units and value syntax: foot-candles against NIST SP 811, letter codes against IEC 60062.
#include "photolot/units.h"

#include <gtest/gtest.h>

#include <charconv>
#include <clocale>
#include <cmath>

namespace photolot {
namespace {

// NIST SP 811 (2008), Appendix B.8: footcandle to lux = 1.076 391 E+01; the international foot
// is exactly 0.3048 m, so 1 fc = 1/0.3048^2 lx = 10.763 910 416 709 722 lx.
TEST(Units, FootcandleFactorMatchesNistSp811) {
  EXPECT_NEAR(kLuxPerFootcandle, 10.763910416709722, 1e-12);
  EXPECT_NEAR(lux_from_footcandles(10), 107.63910417, 1e-8);  // NIST SP 811 factor x 10
  EXPECT_NEAR(footcandles_from_lux(100), 9.290304, 1e-9);     // 100 / 10.7639... = 9.290 304
}

TEST(Units, FindsHeaderUnitsByTheirCommonSpellings) {
  EXPECT_EQ(find_unit("lux")->canonical, "lx");
  EXPECT_EQ(find_unit("LX")->canonical, "lx");
  EXPECT_EQ(find_unit("fc")->canonical, "fc");
  EXPECT_NEAR(find_unit("fc")->scale, 10.763910416709722, 1e-12);  // NIST SP 811, App. B.8
  EXPECT_EQ(find_unit("\xCE\xA9")->canonical, "ohm");              // Ω
  EXPECT_EQ(find_unit("k\xCE\xA9")->canonical, "kohm");            // kΩ
  EXPECT_EQ(find_unit("k \xCE\xA9")->canonical, "kohm");           // k Ω
  EXPECT_EQ(find_unit("M\xCE\xA9")->canonical, "Mohm");            // MΩ
  EXPECT_EQ(find_unit("\xE2\x84\xA6")->canonical, "ohm");          // Ω (ohm sign)
  EXPECT_EQ(find_unit("kohm")->scale, 1e3);
  EXPECT_EQ(find_unit("Mohm")->scale, 1e6);
  EXPECT_EQ(find_unit("\xC2\xB0"
                      "C")
                ->canonical,
            "degC");  // °C
  EXPECT_EQ(find_unit("degC")->canonical, "degC");
  EXPECT_EQ(find_unit("deg C")->canonical, "degC");
  // 0 degC = 273.15 K (SI Brochure, 9th edition, 2.3.1).
  const auto k = find_unit("K");
  ASSERT_TRUE(k);
  EXPECT_NEAR(300 * k->scale + k->offset, 26.85, 1e-12);
  // 212 degF = 100 degC, 32 degF = 0 degC (from memory; the Fahrenheit scale's fixed points).
  const auto f = find_unit(
      "\xC2\xB0"
      "F");
  ASSERT_TRUE(f);
  EXPECT_NEAR(212 * f->scale + f->offset, 100, 1e-12);
  EXPECT_NEAR(32 * f->scale + f->offset, 0, 1e-12);
}

TEST(Units, DoesNotMistakeMilliohmSymbolForMegohm) {
  EXPECT_FALSE(find_unit("m\xCE\xA9"));  // mΩ: not a unit a photoresistor log uses
  EXPECT_FALSE(find_unit("V"));
  EXPECT_FALSE(find_unit(""));
}

// IEC 60062, the resistance letter code: the multiplier letter stands for the decimal point.
TEST(Units, ParsesIec60062LetterCodes) {
  EXPECT_DOUBLE_EQ(*parse_resistance("R47"), 0.47);      // IEC 60062 example
  EXPECT_DOUBLE_EQ(*parse_resistance("4R7"), 4.7);       // IEC 60062 example
  EXPECT_DOUBLE_EQ(*parse_resistance("470R"), 470);      // IEC 60062 example
  EXPECT_DOUBLE_EQ(*parse_resistance("4K7"), 4.7e3);     // IEC 60062 example
  EXPECT_DOUBLE_EQ(*parse_resistance("47K3"), 47.3e3);   // IEC 60062 example
  EXPECT_DOUBLE_EQ(*parse_resistance("4M7"), 4.7e6);     // IEC 60062 example
  EXPECT_DOUBLE_EQ(*parse_resistance("1M0"), 1.0e6);     // IEC 60062 example
  EXPECT_NEAR(*parse_resistance("6L8"), 6.8e-3, 1e-15);  // IEC 60062 example (milliohm)
  EXPECT_DOUBLE_EQ(*parse_resistance("15M0"), 15e6);     // trailing zero states precision
  EXPECT_DOUBLE_EQ(*parse_resistance("K47"), 470);       // letter first: 0.47 kohm
}

TEST(Units, AcceptsLowerCaseKAndATrailingToleranceLetter) {
  EXPECT_NEAR(*parse_resistance("4k7"), 4.7e3, 1e-9);  // lower-case k: common practice
  // IEC 60062: K is both multiplier and 10 % tolerance letter; position decides.
  EXPECT_NEAR(*parse_resistance("27KK"), 27e3, 1e-9);
  EXPECT_NEAR(*parse_resistance("4K7J"), 4.7e3, 1e-9);  // J = 5 % (IEC 60062)
  EXPECT_NEAR(*parse_resistance("1M0F"), 1e6, 1e-6);    // F = 1 % (IEC 60062)
}

TEST(Units, ParsesSiPrefixesAndUnits) {
  // SI Brochure, 9th edition, Table 7: k = 1e3, M = 1e6, m = 1e-3.
  EXPECT_NEAR(*parse_resistance("12.3k"), 12.3e3, 1e-9);
  EXPECT_NEAR(*parse_resistance("1.5M"), 1.5e6, 1e-6);
  EXPECT_NEAR(*parse_resistance("4.7 k\xCE\xA9"), 4.7e3, 1e-9);
  EXPECT_NEAR(*parse_resistance("4.7kohm"), 4.7e3, 1e-9);
  EXPECT_NEAR(*parse_resistance("220 ohm"), 220, 1e-12);
  EXPECT_NEAR(*parse_resistance("20 M\xCE\xA9"), 20e6, 1e-6);
  EXPECT_NEAR(*parse_resistance("4,7k", ','), 4.7e3, 1e-9);
  EXPECT_NEAR(*parse_resistance("4.7e3"), 4.7e3, 1e-9);
  EXPECT_NEAR(*parse_number("1.2k", '.', true), 1.2e3, 1e-9);
  EXPECT_FALSE(parse_number("1.2k", '.', false));
}

TEST(Units, RejectsTextThatIsNotAValue) {
  for (const char* bad : {"", "abc", "4.7x", "x47", "4k7k7", "1,2", "nan", "inf", "0x10", "4..7",
                          "--4", "4.7 V", "."}) {
    EXPECT_FALSE(parse_resistance(bad)) << bad;
  }
  // A letter code needs a small integer part (IEC 60062 codes have a few digits): a 46-digit one
  // is refused, not cast into an integer it cannot fit (found by fuzz_spec; the sanitizer
  // build's test_fuzz replays that input from tests/fuzz/regressions/spec/).
  EXPECT_FALSE(parse_resistance(std::string(45, '6') + "2R1"));
  EXPECT_FALSE(parse_resistance("9007199254740992K1"));
  EXPECT_TRUE(parse_resistance("4R7"));
  EXPECT_FALSE(parse_number("12,5", '.'));
  EXPECT_FALSE(parse_number("12.5", ','));
  EXPECT_FALSE(parse_number("nan"));
  EXPECT_FALSE(parse_number("inf"));
}

// The standard library's std::from_chars is correctly rounded (C++17 [charconv.from.chars]);
// our fast path must give the same double, bit for bit, including values past its range.
TEST(Units, AgreesWithFromCharsToTheLastBit) {
  for (std::string_view text : {"0.1", "4.35", "20500", "0.30000000000000004", "9007199254740993",
                                "9007199254740992", "123456789012345678901", "1e23", "1e-23",
                                "2.2250738585072014e-308", "1.7976931348623157e308", "0.000001234",
                                "12345.678901234567", "0", "-0.5", "1e22", "3.0e-22"}) {
    double expected = 0;
    const std::string_view body = text[0] == '+' ? text.substr(1) : text;
    std::from_chars(body.data(), body.data() + body.size(), expected);
    const auto got = parse_number(text);
    ASSERT_TRUE(got) << text;
    EXPECT_EQ(*got, expected) << text;
  }
}

TEST(Units, ParsesDecimalCommaWithoutTheCLocale) {
  EXPECT_NEAR(*parse_number("12,5", ','), 12.5, 1e-15);
  EXPECT_NEAR(*parse_number("-0,25e2", ','), -25, 1e-15);
  // A process locale with a decimal comma (as Qt may set) must not change the result.
  const char* old = std::setlocale(LC_NUMERIC, nullptr);
  const std::string saved = old ? old : "C";
  if (std::setlocale(LC_NUMERIC, "de_DE.UTF-8")) {
    EXPECT_NEAR(*parse_number("12.5", '.'), 12.5, 1e-15);
    std::setlocale(LC_NUMERIC, saved.c_str());
  }
}

}  // namespace
}  // namespace photolot
