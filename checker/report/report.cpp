#include "checker/report/report.h"

#include <algorithm>
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
  std::stable_sort(findings.begin(), findings.end(), [&](const Finding &a, const Finding &b) { return key(a) < key(b); });
}

std::string driverName(const DesignReport &d, const GateLoop &loop) {
  return loop.driver == kNone ? std::string() : d.circuit->component(loop.driver).name;
}

} // namespace gateloop
