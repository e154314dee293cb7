/// \file
/// A finished run, as the formatters see it. Formatters only read this; they compute no physics.
#pragma once

#include "checker/core/finding.h"
#include "checker/loops/gate_loop.h"
#include "checker/loops/loop_physics.h"
#include "checker/model/circuit.h"
#include "checker/model/parts.h"

#include <optional>
#include <string>
#include <vector>

namespace gateloop {

struct DesignReport {
  std::string name;
  const Circuit *circuit = nullptr;
  const PartLibrary *parts = nullptr;
  std::vector<GateLoop> loops;
  std::vector<LoopAnalysis> analyses;   ///< parallel to loops
  std::vector<Finding> findings;        ///< sorted
  std::vector<Finding> fixed;           ///< baseline entries that no longer occur
  std::size_t componentCount = 0, netCount = 0, switchCount = 0, driverCount = 0;
};

struct ReportSummary {
  std::size_t errors = 0, warnings = 0, notes = 0;
  std::size_t baseline = 0, waived = 0, fixed = 0;
};

/// What a formatter needs to know about a rule (filled from the rule registry by the caller, so
/// formatters never depend on rules).
struct RuleSummary {
  std::string id;
  std::string title;
  Severity defaultSeverity = Severity::Warning;
};

struct RunReport {
  std::string toolVersion;
  std::vector<RuleSummary> rules;          ///< every built-in rule, sorted by id
  const FileTable *files = nullptr;
  std::vector<DesignReport> designs;
  std::vector<InputDiagnostic> inputNotes; ///< notes and warnings from reading the inputs
  ReportSummary summary;                   ///< counts exclude baseline and waived findings
};

/// Counts findings by severity, leaving out accepted (baseline) and waived ones.
ReportSummary summarize(const std::vector<DesignReport> &designs);

/// Sorts findings by location, rule and message so every output is deterministic.
void sortFindings(std::vector<Finding> &findings);

/// `FILE:LINE:COLUMN` of \p loc, leaving out what is unknown; "" without a file.
std::string locationText(const SourceLocation &loc, const FileTable &files);

/// Worst use of a rating among a loop's external resistors over both edges, as a fraction:
/// average power against the derated rating, peak power against the pulse limit.
std::optional<double> worstPowerUse(const LoopAnalysis &a);
std::optional<double> worstPulseUse(const LoopAnalysis &a);

/// The worse of the two as text for tables: "45% pulse", "24% power", or "-" without data.
std::string worstResistorUseText(const LoopAnalysis &a);

/// The worst severity among a loop's findings that are neither accepted nor waived.
std::optional<Severity> worstActiveSeverity(const DesignReport &d, const std::string &loopId);

/// Name of a loop's driver, "" when none.
std::string driverName(const DesignReport &d, const GateLoop &loop);

/// The safety caution every report carries (spec section 7).
extern const char *const kSafetyCaution;

} // namespace gateloop
