// Rule tests: each rule on a failing circuit, a passing circuit and one with missing data, run
// through the whole pipeline. Numbers the rules compare are checked against physics.md's worked
// examples, which were computed from the published formulas named beside each check.
#include "rule_harness.h"

#include <gtest/gtest.h>

#include <regex>

using namespace gateloop;
using namespace gateloop::testing;

namespace {

// Invented demo parts, modelled on the parts example of the specification (a 1200 V 300 A IGBT
// module and an isolated 4 A / 6 A driver). Not real products.
const char *const kParts = R"({
  "schema": "gateloop-parts/1",
  "parts": {
    "SW-1200-300": { "kind": "igbt", "match": {"subckt": ["SWMOD1200"]},
      "pins": {"gate": "G", "emitter": "E", "kelvin": "KE", "collector": "C"},
      "v_ge_max": "20 V", "v_ge_min": "-20 V", "v_th_min": "5.2 V", "v_plateau": "9.5 V",
      "c_ies": "18 nF", "c_res": "0.55 nF", "q_g": "2.4 uC", "q_g_swing": ["-8 V", "15 V"],
      "r_g_int": "2.5 ohm", "r_g_recommended": {"on": ["1 ohm", "10 ohm"], "off": ["1 ohm", "10 ohm"]},
      "v_rated": "1200 V", "i_rated": "300 A", "l_gate_internal": "8 nH", "t_fall": "100 ns" },
    "DRV-ISO-4A": { "kind": "driver", "match": {"subckt": ["DRVISO"]},
      "pins": {"out_source": "OUTH", "out_sink": "OUTL", "ref": "VEE", "supply": "VCC", "clamp": "CLAMP"},
      "i_source_peak": "4 A", "i_sink_peak": "6 A", "r_source": "1.5 ohm", "r_sink": "0.7 ohm",
      "v_on": "15 V", "v_off": "-8 V" },
    "RES-0603-TF": { "kind": "resistor", "case": "0603", "p_rated": "0.1 W", "tolerance": 0.01,
      "t_knee": "70 degC", "t_max": "155 degC", "esl": "0.4 nH",
      "pulse": [["1 us", "25 W"], ["10 us", "9 W"], ["100 us", "3 W"], ["1 ms", "1 W"]] },
    "RES-2512-PP": { "kind": "resistor", "case": "2512", "p_rated": "1 W", "tolerance": 0.01,
      "t_knee": "70 degC", "t_max": "155 degC", "esl": "0.8 nH",
      "pulse": [["1 us", "150 W"], ["10 us", "50 W"], ["100 us", "15 W"], ["1 ms", "4 W"]] },
    "TVS-BI-18": { "kind": "tvs", "match": {"model": ["TVS18"]}, "v_breakdown": "18 V", "v_clamp": "26 V",
      "bidirectional": true }
  } })";

// A half-bridge leg: split driver outputs with separate on/off resistors, pull-down, clamp,
// bypass capacitors, Kelvin reference. Placeholders are replaced per test.
const char *const kLeg = R"(* half-bridge leg for rule tests
XU1 VCC1 GH1 GL1 KE1 CL1 DRVISO
RON1 GH1 G1 {RON}
ROFF1 GL1 G1 {ROFF}
RPD1 G1 KE1 10k
DZ1 G1 KE1 TVS18
C11 VCC1 KE1 22u
C12 VCC1 KE1 22u
XQ1 G1 MID KE1 DCP SWMOD1200
XU2 VCC2 GH2 GL2 KE2 CL2 DRVISO
RON2 GH2 G2 4.7
ROFF2 GL2 G2 2.2
RPD2 G2 KE2 10k
DZ2 G2 KE2 TVS18
C21 VCC2 KE2 22u
C22 VCC2 KE2 22u
XQ2 G2 DCN KE2 MID SWMOD1200
.subckt DRVISO VCC OUTH OUTL VEE CLAMP
.ends
.subckt SWMOD1200 G E KE C
.ends
.model TVS18 D
.end
)";

std::string leg(const std::string &ron = "4.7", const std::string &roff = "2.2") {
  std::string deck = kLeg;
  deck = std::regex_replace(deck, std::regex("\\{RON\\}"), ron);
  deck = std::regex_replace(deck, std::regex("\\{ROFF\\}"), roff);
  return deck;
}

// Operating point of physics.md 3.8: 16 kHz, 55 degC ambient.
const char *const kOperating = R"({"v_bus": "800 V", "i_load": "150 A", "f_sw": "16 kHz", "t_ambient": "55 degC",
  "l_power_loop": "25 nH"})";

const LoopAnalysis &loopNamed(const HarnessRun &run, const std::string &id) {
  const auto &d = run.design();
  for (std::size_t i = 0; i < d.loops.size(); ++i)
    if (d.loops[i].id == id) return d.analyses[i];
  throw std::runtime_error("no loop " + id);
}

double value(const Finding &f, const std::string &name) {
  for (const auto &v : f.values)
    if (v.name == name) return v.value;
  throw std::runtime_error("no value " + name + " in finding " + f.message);
}

} // namespace

