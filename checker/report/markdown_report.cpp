#include "checker/core/eng_format.h"
#include "checker/report/formatters.h"

#include <fmt/format.h>

#include <algorithm>

namespace gateloop {

namespace {

// Backslash-escapes what GitHub-flavoured Markdown would read as markup in a user string (names,
// messages, file names) and flattens line breaks, so a net called "A|B" cannot split a table
// cell and "<script>" stays text.
std::string md(std::string_view text) {
  std::string out;
  for (char c : text) {
    switch (c) {
    case '\\': case '`': case '*': case '_': case '[': case ']': case '<': case '>': case '|': case '~': case '&':
    case '#':
      out += '\\';
      out += c;
      break;
    case '\n': case '\r': case '\t': out += ' '; break;
    default: out += c;
    }
  }
  return out;
}

std::string unitText(std::string_view unit) { return unit == "ohm" ? "Ω" : std::string(unit); }

template <class Q> std::string opt(const std::optional<Q> &v, std::string_view unit) {
  return v ? eng(v->si(), unitText(unit)) : "-";
}
std::string optNum(const std::optional<double> &v) { return v ? eng(*v, "", 3) : "-"; }

std::string plural(std::size_t n, const char *word) {
  return fmt::format("{} {}{}", n, word, n == 1 ? "" : "s");
}

bool active(const Finding &f) { return !f.baseline && !f.waived; }

std::string verdict(const DesignReport &d, const std::string &loopId) {
  auto worst = worstActiveSeverity(d, loopId);
  if (!worst) return "ok";
  return *worst == Severity::Error ? "**error**" : severityName(*worst);
}

void writeFinding(const Finding &f, const FileTable &files, std::ostream &out) {
  std::string subject = f.loop.empty() ? "design" : md(f.loop);
  out << "- **" << subject << "** `" << f.rule << "`: " << md(f.message);
  if (std::string w = locationText(f.where, files); !w.empty()) out << " (" << md(w) << ")";
  if (f.baseline) out << " *(accepted in baseline)*";
  if (f.waived) out << " *(waived" << (f.waiverReason.empty() ? "" : ": " + md(f.waiverReason)) << ")*";
  out << '\n';
  if (!f.values.empty()) {
    std::string values;
    for (const auto &v : f.values) values += (values.empty() ? "" : ", ") + md(v.name) + " = " + md(eng(v.value, unitText(v.unit)));
    out << "  - " << values << '\n';
  }
  // Nested items: a plain continuation line would be folded into the finding's paragraph.
  if (!f.fix.empty()) out << "  - **Fix:** " << md(f.fix) << '\n';
}

void writeLoopTable(const DesignReport &d, std::ostream &out) {
  if (d.loops.empty()) {
    out << "No gate loops: no component is assigned a switch part.\n\n";
    return;
  }
  out << "| loop | driver | R_on | R_off | ζ on | ζ off | I_pk on | I_pk off | worst R use | verdict |\n";
  out << "|:--|:--|--:|--:|--:|--:|--:|--:|--:|:--|\n";
  for (std::size_t i = 0; i < d.loops.size(); ++i) {
    const GateLoop &loop = d.loops[i];
    const LoopAnalysis &a = d.analyses[i];
    std::string drv = driverName(d, loop);
    out << "| " << md(loop.id) << " | " << (drv.empty() ? "-" : md(drv)) << " | " << opt(a.on.rExternal, "ohm")
        << " | " << opt(a.off.rExternal, "ohm") << " | " << optNum(a.on.zeta) << " | " << optNum(a.off.zeta) << " | "
        << opt(a.on.iPeak, "A") << " | " << opt(a.off.iPeak, "A") << " | " << worstResistorUseText(a) << " | "
        << verdict(d, loop.id) << " |\n";
  }
  out << '\n';
}

void writeFindings(const DesignReport &d, const FileTable &files, std::ostream &out) {
  if (d.findings.empty()) {
    out << "No findings.\n\n";
  } else {
    // Errors and warnings in the open; notes folded, they rarely block a review.
    for (Severity s : {Severity::Error, Severity::Warning, Severity::Note}) {
      std::vector<const Finding *> group;
      for (const auto &f : d.findings)
        if (f.severity == s) group.push_back(&f);
      if (group.empty()) continue;
      std::string heading = s == Severity::Error ? "Errors" : s == Severity::Warning ? "Warnings" : "Notes";
      if (s == Severity::Note)
        out << "<details><summary>" << heading << " (" << group.size() << ")</summary>\n\n";
      else
        out << "#### " << heading << " (" << group.size() << ")\n\n";
      for (const Finding *f : group) writeFinding(*f, files, out);
      out << '\n';
      if (s == Severity::Note) out << "</details>\n\n";
    }
  }
  if (!d.fixed.empty()) {
    out << "#### Fixed since baseline (" << d.fixed.size() << ")\n\n";
    for (const auto &f : d.fixed)
      out << "- `" << f.rule << "` on " << (f.loop.empty() ? "the design" : md(f.loop)) << '\n';
    out << '\n';
  }
}

} // namespace

void writeMarkdownReport(const RunReport &report, std::ostream &out) {
  const FileTable &files = *report.files;
  const auto &s = report.summary;
  out << "# gateloop report\n\n";
  out << "**" << plural(s.errors, "error") << ", " << plural(s.warnings, "warning") << ", " << plural(s.notes, "note")
      << "**";
  if (s.baseline) out << " · " << s.baseline << " accepted in baseline";
  if (s.waived) out << " · " << s.waived << " waived";
  if (s.fixed) out << " · " << s.fixed << " fixed since baseline";
  out << "\n\n";
  for (const auto &d : report.designs) {
    std::size_t e = 0, w = 0, n = 0;
    for (const auto &f : d.findings)
      if (active(f)) (f.severity == Severity::Error ? e : f.severity == Severity::Warning ? w : n)++;
    out << "## " << md(d.name) << "\n\n";
    out << plural(d.loops.size(), "gate loop") << " · " << plural(e, "error") << ", " << plural(w, "warning") << ", "
        << plural(n, "note") << "\n\n";
    writeLoopTable(d, out);
    writeFindings(d, files, out);
  }
  if (!report.inputNotes.empty()) {
    out << "<details><summary>Input notes (" << report.inputNotes.size() << ")</summary>\n\n";
    for (const auto &diag : report.inputNotes) out << "- " << md(formatDiagnostic(diag, files)) << '\n';
    out << "\n</details>\n\n";
  }
  out << "> **Caution:** " << kSafetyCaution << '\n';
}

} // namespace gateloop
