/// \file
/// Small text helpers shared by readers, rules and the command line.
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace gateloop {

/// Levenshtein distance, for "did you mean" suggestions.
std::size_t editDistance(std::string_view a, std::string_view b);

/// `; did you mean "x"?` for the closest candidate within a small distance, else "".
std::string didYouMean(std::string_view word, const std::vector<std::string> &candidates);

} // namespace gateloop
