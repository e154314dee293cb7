/// \file
/// The subcommands of `gateloop`, each returning the process exit status.
#pragma once

#include "checker/app/run_inputs.h"
#include "checker/core/diagnostics.h"
#include "checker/report/report.h"
#include "rules/registry.h"

#include <map>
#include <string>
#include <vector>

namespace gateloop {

/// Options shared by check and loops.
struct CommonOptions {
  InputSelection inputs;
  std::string format = "text";
  std::string output;
  std::string color = "auto";
  std::string failOn = "error";
  std::string baselinePath, writeBaselinePath;
  std::vector<std::string> ruleSettings;
  std::string geometrySvgDir;
  bool quiet = false;
};

struct AuditOptions {
  std::vector<std::string> dirs;
  unsigned jobs = 2;
  std::string summaryCsv, summaryJson;
  std::string failOn = "error";
  bool quiet = false;
};

int runCheckCommand(const CommonOptions &o);
int runLoopsCommand(const CommonOptions &o);
int runRulesCommand();
int runExplainCommand(const std::string &ruleId);
int runInitCommand(const std::string &netlist, const std::vector<std::string> &parts, bool force);
int runAuditCommand(const AuditOptions &o);

bool useColor(const CommonOptions &o);
void printDiagnostics(const InputDiagnostics &diags, const FileTable &files, bool errorsOnly);
bool parseRuleSettings(const std::vector<std::string> &settings, std::map<std::string, SeverityOverride> &out,
                       InputDiagnostics &diags);

/// The finished, analysed run of check/loops/audit. Holds the inputs the report points into.
struct AnalysedRun {
  RunInputs inputs;
  RunReport report;
};

/// Reads, analyses and applies waivers and the baseline. Returns 2 (after printing every input
/// error) when the inputs are bad, else 0.
int analyseRun(const CommonOptions &o, AnalysedRun &run);

/// Exit status for the findings of \p report at fail level \p failOn.
int exitStatusFor(const RunReport &report, const std::string &failOn);

} // namespace gateloop
