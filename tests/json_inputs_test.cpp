/// \file
/// Tests of the three JSON readers: parts library (spec 4.3), layout sidecar (4.4) and project
/// file (4.5). The spec's own examples must load unchanged; bad input is checked by the exact
/// rendered message, as the user sees it on stderr.

#include "netlist-io/json_inputs.h"

#include <gtest/gtest.h>

#include <filesystem>
#include <fstream>
#include <string>
#include <unistd.h>
#include <vector>

namespace gateloop {
namespace {

namespace fs = std::filesystem;

const std::string kSpecProject = std::string(GATELOOP_TEST_DATA) + "/inputs/json/spec-project";

/// A scratch folder for the files of one test, removed afterwards.
class JsonInputs : public ::testing::Test {
protected:
  void SetUp() override {
    const auto *info = ::testing::UnitTest::GetInstance()->current_test_info();
    dir_ = fs::temp_directory_path() /
           ("gateloop-json-" + std::to_string(::getpid()) + "-" + info->name());
    fs::remove_all(dir_);
    fs::create_directories(dir_);
  }
  void TearDown() override { fs::remove_all(dir_); }

  std::string write(const std::string &name, const std::string &text) {
    fs::path p = dir_ / name;
    fs::create_directories(p.parent_path());
    std::ofstream(p, std::ios::binary) << text;
    return p.string();
  }

  std::vector<std::string> rendered() const {
    std::vector<std::string> out;
    for (const auto &d : diags_.items()) out.push_back(formatDiagnostic(d, files_));
    return out;
  }

  /// Reads a parts library from \p text and returns every message.
  std::vector<std::string> partsErrors(const std::string &text) {
    lib_ = {};
    path_ = write("lib.json", text);
    EXPECT_FALSE(readPartsLibrary(path_, files_, lib_, diags_));
    return rendered();
  }
  std::vector<std::string> layoutErrors(const std::string &text) {
    layout_ = {};
    path_ = write("board.layout.json", text);
    EXPECT_FALSE(readLayout(path_, files_, layout_, diags_));
    return rendered();
  }
  std::vector<std::string> projectErrors(const std::string &text) {
    project_ = {};
    path_ = write("gateloop.json", text);
    EXPECT_FALSE(readProject(path_, files_, project_, diags_));
    return rendered();
  }

  /// `PATH: suffix`, the way the messages of the file just read begin.
  std::string at(const std::string &suffix) const { return path_ + ": " + suffix; }

