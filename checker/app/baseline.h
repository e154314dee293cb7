/// \file
/// Baseline files: findings a team has accepted. Matched by fingerprint (rule, design, loop,
/// components), never by line number, so moving code does not break the match.
#pragma once

#include "checker/core/diagnostics.h"
#include "checker/report/report.h"

#include <string>
#include <vector>

namespace gateloop {

struct BaselineEntry {
  std::string fingerprint, rule, design, loop;
  std::vector<std::string> refs;
};

/// Reads a baseline file (`gateloop-baseline/1`). Problems go to \p diags.
bool readBaseline(const std::string &path, FileTable &files, std::vector<BaselineEntry> &out, InputDiagnostics &diags);

/// The baseline text for the current findings (sorted, one entry per finding, diff-friendly).
/// Waived findings are left out: the waiver already documents them.
std::string baselineText(const std::vector<DesignReport> &designs);

/// Marks findings present in the baseline and lists baseline entries no longer found as fixed.
void applyBaseline(std::vector<DesignReport> &designs, const std::vector<BaselineEntry> &baseline);

} // namespace gateloop
