/// \file
/// Tests of quantities written in JSON inputs (spec section 3).
/// Prefix factors are checked against the SI prefixes of the SI Brochure, 9th ed. (BIPM 2019),
/// table 7; 1 in = 25.4 mm exactly (international inch, 1959), 1 mil = 0.001 in.

#include "checker/core/quantity_text.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <string>

namespace gateloop {
namespace {

double parseOk(std::string_view text, Dimension dim) {
  std::string err;
  auto v = parseQuantityText(text, dim, &err);
  EXPECT_TRUE(v.has_value()) << text << ": " << err;
  EXPECT_TRUE(v.has_value() || !err.empty());
  return v.value_or(-12345.0);
}

std::string parseErr(std::string_view text, Dimension dim) {
  std::string err;
  auto v = parseQuantityText(text, dim, &err);
  EXPECT_FALSE(v.has_value()) << text << " parsed as " << v.value_or(0);
  return err;
}

// SI Brochure 9th ed., table 7: T = 1e12, G = 1e9, M = 1e6, k = 1e3, c = 1e-2, m = 1e-3,
// µ = 1e-6, n = 1e-9, p = 1e-12, f = 1e-15.
TEST(QuantityText, SiPrefixesPerSiBrochure) {
  EXPECT_DOUBLE_EQ(parseOk("2 TOhm", Dimension::Resistance), 2e12);
  EXPECT_DOUBLE_EQ(parseOk("2 GHz", Dimension::Frequency), 2e9);
  EXPECT_DOUBLE_EQ(parseOk("2 MHz", Dimension::Frequency), 2e6);
  EXPECT_DOUBLE_EQ(parseOk("16 kHz", Dimension::Frequency), 16e3);
  EXPECT_DOUBLE_EQ(parseOk("3 cm", Dimension::Length), 3e-2);
  EXPECT_DOUBLE_EQ(parseOk("0.4 mm", Dimension::Length), 0.4e-3);
  EXPECT_DOUBLE_EQ(parseOk("2.4 uC", Dimension::Charge), 2.4e-6);
  EXPECT_DOUBLE_EQ(parseOk("2.4 \xC2\xB5" "C", Dimension::Charge), 2.4e-6); // U+00B5 micro sign
  EXPECT_DOUBLE_EQ(parseOk("2.4 \xCE\xBC" "C", Dimension::Charge), 2.4e-6); // U+03BC Greek mu
  EXPECT_DOUBLE_EQ(parseOk("4.7 nF", Dimension::Capacitance), 4.7e-9);
  EXPECT_DOUBLE_EQ(parseOk("550 pF", Dimension::Capacitance), 550e-12);
  EXPECT_DOUBLE_EQ(parseOk("30 fF", Dimension::Capacitance), 30e-15);
}

// Spec section 3: "m" is milli and "M" mega; case matters.
TEST(QuantityText, PrefixCaseMatters) {
  EXPECT_DOUBLE_EQ(parseOk("5 mohm", Dimension::Resistance), 5e-3);
  EXPECT_DOUBLE_EQ(parseOk("5 Mohm", Dimension::Resistance), 5e6);
  EXPECT_EQ(parseErr("16 KHz", Dimension::Frequency), "expected a frequency, got \"16 KHz\"");
  EXPECT_EQ(parseErr("4.7 nf", Dimension::Capacitance), "expected a capacitance, got \"4.7 nf\"");
}

TEST(QuantityText, SpaceIsOptionalAndSurroundingBlanksIgnored) {
  EXPECT_DOUBLE_EQ(parseOk("25nH", Dimension::Inductance), 25e-9);
  EXPECT_DOUBLE_EQ(parseOk("  800 V ", Dimension::Voltage), 800.0);
  EXPECT_DOUBLE_EQ(parseOk("1e3 V", Dimension::Voltage), 1000.0);
  EXPECT_DOUBLE_EQ(parseOk("-8 V", Dimension::Voltage), -8.0);
  EXPECT_DOUBLE_EQ(parseOk("+15V", Dimension::Voltage), 15.0);
  EXPECT_DOUBLE_EQ(parseOk(".5 A", Dimension::Current), 0.5);
}

TEST(QuantityText, OhmSpellings) {
  EXPECT_DOUBLE_EQ(parseOk("2.5 ohm", Dimension::Resistance), 2.5);
  EXPECT_DOUBLE_EQ(parseOk("2.5 Ohm", Dimension::Resistance), 2.5);
  EXPECT_DOUBLE_EQ(parseOk("10 kohm", Dimension::Resistance), 10e3);
  EXPECT_DOUBLE_EQ(parseOk("10 k\xCE\xA9", Dimension::Resistance), 10e3);    // Greek capital omega
  EXPECT_DOUBLE_EQ(parseOk("4.7 \xE2\x84\xA6", Dimension::Resistance), 4.7); // U+2126 ohm sign
}

TEST(QuantityText, EveryDimensionHasItsUnit) {
  EXPECT_DOUBLE_EQ(parseOk("0.1 W", Dimension::Power), 0.1);
  EXPECT_DOUBLE_EQ(parseOk("19 uJ", Dimension::Energy), 19e-6);
  EXPECT_DOUBLE_EQ(parseOk("450 ns", Dimension::Time), 450e-9);
  EXPECT_DOUBLE_EQ(parseOk("1 ms", Dimension::Time), 1e-3);
  EXPECT_DOUBLE_EQ(parseOk("300 A", Dimension::Current), 300.0);
  EXPECT_DOUBLE_EQ(parseOk("180 mm", Dimension::Length), 0.18);
  EXPECT_DOUBLE_EQ(parseOk("35 um", Dimension::Length), 35e-6);
}

// 1 mil = 25.4 um and 1 in = 25.4 mm (international inch).
TEST(QuantityText, MilAndInchAreWholeUnits) {
  EXPECT_DOUBLE_EQ(parseOk("10 mil", Dimension::Length), 254e-6);
  EXPECT_DOUBLE_EQ(parseOk("2 in", Dimension::Length), 50.8e-3);
  EXPECT_EQ(parseErr("2 kin", Dimension::Length), "expected a length, got \"2 kin\"");
}

TEST(QuantityText, Temperatures) {
  EXPECT_DOUBLE_EQ(parseOk("55 degC", Dimension::Temperature), 55.0);
  EXPECT_DOUBLE_EQ(parseOk("155 \xC2\xB0" "C", Dimension::Temperature), 155.0);
  EXPECT_DOUBLE_EQ(parseOk("-40degC", Dimension::Temperature), -40.0);
  EXPECT_DOUBLE_EQ(parseOk("70", Dimension::Temperature), 70.0); // a bare number is degC
  EXPECT_EQ(parseErr("55 mdegC", Dimension::Temperature), "expected a temperature, got \"55 mdegC\"");
}

// Compound units: prefixes on both sides, n/m = 1e-9/1e-3 = 1e-6 and so on.
TEST(QuantityText, InductancePerLengthAndSlopes) {
  EXPECT_DOUBLE_EQ(parseOk("1 nH/mm", Dimension::InductancePerLength), 1e-6);
  EXPECT_DOUBLE_EQ(parseOk("0.8 uH/m", Dimension::InductancePerLength), 0.8e-6);
  EXPECT_DOUBLE_EQ(parseOk("600 nH/m", Dimension::InductancePerLength), 600e-9);
  EXPECT_DOUBLE_EQ(parseOk("50 V/ns", Dimension::VoltageSlope), 50e9);
  EXPECT_DOUBLE_EQ(parseOk("20 kV/us", Dimension::VoltageSlope), 20e9);
  EXPECT_DOUBLE_EQ(parseOk("3 A/us", Dimension::CurrentSlope), 3e6);
  EXPECT_DOUBLE_EQ(parseOk("1.5 kA/us", Dimension::CurrentSlope), 1.5e9);
  EXPECT_EQ(parseErr("50 V/nm", Dimension::VoltageSlope), "expected a voltage slope, got \"50 V/nm\"");
  EXPECT_EQ(parseErr("1 nH", Dimension::InductancePerLength), "expected an inductance per length, got \"1 nH\"");
}

TEST(QuantityText, DimensionlessAndPercent) {
  EXPECT_DOUBLE_EQ(parseOk("0.7", Dimension::Dimensionless), 0.7);
  EXPECT_DOUBLE_EQ(parseOk("1 %", Dimension::Dimensionless), 0.01);
  EXPECT_DOUBLE_EQ(parseOk("5%", Dimension::Dimensionless), 0.05);
  EXPECT_EQ(parseErr("5 V", Dimension::Dimensionless), "expected a number, got \"5 V\"");
}

TEST(QuantityText, WrongUnitMessageMatchesSpec) {
  // Spec section 3's own example.
  EXPECT_EQ(parseErr("4.7 nH", Dimension::Capacitance), "expected a capacitance, got \"4.7 nH\"");
  EXPECT_EQ(parseErr("25 nF", Dimension::Inductance), "expected an inductance, got \"25 nF\"");
  EXPECT_EQ(parseErr("800 A", Dimension::Voltage), "expected a voltage, got \"800 A\"");
}

TEST(QuantityText, MissingUnitAndBadNumbers) {
  EXPECT_EQ(parseErr("4.7", Dimension::Capacitance),
            "expected a capacitance, got \"4.7\": a string needs a unit, such as \"4.7 nF\" (a bare number is "
            "read in SI units)");
  EXPECT_EQ(parseErr("abc nF", Dimension::Capacitance),
            "expected a capacitance, got \"abc nF\": it does not start with a number");
  EXPECT_EQ(parseErr("", Dimension::Voltage), "expected a voltage, got \"\": it does not start with a number");
  EXPECT_EQ(parseErr("inf V", Dimension::Voltage), "expected a voltage, got \"inf V\": it does not start with a number");
  EXPECT_EQ(parseErr("1e999 V", Dimension::Voltage), "expected a voltage, got \"1e999 V\": the number is out of range");
  EXPECT_EQ(parseErr("4.7.1 nF", Dimension::Capacitance), "expected a capacitance, got \"4.7.1 nF\"");
  EXPECT_EQ(parseErr("4,7 nF", Dimension::Capacitance), "expected a capacitance, got \"4,7 nF\"");
}

TEST(QuantityText, JsonValues) {
  std::string err;
  EXPECT_DOUBLE_EQ(parseQuantityJson(nlohmann::json(4.7e-9), Dimension::Capacitance, &err).value(), 4.7e-9);
  EXPECT_DOUBLE_EQ(parseQuantityJson(nlohmann::json(-20), Dimension::Voltage, &err).value(), -20.0);
  EXPECT_DOUBLE_EQ(parseQuantityJson(nlohmann::json("18 nF"), Dimension::Capacitance, &err).value(), 18e-9);
  EXPECT_FALSE(parseQuantityJson(nlohmann::json(true), Dimension::Capacitance, &err));
  EXPECT_EQ(err, "expected a capacitance, got true");
  EXPECT_FALSE(parseQuantityJson(nlohmann::json::array({1, 2}), Dimension::Length, &err));
  EXPECT_EQ(err, "expected a length, got [1,2]");
  EXPECT_FALSE(parseQuantityJson(nlohmann::json(nullptr), Dimension::Time, &err));
  EXPECT_EQ(err, "expected a time, got null");
}

TEST(QuantityText, ArticleNames) {
  EXPECT_STREQ(dimensionArticleName(Dimension::Inductance), "an inductance");
  EXPECT_STREQ(dimensionArticleName(Dimension::Energy), "an energy");
  EXPECT_STREQ(dimensionArticleName(Dimension::Resistance), "a resistance");
}

} // namespace
} // namespace gateloop
