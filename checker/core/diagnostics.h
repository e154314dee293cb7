/// \file
/// Problems with the inputs (as opposed to findings about the design). Readers collect every
/// problem they can find instead of stopping at the first one; any Error makes the run exit 2.
#pragma once

#include "checker/core/source_location.h"

#include <string>
#include <vector>

namespace gateloop {

/// SARIF's three levels; used for input problems and for rule findings alike.
enum class Severity { Note, Warning, Error };

const char *severityName(Severity s); ///< "note", "warning", "error"

/// One problem found while reading inputs.
struct InputDiagnostic {
  Severity severity = Severity::Error;
  SourceLocation where;   ///< file/line/column; line 0 when only the file is known
  std::string fieldPath;  ///< JSON field path such as "parts.Q-SW1.c_ies"; empty for text inputs
  std::string message;    ///< lowercase, no trailing period
};

/// Collects input problems across all readers of a run.
class InputDiagnostics {
public:
  void error(SourceLocation where, std::string message) {
    add({Severity::Error, where, {}, std::move(message)});
  }
  void fieldError(SourceLocation fileOnly, std::string fieldPath, std::string message) {
    add({Severity::Error, fileOnly, std::move(fieldPath), std::move(message)});
  }
  void note(SourceLocation where, std::string message) {
    add({Severity::Note, where, {}, std::move(message)});
  }
  void warning(SourceLocation where, std::string message) {
    add({Severity::Warning, where, {}, std::move(message)});
  }
  void add(InputDiagnostic d) { items_.push_back(std::move(d)); }

  bool hasErrors() const;
  std::size_t errorCount() const;
  const std::vector<InputDiagnostic> &items() const { return items_; }

private:
  std::vector<InputDiagnostic> items_;
};

/// Renders `FILE:LINE:COLUMN: error: MESSAGE` (line/column omitted when unknown) or, for a JSON
/// field, `FILE: FIELD.PATH: error: MESSAGE`.
std::string formatDiagnostic(const InputDiagnostic &d, const FileTable &files);

} // namespace gateloop
