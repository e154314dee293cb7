/// \file
/// Small text helpers shared by readers, rules and the command line.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace gateloop {

/// ASCII lower case; names in netlists, part ids and keys compare ignoring ASCII case only.
inline char lowerAscii(char c) { return (c >= 'A' && c <= 'Z') ? static_cast<char>(c - 'A' + 'a') : c; }

inline bool equalsIgnoreCase(std::string_view a, std::string_view b) {
  if (a.size() != b.size()) return false;
  for (std::size_t i = 0; i < a.size(); ++i)
    if (a[i] != b[i] && lowerAscii(a[i]) != lowerAscii(b[i])) return false;
  return true;
}

inline bool startsWithIgnoreCase(std::string_view s, std::string_view prefix) {
  return s.size() >= prefix.size() && equalsIgnoreCase(s.substr(0, prefix.size()), prefix);
}

/// Whether \p part lies inside \p text's characters (a view into it, not an equal copy).
inline bool viewsInto(std::string_view text, std::string_view part) {
  return part.data() >= text.data() && part.data() + part.size() <= text.data() + text.size();
}

/// Lower-cases ASCII letters.
std::string toLower(std::string_view s);

/// Hash of a name that ignores ASCII case, so "GH_1" and "gh_1" hash equal. Readers that keep
/// their own caches of names use the same function to hand the hash on to Circuit::net.
std::uint64_t hashIgnoreCase(std::string_view s) noexcept;

/// Optimal string alignment distance (Levenshtein plus adjacent transpositions), ignoring ASCII
/// case: "c_iesx" and "c_eis" are both one slip away from "c_ies".
std::size_t editDistance(std::string_view a, std::string_view b);

/// The candidate closest to \p word when it is a plausible typo: up to a third of the word may
/// differ, and a cut-short word ("t_amb" for "t_ambient") counts as close.
std::optional<std::string> closestMatch(std::string_view word, const std::vector<std::string> &candidates);

/// `; did you mean "x"?` for closestMatch, else "".
std::string didYouMean(std::string_view word, const std::vector<std::string> &candidates);

} // namespace gateloop
