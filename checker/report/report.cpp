#include "checker/report/report.h"

#include <algorithm>
#include <cmath>
#include <tuple>

namespace gateloop {

const char *const kSafetyCaution =
    "gateloop is a design aid: its numbers come from models and from the data you supplied. "
    "Gate drives and power stages carry lethal voltages and stored energy. Confirm every result on "
    "hardware with suitable isolated measurement practice, and follow the applicable safety "
    "standards, local codes and licensed practice.";

ReportSummary summarize(const std::vector<DesignReport> &designs) {
  ReportSummary s;
  for (const auto &d : designs) {
    s.fixed += d.fixed.size();
    for (const auto &f : d.findings) {
      if (f.baseline) {
        ++s.baseline;
        continue;
      }
      if (f.waived) {
        ++s.waived;
        continue;
      }
      switch (f.severity) {
      case Severity::Error: ++s.errors; break;
      case Severity::Warning: ++s.warnings; break;
      case Severity::Note: ++s.notes; break;
      }
    }
  }
  return s;
}

void sortFindings(std::vector<Finding> &findings) {
  auto key = [](const Finding &f) {
    return std::tie(f.loop, f.where.file, f.where.line, f.where.column, f.rule, f.message);
  };
  // Sort indices, then move each finding once: findings are large, and a design can have
  // tens of thousands of them.
  std::vector<std::size_t> order(findings.size());
  for (std::size_t i = 0; i < order.size(); ++i) order[i] = i;
  std::stable_sort(order.begin(), order.end(),
                   [&](std::size_t a, std::size_t b) { return key(findings[a]) < key(findings[b]); });
  std::vector<Finding> sorted;
  sorted.reserve(findings.size());
  for (std::size_t i : order) sorted.push_back(std::move(findings[i]));
  findings = std::move(sorted);
}

std::string locationText(const SourceLocation &loc, const FileTable &files) {
  if (loc.file == 0) return "";
  std::string s = files.name(loc.file);
  if (loc.line != 0) {
    s += ":" + std::to_string(loc.line);
    if (loc.column != 0) s += ":" + std::to_string(loc.column);
  }
  return s;
}

namespace {
template <class Use> std::optional<double> worstUse(const LoopAnalysis &a, Use use) {
  std::optional<double> worst;
  for (const EdgeAnalysis *e : {&a.on, &a.off})
    for (const auto &l : e->loads)
      if (auto u = use(l); u && (!worst || *u > *worst)) worst = u;
  return worst;
}
} // namespace

std::optional<double> worstPowerUse(const LoopAnalysis &a) {
  return worstUse(a, [](const ResistorLoad &l) -> std::optional<double> {
    if (!l.deratedPower || l.deratedPower->si() <= 0) return std::nullopt;
    return l.averagePower / *l.deratedPower;
  });
}

std::optional<double> worstPulseUse(const LoopAnalysis &a) {
  return worstUse(a, [](const ResistorLoad &l) -> std::optional<double> {
    if (!l.pulseLimit || l.pulseLimit->si() <= 0) return std::nullopt;
    return l.peakPower / *l.pulseLimit;
  });
}

std::string worstResistorUseText(const LoopAnalysis &a) {
  auto power = worstPowerUse(a), pulse = worstPulseUse(a);
  if (!power && !pulse) return "-";
  bool pulseWorse = pulse && (!power || *pulse > *power);
  return std::to_string(static_cast<long>(std::lround((pulseWorse ? *pulse : *power) * 100))) + "% " +
         (pulseWorse ? "pulse" : "power");
}

std::optional<Severity> worstActiveSeverity(const DesignReport &d, const std::string &loopId) {
  std::optional<Severity> worst;
  for (const auto &f : d.findings)
    if (f.loop == loopId && !f.baseline && !f.waived && (!worst || f.severity > *worst)) worst = f.severity;
  return worst;
}

std::string driverName(const DesignReport &d, const GateLoop &loop) {
  return loop.driver == kNone ? std::string() : std::string(d.circuit->component(loop.driver).name);
}

} // namespace gateloop