namespace {
DesignFiles legWith(const std::string &resistorPart, std::string deck = leg()) {
  DesignFiles f{std::move(deck), kParts, "", kOperating};
  f.assign = {{"RON*", resistorPart}, {"ROFF*", resistorPart}};
  return f;
}
} // namespace

TEST(RulePipeline, FindsBothLoopsOfTheLeg) {
  auto run = runPipeline({leg(), kParts, "", kOperating});
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  const auto &d = run->design();
  ASSERT_EQ(d.loops.size(), 2u);
  EXPECT_EQ(d.loops[0].id, "XQ1");
  EXPECT_EQ(d.loops[0].paths.size(), 2u);
  EXPECT_NE(d.loops[0].halfBridgePartner, kNone);
}

// physics.md 3.8, worked example (b) with the spec's example parts: Q_G = 2.4 uC over -8..+15 V,
// R_on 4.7 ohm, R_off 2.2 ohm, 16 kHz. The loop inductance here is only the 8 nH internal plus
// the 0.4 nH ESL, so the peak current is slightly below the no-inductance bound.
TEST(RulePipeline, WorkedExampleNumbers) {
  std::string parts = kParts;
  auto run = runPipeline({leg(), parts, "", kOperating});
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  const LoopAnalysis &a = loopNamed(*run, "XQ1");
  ASSERT_TRUE(a.cGate && a.on.rTotal && a.off.rTotal && a.on.ePulse && a.on.pAvg);
  EXPECT_NEAR(a.cGate->si(), 104.3478e-9, 1e-12);           // physics.md 3.8: C_G,eff = 104.3478 nF
  EXPECT_NEAR(a.on.rTotal->si(), 8.7, 1e-12);               // physics.md 3.8: R_tot,on
  EXPECT_NEAR(a.off.rTotal->si(), 5.4, 1e-12);              // physics.md 3.8: R_tot,off
  EXPECT_NEAR(a.on.ePulse->si(), 14.9103e-6, 1e-10);        // physics.md 3.8: E per pulse, R_on
  EXPECT_NEAR(a.off.ePulse->si(), 11.2444e-6, 1e-10);       // physics.md 3.8: E per pulse, R_off
  EXPECT_NEAR(a.on.pAvg->si(), 0.238566, 1e-6);             // physics.md 3.8: P_Rext,on
  EXPECT_NEAR(a.off.pAvg->si(), 0.179911, 1e-6);            // physics.md 3.8: P_Rext,off
  EXPECT_NEAR(a.on.tPulse->si(), 0.453913e-6, 1e-12);       // physics.md 3.8: t_eq = tau/2 (on)
  // L = 8.4 nH: the exact series-RLC peak is a little under dV/R = 2.643678 A (physics.md 2, 3.2).
  EXPECT_LT(a.on.iPeak->si(), 2.643678);
  EXPECT_GT(a.on.iPeak->si(), 2.60);
}

TEST(RgRange, PassesInsideRange) {
  auto run = runPipeline({leg(), kParts, "", kOperating});
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  for (const auto &f : run->findings("rg-range")) EXPECT_EQ(f.severity, Severity::Note) << f.message;
}

TEST(RgRange, ErrorBelowRecommendedRange) {
  auto run = runPipeline(legWith("RES-2512-PP", leg("4.7", "0.47")));
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("rg-range");
  ASSERT_EQ(f.size(), 1u);
  EXPECT_EQ(f[0].severity, Severity::Error);
  EXPECT_EQ(f[0].loop, "XQ1");
  // Fix: smallest IEC 60063 E24 value at or above 1 ohm / (1 - 1 %) = 1.0101 ohm is 1.1 ohm.
  EXPECT_NE(f[0].fix.find("1.1 ohm (E24)"), std::string::npos) << f[0].fix;
}

TEST(RgRange, WarningWhenOnlyToleranceExtremeIsOutside) {
  // 9.95 ohm nominal is inside 1..10 ohm, but +1 % gives 10.05 ohm.
  auto run = runPipeline(legWith("RES-2512-PP", leg("9.95", "2.2")));
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("rg-range");
  ASSERT_EQ(f.size(), 1u);
  EXPECT_EQ(f[0].severity, Severity::Warning);
  // Largest E24 value at or below 10 ohm / 1.01 = 9.90 ohm is 9.1 ohm (IEC 60063 E24 table).
  EXPECT_NE(f[0].fix.find("9.1 ohm (E24)"), std::string::npos) << f[0].fix;
}

TEST(RgRange, NoteWithoutRecommendedRange) {
  std::string parts = std::regex_replace(std::string(kParts),
                                         std::regex(R"("r_g_recommended": \{[^}]*\},)"), "");
  auto run = runPipeline({leg(), parts, "", kOperating});
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("rg-range");
  ASSERT_FALSE(f.empty());
  for (const auto &x : f) EXPECT_EQ(x.severity, Severity::Note);
  EXPECT_NE(f[0].message.find("r_g_recommended"), std::string::npos);
}


