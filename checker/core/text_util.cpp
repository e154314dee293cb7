#include "checker/core/text_util.h"

#include <algorithm>
#include <cstring>

namespace gateloop {

std::size_t editDistance(std::string_view a, std::string_view b) {
  const std::size_t n = a.size(), m = b.size();
  std::vector<std::vector<std::size_t>> d(n + 1, std::vector<std::size_t>(m + 1));
  for (std::size_t i = 0; i <= n; ++i) d[i][0] = i;
  for (std::size_t j = 0; j <= m; ++j) d[0][j] = j;
  for (std::size_t i = 1; i <= n; ++i)
    for (std::size_t j = 1; j <= m; ++j) {
      std::size_t cost = lowerAscii(a[i - 1]) == lowerAscii(b[j - 1]) ? 0 : 1;
      d[i][j] = std::min({d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + cost});
      if (i > 1 && j > 1 && lowerAscii(a[i - 1]) == lowerAscii(b[j - 2]) && lowerAscii(a[i - 2]) == lowerAscii(b[j - 1]))
        d[i][j] = std::min(d[i][j], d[i - 2][j - 2] + 1);
    }
  return d[n][m];
}

std::optional<std::string> closestMatch(std::string_view word, const std::vector<std::string> &candidates) {
  std::optional<std::string> best;
  std::size_t bestDistance = 0;
  // Up to a third of the word may differ; anything further is another word, not a typo.
  const std::size_t limit = std::max<std::size_t>(1, word.size() / 3);
  for (const auto &c : candidates) {
    std::size_t d = editDistance(word, c);
    if (d > limit && word.size() >= 3 && c.size() > word.size() &&
        std::equal(word.begin(), word.end(), c.begin(), [](char a, char b) { return lowerAscii(a) == lowerAscii(b); }))
      d = limit;
    if (d <= limit && (!best || d < bestDistance)) {
      best = c;
      bestDistance = d;
    }
  }
  return best;
}

std::string didYouMean(std::string_view word, const std::vector<std::string> &candidates) {
  auto best = closestMatch(word, candidates);
  return best ? "; did you mean \"" + *best + "\"?" : std::string();
}

std::string toLower(std::string_view s) {
  std::string out(s);
  for (char &ch : out)
    if (ch >= 'A' && ch <= 'Z') ch = static_cast<char>(ch - 'A' + 'a');
  return out;
}

std::uint64_t hashIgnoreCase(std::string_view s) noexcept {
  // Eight bytes at a time; OR-ing 0x20 into every byte folds ASCII upper case onto lower case
  // (and merges a few punctuation pairs, harmless for a hash), so names equal ignoring case hash
  // equal.
  constexpr std::uint64_t kFold = 0x2020202020202020ull;
  constexpr std::uint64_t kMul = 0xff51afd7ed558ccdull;
  std::uint64_t h = 0x9E3779B97F4A7C15ull ^ s.size();
  std::size_t i = 0;
  for (; i + 8 <= s.size(); i += 8) {
    std::uint64_t w;
    std::memcpy(&w, s.data() + i, 8);
    h = (h ^ (w | kFold)) * kMul;
    h ^= h >> 32;
  }
  if (i < s.size()) {
    std::uint64_t w = 0;
    std::memcpy(&w, s.data() + i, s.size() - i);
    h = (h ^ (w | kFold)) * kMul;
  }
  h ^= h >> 33;
  h *= kMul;
  h ^= h >> 33;
  return h;
}

} // namespace gateloop