  fs::path dir_;
  std::string path_;
  FileTable files_;
  InputDiagnostics diags_;
  PartLibrary lib_;
  Layout layout_;
  Project project_;
};

const char *kPartsHead = R"({ "schema": "gateloop-parts/1", "parts": {)";

// ---------------------------------------------------------------------------------------------
// Valid input

TEST_F(JsonInputs, SpecPartsExampleLoads) {
  ASSERT_TRUE(readPartsLibrary(kSpecProject + "/parts/lib.json", files_, lib_, diags_));
  EXPECT_TRUE(diags_.items().empty()) << ::testing::PrintToString(rendered());
  ASSERT_EQ(lib_.parts.size(), 4u);

  const Part &sw = lib_.parts[lib_.find("SW-1200-300")];
  EXPECT_EQ(sw.kind, PartKind::Igbt);
  EXPECT_EQ(sw.fieldPath, "parts.SW-1200-300");
  EXPECT_EQ(sw.matchSubckt, std::vector<std::string>{"SWMOD1200"});
  EXPECT_EQ(sw.pins.at("gate"), "G");
  EXPECT_EQ(sw.pins.at("emitter"), "E");
  EXPECT_EQ(sw.pins.at("kelvin"), "KE");
  EXPECT_EQ(sw.pins.at("collector"), "C");
  EXPECT_DOUBLE_EQ(sw.vGateMax->si(), 20.0);
  EXPECT_DOUBLE_EQ(sw.vGateMin->si(), -20.0);
  EXPECT_DOUBLE_EQ(sw.vThMin->si(), 5.2);
  EXPECT_DOUBLE_EQ(sw.vPlateau->si(), 9.5);
  EXPECT_DOUBLE_EQ(sw.cIes->si(), 18e-9);
  EXPECT_DOUBLE_EQ(sw.cRes->si(), 0.55e-9);
  EXPECT_DOUBLE_EQ(sw.qG->si(), 2.4e-6);
  EXPECT_DOUBLE_EQ(sw.qGSwing->low.si(), -8.0);
  EXPECT_DOUBLE_EQ(sw.qGSwing->high.si(), 15.0);
  EXPECT_DOUBLE_EQ(sw.rGInt->si(), 2.5);
  EXPECT_DOUBLE_EQ(sw.rgRecommendedOn->low.si(), 1.0);
  EXPECT_DOUBLE_EQ(sw.rgRecommendedOff->high.si(), 10.0);
  EXPECT_DOUBLE_EQ(sw.vRated->si(), 1200.0);
  EXPECT_DOUBLE_EQ(sw.iRated->si(), 300.0);
  EXPECT_DOUBLE_EQ(sw.lGateInternal->si(), 8e-9);
  EXPECT_FALSE(sw.tFall.has_value());

  const Part &drv = lib_.parts[lib_.find("DRV-ISO-4A")];
  EXPECT_EQ(drv.kind, PartKind::Driver);
  EXPECT_EQ(drv.pins.at("out_source"), "OUTH");
  EXPECT_EQ(drv.pins.at("clamp"), "CLAMP");
  EXPECT_DOUBLE_EQ(drv.iSinkPeak->si(), 6.0);
  EXPECT_DOUBLE_EQ(drv.rSink->si(), 0.7);
  EXPECT_DOUBLE_EQ(drv.vOff->si(), -8.0);

  const Part &res = lib_.parts[lib_.find("RES-0603-TF")];
  EXPECT_EQ(res.caseCode, "0603");
  EXPECT_DOUBLE_EQ(res.pRated->si(), 0.1);
  EXPECT_DOUBLE_EQ(*res.tolerance, 0.01);
  EXPECT_DOUBLE_EQ(res.tKnee->si(), 70.0);
  EXPECT_DOUBLE_EQ(res.tMax->si(), 155.0);
  EXPECT_DOUBLE_EQ(res.esl->si(), 0.4e-9);
  ASSERT_EQ(res.pulse.size(), 4u);
  EXPECT_DOUBLE_EQ(res.pulse[0].width.si(), 1e-6);
  EXPECT_DOUBLE_EQ(res.pulse[0].power.si(), 25.0);
  EXPECT_DOUBLE_EQ(res.pulse[3].width.si(), 1e-3);

  const Part &tvs = lib_.parts[lib_.find("TVS-BI-18")];
  EXPECT_EQ(tvs.kind, PartKind::Tvs);
  EXPECT_DOUBLE_EQ(tvs.vBreakdown->si(), 18.0);
  EXPECT_DOUBLE_EQ(tvs.vClamp->si(), 26.0);
  EXPECT_TRUE(tvs.bidirectional);
}

TEST_F(JsonInputs, PartsExtraFieldsAliasesAndSorting) {
  path_ = write("lib.json", std::string(kPartsHead) + R"(
    // comments are allowed
    "M1": {"kind": "mosfet", "match": {"model": "NMOS650"}, "v_gs_max": "22 V", "v_gs_min": "-8 V",
           "c_iss": "2 nF", "c_rss": "15 pF", "t_fall": "20 ns",
           "pins": {"gate": "G", "source": "S", "kelvin": "SK", "drain": "D"}},
    "Q2": {"kind": "igbt", "pins": {"gate": "G", "source": "E", "drain": "C"}},
    "U2": {"kind": "driver", "pins": {"out": "OUT", "ref": "GND2"}},
    "R2": {"kind": "resistor", "tolerance": "1 %", "v_max": "75 V",
           "pulse": [[1e-3, 1], ["1 us", "25 W"], ["10 us", 9]]},
    "C1": {"kind": "capacitor", "capacitance": "4.7 nF", "esl": "0.5 nH"},
    "D1": {"kind": "diode", "v_f": "0.7 V", "match": {"model": ["DFAST", "dslow"]},
           "pins": {"anode": "2", "cathode": "1"}},
    "Z1": {"kind": "zener", "v_breakdown": "18 V", "v_f": 0.8},
    "FB1": {"kind": "ferrite", "r_dc": "50 mohm", "l": "1 uH"}
  } })");
  ASSERT_TRUE(readPartsLibrary(path_, files_, lib_, diags_)) << ::testing::PrintToString(rendered());
  EXPECT_TRUE(diags_.items().empty());
  const Part &m = lib_.parts[lib_.find("M1")];
  EXPECT_EQ(m.kind, PartKind::Mosfet);
  EXPECT_EQ(m.matchModel, std::vector<std::string>{"NMOS650"});
  EXPECT_DOUBLE_EQ(m.vGateMax->si(), 22.0);
  EXPECT_DOUBLE_EQ(m.cIes->si(), 2e-9);
  EXPECT_DOUBLE_EQ(m.cRes->si(), 15e-12);
  EXPECT_DOUBLE_EQ(m.tFall->si(), 20e-9);
  EXPECT_EQ(m.pins.at("source"), "S");
  EXPECT_EQ(m.pins.at("drain"), "D");
  // An IGBT's "source"/"drain" are stored under the IGBT's own words.
  const Part &q = lib_.parts[lib_.find("Q2")];
  EXPECT_EQ(q.pins.at("emitter"), "E");
  EXPECT_EQ(q.pins.at("collector"), "C");
  EXPECT_EQ(q.pins.count("source"), 0u);
  EXPECT_EQ(lib_.parts[lib_.find("U2")].pins.at("out"), "OUT");
  const Part &r = lib_.parts[lib_.find("R2")];
  EXPECT_DOUBLE_EQ(*r.tolerance, 0.01);
  EXPECT_DOUBLE_EQ(r.vMaxElement->si(), 75.0);
  ASSERT_EQ(r.pulse.size(), 3u); // sorted by width on load
  EXPECT_DOUBLE_EQ(r.pulse[0].width.si(), 1e-6);
  EXPECT_DOUBLE_EQ(r.pulse[1].width.si(), 10e-6);
  EXPECT_DOUBLE_EQ(r.pulse[1].power.si(), 9.0);
  EXPECT_DOUBLE_EQ(r.pulse[2].width.si(), 1e-3);
  EXPECT_DOUBLE_EQ(lib_.parts[lib_.find("C1")].capacitance->si(), 4.7e-9);
  EXPECT_EQ(lib_.parts[lib_.find("D1")].matchModel, (std::vector<std::string>{"DFAST", "dslow"}));
  EXPECT_EQ(lib_.parts[lib_.find("D1")].pins.at("anode"), "2");
  EXPECT_DOUBLE_EQ(lib_.parts[lib_.find("Z1")].vForward->si(), 0.8);
  EXPECT_FALSE(lib_.parts[lib_.find("Z1")].bidirectional);
  EXPECT_DOUBLE_EQ(lib_.parts[lib_.find("FB1")].rDc->si(), 0.05);
  EXPECT_DOUBLE_EQ(lib_.parts[lib_.find("FB1")].inductance->si(), 1e-6);
}

