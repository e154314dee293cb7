#include "checker/app/commands.h"
#include "checker/app/geometry_svg.h"

#include "checker/app/analyze.h"
#include "checker/app/baseline.h"
#include "checker/app/output_file.h"
#include "checker/core/text_util.h"
#include "checker/report/formatters.h"
#include "checker/report/rule_docs.h"

#include <fmt/format.h>

#include <iostream>
#include <sstream>

#ifndef GATELOOP_VERSION
#define GATELOOP_VERSION "0.0.0"
#endif

namespace gateloop {

namespace {
constexpr int kExitInputError = 2;
}

int analyseRun(const CommonOptions &o, AnalysedRun &run) {
  RunInputs &in = run.inputs;
  loadRunInputs(o.inputs, in);
  validateRuleParams(in.project.ruleParams, in.project.file, in.diags);
  std::map<std::string, SeverityOverride> overrides;
  parseRuleSettings(o.ruleSettings, overrides, in.diags);
  std::vector<BaselineEntry> baseline;
  if (!o.baselinePath.empty()) readBaseline(o.baselinePath, in.files, baseline, in.diags);
  if (in.diags.hasErrors()) {
    printDiagnostics(in.diags, in.files, true);
    std::cerr << fmt::format("gateloop: {} input error{}; nothing was checked\n", in.diags.errorCount(),
                             in.diags.errorCount() == 1 ? "" : "s");
    return kExitInputError;
  }

  std::string today = todayIso();
  RunReport &report = run.report;
  report.toolVersion = GATELOOP_VERSION;
  report.files = &in.files;
  for (const auto &rule : builtinRules())
    report.rules.push_back({rule->info().id, rule->info().title, rule->info().defaultSeverity});
  for (const auto &d : in.designs) report.designs.push_back(analyzeDesign(*d, in.project, overrides, today));
  applyWaivers(report.designs, in.project, today);
  if (!baseline.empty()) applyBaseline(report.designs, baseline);
  for (const auto &diag : in.diags.items())
    if (diag.severity != Severity::Error) report.inputNotes.push_back(diag);
  report.summary = summarize(report.designs);
  return 0;
}

int exitStatusFor(const RunReport &report, const std::string &failOn) {
  const auto &s = report.summary;
  if (failOn == "never") return 0;
  if (s.errors) return 1;
  if (failOn == "error") return 0;
  if (s.warnings) return 1;
  if (failOn == "warning") return 0;
  return s.notes ? 1 : 0;
}

int runCheckCommand(const CommonOptions &o) {
  AnalysedRun run;
  if (int status = analyseRun(o, run)) return status;

  std::ostringstream out;
  if (o.format == "json") writeJsonReport(run.report, out);
  else if (o.format == "sarif") writeSarifReport(run.report, out);
  else if (o.format == "markdown") writeMarkdownReport(run.report, out);
  else if (o.format == "html") writeHtmlReport(run.report, out);
  else writeTextReport(run.report, {useColor(o), o.quiet}, out);
  if (auto err = writeOutputAtomically(o.output, out.str()); !err.empty()) {
    std::cerr << err << '\n';
    return kExitInputError;
  }
  if (!o.writeBaselinePath.empty()) {
    if (auto err = writeOutputAtomically(o.writeBaselinePath, baselineText(run.report.designs)); !err.empty()) {
      std::cerr << err << '\n';
      return kExitInputError;
    }
  }
  return exitStatusFor(run.report, o.failOn);
}

int runLoopsCommand(const CommonOptions &o) {
  AnalysedRun run;
  if (int status = analyseRun(o, run)) return status;
  std::ostringstream out;
  if (o.format == "json") writeJsonLoops(run.report, out);
  else writeLoopTable(run.report, out);
  if (auto err = writeOutputAtomically(o.output, out.str()); !err.empty()) {
    std::cerr << err << '\n';
    return kExitInputError;
  }
  if (!o.geometrySvgDir.empty()) {
    if (auto err = writeLoopGeometrySvgs(run.report, run.inputs, o.geometrySvgDir); !err.empty()) {
      std::cerr << err << '\n';
      return kExitInputError;
    }
  }
  return 0;
}

int runRulesCommand() {
  for (const auto &rule : builtinRules()) {
    const RuleInfo &info = rule->info();
    std::cout << fmt::format("{:<20} {:<8} {}\n", info.id, severityName(info.defaultSeverity), info.title);
  }
  return 0;
}

int runExplainCommand(const std::string &ruleId) {
  const RuleDoc *doc = findRuleDoc(ruleId);
  const Rule *rule = findRule(ruleId);
  if (!doc || !rule) {
    std::cerr << "gateloop: error: unknown rule id \"" << ruleId << "\"" << didYouMean(ruleId, ruleIds()) << '\n';
    return kExitInputError;
  }
  std::cout << doc->markdown;
  if (!rule->info().options.empty()) {
    std::cout << "\nParameters (project file: rules." << ruleId << ".<key>):\n";
    for (const auto &opt : rule->info().options)
      std::cout << fmt::format("  {:<14} default {:<10} {}\n", opt.key, opt.defaultText, opt.help);
  }
  return 0;
}

} // namespace gateloop
