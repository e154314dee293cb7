#include "checker/core/eng_format.h"
#include "checker/report/formatters.h"

#include <fmt/format.h>

#include <map>

namespace gateloop {

namespace {

const char *colorOf(Severity s) {
  switch (s) {
  case Severity::Error: return "\x1b[1;31m";
  case Severity::Warning: return "\x1b[1;33m";
  case Severity::Note: return "\x1b[1;36m";
  }
  return "";
}

std::string location(const Finding &f, const FileTable &files) {
  std::string s = locationText(f.where, files);
  return s.empty() ? s : s + ": ";
}

void writeFinding(const Finding &f, const FileTable &files, const TextStyle &style, std::ostream &out) {
  std::string level = severityName(f.severity);
  if (style.color) level = std::string(colorOf(f.severity)) + level + "\x1b[0m";
  std::string status;
  if (f.baseline) status = " (accepted in baseline)";
  if (f.waived) status = " (waived: " + f.waiverReason + ")";
  out << "  " << location(f, files) << level << ": " << f.message << " [" << f.rule << "]" << status << '\n';
  if (!f.values.empty()) {
    std::string values;
    for (const auto &v : f.values) {
      if (!values.empty()) values += ", ";
      values += v.name + " = " + eng(v.value, v.unit);
    }
    out << "      values: " << values << '\n';
  }
  if (!f.fix.empty()) out << "      fix: " << f.fix << '\n';
}

std::string opt(const std::optional<Ohm> &v) { return v ? eng(v->si(), "ohm") : "-"; }
template <class Q> std::string opt(const std::optional<Q> &v, const char *unit) { return v ? eng(v->si(), unit) : "-"; }
std::string optNum(const std::optional<double> &v, int sig = 3) { return v ? eng(*v, "", sig) : "-"; }

std::string percent(const std::optional<double> &use) { return use ? fmt::format("{:.0f}%", *use * 100) : "-"; }

} // namespace

void writeTextReport(const RunReport &report, const TextStyle &style, std::ostream &out) {
  const FileTable &files = *report.files;
  for (const auto &d : report.designs) {
    std::size_t e = 0, w = 0, n = 0;
    for (const auto &f : d.findings) {
      if (f.baseline || f.waived) continue;
      (f.severity == Severity::Error ? e : f.severity == Severity::Warning ? w : n)++;
    }
    out << fmt::format("design {}: {} gate loop{}, {} error{}, {} warning{}, {} note{}\n", d.name, d.loops.size(),
                       d.loops.size() == 1 ? "" : "s", e, e == 1 ? "" : "s", w, w == 1 ? "" : "s", n,
                       n == 1 ? "" : "s");
    if (!style.quiet)
      out << fmt::format("  read {} components, {} nets, {} switches, {} drivers\n", d.componentCount, d.netCount,
                         d.switchCount, d.driverCount);
    // Design-wide findings first, then one block per loop in loop order.
    std::map<std::string, std::vector<const Finding *>> byLoop;
    for (const auto &f : d.findings) {
      if (style.quiet && f.severity == Severity::Note) continue;
      byLoop[f.loop].push_back(&f);
    }
    if (auto it = byLoop.find(""); it != byLoop.end()) {
      out << "\n design\n";
      for (const Finding *f : it->second) writeFinding(*f, files, style, out);
    }
    for (std::size_t i = 0; i < d.loops.size(); ++i) {
      const GateLoop &loop = d.loops[i];
      auto it = byLoop.find(loop.id);
      if (it == byLoop.end()) continue;
      const LoopAnalysis &a = d.analyses[i];
      std::string drv = driverName(d, loop);
      out << fmt::format("\n loop {} (driver {}, R_on {}, R_off {}, zeta on {} / off {})\n", loop.id,
                         drv.empty() ? "none" : drv, opt(a.on.rExternal), opt(a.off.rExternal), optNum(a.on.zeta, 2),
                         optNum(a.off.zeta, 2));
      for (const Finding *f : it->second) writeFinding(*f, files, style, out);
    }
    for (const auto &f : d.fixed)
      out << "  fixed since baseline: " << f.rule << " on " << (f.loop.empty() ? d.name : f.loop) << '\n';
    out << '\n';
  }
  if (!style.quiet) {
    for (const auto &diag : report.inputNotes) out << formatDiagnostic(diag, files) << '\n';
    if (!report.inputNotes.empty()) out << '\n';
  }
  const auto &s = report.summary;
  out << fmt::format("summary: {} error{}, {} warning{}, {} note{}", s.errors, s.errors == 1 ? "" : "s", s.warnings,
                     s.warnings == 1 ? "" : "s", s.notes, s.notes == 1 ? "" : "s");
  if (s.baseline) out << fmt::format(", {} accepted in baseline", s.baseline);
  if (s.waived) out << fmt::format(", {} waived", s.waived);
  if (s.fixed) out << fmt::format(", {} fixed since baseline", s.fixed);
  out << '\n';
  if (!style.quiet) out << "\ncaution: " << kSafetyCaution << '\n';
}

void writeLoopTable(const RunReport &report, std::ostream &out) {
  for (const auto &d : report.designs) {
    out << "design " << d.name << '\n';
    if (d.loops.empty()) {
      out << "  (no gate loops: no component is assigned a switch part)\n\n";
      continue;
    }
    out << fmt::format("  {:<16} {:<12} {:>9} {:>9} {:>9} {:>9} {:>7} {:>7} {:>10} {:>8} {:>8} {:>6} {:>6} {:>8}\n",
                       "loop", "driver", "R_on", "R_off", "L_loop", "C_gate", "zeta_on", "zeta_off", "f_ring",
                       "Ipk_on", "Ipk_off", "P_R", "pulse", "length");
    for (std::size_t i = 0; i < d.loops.size(); ++i) {
      const GateLoop &loop = d.loops[i];
      const LoopAnalysis &a = d.analyses[i];
      std::optional<Hertz> ring = a.on.fRing ? a.on.fRing : a.off.fRing;
      std::optional<Henry> l = a.on.lLoop;
      if (a.off.lLoop && (!l || *a.off.lLoop > *l)) l = a.off.lLoop;
      std::string drv = driverName(d, loop);
      out << fmt::format("  {:<16} {:<12} {:>9} {:>9} {:>9} {:>9} {:>7} {:>7} {:>10} {:>8} {:>8} {:>6} {:>6} {:>8}\n",
                         loop.id, drv.empty() ? "-" : drv, opt(a.on.rExternal), opt(a.off.rExternal), opt(l, "H"),
                         opt(a.cGate, "F"), optNum(a.on.zeta, 2), optNum(a.off.zeta, 2), opt(ring, "Hz"),
                         opt(a.on.iPeak, "A"), opt(a.off.iPeak, "A"), percent(worstPowerUse(a)),
                         percent(worstPulseUse(a)), opt(a.length, "m"));
    }
    out << "  (P_R: worst resistor average power as % of its derated rating; pulse: worst peak power as % of "
           "its pulse limit)\n\n";
  }
}

} // namespace gateloop