TEST_F(JsonInputs, SpecLayoutExampleLoads) {
  ASSERT_TRUE(readLayout(kSpecProject + "/hw/inverter.layout.json", files_, layout_, diags_));
  EXPECT_TRUE(diags_.items().empty()) << ::testing::PrintToString(rendered());
  ASSERT_EQ(layout_.stackup.size(), 4u);
  EXPECT_DOUBLE_EQ(layout_.layer("in2")->z.si(), 1.4e-3);
  EXPECT_DOUBLE_EQ(layout_.layer("in1")->copper.si(), 35e-6); // default
  EXPECT_DOUBLE_EQ(layout_.layer("bottom")->z.si(), 1.6e-3);
  ASSERT_EQ(layout_.nets.size(), 3u);
  const NetRouting *g = layout_.routing("G_A");
  ASSERT_NE(g, nullptr);
  EXPECT_DOUBLE_EQ(g->length->si(), 38e-3);
  EXPECT_DOUBLE_EQ(g->width->si(), 0.5e-3);
  EXPECT_EQ(g->layer, "top");
  EXPECT_EQ(g->ret.kind, NetReturn::Kind::Plane);
  EXPECT_EQ(g->ret.target, "in1");
  EXPECT_EQ(g->fieldPath, "nets.G_A");
  const NetRouting *ke = layout_.routing("ke_a"); // net names are case-insensitive
  ASSERT_NE(ke, nullptr);
  EXPECT_EQ(ke->ret.kind, NetReturn::Kind::Pair);
  EXPECT_EQ(ke->ret.target, "G_A");
  ASSERT_EQ(layout_.traces.size(), 1u);
  const TracePath &t = layout_.traces[0];
  EXPECT_EQ(t.fieldPath, "traces[0]");
  ASSERT_EQ(t.pointsM.size(), 3u);
  EXPECT_DOUBLE_EQ(t.pointsM[2].first, 30e-3); // points are in mm
  EXPECT_DOUBLE_EQ(t.pointsM[2].second, 21e-3);
  ASSERT_EQ(layout_.wires.size(), 1u);
  EXPECT_EQ(layout_.wires[0].nets, (std::vector<std::string>{"G_A", "KE_A"}));
  EXPECT_DOUBLE_EQ(layout_.wires[0].length.si(), 0.18);
  EXPECT_DOUBLE_EQ(layout_.wires[0].diameter.si(), 0.8e-3);
  EXPECT_DOUBLE_EQ(layout_.wires[0].spacing.si(), 3e-3);
  EXPECT_FALSE(layout_.wires[0].twisted);
  EXPECT_NE(layout_.file, 0u);
}

TEST_F(JsonInputs, LayoutInMilsWithPairGap) {
  path_ = write("b.layout.json", R"({"schema": "gateloop-layout/1", "units": "mil",
    "stackup": {"top": {"z": 0}},
    "nets": {"G": {"layer": "top", "width": "20 mil", "return": {"pair": "K", "gap": "8 mil"}},
             "K": {"layer": "top", "width": "20 mil"}},
    "traces": [{"net": "G", "layer": "top", "width": "20 mil", "points": [[0, 0], [0, 0], [1000, 0]]}]})");
  ASSERT_TRUE(readLayout(path_, files_, layout_, diags_)) << ::testing::PrintToString(rendered());
  // 1 mil = 25.4 um (1 in = 25.4 mm exactly); the repeated first point is dropped.
  ASSERT_EQ(layout_.traces[0].pointsM.size(), 2u);
  EXPECT_DOUBLE_EQ(layout_.traces[0].pointsM[1].first, 25.4e-3);
  EXPECT_DOUBLE_EQ(layout_.routing("G")->ret.gap->si(), 8 * 25.4e-6);
  EXPECT_DOUBLE_EQ(layout_.routing("K")->width->si(), 20 * 25.4e-6);
}