// rg-power: physics.md 3.8 and 4.1 - P_Rext,on = 0.238566 W against 0.5 x 0.1 W (a 0603 at 55 degC
// keeps its full rating below the 70 degC knee, IEC 60115-1 derating curve).
TEST(RgPower, ErrorFor0603OnTheModule) {
  auto run = runPipeline(legWith("RES-0603-TF"));
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("rg-power");
  ASSERT_EQ(f.size(), 4u); // RON1, ROFF1, RON2, ROFF2
  for (const auto &x : f) EXPECT_EQ(x.severity, Severity::Error);
  const Finding &on = f[0];
  EXPECT_EQ(on.refs.at(0), "RON1");
  EXPECT_NEAR(value(on, "p_avg"), 0.238566, 1e-6);   // physics.md 3.8 (b)
  EXPECT_NEAR(value(on, "p_derated"), 0.1, 1e-12);   // IEC 60115-1 curve: 55 degC < 70 degC knee
  EXPECT_NEAR(value(on, "p_allowed"), 0.05, 1e-12);
}

TEST(RgPower, PassesWith2512) {
  auto run = runPipeline(legWith("RES-2512-PP"));
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  EXPECT_TRUE(run->findings("rg-power").empty());
}

TEST(RgPower, DeratesAboveKnee) {
  // IEC 60115-1 derating: 0.1 W at 100 degC with 70/155 degC -> 0.0647059 W (physics.md 4.1 (b)).
  DesignFiles files = legWith("RES-0603-TF");
  files.operating = R"({"f_sw": "16 kHz", "t_ambient": "100 degC"})";
  auto run = runPipeline(files);
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("rg-power");
  ASSERT_FALSE(f.empty());
  EXPECT_NEAR(value(f[0], "p_derated"), 0.0647059, 1e-7);
}

TEST(RgPower, NoteWithoutResistorPart) {
  auto run = runPipeline({leg(), kParts, "", kOperating});
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("rg-power");
  ASSERT_FALSE(f.empty());
  for (const auto &x : f) EXPECT_EQ(x.severity, Severity::Note);
}

// rg-pulse: physics.md 4.4, the 0603 curve at t_eq = 0.4539 us is clamped to 25 W; repetitive
// limit with D = 0.0072626 is 8.9019 W against P_pk = 32.85 W (no-inductance bound; here the
// 8.4 nH loop lowers the peak slightly).
TEST(RgPulse, ErrorFor0603) {
  auto run = runPipeline(legWith("RES-0603-TF"));
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("rg-pulse");
  ASSERT_FALSE(f.empty());
  EXPECT_EQ(f[0].severity, Severity::Error);
  EXPECT_EQ(f[0].refs.at(0), "RON1");
  EXPECT_NEAR(value(f[0], "p_pulse_allowed"), 0.5 * 8.9019, 2e-3); // physics.md 4.4 (b) x margin 0.5
  EXPECT_NEAR(value(f[0], "t_pulse"), 0.453913e-6, 1e-11);         // physics.md 3.8 (b)
  EXPECT_GT(value(f[0], "p_peak"), 31.0);
  EXPECT_LT(value(f[0], "p_peak"), 32.8485);                       // below the no-L bound of 3.8
}

TEST(RgPulse, PassesWithPulseProofPart) {
  auto run = runPipeline(legWith("RES-2512-PP"));
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  EXPECT_TRUE(run->findings("rg-pulse").empty());
}

TEST(RgPulse, NoteWithoutPulseCurve) {
  std::string parts = std::regex_replace(std::string(kParts), std::regex(R"(,\s*"pulse": \[\["1 us", "150 W"\][^\]]*\][^\]]*\][^\]]*\]\])"), "");
  DesignFiles files = legWith("RES-2512-PP");
  files.parts = parts;
  auto run = runPipeline(files);
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("rg-pulse");
  ASSERT_FALSE(f.empty());
  for (const auto &x : f) EXPECT_EQ(x.severity, Severity::Note);
}

// driver-peak-current: off-path R_total = 0.7 + 0.47 + 2.5 = 3.67 ohm; dV/R = 23 / 3.67 = 6.27 A
// over the 6 A sink rating (physics.md 3.2 bound; the exact RLC peak with 8.4 nH stays above 6 A).
TEST(DriverPeakCurrent, WarnsOverSinkRating) {
  auto run = runPipeline(legWith("RES-2512-PP", leg("4.7", "0.47")));
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("driver-peak-current");
  ASSERT_EQ(f.size(), 1u);
  EXPECT_EQ(f[0].severity, Severity::Warning);
  EXPECT_GT(value(f[0], "i_peak"), 6.0);
  EXPECT_LT(value(f[0], "i_peak"), 23.0 / 3.67);
}

