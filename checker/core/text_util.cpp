#include "checker/core/text_util.h"

#include <algorithm>

namespace gateloop {

namespace {
char lower(char c) { return c >= 'A' && c <= 'Z' ? static_cast<char>(c - 'A' + 'a') : c; }
} // namespace

std::size_t editDistance(std::string_view a, std::string_view b) {
  const std::size_t n = a.size(), m = b.size();
  std::vector<std::vector<std::size_t>> d(n + 1, std::vector<std::size_t>(m + 1));
  for (std::size_t i = 0; i <= n; ++i) d[i][0] = i;
  for (std::size_t j = 0; j <= m; ++j) d[0][j] = j;
  for (std::size_t i = 1; i <= n; ++i)
    for (std::size_t j = 1; j <= m; ++j) {
      std::size_t cost = lower(a[i - 1]) == lower(b[j - 1]) ? 0 : 1;
      d[i][j] = std::min({d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + cost});
      if (i > 1 && j > 1 && lower(a[i - 1]) == lower(b[j - 2]) && lower(a[i - 2]) == lower(b[j - 1]))
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
        std::equal(word.begin(), word.end(), c.begin(), [](char a, char b) { return lower(a) == lower(b); }))
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

} // namespace gateloop