TEST_F(JsonInputs, SpecProjectExampleLoads) {
  const std::string path = kSpecProject + "/gateloop.json";
  ASSERT_TRUE(readProject(path, files_, project_, diags_));
  EXPECT_TRUE(diags_.items().empty()) << ::testing::PrintToString(rendered());
  EXPECT_EQ(project_.rootDir, fs::absolute(kSpecProject).lexically_normal().string());
  EXPECT_EQ(project_.partsPaths, std::vector<std::string>{kSpecProject + "/parts/lib.json"});
  ASSERT_EQ(project_.designs.size(), 1u);
  const DesignSpec &d = project_.designs[0];
  EXPECT_EQ(d.name, "inverter-a");
  EXPECT_EQ(d.fieldPath, "designs[0]");
  EXPECT_EQ(d.netlistPath, kSpecProject + "/hw/inverter.cir");
  EXPECT_EQ(d.layoutPath, kSpecProject + "/hw/inverter.layout.json");
  ASSERT_EQ(d.assign.size(), 1u);
  EXPECT_EQ(d.assign[0], (std::pair<std::string, std::string>{"R*", "RES-0603-TF"}));
  EXPECT_DOUBLE_EQ(d.operating.vBus->si(), 800.0);
  EXPECT_DOUBLE_EQ(d.operating.iLoad->si(), 150.0);
  EXPECT_DOUBLE_EQ(d.operating.fSw->si(), 16e3);
  EXPECT_DOUBLE_EQ(d.operating.tAmbient->si(), 55.0);
  EXPECT_DOUBLE_EQ(d.operating.lPowerLoop->si(), 25e-9);
  EXPECT_DOUBLE_EQ(d.operating.driveVOn->si(), 15.0);
  EXPECT_DOUBLE_EQ(d.operating.driveVOff->si(), -8.0);
  EXPECT_FALSE(d.operating.dvDt.has_value());
  EXPECT_EQ(project_.ruleParams.at("loop-damping").at("zeta_warn").get<double>(), 0.7);
  EXPECT_EQ(project_.ruleParams.at("lead-length").at("max").get<std::string>(), "50 mm");
  ASSERT_EQ(project_.waivers.size(), 1u);
  EXPECT_EQ(project_.waivers[0].rule, "gate-pulldown");
  EXPECT_EQ(project_.waivers[0].loopGlob, "X3.Q2");
  EXPECT_EQ(project_.waivers[0].reason, "pull-down inside module");
  EXPECT_EQ(project_.waivers[0].until, "2027-06-30");
  EXPECT_EQ(project_.waivers[0].fieldPath, "waivers[0]");
}

TEST_F(JsonInputs, ProjectAssignKeepsFileOrderAndExtraOperatingFields) {
  path_ = write("sub/gateloop.json", R"({"schema": "gateloop/1", "designs": [
    {"name": "a", "netlist": "/abs/a.cir", "parts": ["../common/lib.json"],
     "assign": {"RG*": "R-GATE", "R*": "R-ANY", "A*": "X"},
     "operating": {"dv_dt": "50 V/ns", "di_dt": "3 kA/us", "l_per_length": "1 nH/mm",
                   "assumed_length": "30 mm"}}]})");
  ASSERT_TRUE(readProject(path_, files_, project_, diags_)) << ::testing::PrintToString(rendered());
  const DesignSpec &d = project_.designs[0];
  ASSERT_EQ(d.assign.size(), 3u);
  EXPECT_EQ(d.assign[0].first, "RG*"); // file order, not alphabetical
  EXPECT_EQ(d.assign[1].first, "R*");
  EXPECT_EQ(d.assign[2].first, "A*");
  EXPECT_EQ(d.netlistPath, "/abs/a.cir");
  EXPECT_EQ(d.partsPaths, std::vector<std::string>{(dir_ / "common/lib.json").string()});
  EXPECT_EQ(project_.rootDir, (dir_ / "sub").string());
  EXPECT_DOUBLE_EQ(d.operating.dvDt->si(), 50e9);
  EXPECT_DOUBLE_EQ(d.operating.diDt->si(), 3e9);
  EXPECT_DOUBLE_EQ(d.operating.assumedInductancePerLength->si(), 1e-6);
  EXPECT_DOUBLE_EQ(d.operating.assumedLength->si(), 30e-3);
}