TEST(DriverPeakCurrent, PassesAndNotesMissingRating) {
  auto run = runPipeline(legWith("RES-2512-PP"));
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  EXPECT_TRUE(run->findings("driver-peak-current").empty());
  std::string parts = std::regex_replace(std::string(kParts), std::regex(R"("i_sink_peak": "6 A", )"), "");
  DesignFiles files = legWith("RES-2512-PP");
  files.parts = parts;
  auto noted = runPipeline(files);
  ASSERT_TRUE(noted->inputOk) << noted->diagnostics();
  auto f = noted->findings("driver-peak-current");
  ASSERT_EQ(f.size(), 2u);
  EXPECT_EQ(f[0].severity, Severity::Note);
}

namespace {

// A single low-side switch on one bidirectional driver output (an invented test board).
const char *const kSingleDeck = R"(* single switch loop
XU1 VDD OUT 0 DRVBI
RG1 OUT G {RG}
M1 DRN G 0 0 NMOSX
RPD1 G 0 10k
.subckt DRVBI VDD OUT GND
.ends
.model NMOSX NMOS
.end
)";

// Parts chosen to reproduce physics.md section 2's worked examples: C = q_g / swing.
std::string singleParts(const std::string &qg, const std::string &vOn, const std::string &lInt,
                        const std::string &vMax) {
  return R"({ "schema": "gateloop-parts/1", "parts": {
    "SW-TEST": { "kind": "mosfet", "match": {"model": ["NMOSX"]},
      "q_g": ")" + qg + R"(", "q_g_swing": ["0 V", ")" + vOn + R"("], "r_g_int": "0 ohm",
      "l_gate_internal": ")" + lInt + R"(", "v_gs_max": ")" + vMax + R"(", "v_gs_min": "-10 V",
      "r_g_recommended": {"on": ["0.5 ohm", "20 ohm"], "off": ["0.5 ohm", "20 ohm"]} },
    "DRV-BI": { "kind": "driver", "match": {"subckt": ["DRVBI"]},
      "pins": {"out": "OUT", "ref": "GND", "supply": "VDD"},
      "r_source": "0 ohm", "r_sink": "0 ohm", "v_on": ")" + vOn + R"(", "v_off": "0 V",
      "i_source_peak": "10 A", "i_sink_peak": "10 A" } } })";
}

std::string singleDeck(const std::string &rg) {
  return std::regex_replace(std::string(kSingleDeck), std::regex("\\{RG\\}"), rg);
}

// Si MOSFET worked example of physics.md 2: dV 15 V, R 3 ohm, L 20 nH, C 5 nF -> zeta 0.75.
DesignFiles siExample() { return {singleDeck("3"), singleParts("75 nC", "15 V", "20 nH", "20 V"), "", R"({"f_sw": "100 kHz"})"}; }
// GaN worked example: dV 6 V, R 2 ohm, L 10 nH, C 1 nF -> zeta 0.316228, peak 8.1055 V.
DesignFiles ganExample() { return {singleDeck("2"), singleParts("6 nC", "6 V", "10 nH", "7 V"), "", R"({"f_sw": "100 kHz"})"}; }

} // namespace

// loop-damping against Ogata 2010 sec. 5-3 / physics.md 2 worked example (b): zeta = 0.75.
TEST(LoopDamping, SiExampleZetaAndFix) {
  auto pass = runPipeline(siExample());
  ASSERT_TRUE(pass->inputOk) << pass->diagnostics();
  const auto &a = pass->design().analyses.at(0);
  ASSERT_TRUE(a.on.zeta);
  EXPECT_NEAR(*a.on.zeta, 0.75, 1e-9);                  // physics.md 2: zeta = 0.75
  EXPECT_NEAR(a.on.fRing->si(), 10.5271e6, 1e2);        // physics.md 2: f_ring = 10.5271 MHz
  EXPECT_NEAR(a.on.overshoot.value(), 0.028375, 1e-6);  // physics.md 2: PO = 0.028375
  EXPECT_NEAR(a.on.iPeak->si(), 3.304878, 1e-5);        // physics.md 2: I_pk = 3.304878 A
  for (const auto &f : pass->findings("loop-damping")) EXPECT_NE(f.severity, Severity::Warning);

  auto warn = runPipeline(siExample(), {{"loop-damping", {{"zeta_warn", 0.8}}}});
  ASSERT_TRUE(warn->inputOk) << warn->diagnostics();
  auto f = warn->findings("loop-damping");
  std::vector<Finding> warnings;
  for (const auto &x : f)
    if (x.severity == Severity::Warning) warnings.push_back(x);
  ASSERT_EQ(warnings.size(), 2u); // on and off share the path
  EXPECT_NEAR(value(warnings[0], "zeta"), 0.75, 1e-9);
  // R for zeta 0.8 = 2 * 0.8 * sqrt(20 nH / 5 nF) = 3.2 ohm -> IEC 60063 E24 3.3 ohm.
  EXPECT_NE(warnings[0].fix.find("3.3 ohm (E24)"), std::string::npos) << warnings[0].fix;
}

TEST(LoopDamping, GanExampleIsAnError) {
  auto run = runPipeline(ganExample());
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("loop-damping");
  ASSERT_FALSE(f.empty());
  bool error = false;
  for (const auto &x : f)
    if (x.severity == Severity::Error) {
      error = true;
      EXPECT_NEAR(value(x, "zeta"), 0.316228, 1e-6); // physics.md 2: GaN zeta = 0.316228
    }
  EXPECT_TRUE(error);
}

