// Engineering notation for messages and tables: SI prefixes (SI Brochure, 9th ed., BIPM 2019,
// table 7) with three significant figures by default.
#include "checker/core/eng_format.h"

#include <gtest/gtest.h>

#include <cmath>

using gateloop::eng;

TEST(EngFormat, PrefixesAndTrailingZeros) {
  EXPECT_EQ(eng(4.7, "ohm"), "4.7 ohm");
  EXPECT_EQ(eng(0.47, "ohm"), "470 mohm");
  EXPECT_EQ(eng(9.3826e-9, "H"), "9.38 nH");
  EXPECT_EQ(eng(104.3478e-9, "F"), "104 nF");
  EXPECT_EQ(eng(2.0, "V"), "2 V");
  EXPECT_EQ(eng(16e3, "Hz"), "16 kHz");
  EXPECT_EQ(eng(-8.0, "V"), "-8 V");
  EXPECT_EQ(eng(0.0, "W"), "0 W");
  EXPECT_EQ(eng(1e-16, "F"), "0.1 fF");
}

TEST(EngFormat, RoundingAtPrefixBoundary) {
  // 999.96 mV rounds to three figures as 1 V, not "1000 mV".
  EXPECT_EQ(eng(0.99996, "V"), "1 V");
  EXPECT_EQ(eng(0.9994, "V"), "999 mV");
}

TEST(EngFormat, PlainNumbersAndSpecialValues) {
  EXPECT_EQ(eng(0.75, ""), "0.75");
  EXPECT_EQ(eng(0.316228, "", 2), "0.32");
  EXPECT_EQ(eng(std::nan(""), "V"), "n/a");
  EXPECT_EQ(eng(INFINITY, "m"), "inf");
}
