/// \file
/// SPICE number syntax (Berkeley SPICE 3 rules) and IEC 60062 RKM codes, as found in decks.
#pragma once

#include <optional>
#include <string_view>

namespace gateloop {

struct SpiceValue {
  double value = 0.0;
  /// True when the token was read as an IEC 60062 RKM code (`4k7`, `4R7`, `1M0`), which SPICE
  /// simulators read differently; callers attach a note to the element.
  bool rkm = false;
};

/// Reads one SPICE value token: number, optional exponent, optional scale factor
/// (T G MEG K M U N P F MIL, case-insensitive, M = milli), trailing letters ignored; or an RKM
/// code with the multiplier letter in place of the decimal point. nullopt when the token does not
/// start with a number.
///
/// Details (docs/spice-reader.md): the micro sign (U+00B5) and Greek mu (U+03BC) count as `u`;
/// after the number only letters (ASCII or non-ASCII UTF-8) may follow, so `4.7k7`, `1,5` and
/// `5%` give nullopt instead of a silently truncated number. RKM codes are digits, one of the
/// letters R K M G T p n u (either case) and digits (`4k7`, `2u2`), optionally followed by letters
/// (`4k7J`), or `R` followed by digits (`R47`); `M` is mega there, as IEC 60062 says. `47R` reads
/// as 47 in both readings and is not flagged. Three-digit codes (`472`) are plain numbers.
std::optional<SpiceValue> parseSpiceValue(std::string_view token);

/// How a Berkeley SPICE 3 number reader reads \p token: number, exponent, one scale factor, and
/// everything after that dropped (`4k7` -> 4000, `1M0` -> 0.001, `4R7` -> 4). nullopt when it
/// would reject the token (`R47`). Used to word the note on RKM values.
std::optional<double> parseSpice3Value(std::string_view token);

} // namespace gateloop