TEST(LoopDamping, NoteWithoutGateCharge) {
  DesignFiles files = siExample();
  files.parts = std::regex_replace(files.parts, std::regex(R"("q_g": "75 nC", )"), "");
  auto run = runPipeline(files);
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("loop-damping");
  ASSERT_FALSE(f.empty());
  for (const auto &x : f) EXPECT_EQ(x.severity, Severity::Note);
}

// gate-voltage: physics.md 2 GaN example, peak gate voltage 8.1055 V over a +7 V maximum.
TEST(GateVoltage, GanOvershootOverMaximum) {
  auto run = runPipeline(ganExample());
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("gate-voltage");
  ASSERT_EQ(f.size(), 1u);
  EXPECT_EQ(f[0].severity, Severity::Error);
  EXPECT_NEAR(value(f[0], "v_peak_on"), 8.1055, 1e-4); // physics.md 2 (b)
}

TEST(GateVoltage, PassesAndNotesMissingLimits) {
  auto pass = runPipeline(siExample());
  ASSERT_TRUE(pass->inputOk);
  EXPECT_TRUE(pass->findings("gate-voltage").empty());
  DesignFiles files = siExample();
  files.parts = std::regex_replace(files.parts, std::regex(R"("v_gs_max": "20 V", )"), "");
  auto noted = runPipeline(files);
  ASSERT_TRUE(noted->inputOk) << noted->diagnostics();
  auto f = noted->findings("gate-voltage");
  ASSERT_EQ(f.size(), 1u);
  EXPECT_EQ(f[0].severity, Severity::Note);
}

// lead-length: Hammerstad-Jensen microstrip (physics.md 1.8): 0.5 mm x 35 um over a plane 0.2 mm
// below gives 246.911 nH/m, 38 mm -> 9.3826 nH. The GaN loop's damping-based maximum uses
// L_max = R^2 C / (4 zeta^2) = 2.0408 nH (physics.md 2, derived limits) less the 0.5 nH internal.
TEST(LeadLength, DampingBasedMaximumFromLayout) {
  const char *layout = R"({ "schema": "gateloop-layout/1",
    "stackup": {"top": {"z": "0 mm", "copper": "35 um"}, "in1": {"z": "0.2 mm"}},
    "nets": {"G": {"length": "38 mm", "width": "0.5 mm", "layer": "top", "return": {"plane": "in1"}}} })";
  DesignFiles files{singleDeck("2"), singleParts("6 nC", "6 V", "0.5 nH", "7 V"), layout, R"({"f_sw": "100 kHz"})"};
  auto run = runPipeline(files);
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  const auto &a = run->design().analyses.at(0);
  EXPECT_NEAR(a.lLayout.si(), 9.3826e-9, 1e-13); // physics.md 1.8 (b)
  auto f = run->findings("lead-length");
  ASSERT_EQ(f.size(), 1u);
  EXPECT_EQ(f[0].severity, Severity::Warning);
  EXPECT_NEAR(value(f[0], "length"), 0.038, 1e-12);
  EXPECT_NEAR(value(f[0], "max"), (2.040816e-9 - 0.5e-9) / 246.911e-9, 2e-6);
}

TEST(LeadLength, ShortLoopPasses) {
  // 5 mm of the same trace stays under the 6.24 mm damping-based maximum computed above.
  const char *layout = R"({ "schema": "gateloop-layout/1",
    "stackup": {"top": {"z": "0 mm", "copper": "35 um"}, "in1": {"z": "0.2 mm"}},
    "nets": {"G": {"length": "5 mm", "width": "0.5 mm", "layer": "top", "return": {"plane": "in1"}}} })";
  DesignFiles files{singleDeck("2"), singleParts("6 nC", "6 V", "0.5 nH", "7 V"), layout, R"({"f_sw": "100 kHz"})"};
  auto run = runPipeline(files);
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  EXPECT_TRUE(run->findings("lead-length").empty());
}

TEST(LeadLength, ConfiguredMaximumAndMissingLength) {
  auto run = runPipeline(siExample(), {{"lead-length", {{"max", "50 mm"}}}});
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("lead-length");
  ASSERT_EQ(f.size(), 1u);
  EXPECT_EQ(f[0].severity, Severity::Note); // no layout: no length to compare
}

// onoff-paths
TEST(OnOffPaths, SplitOutputsPass) {
  auto run = runPipeline(legWith("RES-2512-PP"));
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  EXPECT_TRUE(run->findings("onoff-paths").empty());
}

TEST(OnOffPaths, SharedPathWarns) {
  auto run = runPipeline(siExample());
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("onoff-paths");
  ASSERT_EQ(f.size(), 1u);
  EXPECT_EQ(f[0].severity, Severity::Warning);
}