TEST_F(JsonInputs, OperatingPointFileOverlaysADesign) {
  path_ = write("op.json", R"({"schema": "gateloop-operating/1", "v_bus": "600 V", "drive": {"v_off": "-5 V"},
                               "dv_dt": "30 V/ns"})");
  OperatingPoint op;
  op.vBus = Volt(800);
  op.fSw = Hertz(16e3);
  op.driveVOn = Volt(15);
  ASSERT_TRUE(readOperatingPoint(path_, files_, op, diags_)) << ::testing::PrintToString(rendered());
  EXPECT_DOUBLE_EQ(op.vBus->si(), 600.0);   // given in the file
  EXPECT_DOUBLE_EQ(op.fSw->si(), 16e3);     // kept
  EXPECT_DOUBLE_EQ(op.driveVOn->si(), 15.0);
  EXPECT_DOUBLE_EQ(op.driveVOff->si(), -5.0);
  EXPECT_DOUBLE_EQ(op.dvDt->si(), 30e9);

  path_ = write("op2.json", R"({"f_sw": "16 kHz", "v_bus": "800 A"})"); // schema line optional
  OperatingPoint op2;
  EXPECT_FALSE(readOperatingPoint(path_, files_, op2, diags_));
  auto msgs = rendered();
  ASSERT_EQ(msgs.size(), 1u);
  EXPECT_EQ(msgs[0], at("v_bus: error: expected a voltage, got \"800 A\""));
  EXPECT_DOUBLE_EQ(op2.fSw->si(), 16e3);
}

TEST_F(JsonInputs, FindProjectFileWalksUp) {
  write("proj/gateloop.json", "{}");
  fs::create_directories(dir_ / "proj/hw/deep");
  auto found = findProjectFile((dir_ / "proj/hw/deep").string());
  ASSERT_TRUE(found.has_value());
  EXPECT_EQ(fs::path(*found), dir_ / "proj/gateloop.json");
  EXPECT_EQ(fs::path(*findProjectFile((dir_ / "proj").string())), dir_ / "proj/gateloop.json");
  // Above the project there is none (unless the machine's temp folder sits below a project).
  auto above = findProjectFile(dir_.string());
  EXPECT_TRUE(!above || fs::path(*above).parent_path() != dir_ / "proj");
}

// ---------------------------------------------------------------------------------------------
// Bad input: exact messages

TEST_F(JsonInputs, JsonSyntaxErrorHasLineAndColumn) {
  auto errs = partsErrors("{ \"schema\": \"gateloop-parts/1\",\n  \"parts\": {\n    \"R1\": {\"kind\": \"resistor\",}\n  }\n}\n");
  ASSERT_EQ(errs.size(), 1u);
  EXPECT_EQ(errs[0], path_ + ":3:31: error: invalid JSON: syntax error while parsing object key - unexpected '}'; "
                             "expected string literal");
}

TEST_F(JsonInputs, UnterminatedJsonPointsAtTheEnd) {
  auto errs = layoutErrors("{\"schema\": \"gateloop-layout/1\",\n \"nets\": {\n");
  ASSERT_EQ(errs.size(), 1u);
  EXPECT_EQ(errs[0], path_ + ":2:11: error: invalid JSON: syntax error while parsing object key - unexpected "
                             "end of input; expected string literal");
}

TEST_F(JsonInputs, WrongUnitNamesTheFieldPath) {
  // Spec section 3's example message.
  auto errs = partsErrors(std::string(kPartsHead) + R"("Q-SW1": {"kind": "igbt", "c_ies": "4.7 nH"}}})");
  ASSERT_EQ(errs.size(), 1u);
  EXPECT_EQ(errs[0], at("parts.Q-SW1.c_ies: error: expected a capacitance, got \"4.7 nH\""));
}

TEST_F(JsonInputs, UnknownFieldSuggestsTheNearestOne) {
  auto errs = partsErrors(std::string(kPartsHead) + R"("Q1": {"kind": "igbt", "c_iess": "18 nF", "v_get_max": 20,
                          "foo": 1}}})");
  ASSERT_EQ(errs.size(), 3u);
  EXPECT_EQ(errs[0], at("parts.Q1.c_iess: error: unknown field; did you mean \"c_ies\"?"));
  EXPECT_EQ(errs[1], at("parts.Q1.v_get_max: error: unknown field; did you mean \"v_ge_max\"?"));
  EXPECT_EQ(errs[2], at("parts.Q1.foo: error: unknown field"));
}

TEST_F(JsonInputs, FieldOfAnotherKind) {
  auto errs = partsErrors(std::string(kPartsHead) + R"("R1": {"kind": "resistor", "v_f": "0.7 V"}}})");
  ASSERT_EQ(errs.size(), 1u);
  EXPECT_EQ(errs[0], at("parts.R1.v_f: error: field does not apply to a part of kind \"resistor\""));
}

TEST_F(JsonInputs, UnknownAndMissingKind) {
  auto errs = partsErrors(std::string(kPartsHead) + R"("Q1": {"kind": "igtb"}, "Q2": {"c_ies": "1 nF"}}})");
  ASSERT_EQ(errs.size(), 2u);
  EXPECT_EQ(errs[0], at("parts.Q1.kind: error: unknown kind \"igtb\" (expected igbt, mosfet, driver, resistor, "
                        "capacitor, diode, zener, tvs or ferrite); did you mean \"igbt\"?"));
  EXPECT_EQ(errs[1], at("parts.Q2: error: missing required field \"kind\""));
  EXPECT_TRUE(lib_.parts.empty());
}

