/// \file
/// The SARIF, Markdown and HTML formatters on hand-built run reports: SARIF structure (rule
/// indexes, regions, fingerprints, baseline state, suppressions), the Markdown review summary and
/// the HTML page (well-formed XHTML, one plot per plottable loop, no external references,
/// escaping). All circuit data is invented for the tests.
#include "checker/core/eng_format.h"
#include "checker/physics/rlc_step.h"
#include "checker/report/formatters.h"
#include "checker/report/svg_plot.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>
#include <pugixml.hpp>

#include <algorithm>
#include <cmath>
#include <cstring>
#include <memory>
#include <sstream>
#include <string>
#include <vector>

using namespace gateloop;
using nlohmann::json;

namespace {

// A design with two IGBT gate loops: X1.Q1 is fully characterised (on loop over-damped, off
// loop ringing), X1.Q2 has no layout data, so no loop inductance and no plot.
struct Fixture {
  FileTable files;
  Circuit circuit;
  PartLibrary parts;
  RunReport report;
  FileId deck = 0, project = 0;
  ComponentId q1 = kNone, q2 = kNone, u1 = kNone, r1 = kNone;

  Fixture() {
    deck = files.add("hw/inverter.cir");
    project = files.add("gateloop.json");
    Part igbt;
    igbt.id = "IGBT-1200V-300A";
    igbt.kind = PartKind::Igbt;
    igbt.vGateMax = Volt(20);
    igbt.vGateMin = Volt(-20);
    parts.parts.push_back(igbt);

    auto net = [&](const char *name) { return circuit.net(name, SourceLocation{deck, 3, 1}); };
    std::uint32_t swPins = circuit.internPinNames({"c", "g", "e"});
    std::uint32_t twoPins = circuit.internPinNames({"1", "2"});
    std::uint32_t drvPins = circuit.internPinNames({"out", "ref"});
    auto add = [&](const char *name, ElementKind kind, std::vector<NetId> nets, std::uint32_t pins, std::uint32_t part) {
      Component c;
      c.name = name;
      c.kind = kind;
      c.part = part;
      c.where = SourceLocation{deck, 10, 1};
      return circuit.addComponent(c, nets, pins);
    };
    NetId dc = net("DC+"), g1 = net("G1"), e1 = net("PH"), out1 = net("OUT1"), g2 = net("G2"), n0 = net("0");
    q1 = add("X1.Q1", ElementKind::Subcircuit, {dc, g1, e1}, swPins, 0);
    q2 = add("X1.Q2", ElementKind::Subcircuit, {e1, g2, n0}, swPins, 0);
    u1 = add("X1.U1", ElementKind::Subcircuit, {out1, e1}, drvPins, kNone);
    r1 = add("X1.R1", ElementKind::Resistor, {out1, g1}, twoPins, kNone);

    DesignReport d;
    d.name = "inverter";
    d.circuit = &circuit;
    d.parts = &parts;
    d.componentCount = circuit.components().size();
    d.netCount = circuit.nets().size();
    d.switchCount = 2;
    d.driverCount = 1;

    GateLoop l1;
    l1.id = "X1.Q1";
    l1.switchId = q1;
    l1.gateNet = g1;
    l1.refNet = e1;
    l1.driver = u1;
    GateLoop l2 = l1;
    l2.id = "X1.Q2";
    l2.switchId = q2;
    l2.gateNet = g2;
    l2.refNet = n0;
    d.loops = {l1, l2};

    LoopAnalysis a1;
    a1.vOn = Volt(15);
    a1.vOff = Volt(-8);
    a1.cGate = Farad(100e-9);
    fillEdge(a1.on, Ohm(4.7), Ohm(6.0), Henry(30e-9), *a1.cGate, Volt(23));
    fillEdge(a1.off, Ohm(0.2), Ohm(0.5), Henry(30e-9), *a1.cGate, Volt(-23));
    ResistorLoad load;
    load.id = r1;
    load.resistance = Ohm(4.7);
    load.averagePower = Watt(0.3);
    load.deratedPower = Watt(0.5);
    load.peakPower = Watt(30);
    load.pulseLimit = Watt(40);
    a1.on.loads.push_back(load);
    LoopAnalysis a2 = a1;
    a2.on.lLoop.reset();
    a2.off.lLoop.reset();
    a2.on.zeta.reset();
    a2.off.zeta.reset();
    a2.off.fRing.reset();
    a2.on.loads.clear();
    a2.missing = {"layout: no nets of this loop are in the sidecar"};
    d.analyses = {a1, a2};

    Finding damping;
    damping.rule = "loop-damping";
    damping.severity = Severity::Warning;
    damping.design = d.name;
    damping.loop = "X1.Q1";
    damping.refs = {"X1.R1"};
    damping.message = "off loop damping ratio 0.46 is below 0.7";
    damping.values = {{"zeta", 0.456, ""}, {"zeta_warn", 0.7, ""}, {"r_off", 0.2, "ohm"}};
    damping.fix = "raise the off resistance to 2.2 ohm";
    damping.where = SourceLocation{deck, 42, 1};

    Finding pulldown;
    pulldown.rule = "gate-pulldown";
    pulldown.severity = Severity::Warning;
    pulldown.design = d.name;
    pulldown.loop = "X1.Q1";
    pulldown.message = "no resistor between gate and reference";
    pulldown.fix = "add 10 kohm from G1 to PH";
    pulldown.where = SourceLocation{deck, 12, 0};
    pulldown.waived = true;
    pulldown.waiverReason = "pull-down sits inside the module";

    Finding partData;
    partData.rule = "connectivity";
    partData.severity = Severity::Note;
    partData.design = d.name;
    partData.loop = "X1.Q2";
    partData.refs = {"X1.U1"};
    partData.message = "driver X1.U1 has no part data";
    partData.where = SourceLocation{deck, 0, 0}; // file known, line unknown
    partData.baseline = true;

    Finding waiver;
    waiver.rule = "waiver";
    waiver.severity = Severity::Note;
    waiver.design = d.name;
    waiver.message = "waiver waivers[1] for rg-power on X9.* matches no finding";
    waiver.fix = "remove the waiver if the issue it covered is fixed";

    d.findings = {damping, pulldown, partData, waiver};
    for (auto &f : d.findings) f.fingerprint = findingFingerprint(f);
    sortFindings(d.findings);

    Finding fixed;
    fixed.rule = "rg-range";
    fixed.design = d.name;
    fixed.loop = "X1.Q1";
    fixed.fingerprint = findingFingerprint(fixed);
    d.fixed = {fixed};

    report.toolVersion = "0.1.0";
    report.rules = {{"connectivity", "gate loops are complete and every switch has part data", Severity::Error},
                    {"gate-pulldown", "gate pull-down resistor present", Severity::Warning},
                    {"loop-damping", "gate loop damping ratio", Severity::Error},
                    {"rg-range", "gate resistance inside the recommended range", Severity::Error}};
    report.files = &files;
    report.designs.push_back(std::move(d));
    report.inputNotes.push_back({Severity::Note, SourceLocation{project, 7, 5}, {}, "no operating point given"});
    report.summary = summarize(report.designs);
  }