TEST(OnOffPaths, DiodeOnlyPathHasNoTurnOff) {
  // OUT -> D1 (anode at the driver) -> RG1 -> gate: only turn-on current can flow.
  std::string deck = std::regex_replace(singleDeck("3"), std::regex("RG1 OUT G 3"), "D1 OUT MIDD DSTEER\nRG1 MIDD G 3");
  deck = std::regex_replace(deck, std::regex("\\.end\n"), ".model DSTEER D\n.end\n");
  DesignFiles files = siExample();
  files.deck = deck;
  auto run = runPipeline(files);
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("onoff-paths");
  ASSERT_EQ(f.size(), 1u);
  EXPECT_EQ(f[0].severity, Severity::Error);
  EXPECT_NE(f[0].message.find("no turn-off path"), std::string::npos) << f[0].message;
}

namespace {
std::string replaceAll(std::string text, const std::string &from, const std::string &to) {
  return std::regex_replace(text, std::regex(from), to);
}
} // namespace

// gate-clamp: an 18 V bidirectional TVS lies between the 15 V drive and the 20 V maximum, and
// between -8 V and -20 V (common practice, no single source: clamp above drive, below rating).
TEST(GateClamp, BidirectionalTvsPasses) {
  auto run = runPipeline(legWith("RES-2512-PP"));
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  EXPECT_TRUE(run->findings("gate-clamp").empty());
}

