/// \file
/// IEC 60063 preferred-number series E3 ... E192 (docs/physics.md "Preferred values"): the
/// values per decade, the nearest preferred value in log space and the next value above or below.
/// E3-E24 are stored tables (they contain historic values off the geometric formula, such as 2.7,
/// 3.3, 4.7 and 8.2); E48, E96 and E192 are generated as 10^(i/n) rounded to three figures, with
/// IEC 60063's single exception 9.20 (formula 9.19) patched into E192.
#pragma once

#include <optional>
#include <span>
#include <string_view>

namespace gateloop {

/// The IEC 60063 series.
enum class ESeries { E3, E6, E12, E24, E48, E96, E192 };

/// "E3" ... "E192".
std::string_view eseriesName(ESeries s);

/// Parses "E24" or "e24"; empty for anything else.
std::optional<ESeries> parseESeries(std::string_view text);

/// Number of values per decade (3, 6, ..., 192).
int valuesPerDecade(ESeries s);

/// The series' values in the decade [1, 10), ascending (E24: 1.0, 1.1, ..., 9.1). The span stays
/// valid for the whole program.
std::span<const double> eseriesValues(ESeries s);

/// Tolerance usually associated with the series, as a fraction (E6 0.20, E12 0.10, E24 0.05,
/// E48 0.02, E96 0.01, E192 0.005). Empty for E3, for which IEC 60063 associates no single
/// tolerance (it is used for parts wider than 20 %).
std::optional<double> eseriesTolerance(ESeries s);

/// Preferred value of series \p s nearest to \p value, compared in log space (the boundary
/// between two neighbours is their geometric mean, so 3.148 goes to 3.3 in E24, not 3.0). Works in
/// every decade, including across a decade boundary (9.6 -> 10 in E24). An exact tie goes to the
/// larger value. NaN for a value that is not positive and finite.
double nearestPreferred(double value, ESeries s);

/// Smallest preferred value >= \p value (values within 1e-9 relative of a preferred value count
/// as equal to it). NaN for a value that is not positive and finite.
double nextPreferredAtOrAbove(double value, ESeries s);

/// Largest preferred value <= \p value (same tolerance as nextPreferredAtOrAbove).
double nextPreferredAtOrBelow(double value, ESeries s);

/// True when \p value is a preferred value of \p s within 1e-9 relative (4.7e3 is in E12).
bool isPreferred(double value, ESeries s);

} // namespace gateloop