  // Edge values filled consistently from the series-RLC model (Nilsson & Riedel 2015 ch. 8 via
  // seriesRlcStep), so the plot and the table describe the same loop.
  static void fillEdge(EdgeAnalysis &e, Ohm rExt, Ohm rTotal, Henry l, Farad c, Volt step) {
    RlcStep s = seriesRlcStep(rTotal, l, c, step);
    e.hasPath = true;
    e.rExternal = rExt;
    e.rTotal = rTotal;
    e.lLoop = l;
    e.zeta = s.zeta;
    e.fRing = s.fRing;
    e.overshoot = s.overshoot;
    e.iPeak = Ampere(std::fabs(s.iPeak.si())); // the analysis keeps magnitudes
  }
};

std::string sarifOf(const RunReport &r) {
  std::ostringstream out;
  writeSarifReport(r, out);
  return out.str();
}
std::string markdownOf(const RunReport &r) {
  std::ostringstream out;
  writeMarkdownReport(r, out);
  return out.str();
}
std::string htmlOf(const RunReport &r) {
  std::ostringstream out;
  writeHtmlReport(r, out);
  return out.str();
}

const json *resultFor(const json &results, const std::string &ruleId) {
  for (const auto &r : results)
    if (r["ruleId"] == ruleId) return &r;
  return nullptr;
}

// ---------------------------------------------------------------------------------------------
// SARIF

TEST(SarifReport, HasOneRunWithToolAndRuleCatalogue) {
  Fixture fx;
  json s = json::parse(sarifOf(fx.report));
  EXPECT_EQ(s["version"], "2.1.0");
  EXPECT_EQ(s["$schema"], "https://json.schemastore.org/sarif-2.1.0.json");
  ASSERT_EQ(s["runs"].size(), 1u);
  const json &driver = s["runs"][0]["tool"]["driver"];
  EXPECT_EQ(driver["name"], "gateloop");
  EXPECT_EQ(driver["version"], "0.1.0");
  EXPECT_TRUE(driver.contains("informationUri"));
  const json &rules = driver["rules"];
  // The four catalogue rules in order, then the extra "waiver" id used by a finding.
  ASSERT_EQ(rules.size(), 5u);
  EXPECT_EQ(rules[0]["id"], "connectivity");
  EXPECT_FALSE(rules[0].contains("name")) << "a one-word id has no name distinct from it";
  EXPECT_EQ(rules[2]["id"], "loop-damping");
  EXPECT_EQ(rules[2]["name"], "LoopDamping");
  EXPECT_EQ(rules[2]["shortDescription"]["text"], "Gate loop damping ratio.");
  EXPECT_EQ(rules[2]["defaultConfiguration"]["level"], "error");
  EXPECT_EQ(rules[1]["defaultConfiguration"]["level"], "warning");
  EXPECT_EQ(rules[4]["id"], "waiver");
  EXPECT_EQ(rules[4]["defaultConfiguration"]["level"], "note");
  for (const auto &r : rules) {
    EXPECT_TRUE(r.contains("fullDescription")) << r["id"];
    EXPECT_FALSE(r.contains("helpUri")) << "no real URI exists for the rule pages";
  }
}

TEST(SarifReport, RuleIndexPointsAtTheRuleOfTheResult) {
  Fixture fx;
  json s = json::parse(sarifOf(fx.report));
  const json &rules = s["runs"][0]["tool"]["driver"]["rules"];
  const json &results = s["runs"][0]["results"];
  ASSERT_EQ(results.size(), 4u);
  for (const auto &r : results) {
    std::size_t index = r["ruleIndex"].get<std::size_t>();
    ASSERT_LT(index, rules.size());
    EXPECT_EQ(rules[index]["id"], r["ruleId"]);
  }
}

TEST(SarifReport, RegionOnlyWhereTheLineIsKnown) {
  Fixture fx;
  json s = json::parse(sarifOf(fx.report));
  const json &results = s["runs"][0]["results"];
  const json *damping = resultFor(results, "loop-damping");
  ASSERT_NE(damping, nullptr);
  const json &phys = (*damping)["locations"][0]["physicalLocation"];
  EXPECT_EQ(phys["artifactLocation"]["uri"], "hw/inverter.cir");
  EXPECT_EQ(phys["artifactLocation"]["uriBaseId"], "SRCROOT");
  EXPECT_EQ(phys["region"]["startLine"], 42);
  EXPECT_EQ(phys["region"]["startColumn"], 1);

  // Line known, column unknown: startLine only.
  const json *pulldown = resultFor(results, "gate-pulldown");
  ASSERT_NE(pulldown, nullptr);
  const json &region = (*pulldown)["locations"][0]["physicalLocation"]["region"];
  EXPECT_EQ(region["startLine"], 12);
  EXPECT_FALSE(region.contains("startColumn"));

  // File known, line unknown: no region, never clamped to line 1; the file is the analysis
  // target and the result sits at its logical location.
  const json *conn = resultFor(results, "connectivity");
  ASSERT_NE(conn, nullptr);
  EXPECT_FALSE((*conn)["locations"][0].contains("physicalLocation"));
  EXPECT_EQ((*conn)["analysisTarget"]["uri"], "hw/inverter.cir");
  EXPECT_EQ((*conn)["locations"][0]["logicalLocations"][0]["fullyQualifiedName"], "inverter/X1.Q2");
  EXPECT_EQ(s.dump().find("\"startLine\":0"), std::string::npos);

  // No file: a logical location only.
  const json *waiver = resultFor(results, "waiver");
  ASSERT_NE(waiver, nullptr);
  EXPECT_FALSE((*waiver)["locations"][0].contains("physicalLocation"));
  EXPECT_EQ((*waiver)["locations"][0]["logicalLocations"][0]["fullyQualifiedName"], "inverter");
  EXPECT_EQ((*damping)["locations"][0]["logicalLocations"][0]["fullyQualifiedName"], "inverter/X1.Q1");

  // Artifacts list each referenced file once and the indexes agree.
  const json &artifacts = s["runs"][0]["artifacts"];
  ASSERT_EQ(artifacts.size(), 2u);
  std::size_t idx = phys["artifactLocation"]["index"].get<std::size_t>();
  EXPECT_EQ(artifacts[idx]["location"]["uri"], "hw/inverter.cir");
  EXPECT_TRUE(s["runs"][0]["originalUriBaseIds"].contains("SRCROOT"));
}

TEST(SarifReport, FingerprintsBaselineStateAndSuppressions) {
  Fixture fx;
  json s = json::parse(sarifOf(fx.report));
  const json &results = s["runs"][0]["results"];
  const auto &findings = fx.report.designs[0].findings;
  ASSERT_EQ(results.size(), findings.size());
  for (std::size_t i = 0; i < findings.size(); ++i) {
    // Results keep the order of the (sorted) findings.
    EXPECT_EQ(results[i]["ruleId"], findings[i].rule);
    EXPECT_EQ(results[i]["partialFingerprints"]["gateloop/v1"], findings[i].fingerprint);
    EXPECT_EQ(results[i]["baselineState"], findings[i].baseline ? "unchanged" : "new");
    EXPECT_EQ(results[i].contains("suppressions"), findings[i].waived);
  }
  const json *pulldown = resultFor(results, "gate-pulldown");
  ASSERT_NE(pulldown, nullptr);
  EXPECT_EQ((*pulldown)["suppressions"][0]["kind"], "external");
  EXPECT_EQ((*pulldown)["suppressions"][0]["justification"], "pull-down sits inside the module");
  EXPECT_EQ((*pulldown)["properties"]["waived"], true);

  const json *damping = resultFor(results, "loop-damping");
  EXPECT_EQ((*damping)["level"], "warning");
  EXPECT_EQ((*damping)["message"]["text"],
            "Off loop damping ratio 0.46 is below 0.7. Fix: raise the off resistance to 2.2 ohm.");
  EXPECT_DOUBLE_EQ((*damping)["properties"]["values"]["zeta"].get<double>(), 0.456);
  EXPECT_EQ((*damping)["properties"]["units"]["r_off"], "ohm");

  // Fixed-since-baseline entries go to the run's properties, not into results.
  const json &fixed = s["runs"][0]["properties"]["fixedSinceBaseline"];
  ASSERT_EQ(fixed.size(), 1u);
  EXPECT_EQ(fixed[0]["ruleId"], "rg-range");
  EXPECT_EQ(s["runs"][0]["invocations"][0]["toolExecutionNotifications"].size(), 1u);
}

TEST(SarifReport, IsDeterministicAndEncodesFileNames) {
  Fixture fx;
  EXPECT_EQ(sarifOf(fx.report), sarifOf(fx.report));
  Fixture odd;
  FileId id = odd.files.add("boards/main board#2.cir");
  odd.report.designs[0].findings[0].where = SourceLocation{id, 5, 2};
  FileId abs = odd.files.add("/srv/hw/a.cir");
  odd.report.designs[0].findings[1].where = SourceLocation{abs, 3, 0};
  json s = json::parse(sarifOf(odd.report));
  std::vector<std::string> uris;
  for (const auto &a : s["runs"][0]["artifacts"]) uris.push_back(a["location"]["uri"]);
  EXPECT_NE(std::find(uris.begin(), uris.end(), "boards/main%20board%232.cir"), uris.end());
  EXPECT_NE(std::find(uris.begin(), uris.end(), "file:///srv/hw/a.cir"), uris.end());
}

TEST(SarifReport, InvalidUtf8DoesNotAbortTheReport) {
  Fixture fx;
  fx.report.designs[0].findings[0].message = "net \xff\xfe is odd";
  std::string text;
  ASSERT_NO_THROW(text = sarifOf(fx.report));
  json parsed;
  EXPECT_NO_THROW(parsed = json::parse(text));
  EXPECT_EQ(parsed["version"], "2.1.0");
}

// ---------------------------------------------------------------------------------------------
// Markdown

TEST(MarkdownReport, LoopTableFindingsAndFixes) {
  Fixture fx;
  std::string md = markdownOf(fx.report);
  EXPECT_NE(md.find("| loop | driver | R_on | R_off | ζ on | ζ off | I_pk on | I_pk off | worst R use | verdict |"),
            std::string::npos)
      << md;
  // X1.Q1: 4.7 ohm on, 0.2 ohm off, the damping warning is its worst active finding (the waived
  // pull-down does not count); the worst resistor use is the pulse at 30 W of 40 W.
  EXPECT_NE(md.find("| X1.Q1 | X1.U1 | 4.7 Ω | 200 mΩ |"), std::string::npos) << md;
  EXPECT_NE(md.find("| 75% pulse | warning |"), std::string::npos) << md;
  // X1.Q2: only a baseline note, so ok; no rating data, no zeta.
  EXPECT_NE(md.find("| X1.Q2 | X1.U1 |"), std::string::npos);
  EXPECT_NE(md.find("| - | ok |"), std::string::npos) << md;
  EXPECT_NE(md.find("  - **Fix:** raise the off resistance to 2.2 ohm\n"), std::string::npos);
  EXPECT_NE(md.find("#### Warnings (2)"), std::string::npos) << md;
  EXPECT_NE(md.find("*(accepted in baseline)*"), std::string::npos);
  EXPECT_NE(md.find("*(waived: pull-down sits inside the module)*"), std::string::npos);
  EXPECT_NE(md.find("#### Fixed since baseline (1)"), std::string::npos);
  EXPECT_NE(md.find("hw/inverter.cir:42:1"), std::string::npos);
  EXPECT_NE(md.find("  - zeta = 0.456, zeta\\_warn = 0.7, r\\_off = 200 mΩ\n"), std::string::npos) << md;
  EXPECT_NE(md.find(kSafetyCaution), std::string::npos);
  EXPECT_NE(md.find("**0 errors, 1 warning, 1 note** · 1 accepted in baseline · 1 waived · 1 fixed since baseline"),
            std::string::npos)
      << md;
}

TEST(MarkdownReport, EscapesUserStrings) {
  Fixture fx;
  fx.report.designs[0].name = "bad|name <b>";
  fx.report.designs[0].findings[0].message = "net A|B is *odd*";
  std::string md = markdownOf(fx.report);
  EXPECT_NE(md.find("## bad\\|name \\<b\\>"), std::string::npos) << md;
  EXPECT_NE(md.find("net A\\|B is \\*odd\\*"), std::string::npos) << md;
  EXPECT_EQ(md.find("<b>"), std::string::npos);
}

TEST(MarkdownReport, CleanDesignFitsOnAScreen) {
  Fixture fx;
  DesignReport &d = fx.report.designs[0];
  d.findings.clear();
  d.fixed.clear();
  // Four loops, as in a two-leg board.
  d.loops.push_back(d.loops[0]);
  d.loops.push_back(d.loops[1]);
  d.analyses.push_back(d.analyses[0]);
  d.analyses.push_back(d.analyses[1]);
  fx.report.inputNotes.clear();
  fx.report.summary = summarize(fx.report.designs);
  std::string md = markdownOf(fx.report);
  auto lines = std::count(md.begin(), md.end(), '\n');
  EXPECT_LE(lines, 40) << md;
  EXPECT_NE(md.find("No findings."), std::string::npos);
  EXPECT_NE(md.find("**0 errors, 0 warnings, 0 notes**"), std::string::npos);
}

// ---------------------------------------------------------------------------------------------
// HTML

struct Point {
  double x, y;
};

std::vector<Point> polylinePoints(const pugi::xml_node &poly) {
  std::vector<Point> pts;
  std::istringstream in(poly.attribute("points").value());
  std::string pair;
  while (in >> pair) {
    auto comma = pair.find(',');
    pts.push_back({std::stod(pair.substr(0, comma)), std::stod(pair.substr(comma + 1))});
  }
  return pts;
}

void collect(const pugi::xml_node &node, const char *name, std::vector<pugi::xml_node> &out) {
  for (auto child : node.children()) {
    if (std::string(child.name()) == name) out.push_back(child);
    collect(child, name, out);
  }
}

TEST(HtmlReport, WellFormedWithOnePlotPerPlottableLoop) {
  Fixture fx;
  std::string html = htmlOf(fx.report);
  pugi::xml_document doc;
  pugi::xml_parse_result parsed = doc.load_string(html.c_str(), pugi::parse_default);
  ASSERT_TRUE(parsed) << parsed.description() << " at offset " << parsed.offset << ": "
                      << html.substr(std::max<std::ptrdiff_t>(0, parsed.offset - 80), 160);
  std::vector<pugi::xml_node> svgs;
  collect(doc, "svg", svgs);
  // X1.Q1 has the data; X1.Q2 lacks the loop inductance and says so instead.
  ASSERT_EQ(svgs.size(), 1u);
  EXPECT_NE(html.find("No plot: not enough data (turn-on: no L_loop; turn-off: no L_loop)."), std::string::npos);
  EXPECT_NE(html.find("Missing: layout: no nets of this loop are in the sidecar"), std::string::npos);

  const pugi::xml_node svg = svgs[0];
  double vx, vy, vw, vh;
  std::istringstream(svg.attribute("viewBox").value()) >> vx >> vy >> vw >> vh;
  std::vector<pugi::xml_node> polys;
  collect(svg, "polyline", polys);
  ASSERT_EQ(polys.size(), 2u); // turn-on and turn-off
  std::vector<std::vector<Point>> curves;
  for (const auto &p : polys) {
    auto pts = polylinePoints(p);
    ASSERT_GE(pts.size(), 100u);
    for (const auto &pt : pts) {
      EXPECT_GE(pt.x, vx);
      EXPECT_LE(pt.x, vx + vw);
      EXPECT_GE(pt.y, vy);
      EXPECT_LE(pt.y, vy + vh);
    }
    curves.push_back(pts);
  }
  // Both panels share the voltage axis: the turn-on curve ends at V_on where the turn-off curve
  // starts (the on loop is over-damped, zeta 5.5, so it has settled).
  EXPECT_NEAR(curves[0].back().y, curves[1].front().y, 1.0);
  // Over-damped turn-on never passes its final value (screen y grows downwards).
  double onTop = std::min_element(curves[0].begin(), curves[0].end(), [](auto a, auto b) { return a.y < b.y; })->y;
  EXPECT_GE(onTop, curves[0].back().y - 0.11);
  // The off loop (zeta 0.46) rings: it undershoots V_off visibly, by about 20 % of the 23 V swing
  // (Ogata 2010 sec. 5-3: exp(-zeta pi / sqrt(1 - zeta^2)) = 0.20 at zeta 0.456).
  double offBottom = std::max_element(curves[1].begin(), curves[1].end(), [](auto a, auto b) { return a.y < b.y; })->y;
  double swing = curves[1].back().y - curves[1].front().y;
  EXPECT_NEAR((offBottom - curves[1].back().y) / swing, 0.20, 0.02);
}

TEST(HtmlReport, SelfContainedAndEscaped) {
  Fixture fx;
  fx.report.designs[0].findings[0].message = "<script>alert(1)</script> & \"quoted\"";
  fx.report.designs[0].name = "inverter <rev B>";
  std::string html = htmlOf(fx.report);
  pugi::xml_document doc;
  ASSERT_TRUE(doc.load_string(html.c_str(), pugi::parse_default));
  std::vector<pugi::xml_node> scripts;
  collect(doc, "script", scripts);
  EXPECT_TRUE(scripts.empty());
  EXPECT_NE(html.find("&lt;script&gt;alert(1)&lt;/script&gt; &amp; &quot;quoted&quot;"), std::string::npos);
  EXPECT_NE(html.find("inverter &lt;rev B&gt;"), std::string::npos);
  // No external references: the only URLs are the XHTML and SVG namespace names.
  std::string rest = html;
  for (const char *ns : {"http://www.w3.org/1999/xhtml", "http://www.w3.org/2000/svg"}) {
    for (auto pos = rest.find(ns); pos != std::string::npos; pos = rest.find(ns)) rest.erase(pos, std::strlen(ns));
  }
  EXPECT_EQ(rest.find("http://"), std::string::npos);
  EXPECT_EQ(rest.find("https://"), std::string::npos);
  EXPECT_EQ(rest.find("url("), std::string::npos);
  EXPECT_NE(html.find("raise the off resistance to 2.2 ohm"), std::string::npos);
  EXPECT_NE(html.find("Fixed since baseline"), std::string::npos);
  EXPECT_NE(html.find("v_ge_max 20 V"), std::string::npos) << "the part's limit line is labelled";
  std::string caution = kSafetyCaution;
  EXPECT_NE(html.find(caution.substr(0, 40)), std::string::npos);
}

TEST(HtmlReport, LoopWithoutPathSaysSoAndOtherEdgeIsPlotted) {
  Fixture fx;
  LoopAnalysis &a = fx.report.designs[0].analyses[0];
  a.off = EdgeAnalysis{};
  GateVoltagePlot plot = gateVoltagePlot(fx.report.designs[0], 0);
  EXPECT_FALSE(plot.svg.empty());
  ASSERT_EQ(plot.missing.size(), 1u);
  EXPECT_EQ(plot.missing[0], "turn-off: no conducting path");
  EXPECT_NE(plot.svg.find("turn-off: no conducting path"), std::string::npos);
}

TEST(XmlEscape, ReplacesInvalidUtf8AndDropsControlCharacters) {
  EXPECT_EQ(xmlEscape("a<b>&\"'"), "a&lt;b&gt;&amp;&quot;&#39;");
  EXPECT_EQ(xmlEscape("ok \xC2\xB5H"), "ok \xC2\xB5H");          // valid 2-byte sequence kept
  EXPECT_EQ(xmlEscape("x\xFFy"), "x\xEF\xBF\xBDy");              // stray byte replaced
  EXPECT_EQ(xmlEscape("x\xE2\x82"), "x\xEF\xBF\xBD\xEF\xBF\xBD"); // truncated sequence
  EXPECT_EQ(xmlEscape("a\x01\x1b[0mb\tc"), "a[0mb\tc");          // control characters dropped
}

} // namespace