TEST(GateClamp, ZenerBelowDriveLevelWarns) {
  // SPICE D elements list the anode first: this Zener has its cathode on the gate.
  DesignFiles files = legWith("RES-2512-PP", replaceAll(leg(), "DZ1 G1 KE1 TVS18", "DZ1 KE1 G1 Z12"));
  files.deck = replaceAll(files.deck, "\\.model TVS18 D", ".model TVS18 D\n.model Z12 D");
  files.parts = replaceAll(files.parts, R"("TVS-BI-18": \{)",
                           R"("Z-12": { "kind": "zener", "match": {"model": ["Z12"]}, "v_breakdown": "12 V" },
    "TVS-BI-18": {)");
  auto run = runPipeline(files);
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("gate-clamp");
  ASSERT_EQ(f.size(), 2u);
  // Positive: 12 V inside the 15 V drive. Negative: the Zener conducts forward at -0.7 V, inside -8 V.
  EXPECT_NE(f[0].message.find("conducts during normal drive"), std::string::npos) << f[0].message;
  EXPECT_EQ(f[0].refs.at(0), "DZ1");
}

TEST(GateClamp, MissingClampAndMissingData) {
  auto none = runPipeline(legWith("RES-2512-PP", replaceAll(leg(), "DZ1 G1 KE1 TVS18\n", "")));
  ASSERT_TRUE(none->inputOk) << none->diagnostics();
  auto f = none->findings("gate-clamp");
  ASSERT_EQ(f.size(), 2u); // positive and negative polarity of XQ1
  EXPECT_NE(f[0].message.find("has no"), std::string::npos);
  DesignFiles files = legWith("RES-2512-PP");
  files.parts = replaceAll(files.parts, R"("v_breakdown": "18 V", )", "");
  auto noted = runPipeline(files);
  ASSERT_TRUE(noted->inputOk) << noted->diagnostics();
  auto n = noted->findings("gate-clamp");
  ASSERT_FALSE(n.empty());
  EXPECT_EQ(n[0].severity, Severity::Note);
}

// gate-pulldown: 1-100 kohm typical (physics.md 3.7, common practice, no single source).
TEST(GatePulldown, PresentMissingAndOutOfRange) {
  auto pass = runPipeline(legWith("RES-2512-PP"));
  ASSERT_TRUE(pass->inputOk);
  EXPECT_TRUE(pass->findings("gate-pulldown").empty());
  auto missing = runPipeline(legWith("RES-2512-PP", replaceAll(leg(), "RPD1 G1 KE1 10k\n", "")));
  ASSERT_TRUE(missing->inputOk);
  auto f = missing->findings("gate-pulldown");
  ASSERT_EQ(f.size(), 1u);
  EXPECT_EQ(f[0].loop, "XQ1");
  auto high = runPipeline(legWith("RES-2512-PP", replaceAll(leg(), "RPD1 G1 KE1 10k", "RPD1 G1 KE1 1MEG")));
  ASSERT_TRUE(high->inputOk);
  auto h = high->findings("gate-pulldown");
  ASSERT_EQ(h.size(), 1u);
  EXPECT_NEAR(value(h[0], "r"), 1e6, 1e-6); // SPICE3 scale factor MEG = 1e6
}

// kelvin-return
TEST(KelvinReturn, DriverOnKelvinPasses) {
  auto run = runPipeline(legWith("RES-2512-PP"));
  ASSERT_TRUE(run->inputOk);
  EXPECT_TRUE(run->findings("kelvin-return").empty());
}

TEST(KelvinReturn, DriverOnPowerEmitterWarns) {
  std::string deck = replaceAll(leg(), "XU1 VCC1 GH1 GL1 KE1 CL1 DRVISO", "XU1 VCC1 GH1 GL1 MID CL1 DRVISO");
  auto run = runPipeline(legWith("RES-2512-PP", deck));
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("kelvin-return");
  ASSERT_EQ(f.size(), 1u);
  EXPECT_EQ(f[0].severity, Severity::Warning);
  EXPECT_NE(f[0].message.find("MID"), std::string::npos);
}

TEST(KelvinReturn, UnconnectedKelvinPinWarns) {
  std::string deck = replaceAll(leg(), "XQ1 G1 MID KE1 DCP SWMOD1200", "XQ1 G1 MID KEX DCP SWMOD1200");
  auto run = runPipeline(legWith("RES-2512-PP", deck));
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("kelvin-return");
  ASSERT_EQ(f.size(), 1u);
  EXPECT_NE(f[0].message.find("not connected"), std::string::npos);
}

// connectivity
TEST(Connectivity, CleanLegHasNoErrors) {
  auto run = runPipeline(legWith("RES-2512-PP"));
  ASSERT_TRUE(run->inputOk);
  EXPECT_TRUE(run->findings("connectivity").empty());
}

TEST(Connectivity, GateWithoutDriverAndDriverWithoutSwitch) {
  std::string deck = replaceAll(leg(), "RON1 GH1 G1 4.7\nROFF1 GL1 G1 2.2\n", "RON1 GH1 NC1 4.7\nROFF1 GL1 NC1 2.2\n");
  auto run = runPipeline(legWith("RES-2512-PP", deck));
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("connectivity");
  ASSERT_EQ(f.size(), 3u); // XQ1's gate; XU1's OUTH and OUTL
  for (const auto &x : f) EXPECT_EQ(x.severity, Severity::Error);
  std::size_t unusedOutputs = 0;
  for (const auto &x : f) unusedOutputs += x.message.find("reaches no switch gate") != std::string::npos;
  EXPECT_EQ(unusedOutputs, 2u);
}

TEST(Connectivity, SpareUnconnectedOutputIsNotAnError) {
  // Both resistors hang off OUTH; OUTL's net holds only the driver pin: a spare output.
  std::string deck = replaceAll(leg(), "ROFF1 GL1 G1 2.2\n", "ROFF1 GH1 G1 2.2\n");
  auto run = runPipeline(legWith("RES-2512-PP", deck));
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  EXPECT_TRUE(run->findings("connectivity").empty());
}

TEST(Connectivity, MissingGateResistorAndUnassignedTransistors) {
  std::string deck = replaceAll(leg(), "XU1 VCC1 GH1 GL1", "XU1 VCC1 G1 GL1");
  deck = replaceAll(deck, "RON1 GH1 G1 4.7\n", "M9 A B C C NMOSX\n");
  deck = replaceAll(deck, "\\.end\n", ".model NMOSX NMOS\n.end\n");
  auto run = runPipeline(legWith("RES-2512-PP", deck));
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("connectivity");
  ASSERT_EQ(f.size(), 2u);
  bool errorSeen = false, noteSeen = false;
  for (const auto &x : f) {
    if (x.severity == Severity::Error) errorSeen = x.message.find("without a gate resistor") != std::string::npos;
    if (x.severity == Severity::Note) noteSeen = x.message.find("M9") != std::string::npos;
  }
  EXPECT_TRUE(errorSeen);
  EXPECT_TRUE(noteSeen);
}

// miller-bounce against physics.md 3.4 check (b): C_res 10 pF, C_iss 2 nF,
// R_tot,off = 0.7 + 2.0 + 3.0 ohm, 50 V/ns, 800 V -> estimate (2) = 2.14966 V.
namespace {
DesignFiles sicLeg(const std::string &vOff) {
  std::string parts = replaceAll(kParts, R"("c_ies": "18 nF")", R"("c_ies": "2 nF")");
  parts = replaceAll(parts, R"("c_res": "0.55 nF")", R"("c_res": "10 pF")");
  parts = replaceAll(parts, R"("r_g_int": "2.5 ohm")", R"("r_g_int": "3 ohm")");
  parts = replaceAll(parts, R"("v_th_min": "5.2 V")", R"("v_th_min": "1.8 V")");
  DesignFiles f{leg("4.7", "2.0"), parts, "",
                R"({"v_bus": "800 V", "f_sw": "16 kHz", "dv_dt": "50 V/ns", "drive": {"v_on": "15 V", "v_off": ")" +
                    vOff + R"("}})"};
  f.assign = {{"RON*", "RES-2512-PP"}, {"ROFF*", "RES-2512-PP"}};
  return f;
}
} // namespace

TEST(MillerBounce, ZeroOffVoltageLiftsGateOverThreshold) {
  auto run = runPipeline(sicLeg("0 V"));
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("miller-bounce");
  ASSERT_EQ(f.size(), 2u); // both switches of the leg see the partner's 50 V/ns
  EXPECT_EQ(f[0].severity, Severity::Error);
  EXPECT_EQ(f[0].loop, "XQ1"); // R_off 2.0 ohm: exactly the physics.md 3.4 check circuit
  EXPECT_NEAR(value(f[0], "v_induced"), 2.14966, 1e-5); // physics.md 3.4 (b), estimate (2)
}

