/// \file
/// Numbers for people: engineering prefixes and units ("4.7 ohm", "31 nH", "2.6 A").
#pragma once

#include <string>
#include <string_view>

namespace gateloop {

/// \p si in SI units shown with \p significant figures and a prefix (T..f); an empty unit prints
/// the plain number. NaN prints "n/a".
std::string eng(double si, std::string_view unit, int significant = 3);

} // namespace gateloop
