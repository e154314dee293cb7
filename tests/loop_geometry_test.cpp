// Loop inductance from drawn traces (partial-element method) wired into the gate-loop analysis,
// and the geometry drawing of `gateloop loops --geometry-svg`.
#include "checker/app/geometry_svg.h"
#include "rule_harness.h"

#include <gtest/gtest.h>

#include <pugixml.hpp>

using namespace gateloop;
using namespace gateloop::testing;

namespace {

const char *const kDeck = R"(* one switch, one driver
XU1 VDD OUT 0 DRVBI
RG1 OUT G 3
M1 DRN G SRC SRC NMOSX
RPD1 G SRC 10k
.subckt DRVBI VDD OUT GND
.ends
.model NMOSX NMOS
.end
)";

const char *const kParts = R"({ "schema": "gateloop-parts/1", "parts": {
  "SW-TEST": { "kind": "mosfet", "match": {"model": ["NMOSX"]}, "q_g": "75 nC", "q_g_swing": ["0 V", "15 V"],
               "r_g_int": "1 ohm", "l_gate_internal": "2 nH" },
  "DRV-BI": { "kind": "driver", "match": {"subckt": ["DRVBI"]}, "pins": {"out": "OUT", "ref": "GND"},
              "r_source": "1 ohm", "r_sink": "1 ohm", "v_on": "15 V", "v_off": "0 V" } } })";

// A 100 mm straight gate trace over a plane 0.2 mm below, drawn as a trace (return by image) and,
// for comparison, given as a per-net length.
std::string layout(bool traces) {
  std::string s = R"({ "schema": "gateloop-layout/1",
    "stackup": {"top": {"z": "0 mm", "copper": "35 um"}, "in1": {"z": "0.2 mm"}},
    "nets": {"G": {"length": "100 mm", "width": "0.5 mm", "layer": "top", "return": {"plane": "in1"}}})";
  if (traces) s += R"(, "traces": [{"net": "G", "layer": "top", "width": "0.5 mm", "points": [[0, 0], [100, 0]]}])";
  return s + "}";
}

} // namespace

// The partial-element loop (DC current distribution, image in the plane) and the Hammerstad-Jensen
// microstrip per-unit-length value (high-frequency) bracket the same conductor; physics.md 1.8
// says 5-12 % between the two is normal for this cross-section.
TEST(LoopGeometry, TracesAgreeWithMicrostripModel) {
  auto perNet = runPipeline({kDeck, kParts, layout(false), R"({"f_sw": "100 kHz"})"});
  auto drawn = runPipeline({kDeck, kParts, layout(true), R"({"f_sw": "100 kHz"})"});
  ASSERT_TRUE(perNet->inputOk) << perNet->diagnostics();
  ASSERT_TRUE(drawn->inputOk) << drawn->diagnostics();
  const LoopAnalysis &a = perNet->design().analyses.at(0);
  const LoopAnalysis &b = drawn->design().analyses.at(0);
  EXPECT_EQ(a.inductanceMethod, "nets");
  EXPECT_EQ(b.inductanceMethod, "traces");
  EXPECT_NEAR(a.lLayout.si(), 24.6911e-9, 1e-12); // physics.md 1.8: 246.911 nH/m x 100 mm
  ASSERT_TRUE(b.lOutgoingSelf && b.lMutual);
  EXPECT_NEAR(b.lLayout.si() / a.lLayout.si(), 1.0, 0.15);
  EXPECT_NEAR(b.length->si(), 0.1, 1e-12);
  // The split adds up: outgoing self + return self + mutual (image terms included).
  EXPECT_NEAR((*b.lOutgoingSelf + b.lReturnSelf.value_or(Henry(0)) + *b.lMutual).si(), b.lLayout.si(), 1e-15);
}

TEST(LoopGeometry, SvgDrawingOfTheLoop) {
  auto run = runPipeline({kDeck, kParts, layout(true), R"({"f_sw": "100 kHz"})"});
  ASSERT_TRUE(run->inputOk) << run->diagnostics();
  RunReport report;
  report.files = &run->inputs.files;
  report.designs = std::move(run->designs);
  auto dir = std::filesystem::temp_directory_path() / ("gateloop-svg-" + std::to_string(::getpid()));
  ASSERT_EQ(writeLoopGeometrySvgs(report, run->inputs, dir.string()), "");
  auto file = dir / "test--M1.svg";
  ASSERT_TRUE(std::filesystem::exists(file));
  pugi::xml_document doc;
  ASSERT_TRUE(doc.load_file(file.c_str()));
  pugi::xml_node svg = doc.child("svg");
  ASSERT_TRUE(svg);
  EXPECT_TRUE(svg.child("polygon"));             // the shaded enclosed area
  EXPECT_TRUE(svg.child("polyline"));            // the drawn trace
  EXPECT_NE(std::string(svg.child("title").text().get()).find("M1"), std::string::npos);
  std::filesystem::remove_all(dir);
}
