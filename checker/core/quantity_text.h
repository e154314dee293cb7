/// \file
/// Physical quantities written in JSON input files (spec section 3): a number in SI base units,
/// or a string "<number> <prefix><unit>" whose unit must match the field's dimension. This is
/// deliberately separate from the SPICE value reader (netlist-io/spice_value.h): different rules
/// (here `m` is milli and `M` mega, case matters, and the unit is required and checked).
#pragma once

#include <nlohmann/json_fwd.hpp>

#include <optional>
#include <string>
#include <string_view>

namespace gateloop {

enum class Dimension {
  Resistance,          ///< ohm, Ohm, Ω
  Capacitance,         ///< F
  Inductance,          ///< H
  Voltage,             ///< V
  Current,             ///< A
  Power,               ///< W
  Energy,              ///< J
  Charge,              ///< C
  Time,                ///< s
  Frequency,           ///< Hz
  Length,              ///< m (also "mil" and "in" as whole units)
  Temperature,         ///< degC (°C); a bare number is degC as well
  InductancePerLength, ///< H/m with prefixes on both sides ("nH/mm", "uH/m")
  VoltageSlope,        ///< V/s ("50 V/ns", "kV/us")
  CurrentSlope,        ///< A/s ("1.5 kA/us")
  Dimensionless,       ///< a plain number
};

/// Human name of a dimension as used in messages ("a capacitance").
const char *dimensionArticleName(Dimension d);

/// Parses \p text as a quantity of dimension \p dim. On failure returns nullopt and sets
/// \p error to a message such as `expected a capacitance, got "4.7 nH"`.
std::optional<double> parseQuantityText(std::string_view text, Dimension dim, std::string *error);

/// Same for a JSON value: a number (SI) or a string as above.
std::optional<double> parseQuantityJson(const nlohmann::json &value, Dimension dim, std::string *error);

} // namespace gateloop