TEST_F(JsonInputs, WrongAndMissingSchema) {
  auto errs = partsErrors(R"({"schema": "gateloop-parts/2", "parts": {}})");
  ASSERT_EQ(errs.size(), 1u);
  EXPECT_EQ(errs[0], at("schema: error: expected \"gateloop-parts/1\", got \"gateloop-parts/2\""));
  diags_ = {};
  errs = layoutErrors(R"({"nets": {}})");
  ASSERT_EQ(errs.size(), 1u);
  EXPECT_EQ(errs[0], at("error: missing required field \"schema\""));
}

TEST_F(JsonInputs, DuplicatePartAcrossLibraries) {
  std::string first = write("a.json", std::string(kPartsHead) + R"("R1": {"kind": "resistor"}}})");
  ASSERT_TRUE(readPartsLibrary(first, files_, lib_, diags_));
  path_ = write("b.json", std::string(kPartsHead) + R"("R1": {"kind": "resistor", "p_rated": "1 W"}}})");
  EXPECT_FALSE(readPartsLibrary(path_, files_, lib_, diags_));
  auto errs = rendered();
  ASSERT_EQ(errs.size(), 1u);
  EXPECT_EQ(errs[0], at("parts.R1: error: part \"R1\" is already defined in " + first));
  ASSERT_EQ(lib_.parts.size(), 1u);
  EXPECT_FALSE(lib_.parts[0].pRated.has_value()); // the first definition stays
}

TEST_F(JsonInputs, DuplicateKeyInOneFile) {
  auto errs = partsErrors(std::string(kPartsHead) + R"("R1": {"kind": "resistor"}, "R1": {"kind": "capacitor"}}})");
  ASSERT_EQ(errs.size(), 1u);
  EXPECT_EQ(errs[0], at("parts.R1: error: duplicate key \"R1\" (only one value can be used)"));
}

TEST_F(JsonInputs, ToleranceMustBeAFraction) {
  auto errs = partsErrors(std::string(kPartsHead) + R"("R1": {"kind": "resistor", "tolerance": 1},
                                                        "R2": {"kind": "resistor", "tolerance": "-1 %"}}})");
  ASSERT_EQ(errs.size(), 2u);
  EXPECT_EQ(errs[0], at("parts.R1.tolerance: error: must be a fraction below 1 (write 0.01 or \"1 %\" for 1 %), got 1"));
  EXPECT_EQ(errs[1], at("parts.R2.tolerance: error: must not be negative, got \"-1 %\""));
}

TEST_F(JsonInputs, PulseCurveMustBePositivePairs) {
  auto errs = partsErrors(std::string(kPartsHead) +
                          R"("R1": {"kind": "resistor", "pulse": [["1 us", "25 W"], ["0 us", "9 W"], ["1 ms"]]},
                             "R2": {"kind": "resistor", "pulse": [["1 us", "25 W"], [1e-6, 9]]}}})");
  ASSERT_EQ(errs.size(), 3u);
  EXPECT_EQ(errs[0], at("parts.R1.pulse[1][0]: error: must be greater than zero, got \"0 us\""));
  EXPECT_EQ(errs[1], at("parts.R1.pulse[2]: error: expected a pair [width, power], got [\"1 ms\"]"));
  EXPECT_EQ(errs[2], at("parts.R2.pulse: error: two points have the same pulse width"));
}

TEST_F(JsonInputs, RecommendedRangeAndSwingOrder) {
  auto errs = partsErrors(std::string(kPartsHead) +
                          R"("Q1": {"kind": "igbt", "r_g_recommended": {"on": ["10 ohm", "1 ohm"], "offf": []},
                                    "q_g_swing": ["15 V", "-8 V"], "v_ge_max": 20, "v_gs_max": 20}}})");
  ASSERT_EQ(errs.size(), 4u);
  EXPECT_EQ(errs[0], at("parts.Q1.v_gs_max: error: give either \"v_ge_max\" or \"v_gs_max\", not both"));
  EXPECT_EQ(errs[1], at("parts.Q1.q_g_swing: error: the low end must be below the high end, got [\"15 V\",\"-8 V\"]"));
  EXPECT_EQ(errs[2], at("parts.Q1.r_g_recommended.offf: error: unknown field; did you mean \"off\"?"));
  EXPECT_EQ(errs[3], at("parts.Q1.r_g_recommended.on: error: the low end must be at most the high end, got "
                        "[\"10 ohm\",\"1 ohm\"]"));
}

