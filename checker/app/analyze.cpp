#include "checker/app/analyze.h"

#include "checker/core/parallel.h"
#include "checker/model/part_resolution.h"

#include <chrono>
#include <cstdlib>
#include <ctime>

namespace gateloop {

DesignReport analyzeDesign(const LoadedDesign &design, const Project &project,
                           const std::map<std::string, SeverityOverride> &overrides, const std::string &today,
                           StageSeconds *seconds) {
  using Clock = std::chrono::steady_clock;
  auto mark = Clock::now();
  auto lap = [&](double StageSeconds::*stage) {
    auto now = Clock::now();
    if (seconds) seconds->*stage = std::chrono::duration<double>(now - mark).count();
    mark = now;
  };
  DesignReport report;
  report.name = design.spec.name;
  report.circuit = &design.circuit;
  report.parts = &design.parts;
  report.loops = extractGateLoops(design.circuit, design.parts);
  lap(&StageSeconds::extraction);
  const Layout *layout = design.layout ? &*design.layout : nullptr;
  report.analyses.resize(report.loops.size());
  parallelFor(report.loops.size(), [&](std::size_t i) {
    report.analyses[i] = analyzeLoop(report.loops[i], design.circuit, design.parts, layout, design.spec.operating);
  });
  lap(&StageSeconds::physics);

  report.componentCount = 0;
  for (const auto &c : design.circuit.components()) {
    if (c.hidden || (c.kind == ElementKind::Subcircuit && c.part == kNone)) continue;
    ++report.componentCount;
    LoopRole role = loopRole(c, design.parts);
    if (role == LoopRole::Switch) ++report.switchCount;
    if (role == LoopRole::Driver) ++report.driverCount;
  }
  report.netCount = design.circuit.nets().size();
  lap(&StageSeconds::census);

  DesignContext ctx{report.name, design.circuit, design.parts, layout, design.spec.operating,
                    report.loops, report.analyses, design.netlistFile};
  report.findings = runRules(ctx, project.ruleParams, overrides);
  sortFindings(report.findings);
  lap(&StageSeconds::rules);
  return report;
}

void applyWaivers(std::vector<DesignReport> &designs, const Project &project, const std::string &today) {
  for (const Waiver &w : project.waivers) {
    bool expired = !w.until.empty() && w.until < today;
    std::size_t matched = 0;
    for (auto &d : designs) {
      for (auto &f : d.findings) {
        if (f.rule != w.rule || !globMatch(w.loopGlob, f.loop.empty() ? d.name : f.loop)) continue;
        ++matched;
        if (!expired) {
          f.waived = true;
          f.waiverReason = w.reason;
        }
      }
    }
    if (designs.empty()) continue;
    Finding note;
    note.rule = "waiver";
    note.design = designs.front().name;
    note.where = {project.file, 0, 0};
    if (expired && matched) {
      note.severity = Severity::Warning;
      note.message = "waiver " + w.fieldPath + " for " + w.rule + " on " + w.loopGlob + " expired on " + w.until +
                     " and no longer waives " + std::to_string(matched) + " finding" + (matched == 1 ? "" : "s");
      note.fix = "fix the findings, or renew the waiver with a new 'until' date and a reason";
    } else if (!matched) {
      note.severity = Severity::Note;
      note.message = "waiver " + w.fieldPath + " for " + w.rule + " on " + w.loopGlob + " matches no finding";
      note.fix = "remove the waiver if the issue it covered is fixed";
    } else {
      continue;
    }
    note.fingerprint = findingFingerprint(note);
    designs.front().findings.push_back(std::move(note));
    sortFindings(designs.front().findings);
  }
}

std::string todayIso() {
  if (const char *fixed = std::getenv("GATELOOP_TODAY")) return fixed;
  std::time_t now = std::time(nullptr);
  std::tm tm{};
  gmtime_r(&now, &tm);
  char buf[16];
  std::strftime(buf, sizeof buf, "%Y-%m-%d", &tm);
  return buf;
}

} // namespace gateloop
