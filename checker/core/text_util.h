/// \file
/// Small text helpers shared by readers, rules and the command line.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace gateloop {

/// Optimal string alignment distance (Levenshtein plus adjacent transpositions), ignoring ASCII
/// case: "c_iesx" and "c_eis" are both one slip away from "c_ies".
std::size_t editDistance(std::string_view a, std::string_view b);

/// The candidate closest to \p word when it is a plausible typo: up to a third of the word may
/// differ, and a cut-short word ("t_amb" for "t_ambient") counts as close.
std::optional<std::string> closestMatch(std::string_view word, const std::vector<std::string> &candidates);

/// `; did you mean "x"?` for closestMatch, else "".
std::string didYouMean(std::string_view word, const std::vector<std::string> &candidates);

} // namespace gateloop
