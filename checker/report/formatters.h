/// \file
/// Report formatters, one file each. They read a finished RunReport and write text.
#pragma once

#include "checker/report/report.h"

#include <ostream>

namespace gateloop {

struct TextStyle {
  bool color = false;
  bool quiet = false;   ///< findings only, no loop tables or notes
};

/// Findings grouped by design and loop, numbers with engineering prefixes, readable without
/// colour.
void writeTextReport(const RunReport &report, const TextStyle &style, std::ostream &out);

/// The per-loop table of `gateloop loops`.
void writeLoopTable(const RunReport &report, std::ostream &out);

/// JSON with the keys of spec section 5 (SI numbers, null where a quantity does not apply).
void writeJsonReport(const RunReport &report, std::ostream &out);

/// `gateloop loops --format json`: the same loop objects without findings.
void writeJsonLoops(const RunReport &report, std::ostream &out);

/// SARIF 2.1.0: one run, the rule catalogue in tool.driver.rules, one result per finding.
void writeSarifReport(const RunReport &report, std::ostream &out);

/// A review summary for a pull-request comment: loop table, findings and fixes per design.
void writeMarkdownReport(const RunReport &report, std::ostream &out);

/// One self-contained HTML page (no network) with loop table, findings and a gate-voltage plot
/// of each loop's predicted turn-on and turn-off.
void writeHtmlReport(const RunReport &report, std::ostream &out);

} // namespace gateloop
