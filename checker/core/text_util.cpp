#include "checker/core/text_util.h"

#include <algorithm>
#include <numeric>

namespace gateloop {

std::size_t editDistance(std::string_view a, std::string_view b) {
  std::vector<std::size_t> row(b.size() + 1);
  std::iota(row.begin(), row.end(), std::size_t{0});
  for (std::size_t i = 1; i <= a.size(); ++i) {
    std::size_t diag = row[0];
    row[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      std::size_t up = row[j];
      row[j] = std::min({row[j] + 1, row[j - 1] + 1, diag + (a[i - 1] == b[j - 1] ? 0u : 1u)});
      diag = up;
    }
  }
  return row[b.size()];
}

std::string didYouMean(std::string_view word, const std::vector<std::string> &candidates) {
  const std::string *best = nullptr;
  std::size_t bestDistance = 0;
  for (const auto &c : candidates) {
    std::size_t d = editDistance(word, c);
    if (!best || d < bestDistance) {
      best = &c;
      bestDistance = d;
    }
  }
  // Beyond a third of the word's length a suggestion is more confusing than helpful.
  if (!best || bestDistance == 0 || bestDistance > std::max<std::size_t>(2, word.size() / 3)) return {};
  return "; did you mean \"" + *best + "\"?";
}

} // namespace gateloop