TEST_F(JsonInputs, DriverPins) {
  auto errs = partsErrors(std::string(kPartsHead) +
                          R"("U1": {"kind": "driver", "pins": {"out": "O", "out_sink": "OL", "gnd": "G"}}}})");
  ASSERT_EQ(errs.size(), 2u);
  EXPECT_EQ(errs[0], at("parts.U1.pins.gnd: error: unknown pin role for a part of kind \"driver\""));
  EXPECT_EQ(errs[1], at("parts.U1.pins.out: error: a driver has either one bidirectional \"out\" or "
                        "\"out_source\"/\"out_sink\", not both"));
}

TEST_F(JsonInputs, MissingFile) {
  path_ = (dir_ / "nope.json").string();
  EXPECT_FALSE(readPartsLibrary(path_, files_, lib_, diags_));
  auto errs = rendered();
  ASSERT_EQ(errs.size(), 1u);
  EXPECT_EQ(errs[0], at("error: cannot open file (No such file or directory)"));

  diags_ = {};
  path_ = dir_.string();
  EXPECT_FALSE(readProject(path_, files_, project_, diags_));
  errs = rendered();
  ASSERT_EQ(errs.size(), 1u);
  EXPECT_EQ(errs[0], at("error: cannot open file (it is a folder)"));
}

TEST_F(JsonInputs, DeepNestingIsRefusedNotACrash) {
  auto errs = partsErrors("{\"schema\": " + std::string(200000, '[') + std::string(200000, ']') + "}");
  ASSERT_EQ(errs.size(), 1u);
  EXPECT_EQ(errs[0], at("error: invalid JSON: nested deeper than 100 levels"));
}

TEST_F(JsonInputs, TopLevelMustBeAnObject) {
  auto errs = projectErrors("[1, 2]");
  ASSERT_EQ(errs.size(), 1u);
  EXPECT_EQ(errs[0], path_ + ":1:1: error: expected a JSON object at the top level, got [1,2]");
}

TEST_F(JsonInputs, LayoutLayersMustBeInTheStackup) {
  auto errs = layoutErrors(R"({"schema": "gateloop-layout/1", "stackup": {"top": {"z": "0 mm"}, "in1": {"z": "0.2 mm"}},
    "nets": {"G": {"layer": "tpo", "return": {"plane": "in3"}}}})");
  ASSERT_EQ(errs.size(), 2u);
  EXPECT_EQ(errs[0], at("nets.G.layer: error: layer \"tpo\" is not in the stackup; did you mean \"top\"?"));
  EXPECT_EQ(errs[1], at("nets.G.return.plane: error: layer \"in3\" is not in the stackup; did you mean \"in1\"?"));
}

TEST_F(JsonInputs, LayoutTraceProblems) {
  auto errs = layoutErrors(R"({"schema": "gateloop-layout/1", "stackup": {"top": {"z": 0}},
    "traces": [{"net": "G", "layer": "top", "width": "0.5 mm", "points": [[1, 2]]},
               {"net": "G", "layer": "top", "width": "0 mm", "points": [[1, 2], [3, 4]]},
               {"net": "G", "layer": "top", "width": "0.5 mm", "points": [[1, 2], [3, "4 mm"], [5]]},
               {"layer": "top", "width": "0.5 mm", "points": [[1, 2], [3, 4]]}]})");
  ASSERT_EQ(errs.size(), 5u);
  EXPECT_EQ(errs[0], at("traces[0].points: error: a trace needs at least two distinct points"));
  EXPECT_EQ(errs[1], at("traces[1].width: error: must be greater than zero, got \"0 mm\""));
  EXPECT_EQ(errs[2], at("traces[2].points[1]: error: expected a point [x, y] in mm, got [3,\"4 mm\"]"));
  EXPECT_EQ(errs[3], at("traces[2].points[2]: error: expected a point [x, y] in mm, got [5]"));
  EXPECT_EQ(errs[4], at("traces[3]: error: missing required field \"net\""));
  EXPECT_TRUE(layout_.traces.empty());
}

TEST_F(JsonInputs, LayoutWireAndPairProblems) {
  auto errs = layoutErrors(R"({"schema": "gateloop-layout/1", "units": "inch",
    "nets": {"G_A": {"length": "-3 mm", "return": {"pair": "KE_B"}}, "KE_A": {"length": "30 mm"},
             "X": {"return": {"pair": "X"}}},
    "wires": [{"nets": ["G_A", "KE_A"], "length": "180 mm", "diameter": "0.8 mm", "spacing": "0.8 mm"},
              {"nets": ["G_A"], "length": "180 mm", "diameter": "0.8 mm", "spacing": "3 mm"}]})");
  ASSERT_EQ(errs.size(), 6u);
  EXPECT_EQ(errs[0], at("units: error: expected \"mm\" or \"mil\", got \"inch\""));
  EXPECT_EQ(errs[1], at("nets.G_A.length: error: must be greater than zero, got \"-3 mm\""));
  EXPECT_EQ(errs[2], at("nets.X.return.pair: error: a net cannot be its own return"));
  EXPECT_EQ(errs[3], at("wires[0].spacing: error: must be larger than the diameter (centre-to-centre spacing of "
                        "two round wires)"));
  EXPECT_EQ(errs[4], at("wires[1].nets: error: expected the two nets of the lead pair, got [\"G_A\"]"));
  EXPECT_EQ(errs[5], at("nets.G_A.return.pair: error: return net \"KE_B\" is not described in \"nets\" or "
                        "\"traces\"; did you mean \"KE_A\"?"));
}

