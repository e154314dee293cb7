#include "checker/core/eng_format.h"
#include "checker/report/formatters.h"
#include "checker/report/svg_plot.h"

#include <fmt/format.h>

namespace gateloop {

namespace {

// Inline so the page is one file that opens offline; written as XHTML-compatible markup (every
// element closed) so the tests can parse it as XML.
constexpr const char *kStyle = R"css(
body { font-family: system-ui, sans-serif; margin: 1.5em auto; max-width: 80em; padding: 0 1em; color: #1d1d1d; }
h1 { font-size: 1.6em; margin-bottom: 0.2em; }
h2 { font-size: 1.3em; border-bottom: 1px solid #ccc; padding-bottom: 0.2em; margin-top: 1.6em; }
h3 { font-size: 1.05em; margin-top: 1.2em; }
table.loops { border-collapse: collapse; font-size: 0.9em; }
table.loops th, table.loops td { border: 1px solid #d0d0d0; padding: 0.25em 0.5em; }
table.loops th { background: #f2f2f2; text-align: left; }
table.loops td.num { text-align: right; white-space: nowrap; }
.sev { display: inline-block; min-width: 4.5em; font-weight: bold; }
.error .sev, td.error { color: #b00020; }
.warning .sev, td.warning { color: #a15c00; }
.note .sev, td.note { color: #1f5fbf; }
td.ok { color: #2e7d32; }
ul.findings { list-style: none; padding-left: 0; }
ul.findings li { margin: 0 0 0.7em 0; padding: 0.3em 0.6em; border-left: 4px solid #ccc; }
ul.findings li.error { border-color: #b00020; }
ul.findings li.warning { border-color: #e0a000; }
ul.findings li.note { border-color: #1f5fbf; }
ul.findings li.accepted { opacity: 0.65; }
.rule { font-family: ui-monospace, monospace; }
.where, .values { color: #555; font-size: 0.9em; }
.fix { margin-top: 0.2em; }
.status { font-style: italic; color: #555; }
figure { margin: 1em 0 1.5em 0; }
figure svg { width: 100%; max-width: 960px; height: auto; }
figcaption { font-weight: bold; margin-bottom: 0.3em; }
.nodata { color: #555; font-style: italic; }
.caution { margin-top: 2em; padding: 0.6em 0.8em; background: #fff4e5; border: 1px solid #e0a000; }
footer { margin-top: 1em; color: #777; font-size: 0.85em; }
)css";

std::string h(std::string_view s) { return xmlEscape(s); }

std::string unitText(std::string_view unit) { return unit == "ohm" ? "Ω" : std::string(unit); }

template <class Q> std::string opt(const std::optional<Q> &v, std::string_view unit) {
  return v ? eng(v->si(), unitText(unit)) : "-";
}
std::string optNum(const std::optional<double> &v) { return v ? eng(*v, "", 3) : "-"; }

std::string plural(std::size_t n, const char *word) { return fmt::format("{} {}{}", n, word, n == 1 ? "" : "s"); }

bool active(const Finding &f) { return !f.baseline && !f.waived; }

std::string verdict(const DesignReport &d, const std::string &loopId) {
  auto worst = worstActiveSeverity(d, loopId);
  return worst ? severityName(*worst) : "ok";
}

void writeLoopTable(const DesignReport &d, std::ostream &out) {
  if (d.loops.empty()) {
    out << "<p class=\"nodata\">No gate loops: no component is assigned a switch part.</p>\n";
    return;
  }
  out << "<table class=\"loops\">\n<thead><tr><th>loop</th><th>driver</th><th>R_on</th><th>R_off</th>"
         "<th>L_loop</th><th>C_gate</th><th>ζ on</th><th>ζ off</th><th>f_ring</th><th>I_pk on</th>"
         "<th>I_pk off</th><th>V_pk on</th><th>V_pk off</th><th>worst R use</th><th>verdict</th></tr></thead>\n"
         "<tbody>\n";
  for (std::size_t i = 0; i < d.loops.size(); ++i) {
    const GateLoop &loop = d.loops[i];
    const LoopAnalysis &a = d.analyses[i];
    std::optional<Henry> l = a.on.lLoop;
    if (a.off.lLoop && (!l || *a.off.lLoop > *l)) l = a.off.lLoop;
    std::optional<Hertz> ring = a.on.fRing ? a.on.fRing : a.off.fRing;
    std::string drv = driverName(d, loop);
    std::string v = verdict(d, loop.id);
    auto num = [&](const std::string &text) { out << "<td class=\"num\">" << h(text) << "</td>"; };
    out << "<tr><td>" << h(loop.id) << "</td><td>" << (drv.empty() ? "-" : h(drv)) << "</td>";
    num(opt(a.on.rExternal, "ohm"));
    num(opt(a.off.rExternal, "ohm"));
    num(opt(l, "H"));
    num(opt(a.cGate, "F"));
    num(optNum(a.on.zeta));
    num(optNum(a.off.zeta));
    num(opt(ring, "Hz"));
    num(opt(a.on.iPeak, "A"));
    num(opt(a.off.iPeak, "A"));
    num(opt(a.on.vPeak, "V"));
    num(opt(a.off.vPeak, "V"));
    num(worstResistorUseText(a));
    out << "<td class=\"" << v << "\">" << v << "</td></tr>\n";
  }
  out << "</tbody>\n</table>\n";
}

void writeFinding(const Finding &f, const FileTable &files, std::ostream &out) {
  std::string cls = severityName(f.severity);
  if (!active(f)) cls += " accepted";
  out << "<li class=\"" << cls << "\"><span class=\"sev\">" << severityName(f.severity) << "</span> ";
  out << "<strong>" << (f.loop.empty() ? std::string("design") : h(f.loop)) << "</strong> ";
  out << "<span class=\"rule\">[" << h(f.rule) << "]</span> " << h(f.message);
  if (f.baseline) out << " <span class=\"status\">(accepted in baseline)</span>";
  if (f.waived)
    out << " <span class=\"status\">(waived" << (f.waiverReason.empty() ? "" : ": " + h(f.waiverReason))
        << ")</span>";
  if (std::string w = locationText(f.where, files); !w.empty()) out << "<br/><span class=\"where\">" << h(w) << "</span>";
  if (!f.values.empty()) {
    std::string values;
    for (const auto &v : f.values) values += (values.empty() ? "" : ", ") + v.name + " = " + eng(v.value, unitText(v.unit));
    out << "<br/><span class=\"values\">" << h(values) << "</span>";
  }
  if (!f.fix.empty()) out << "<div class=\"fix\"><strong>Fix:</strong> " << h(f.fix) << "</div>";
  out << "</li>\n";
}

void writeFindings(const DesignReport &d, const FileTable &files, std::ostream &out) {
  out << "<h3>Findings</h3>\n";
  if (d.findings.empty()) {
    out << "<p>No findings.</p>\n";
  } else {
    out << "<ul class=\"findings\">\n";
    for (Severity s : {Severity::Error, Severity::Warning, Severity::Note})
      for (const auto &f : d.findings)
        if (f.severity == s) writeFinding(f, files, out);
    out << "</ul>\n";
  }
  if (!d.fixed.empty()) {
    out << "<h3>Fixed since baseline</h3>\n<ul>\n";
    for (const auto &f : d.fixed)
      out << "<li><span class=\"rule\">[" << h(f.rule) << "]</span> on "
          << (f.loop.empty() ? std::string("the design") : h(f.loop)) << "</li>\n";
    out << "</ul>\n";
  }
}

void writePlots(const DesignReport &d, std::size_t designIndex, std::ostream &out) {
  if (d.loops.empty()) return;
  out << "<h3>Predicted gate voltage</h3>\n"
         "<p>Series R-L-C step response of each loop (total gate resistance, loop inductance and effective gate "
         "capacitance) for a driver step between the drive rails.</p>\n";
  for (std::size_t i = 0; i < d.loops.size(); ++i) {
    GateVoltagePlot plot = gateVoltagePlot(d, i);
    out << "<figure id=\"d" << designIndex << "-loop" << i << "\">\n<figcaption>" << h(d.loops[i].id)
        << "</figcaption>\n";
    if (!plot.svg.empty()) out << plot.svg << '\n';
    if (!plot.missing.empty()) {
      out << "<p class=\"nodata\">" << (plot.svg.empty() ? "No plot: not enough data (" : "Partly plotted (");
      for (std::size_t k = 0; k < plot.missing.size(); ++k) out << (k ? "; " : "") << h(plot.missing[k]);
      out << ").</p>\n";
    }
    // What the curve rests on: without layout data the loop inductance is only the parts' own,
    // and the ringing shown is a lower bound.
    const LoopAnalysis &a = d.analyses[i];
    if (!plot.svg.empty() && a.inductanceMethod == "none")
      out << "<p class=\"nodata\">No layout data for this loop: L_loop holds only the parts' internal "
             "inductance, so real ringing will be larger than shown.</p>\n";
    for (const auto &[label, list] : {std::pair{"Assumed", &a.assumptions}, std::pair{"Missing", &a.missing}}) {
      if (list->empty()) continue;
      out << "<p class=\"where\">" << label << ": ";
      for (std::size_t k = 0; k < list->size(); ++k) out << (k ? "; " : "") << h((*list)[k]);
      out << "</p>\n";
    }
    out << "</figure>\n";
  }
}

} // namespace

void writeHtmlReport(const RunReport &report, std::ostream &out) {
  const FileTable &files = *report.files;
  const auto &s = report.summary;
  out << "<!DOCTYPE html>\n<html xmlns=\"http://www.w3.org/1999/xhtml\" lang=\"en\">\n<head>\n"
         "<meta charset=\"utf-8\"/>\n<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\"/>\n"
         "<title>gateloop report</title>\n<style>"
      << kStyle << "</style>\n</head>\n<body>\n";
  out << "<h1>gateloop report</h1>\n<p class=\"summary\"><strong>" << plural(s.errors, "error") << ", "
      << plural(s.warnings, "warning") << ", " << plural(s.notes, "note") << "</strong>";
  if (s.baseline) out << " · " << s.baseline << " accepted in baseline";
  if (s.waived) out << " · " << s.waived << " waived";
  if (s.fixed) out << " · " << s.fixed << " fixed since baseline";
  out << "</p>\n";
  for (std::size_t di = 0; di < report.designs.size(); ++di) {
    const DesignReport &d = report.designs[di];
    std::size_t e = 0, w = 0, n = 0;
    for (const auto &f : d.findings)
      if (active(f)) (f.severity == Severity::Error ? e : f.severity == Severity::Warning ? w : n)++;
    out << "<section class=\"design\">\n<h2>" << h(d.name) << "</h2>\n<p>" << plural(d.loops.size(), "gate loop")
        << " · " << plural(e, "error") << ", " << plural(w, "warning") << ", " << plural(n, "note") << " · read "
        << plural(d.componentCount, "component") << ", " << plural(d.netCount, "net") << ", "
        << fmt::format("{} switch{}", d.switchCount, d.switchCount == 1 ? "" : "es") << ", " << plural(d.driverCount, "driver") << "</p>\n";
    writeLoopTable(d, out);
    writeFindings(d, files, out);
    writePlots(d, di, out);
    out << "</section>\n";
  }
  if (!report.inputNotes.empty()) {
    out << "<section>\n<h2>Input notes</h2>\n<ul>\n";
    for (const auto &diag : report.inputNotes) out << "<li>" << h(formatDiagnostic(diag, files)) << "</li>\n";
    out << "</ul>\n</section>\n";
  }
  out << "<p class=\"caution\"><strong>Caution:</strong> " << h(kSafetyCaution) << "</p>\n";
  out << "<footer>gateloop " << h(report.toolVersion) << "</footer>\n</body>\n</html>\n";
}

} // namespace gateloop
