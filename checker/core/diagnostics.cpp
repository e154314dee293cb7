#include "checker/core/diagnostics.h"

#include <algorithm>

namespace gateloop {

const char *severityName(Severity s) {
  switch (s) {
  case Severity::Note: return "note";
  case Severity::Warning: return "warning";
  case Severity::Error: return "error";
  }
  return "error";
}

bool InputDiagnostics::hasErrors() const { return errorCount() != 0; }

std::size_t InputDiagnostics::errorCount() const {
  return static_cast<std::size_t>(std::count_if(items_.begin(), items_.end(), [](const auto &d) {
    return d.severity == Severity::Error;
  }));
}

std::string formatDiagnostic(const InputDiagnostic &d, const FileTable &files) {
  std::string out = d.where.file != 0 ? files.name(d.where.file) : std::string("gateloop");
  if (!d.fieldPath.empty()) {
    out += ": " + d.fieldPath;
  } else if (d.where.line != 0) {
    out += ":" + std::to_string(d.where.line);
    if (d.where.column != 0) out += ":" + std::to_string(d.where.column);
  }
  out += ": ";
  out += severityName(d.severity);
  out += ": ";
  out += d.message;
  return out;
}

} // namespace gateloop
