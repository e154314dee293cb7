/// \file
/// IEC 60063 preferred values against the tables of IEC 60063:2015 as reproduced in
/// docs/physics.md "Preferred values" (physics.md 5.1) and its nearest-value checks.
#include "checker/physics/eseries.h"

#include <gtest/gtest.h>

#include <cmath>
#include <vector>

using namespace gateloop;

namespace {

std::vector<double> valuesOf(ESeries s) {
  const auto v = eseriesValues(s);
  return {v.begin(), v.end()};
}

std::vector<double> everySecond(const std::vector<double> &v) {
  std::vector<double> out;
  for (std::size_t i = 0; i < v.size(); i += 2)
    out.push_back(v[i]);
  return out;
}

} // namespace

TEST(PhysicsESeries, FullE24Table) {
  // IEC 60063:2015 E24 table (physics.md 5.1).
  const std::vector<double> e24 = {1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0,
                                   3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1};
  EXPECT_EQ(valuesOf(ESeries::E24), e24);
}

TEST(PhysicsESeries, SmallSeriesTables) {
  // IEC 60063:2015 tables for E3, E6, E12 (physics.md 5.1).
  EXPECT_EQ(valuesOf(ESeries::E3), (std::vector<double>{1.0, 2.2, 4.7}));
  EXPECT_EQ(valuesOf(ESeries::E6), (std::vector<double>{1.0, 1.5, 2.2, 3.3, 4.7, 6.8}));
  EXPECT_EQ(valuesOf(ESeries::E12), (std::vector<double>{1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9,
                                                        4.7, 5.6, 6.8, 8.2}));
  // physics.md 5.1 (b, verified there): E12 = every second E24 value, E6 = every second E12.
  EXPECT_EQ(valuesOf(ESeries::E12), everySecond(valuesOf(ESeries::E24)));
  EXPECT_EQ(valuesOf(ESeries::E6), everySecond(valuesOf(ESeries::E12)));
}

TEST(PhysicsESeries, FullE96Table) {
  // IEC 60063:2015 E96 table (physics.md 5.1); the generated series must match it exactly.
  const std::vector<double> e96 = {
      1.00, 1.02, 1.05, 1.07, 1.10, 1.13, 1.15, 1.18, 1.21, 1.24, 1.27, 1.30, 1.33, 1.37, 1.40, 1.43,
      1.47, 1.50, 1.54, 1.58, 1.62, 1.65, 1.69, 1.74, 1.78, 1.82, 1.87, 1.91, 1.96, 2.00, 2.05, 2.10,
      2.15, 2.21, 2.26, 2.32, 2.37, 2.43, 2.49, 2.55, 2.61, 2.67, 2.74, 2.80, 2.87, 2.94, 3.01, 3.09,
      3.16, 3.24, 3.32, 3.40, 3.48, 3.57, 3.65, 3.74, 3.83, 3.92, 4.02, 4.12, 4.22, 4.32, 4.42, 4.53,
      4.64, 4.75, 4.87, 4.99, 5.11, 5.23, 5.36, 5.49, 5.62, 5.76, 5.90, 6.04, 6.19, 6.34, 6.49, 6.65,
      6.81, 6.98, 7.15, 7.32, 7.50, 7.68, 7.87, 8.06, 8.25, 8.45, 8.66, 8.87, 9.09, 9.31, 9.53, 9.76};
  EXPECT_EQ(valuesOf(ESeries::E96), e96);
  // physics.md 5.1: E48 = every second E96 value starting at 1.00.
  EXPECT_EQ(valuesOf(ESeries::E48), everySecond(e96));
  EXPECT_EQ(valuesOf(ESeries::E48).front(), 1.00);
  EXPECT_EQ(valuesOf(ESeries::E48).back(), 9.53);
}

TEST(PhysicsESeries, E192HasThePatchedValue) {
  // IEC 60063 E192: generated, with the single exception 9.20 where 10^(185/192) rounds to 9.19
  // (physics.md 5.1, from memory for E192).
  const auto e192 = valuesOf(ESeries::E192);
  ASSERT_EQ(e192.size(), 192u);
  int count920 = 0, count919 = 0;
  for (double v : e192) {
    count920 += v == 9.20;
    count919 += v == 9.19;
  }
  EXPECT_EQ(count920, 1);
  EXPECT_EQ(count919, 0);
  // E96 values are the even-indexed E192 values (the series are nested by construction).
  EXPECT_EQ(everySecond(e192), valuesOf(ESeries::E96));
  for (std::size_t i = 1; i < e192.size(); ++i)
    EXPECT_LT(e192[i - 1], e192[i]);
}

