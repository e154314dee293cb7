#include "checker/core/source_location.h"

#include <algorithm>

namespace gateloop {

LineIndex::LineIndex(std::string_view text) {
  lineStarts_.push_back(0);
  for (std::size_t i = 0; i < text.size(); ++i)
    if (text[i] == '\n') lineStarts_.push_back(i + 1);
}

SourceLocation LineIndex::locate(FileId file, std::size_t offset) const {
  auto it = std::upper_bound(lineStarts_.begin(), lineStarts_.end(), offset);
  std::size_t line = static_cast<std::size_t>(it - lineStarts_.begin()); // >= 1
  std::size_t column = offset - lineStarts_[line - 1] + 1;
  return {file, static_cast<std::uint32_t>(line), static_cast<std::uint32_t>(column)};
}

} // namespace gateloop
