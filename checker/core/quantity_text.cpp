/// \file
/// Quantities in JSON inputs (spec section 3): SI prefixes and unit symbols, case-sensitive.

#include "checker/core/quantity_text.h"

#include <nlohmann/json.hpp>

#include <array>
#include <charconv>
#include <cmath>
#include <string>
#include <vector>

namespace gateloop {

namespace {

/// One accepted unit spelling and the factor that takes it to the stored unit.
struct UnitSymbol {
  std::string_view text;
  double factor;
  bool prefixable; ///< whether an SI prefix may stand in front of it
};

/// SI prefixes (SI Brochure, 9th ed., BIPM 2019, table 7). Longer spellings first so the
/// two-byte micro signs are tried before single letters. `c` (centi) is in the brochure too and
/// is accepted because "cm" is common in lengths.
struct Prefix {
  std::string_view text;
  double factor;
};
constexpr std::array<Prefix, 12> kPrefixes{{
    {"\xC2\xB5", 1e-6}, // U+00B5 MICRO SIGN
    {"\xCE\xBC", 1e-6}, // U+03BC GREEK SMALL LETTER MU
    {"T", 1e12},
    {"G", 1e9},
    {"M", 1e6},
    {"k", 1e3},
    {"c", 1e-2},
    {"m", 1e-3},
    {"u", 1e-6},
    {"n", 1e-9},
    {"p", 1e-12},
    {"f", 1e-15},
}};

constexpr double kMil = 25.4e-6; // 1 mil = 0.001 in, 1 in = 25.4 mm exactly (international inch, 1959)

const std::vector<UnitSymbol> &unitsOf(Dimension d) {
  static const std::vector<UnitSymbol> resistance{
      {"ohm", 1, true}, {"Ohm", 1, true}, {"ohms", 1, true}, {"Ohms", 1, true},
      {"\xCE\xA9", 1, true},      // U+03A9 GREEK CAPITAL LETTER OMEGA
      {"\xE2\x84\xA6", 1, true}}; // U+2126 OHM SIGN
  static const std::vector<UnitSymbol> capacitance{{"F", 1, true}};
  static const std::vector<UnitSymbol> inductance{{"H", 1, true}};
  static const std::vector<UnitSymbol> voltage{{"V", 1, true}};
  static const std::vector<UnitSymbol> current{{"A", 1, true}};
  static const std::vector<UnitSymbol> power{{"W", 1, true}};
  static const std::vector<UnitSymbol> energy{{"J", 1, true}};
  static const std::vector<UnitSymbol> charge{{"C", 1, true}};
  static const std::vector<UnitSymbol> time{{"s", 1, true}};
  static const std::vector<UnitSymbol> frequency{{"Hz", 1, true}};
  static const std::vector<UnitSymbol> length{
      {"m", 1, true}, {"mil", kMil, false}, {"mils", kMil, false}, {"in", 1000 * kMil, false}};
  static const std::vector<UnitSymbol> temperature{
      {"degC", 1, false}, {"\xC2\xB0" "C", 1, false} /* °C */, {"\xE2\x84\x83", 1, false} /* ℃ */};
  static const std::vector<UnitSymbol> dimensionless{{"%", 0.01, false}};
  static const std::vector<UnitSymbol> none{};
  switch (d) {
  case Dimension::Resistance: return resistance;
  case Dimension::Capacitance: return capacitance;
  case Dimension::Inductance: return inductance;
  case Dimension::Voltage: return voltage;
  case Dimension::Current: return current;
  case Dimension::Power: return power;
  case Dimension::Energy: return energy;
  case Dimension::Charge: return charge;
  case Dimension::Time: return time;
  case Dimension::Frequency: return frequency;
  case Dimension::Length: return length;
  case Dimension::Temperature: return temperature;
  case Dimension::Dimensionless: return dimensionless;
  case Dimension::InductancePerLength:
  case Dimension::VoltageSlope:
  case Dimension::CurrentSlope: return none; // compound; handled by matchCompound
  }
  return none;
}

/// A typical spelling used in the "needs a unit" hint.
const char *exampleUnit(Dimension d) {
  switch (d) {
  case Dimension::Resistance: return "ohm";
  case Dimension::Capacitance: return "nF";
  case Dimension::Inductance: return "nH";
  case Dimension::Voltage: return "V";
  case Dimension::Current: return "A";
  case Dimension::Power: return "W";
  case Dimension::Energy: return "uJ";
  case Dimension::Charge: return "nC";
  case Dimension::Time: return "ns";
  case Dimension::Frequency: return "kHz";
  case Dimension::Length: return "mm";
  case Dimension::Temperature: return "degC";
  case Dimension::InductancePerLength: return "nH/mm";
  case Dimension::VoltageSlope: return "V/ns";
  case Dimension::CurrentSlope: return "A/us";
  case Dimension::Dimensionless: return "%";
  }
  return "";
}

/// Factor of \p unit against \p symbols, with an optional SI prefix; exact (unprefixed)
/// spellings are tried first so "mil" is a mil and "m" a metre, never a prefix on nothing.
std::optional<double> matchSimple(std::string_view unit, const std::vector<UnitSymbol> &symbols) {
  for (const auto &s : symbols)
    if (unit == s.text) return s.factor;
  for (const auto &p : kPrefixes) {
    if (unit.size() <= p.text.size() || unit.substr(0, p.text.size()) != p.text) continue;
    std::string_view rest = unit.substr(p.text.size());
    for (const auto &s : symbols)
      if (s.prefixable && rest == s.text) return p.factor * s.factor;
  }
  return std::nullopt;
}

/// "<prefix>NUM/<prefix>DEN", e.g. "nH/mm" or "kV/us".
std::optional<double> matchCompound(std::string_view unit, const std::vector<UnitSymbol> &num,
                                    const std::vector<UnitSymbol> &den) {
  auto slash = unit.find('/');
  if (slash == std::string_view::npos) return std::nullopt;
  auto n = matchSimple(unit.substr(0, slash), num);
  auto d = matchSimple(unit.substr(slash + 1), den);
  if (!n || !d) return std::nullopt;
  return *n / *d;
}

std::optional<double> unitFactor(std::string_view unit, Dimension dim) {
  switch (dim) {
  case Dimension::InductancePerLength:
    return matchCompound(unit, unitsOf(Dimension::Inductance), unitsOf(Dimension::Length));
  case Dimension::VoltageSlope:
    return matchCompound(unit, unitsOf(Dimension::Voltage), unitsOf(Dimension::Time));
  case Dimension::CurrentSlope:
    return matchCompound(unit, unitsOf(Dimension::Current), unitsOf(Dimension::Time));
  default: return matchSimple(unit, unitsOf(dim));
  }
}

bool isSpace(char c) { return c == ' ' || c == '\t' || c == '\n' || c == '\r'; }
bool isDigit(char c) { return c >= '0' && c <= '9'; }

/// Length of the decimal number at the start of \p s ([+-]digits[.digits][e[+-]digits]), 0 when
/// there is none. Written out instead of left to from_chars so that "inf", "nan" and hex never
/// count as numbers, and an "e" not followed by digits stays part of the unit.
std::size_t scanNumber(std::string_view s) {
  std::size_t i = 0;
  if (i < s.size() && (s[i] == '+' || s[i] == '-')) ++i;
  std::size_t digits = 0;
  while (i < s.size() && isDigit(s[i])) ++i, ++digits;
  if (i < s.size() && s[i] == '.') {
    ++i;
    while (i < s.size() && isDigit(s[i])) ++i, ++digits;
  }
  if (digits == 0) return 0;
  if (i < s.size() && (s[i] == 'e' || s[i] == 'E')) {
    std::size_t j = i + 1;
    if (j < s.size() && (s[j] == '+' || s[j] == '-')) ++j;
    std::size_t expDigits = 0;
    while (j < s.size() && isDigit(s[j])) ++j, ++expDigits;
    if (expDigits != 0) i = j;
  }
  return i;
}

std::string quoted(std::string_view text) {
  // Reuse the JSON string escaper so control characters cannot garble a message.
  return nlohmann::json(std::string(text)).dump(-1, ' ', false, nlohmann::json::error_handler_t::replace);
}

std::string expected(Dimension dim) { return std::string("expected ") + dimensionArticleName(dim); }

} // namespace

const char *dimensionArticleName(Dimension d) {
  switch (d) {
  case Dimension::Resistance: return "a resistance";
  case Dimension::Capacitance: return "a capacitance";
  case Dimension::Inductance: return "an inductance";
  case Dimension::Voltage: return "a voltage";
  case Dimension::Current: return "a current";
  case Dimension::Power: return "a power";
  case Dimension::Energy: return "an energy";
  case Dimension::Charge: return "a charge";
  case Dimension::Time: return "a time";
  case Dimension::Frequency: return "a frequency";
  case Dimension::Length: return "a length";
  case Dimension::Temperature: return "a temperature";
  case Dimension::InductancePerLength: return "an inductance per length";
  case Dimension::VoltageSlope: return "a voltage slope";
  case Dimension::CurrentSlope: return "a current slope";
  case Dimension::Dimensionless: return "a number";
  }
  return "a value";
}

std::optional<double> parseQuantityText(std::string_view text, Dimension dim, std::string *error) {
  auto fail = [&](std::string msg) -> std::optional<double> {
    if (error) *error = std::move(msg);
    return std::nullopt;
  };
  std::string_view s = text;
  while (!s.empty() && isSpace(s.front())) s.remove_prefix(1);
  while (!s.empty() && isSpace(s.back())) s.remove_suffix(1);

  std::size_t numLen = scanNumber(s);
  if (numLen == 0) return fail(expected(dim) + ", got " + quoted(text) + ": it does not start with a number");
  std::string_view numText = s.substr(0, numLen);
  if (numText.front() == '+') numText.remove_prefix(1); // from_chars takes no leading '+'
  double number = 0.0;
  auto [end, ec] = std::from_chars(numText.data(), numText.data() + numText.size(), number);
  if (ec != std::errc() || end != numText.data() + numText.size() || !std::isfinite(number))
    return fail(expected(dim) + ", got " + quoted(text) + ": the number is out of range");

  std::string_view unit = s.substr(numLen);
  while (!unit.empty() && isSpace(unit.front())) unit.remove_prefix(1);

  if (unit.empty()) {
    // A bare number inside a string is only unambiguous where there is no unit to forget.
    if (dim == Dimension::Dimensionless || dim == Dimension::Temperature) return number;
    return fail(expected(dim) + ", got " + quoted(text) + ": a string needs a unit, such as \"" +
                std::string(s) + " " + exampleUnit(dim) + "\" (a bare number is read in SI units)");
  }
  auto factor = unitFactor(unit, dim);
  if (!factor) return fail(expected(dim) + ", got " + quoted(text));
  return number * *factor;
}

std::optional<double> parseQuantityJson(const nlohmann::json &value, Dimension dim, std::string *error) {
  if (value.is_number()) {
    double v = value.get<double>();
    if (!std::isfinite(v)) {
      if (error) *error = expected(dim) + ", got " + value.dump() + ": the number is out of range";
      return std::nullopt;
    }
    return v;
  }
  if (value.is_string()) return parseQuantityText(value.get_ref<const std::string &>(), dim, error);
  if (error)
    *error = expected(dim) + ", got " +
             value.dump(-1, ' ', false, nlohmann::json::error_handler_t::replace);
  return std::nullopt;
}

} // namespace gateloop