TEST(PhysicsESeries, NearestValueChecks) {
  // physics.md 5.1 check (b), nearest in log space.
  EXPECT_DOUBLE_EQ(nearestPreferred(4.6, ESeries::E12), 4.7);
  EXPECT_DOUBLE_EQ(nearestPreferred(4.6, ESeries::E24), 4.7);
  EXPECT_DOUBLE_EQ(nearestPreferred(4.6, ESeries::E96), 4.64);
  EXPECT_DOUBLE_EQ(nearestPreferred(9.6, ESeries::E24), 10.0);  // next decade
  EXPECT_DOUBLE_EQ(nearestPreferred(9.6, ESeries::E96), 9.53);
  EXPECT_DOUBLE_EQ(nearestPreferred(2050.0, ESeries::E24), 2000.0);
  EXPECT_DOUBLE_EQ(nearestPreferred(2050.0, ESeries::E12), 2200.0);
  EXPECT_DOUBLE_EQ(nearestPreferred(2050.0, ESeries::E96), 2050.0);
  // physics.md 5.1: 3.148 -> 3.3 in E24 (geometric boundary 3.1464; a linear rule gives 3.0).
  EXPECT_DOUBLE_EQ(nearestPreferred(3.148, ESeries::E24), 3.3);
  EXPECT_DOUBLE_EQ(nearestPreferred(3.146, ESeries::E24), 3.0);
  // Small and large decades (gate-loop capacitors and pull-down resistors).
  EXPECT_DOUBLE_EQ(nearestPreferred(4.6e-9, ESeries::E12), 4.7e-9);
  EXPECT_DOUBLE_EQ(nearestPreferred(9.8e3, ESeries::E12), 10e3);
  EXPECT_TRUE(std::isnan(nearestPreferred(0.0, ESeries::E12)));
  EXPECT_TRUE(std::isnan(nearestPreferred(-4.7, ESeries::E12)));
}

TEST(PhysicsESeries, NextValueAboveAndBelow) {
  // Neighbours in the IEC 60063 E24 / E12 tables (physics.md 5.1).
  EXPECT_DOUBLE_EQ(nextPreferredAtOrAbove(4.7, ESeries::E24), 4.7);
  EXPECT_DOUBLE_EQ(nextPreferredAtOrBelow(4.7, ESeries::E24), 4.7);
  EXPECT_DOUBLE_EQ(nextPreferredAtOrAbove(4.71, ESeries::E24), 5.1);
  EXPECT_DOUBLE_EQ(nextPreferredAtOrBelow(4.71, ESeries::E24), 4.7);
  EXPECT_DOUBLE_EQ(nextPreferredAtOrAbove(9.2, ESeries::E24), 10.0);
  EXPECT_DOUBLE_EQ(nextPreferredAtOrBelow(9.2, ESeries::E24), 9.1);
  EXPECT_DOUBLE_EQ(nextPreferredAtOrAbove(0.00095, ESeries::E12), 0.001);
  EXPECT_DOUBLE_EQ(nextPreferredAtOrBelow(0.00095, ESeries::E12), 0.00082);
  EXPECT_DOUBLE_EQ(nextPreferredAtOrBelow(1000.0, ESeries::E3), 1000.0);
  EXPECT_DOUBLE_EQ(nextPreferredAtOrBelow(999.0, ESeries::E3), 470.0);
  // 4.7k written with round-off still counts as the preferred value.
  EXPECT_TRUE(isPreferred(4.7 * 1000.0 * (1.0 + 1e-12), ESeries::E12));
  EXPECT_FALSE(isPreferred(4.8e3, ESeries::E12));
}

TEST(PhysicsESeries, NamesAndTolerances) {
  // Usual associated tolerances (physics.md 5.1, from memory).
  EXPECT_EQ(eseriesTolerance(ESeries::E6), 0.20);
  EXPECT_EQ(eseriesTolerance(ESeries::E12), 0.10);
  EXPECT_EQ(eseriesTolerance(ESeries::E24), 0.05);
  EXPECT_EQ(eseriesTolerance(ESeries::E48), 0.02);
  EXPECT_EQ(eseriesTolerance(ESeries::E96), 0.01);
  EXPECT_EQ(eseriesTolerance(ESeries::E192), 0.005);
  EXPECT_FALSE(eseriesTolerance(ESeries::E3).has_value());
  EXPECT_EQ(valuesPerDecade(ESeries::E192), 192);
  EXPECT_EQ(eseriesName(ESeries::E96), "E96");
  EXPECT_EQ(parseESeries("e24"), ESeries::E24);
  EXPECT_EQ(parseESeries("E192"), ESeries::E192);
  EXPECT_FALSE(parseESeries("E25").has_value());
  EXPECT_FALSE(parseESeries("").has_value());
}
