/// \file
/// Reader for SPICE decks (spec 4.1): Berkeley SPICE 3 syntax with the dot cards and element
/// letters used across the trade; hierarchy flattened into a Circuit.
#pragma once

#include "checker/core/diagnostics.h"
#include "checker/model/circuit.h"

#include <cstddef>
#include <string>
#include <string_view>

namespace gateloop {

struct SpiceReadOptions {
  std::string projectRoot;          ///< includes must stay below this folder (absolute path)
  bool allowOutsideRoot = false;
  std::size_t maxElements = 5'000'000; ///< cap on flattened elements
  unsigned maxIncludeDepth = 32;
};

/// Reads the deck at \p path (display name relative to options.projectRoot where possible),
/// following .include/.lib, and flattens it into \p out. Every problem goes to \p diags (errors
/// with file, line and column; notes for constructs read but not modelled). Returns false when an
/// error was reported.
bool readSpiceDeck(const std::string &path, const SpiceReadOptions &options, FileTable &files,
                   Circuit &out, InputDiagnostics &diags);

/// Same for deck text held in memory (tests, fuzzing). Includes are resolved relative to
/// options.projectRoot.
bool readSpiceText(std::string_view text, const std::string &displayName,
                   const SpiceReadOptions &options, FileTable &files, Circuit &out,
                   InputDiagnostics &diags);

} // namespace gateloop
