#include "checker/app/cli.h"

#include "checker/app/analyze.h"
#include "checker/app/baseline.h"
#include "checker/app/commands.h"
#include "checker/app/output_file.h"
#include "checker/core/text_util.h"
#include "checker/report/formatters.h"
#include "checker/report/rule_docs.h"
#include "rules/registry.h"

#include <CLI/CLI.hpp>
#include <fmt/format.h>

#include <cstdlib>
#include <iostream>
#include <sstream>
#include <unistd.h>

#ifndef GATELOOP_VERSION
#define GATELOOP_VERSION "0.0.0"
#endif

namespace gateloop {

namespace {

constexpr int kExitClean = 0;
constexpr int kExitFindings = 1;
constexpr int kExitInputError = 2;

void addInputOptions(CLI::App &cmd, CommonOptions &o) {
  cmd.add_option("project", o.inputs.projectPath, "project file (default: gateloop.json here or in a folder above)");
  cmd.add_option("--netlist", o.inputs.netlistPath, "check one design given by its netlist (SPICE deck or .xml)");
  cmd.add_option("--layout", o.inputs.layoutPath, "layout sidecar of the --netlist design");
  cmd.add_option("--parts", o.inputs.partsPaths, "parts library of the --netlist design (repeatable)");
  cmd.add_option("--operating", o.inputs.operatingPath, "operating-point file of the --netlist design");
  cmd.add_flag("--allow-outside-root", o.inputs.allowOutsideRoot,
               "let .include/.lib read files outside the project folder");
  cmd.add_option("--max-elements", o.inputs.maxElements, "cap on flattened netlist elements")
      ->capture_default_str();
}

void addReportOptions(CLI::App &cmd, CommonOptions &o, bool findings) {
  cmd.add_option("--format", o.format, findings ? "text, json, sarif, markdown or html" : "text or json")
      ->check(findings ? CLI::IsMember({"text", "json", "sarif", "markdown", "html"}) : CLI::IsMember({"text", "json"}))
      ->capture_default_str();
  cmd.add_option("--output", o.output, "write the report to this file instead of standard output");
  cmd.add_option("--color", o.color, "auto, always or never (NO_COLOR is honoured)")
      ->check(CLI::IsMember({"auto", "always", "never"}))
      ->capture_default_str();
  cmd.add_flag("--quiet", o.quiet, "findings only: no notes, tables or caution");
  if (!findings) return;
  cmd.add_option("--fail-on", o.failOn, "lowest severity that fails the run: error, warning, note or never")
      ->check(CLI::IsMember({"error", "warning", "note", "never"}))
      ->capture_default_str();
  cmd.add_option("--baseline", o.baselinePath, "accepted findings; they are listed but do not fail the run");
  cmd.add_option("--write-baseline", o.writeBaselinePath, "write the current findings as the new baseline");
  cmd.add_option("--rule", o.ruleSettings, "ID=off|error|warning|note (repeatable)");
}

} // namespace

bool useColor(const CommonOptions &o) {
  if (o.color == "never") return false;
  if (o.color == "always") return true;
  if (std::getenv("NO_COLOR") && *std::getenv("NO_COLOR")) return false;
  return o.output.empty() && ::isatty(STDOUT_FILENO);
}

void printDiagnostics(const InputDiagnostics &diags, const FileTable &files, bool errorsOnly) {
  for (const auto &d : diags.items())
    if (!errorsOnly || d.severity == Severity::Error) std::cerr << formatDiagnostic(d, files) << '\n';
}

bool parseRuleSettings(const std::vector<std::string> &settings, std::map<std::string, SeverityOverride> &out,
                       InputDiagnostics &diags) {
  bool ok = true;
  for (const auto &s : settings) {
    auto eq = s.find('=');
    std::string id = s.substr(0, eq);
    if (eq == std::string::npos) {
      diags.error({}, "--rule " + s + ": expected ID=off|error|warning|note");
      ok = false;
      continue;
    }
    if (!findRule(id)) {
      diags.error({}, "--rule " + s + ": unknown rule id \"" + id + "\"" + didYouMean(id, ruleIds()));
      ok = false;
      continue;
    }
    auto level = parseSeverityOverride(s.substr(eq + 1));
    if (!level) {
      diags.error({}, "--rule " + s + ": expected off, error, warning or note after '='");
      ok = false;
      continue;
    }
    out[id] = *level;
  }
  return ok;
}

int runCli(int argc, char **argv) {
  CLI::App app{"gateloop: design-rule checker for the gate-drive loops of power-electronics boards"};
  app.require_subcommand(1);
  app.set_version_flag("--version", std::string("gateloop ") + GATELOOP_VERSION);
  app.footer(std::string("Exit status: 0 clean, 1 findings at or above --fail-on, 2 input or usage error.\n\n") +
             "Caution: " + kSafetyCaution);

  CommonOptions checkOpts, loopsOpts, auditOpts;
  std::string explainId, initNetlist;
  std::vector<std::string> initParts;
  bool initForce = false;
  AuditOptions audit;

  auto *check = app.add_subcommand("check", "run all enabled rules on every design and report findings");
  addInputOptions(*check, checkOpts);
  addReportOptions(*check, checkOpts, true);

  auto *loops = app.add_subcommand("loops", "print one row per gate loop with its computed quantities");
  addInputOptions(*loops, loopsOpts);
  addReportOptions(*loops, loopsOpts, false);
  loops->add_option("--geometry-svg", loopsOpts.geometrySvgDir, "write one SVG drawing per loop with traces into this folder");

  app.add_subcommand("rules", "list every rule: id, default severity, one line");
  auto *explain = app.add_subcommand("explain", "show a rule's documentation");
  explain->add_option("rule", explainId, "rule id")->required();

  auto *init = app.add_subcommand("init", "write a starter project file and a layout-sidecar template");
  init->add_option("netlist", initNetlist, "SPICE deck or XML netlist")->required();
  init->add_option("--parts", initParts, "parts library to resolve switches and drivers (repeatable)");
  init->add_flag("--force", initForce, "overwrite existing files");

  auto *auditCmd = app.add_subcommand("audit", "check every project below the folders and summarise");
  auditCmd->add_option("dirs", audit.dirs, "folders to search for gateloop.json")->required();
  auditCmd->add_option("--jobs", audit.jobs, "projects checked in parallel")->capture_default_str();
  auditCmd->add_option("--summary-csv", audit.summaryCsv, "write the summary table as CSV");
  auditCmd->add_option("--summary-json", audit.summaryJson, "write the summary as JSON");
  auditCmd->add_option("--fail-on", audit.failOn, "lowest severity that fails the run")
      ->check(CLI::IsMember({"error", "warning", "note", "never"}))
      ->capture_default_str();
  auditCmd->add_flag("--quiet", audit.quiet, "no progress display");

  try {
    app.parse(argc, argv);
  } catch (const CLI::CallForHelp &e) {
    return app.exit(e);
  } catch (const CLI::CallForVersion &e) {
    return app.exit(e);
  } catch (const CLI::ParseError &e) {
    app.exit(e);
    return kExitInputError;
  }

  if (check->parsed()) return runCheckCommand(checkOpts);
  if (loops->parsed()) return runLoopsCommand(loopsOpts);
  if (app.got_subcommand("rules")) return runRulesCommand();
  if (explain->parsed()) return runExplainCommand(explainId);
  if (init->parsed()) return runInitCommand(initNetlist, initParts, initForce);
  if (auditCmd->parsed()) return runAuditCommand(audit);
  return kExitInputError;
}

} // namespace gateloop
