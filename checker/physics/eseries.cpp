/// \file
/// IEC 60063 preferred values; see eseries.h.
#include "checker/physics/eseries.h"

#include <array>
#include <cmath>
#include <limits>
#include <vector>

namespace gateloop {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kSameValue = 1e-9; // relative; absorbs decimal scaling round-off

// IEC 60063:2015 tables. The two-figure series do not follow round(10^(i/n)), so they are stored.
constexpr std::array<double, 3> kE3 = {1.0, 2.2, 4.7};
constexpr std::array<double, 6> kE6 = {1.0, 1.5, 2.2, 3.3, 4.7, 6.8};
constexpr std::array<double, 12> kE12 = {1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2};
constexpr std::array<double, 24> kE24 = {1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0,
                                         2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3,
                                         4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1};

// Three-figure series: 10^(i/n) rounded to two decimals; E192 has the single exception 9.20
// where the formula gives 9.19 (IEC 60063).
std::vector<double> generateSeries(int n) {
  std::vector<double> v;
  v.reserve(static_cast<std::size_t>(n));
  for (int i = 0; i < n; ++i)
    v.push_back(std::round(std::pow(10.0, static_cast<double>(i) / n) * 100.0) / 100.0);
  if (n == 192)
    for (double &x : v)
      if (x == 9.19)
        x = 9.20;
  return v;
}

// Value m x 10^decade, divided rather than multiplied for negative decades so that 4.7e-9 comes
// out as the double nearest to 4.7/1e9 (powers of ten up to 1e22 are exact).
double scaled(double mantissa, int decade) {
  return decade >= 0 ? mantissa * std::pow(10.0, decade) : mantissa / std::pow(10.0, -decade);
}

// All preferred values in the decade of value and its two neighbours, ascending; enough for the
// nearest value and both neighbours even when log10 rounds across a decade boundary.
std::vector<double> candidates(double value, ESeries s) {
  const int decade = static_cast<int>(std::floor(std::log10(value)));
  const auto values = eseriesValues(s);
  std::vector<double> out;
  out.reserve(values.size() * 3);
  for (int d = decade - 1; d <= decade + 1; ++d)
    for (double m : values)
      out.push_back(scaled(m, d));
  return out;
}

bool usable(double value) { return std::isfinite(value) && value > 0.0; }

} // namespace

std::string_view eseriesName(ESeries s) {
  switch (s) {
  case ESeries::E3: return "E3";
  case ESeries::E6: return "E6";
  case ESeries::E12: return "E12";
  case ESeries::E24: return "E24";
  case ESeries::E48: return "E48";
  case ESeries::E96: return "E96";
  case ESeries::E192: return "E192";
  }
  return "E?";
}

std::optional<ESeries> parseESeries(std::string_view text) {
  for (ESeries s : {ESeries::E3, ESeries::E6, ESeries::E12, ESeries::E24, ESeries::E48,
                    ESeries::E96, ESeries::E192}) {
    const std::string_view name = eseriesName(s);
    if (text.size() == name.size() && (text[0] == 'E' || text[0] == 'e') &&
        text.substr(1) == name.substr(1))
      return s;
  }
  return std::nullopt;
}

int valuesPerDecade(ESeries s) { return static_cast<int>(eseriesValues(s).size()); }

std::span<const double> eseriesValues(ESeries s) {
  static const std::vector<double> e48 = generateSeries(48);
  static const std::vector<double> e96 = generateSeries(96);
  static const std::vector<double> e192 = generateSeries(192);
  switch (s) {
  case ESeries::E3: return kE3;
  case ESeries::E6: return kE6;
  case ESeries::E12: return kE12;
  case ESeries::E24: return kE24;
  case ESeries::E48: return e48;
  case ESeries::E96: return e96;
  case ESeries::E192: return e192;
  }
  return {};
}

std::optional<double> eseriesTolerance(ESeries s) {
  switch (s) {
  case ESeries::E3: return std::nullopt;
  case ESeries::E6: return 0.20;
  case ESeries::E12: return 0.10;
  case ESeries::E24: return 0.05;
  case ESeries::E48: return 0.02;
  case ESeries::E96: return 0.01;
  case ESeries::E192: return 0.005;
  }
  return std::nullopt;
}

double nearestPreferred(double value, ESeries s) {
  if (!usable(value))
    return kNaN;
  double best = kNaN;
  double bestDistance = std::numeric_limits<double>::infinity();
  // Ascending candidates with <= keep the larger value on an exact tie.
  for (double c : candidates(value, s)) {
    const double distance = std::abs(std::log(c / value));
    if (distance <= bestDistance) {
      best = c;
      bestDistance = distance;
    }
  }
  return best;
}

double nextPreferredAtOrAbove(double value, ESeries s) {
  if (!usable(value))
    return kNaN;
  for (double c : candidates(value, s))
    if (c >= value * (1.0 - kSameValue))
      return c;
  return kNaN; // unreachable: the decade above always has a candidate
}

double nextPreferredAtOrBelow(double value, ESeries s) {
  if (!usable(value))
    return kNaN;
  const auto all = candidates(value, s);
  for (auto it = all.rbegin(); it != all.rend(); ++it)
    if (*it <= value * (1.0 + kSameValue))
      return *it;
  return kNaN; // unreachable: the decade below always has a candidate
}

bool isPreferred(double value, ESeries s) {
  if (!usable(value))
    return false;
  const double nearest = nearestPreferred(value, s);
  return std::abs(nearest - value) <= kSameValue * value;
}

} // namespace gateloop
