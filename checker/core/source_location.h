/// \file
/// Where a piece of input came from. Every parsed element, net and field keeps one, so a finding
/// can point back at the line an engineer has to edit.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

namespace gateloop {

using FileId = std::uint32_t;

/// A position in one input file. Line and column are 1-based; 0 means unknown, and formatters
/// then leave that part out instead of inventing one.
struct SourceLocation {
  FileId file = 0;
  std::uint32_t line = 0;
  std::uint32_t column = 0;

  bool known() const { return line != 0; }
};

/// The table of input files of one run. Index 0 is reserved for "no file".
/// Display names are the paths as the user should read them (relative to the project root where
/// possible).
class FileTable {
public:
  FileTable() { names_.emplace_back(); }
  FileId add(std::string displayName) {
    names_.push_back(std::move(displayName));
    return static_cast<FileId>(names_.size() - 1);
  }
  const std::string &name(FileId id) const { return names_.at(id); }
  std::size_t size() const { return names_.size(); }

private:
  std::vector<std::string> names_;
};

/// Turns byte offsets into 1-based line and column. Built once per file; lookups are a binary
/// search, so parsers only pay for it when they actually report something.
class LineIndex {
public:
  explicit LineIndex(std::string_view text);
  /// Line and column (1-based, column counted in bytes) of \p offset; offsets past the end map to
  /// the last position.
  SourceLocation locate(FileId file, std::size_t offset) const;

private:
  std::vector<std::size_t> lineStarts_;
};

} // namespace gateloop