TEST_F(JsonInputs, BareMetresForATraceWidthWarn) {
  path_ = write("w.layout.json", R"({"schema": "gateloop-layout/1", "stackup": {"top": {"z": 0}},
    "nets": {"G": {"layer": "top", "width": 0.5}}})");
  EXPECT_TRUE(readLayout(path_, files_, layout_, diags_));
  auto msgs = rendered();
  ASSERT_EQ(msgs.size(), 1u);
  EXPECT_EQ(msgs[0], at("nets.G.width: warning: bare number 0.5 is read in metres; write \"0.5 mm\" if "
                        "millimetres were meant"));
}

TEST_F(JsonInputs, ProjectOperatingAndDesignErrors) {
  auto errs = projectErrors(R"({"schema": "gateloop/1", "designs": [
    {"name": "a", "netlist": "a.cir", "operating": {"f_sw": "16 kV", "v_bus": "-800 V", "t_amb": 25,
                                                    "drive": {"v_on": "-8 V", "v_off": "15 V"}}},
    {"name": "a", "netlist": "b.cir"},
    {"netlist": ""}]})");
  ASSERT_EQ(errs.size(), 7u);
  EXPECT_EQ(errs[0], at("designs[0].operating.t_amb: error: unknown field; did you mean \"t_ambient\"?"));
  EXPECT_EQ(errs[1], at("designs[0].operating.v_bus: error: must be greater than zero, got \"-800 V\""));
  EXPECT_EQ(errs[2], at("designs[0].operating.f_sw: error: expected a frequency, got \"16 kV\""));
  EXPECT_EQ(errs[3], at("designs[0].operating.drive.v_off: error: must be below v_on"));
  EXPECT_EQ(errs[4], at("designs[1].name: error: another design is already called \"a\""));
  EXPECT_EQ(errs[5], at("designs[2]: error: missing required field \"name\""));
  EXPECT_EQ(errs[6], at("designs[2].netlist: error: must not be empty"));
}

TEST_F(JsonInputs, ProjectWaiverErrors) {
  auto errs = projectErrors(R"({"schema": "gateloop/1", "designs": [{"name": "a", "netlist": "a.cir"}],
    "waivers": [{"rule": "gate-pulldown", "loop": "X3.Q2", "reason": "  "},
                {"rule": "gate-pulldown", "loop": "X3.Q2", "reason": "module", "until": "2027-02-29"},
                {"rule": "gate-pulldown", "reason": "module", "until": "2028-02-29"},
                {"rule": "rg-range", "loop": "*", "reason": "r", "untill": "2027-01-01"},
                {"rule": "rg-power", "loop": "*", "reason": "r", "until": "2028-02-29"}]})");
  ASSERT_EQ(errs.size(), 4u);
  EXPECT_EQ(errs[0], at("waivers[0].reason: error: must not be empty"));
  EXPECT_EQ(errs[1], at("waivers[1].until: error: expected a date written YYYY-MM-DD, got \"2027-02-29\""));
  EXPECT_EQ(errs[2], at("waivers[2]: error: missing required field \"loop\""));
  EXPECT_EQ(errs[3], at("waivers[3].untill: error: unknown field; did you mean \"until\"?"));
  // Waivers with a field error other than an unknown field are dropped; 2028 is a leap year
  // (Gregorian rule), so 2028-02-29 is a real date while 2027-02-29 is not.
  ASSERT_EQ(project_.waivers.size(), 2u);
  EXPECT_EQ(project_.waivers[0].rule, "rg-range");
  EXPECT_EQ(project_.waivers[1].until, "2028-02-29");
}

TEST_F(JsonInputs, ProjectWithoutDesigns) {
  auto errs = projectErrors(R"({"schema": "gateloop/1", "parts": "lib.json", "rules": []})");
  ASSERT_EQ(errs.size(), 2u);
  EXPECT_EQ(errs[0], at("error: missing required field \"designs\""));
  EXPECT_EQ(errs[1], at("rules: error: expected an object, got []"));
  EXPECT_EQ(project_.partsPaths, std::vector<std::string>{(dir_ / "lib.json").string()});
}

TEST_F(JsonInputs, AllProblemsOfAFileAreReported) {
  auto errs = partsErrors(std::string(kPartsHead) + R"(
    "Q1": {"kind": "igbt", "c_ies": "18 nH", "q_g": "-2 uC", "v_rated": true},
    "U1": {"kind": "driver", "i_source_peak": "4 V"}}})");
  EXPECT_EQ(errs.size(), 4u) << ::testing::PrintToString(errs);
  EXPECT_EQ(diags_.errorCount(), 4u);
}

} // namespace
} // namespace gateloop