TEST(MillerBounce, NegativeOffVoltagePassesAndMissingSlopeNotes) {
  auto pass = runPipeline(sicLeg("-4 V"));
  ASSERT_TRUE(pass->inputOk) << pass->diagnostics();
  for (const auto &f : pass->findings("miller-bounce")) ADD_FAILURE() << f.message;
  DesignFiles files = legWith("RES-2512-PP");
  std::string parts = replaceAll(kParts, R"("v_plateau": "9.5 V",\s*)", "");
  files.parts = parts;
  auto noted = runPipeline(files);
  ASSERT_TRUE(noted->inputOk) << noted->diagnostics();
  auto f = noted->findings("miller-bounce");
  ASSERT_EQ(f.size(), 2u);
  EXPECT_EQ(f[0].severity, Severity::Note);
}

// turnoff-overshoot against physics.md 3.5 (b): 800 V + 30 nH x 5 kA/us = 950 V.
TEST(TurnoffOvershoot, PeakOverDeratedRating) {
  DesignFiles files = legWith("RES-2512-PP");
  files.operating = R"({"v_bus": "800 V", "f_sw": "16 kHz", "l_power_loop": "30 nH", "di_dt": "5 kA/us"})";
  auto run = runPipeline(files, {{"turnoff-overshoot", {{"derating", 0.75}}}});
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("turnoff-overshoot");
  ASSERT_EQ(f.size(), 2u);
  EXPECT_NEAR(value(f[0], "v_peak"), 950.0, 1e-9); // physics.md 3.5 (b)
  EXPECT_NEAR(value(f[0], "v_limit"), 900.0, 1e-9);
}

TEST(TurnoffOvershoot, PassesFromFallTimeAndNotesMissingBus) {
  // 150 A falling in 100 ns (t_fall) with 25 nH: 837.5 V (physics.md 3.5 (b)) < 0.8 x 1200 V.
  auto pass = runPipeline(legWith("RES-2512-PP"));
  ASSERT_TRUE(pass->inputOk);
  EXPECT_TRUE(pass->findings("turnoff-overshoot").empty());
  DesignFiles files = legWith("RES-2512-PP");
  files.operating = R"({"f_sw": "16 kHz"})";
  auto noted = runPipeline(files);
  ASSERT_TRUE(noted->inputOk);
  auto f = noted->findings("turnoff-overshoot");
  ASSERT_EQ(f.size(), 2u);
  EXPECT_EQ(f[0].severity, Severity::Note);
}

// driver-decoupling against physics.md 3.6 (b): Q_G 2.4 uC, 0.5 V ripple, k = 10 -> 48 uF.
TEST(DriverDecoupling, TooLittleBypassForK10) {
  auto run = runPipeline(legWith("RES-2512-PP"), {{"driver-decoupling", {{"k", 10}}}});
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  auto f = run->findings("driver-decoupling");
  ASSERT_EQ(f.size(), 2u); // XU1 and XU2 each have 44 uF
  EXPECT_NEAR(value(f[0], "c_needed"), 48e-6, 1e-12);
  EXPECT_NEAR(value(f[0], "c_bypass"), 44e-6, 1e-12);
}

TEST(DriverDecoupling, DefaultPassesAndMissingPinNotes) {
  auto pass = runPipeline(legWith("RES-2512-PP"));
  ASSERT_TRUE(pass->inputOk);
  EXPECT_TRUE(pass->findings("driver-decoupling").empty());
  DesignFiles files = legWith("RES-2512-PP");
  files.parts = replaceAll(files.parts, R"(, "supply": "VCC")", "");
  auto noted = runPipeline(files);
  ASSERT_TRUE(noted->inputOk) << noted->diagnostics();
  auto f = noted->findings("driver-decoupling");
  ASSERT_EQ(f.size(), 1u); // one note for the part, not one per driver
  EXPECT_EQ(f[0].severity, Severity::Note);
  EXPECT_NE(f[0].message.find("DRV-ISO-4A"), std::string::npos) << f[0].message;
}

TEST(RuleOptions, UnknownRuleAndParameterAreInputErrors) {
  auto run = runPipeline(legWith("RES-2512-PP"), {{"loop-dampin", {{"zeta_warn", 0.7}}},
                                                  {"loop-damping", {{"zeta_wran", 0.7}}}});
  // Rule parameters are validated by the command (validateRuleParams); check it directly.
  InputDiagnostics diags;
  validateRuleParams(run->inputs.project.ruleParams, run->inputs.project.file, diags);
  ASSERT_EQ(diags.errorCount(), 2u);
  std::string all;
  for (const auto &d : diags.items()) all += formatDiagnostic(d, run->inputs.files) + "\n";
  EXPECT_NE(all.find("rules.loop-dampin: error: unknown rule id; did you mean \"loop-damping\"?"), std::string::npos) << all;
  EXPECT_NE(all.find("rules.loop-damping.zeta_wran: error: unknown parameter; did you mean \"zeta_warn\"?"),
            std::string::npos) << all;
}
