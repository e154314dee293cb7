// The per-loop stages run on several threads (checker/core/parallel.h). Whatever the thread count,
// `gateloop check` must give the same report, byte for byte: tasks write only their own slots and
// findings are merged in a fixed order. The deck has enough legs to be split among threads and
// into several blocks of loops for the rules.
#include "test_support.h"

#include <gtest/gtest.h>

#include <string>

using namespace gateloop::testing;

namespace {

// A half-bridge leg per iteration, as bench/gen_deck writes them; the parts' gate rating is too
// narrow for the clamp, so every loop also gets a finding to merge.
std::string deckOfLegs(int legs) {
  std::string d = "legs for the thread-count test\n"
                  ".model NSW NMOS(level=1 vto=3.5 kp=20)\n.model DSTEER D\n.model DZ18 D(bv=18)\n"
                  "Vdc dcp 0 DC 800\n";
  for (int i = 0; i < legs; ++i) {
    std::string s = "_";
    s += std::to_string(i); // (GCC 12 warns wrongly on "_" + std::to_string)
    const std::string sw = "sw" + s;
    for (const char *side : {"h", "l"}) {
      const std::string x = side + s, src = side[0] == 'h' ? sw : "0", drain = side[0] == 'h' ? "dcp" : sw;
      d += "Vdrv" + x + " drv" + x + " " + src + " PULSE(-5 15 0 20n 20n 4.9u 10u)\n";
      d += "Rgon" + x + " drv" + x + " g" + x + " " + (i % 3 == 0 ? "33" : "4.7") + "\n";
      d += "Rgoff" + x + " drv" + x + " k" + x + " 2.2\n";
      d += "Dst" + x + " g" + x + " k" + x + " DSTEER\n";
      d += "Rpd" + x + " g" + x + " " + src + " 10k\n";
      d += "Dza" + x + " z" + x + " g" + x + " DZ18\nDzb" + x + " z" + x + " " + src + " DZ18\n";
      d += "M" + x + " " + drain + " g" + x + " " + src + " " + src + " NSW\n";
    }
  }
  return d + ".end\n";
}

const char *const kParts = R"({ "schema": "gateloop-parts/1", "parts": {
  "SW-T": { "kind": "mosfet", "match": {"model": ["NSW"]}, "v_gs_max": "20 V", "v_gs_min": "-10 V",
    "v_th_min": "3 V", "v_plateau": "5 V", "c_ies": "2 nF", "c_res": "20 pF", "q_g": "60 nC",
    "q_g_swing": ["-5 V", "15 V"], "r_g_int": "1 ohm", "l_gate_internal": "3 nH",
    "r_g_recommended": {"on": ["1 ohm", "22 ohm"], "off": ["1 ohm", "22 ohm"]}, "v_rated": "650 V" },
  "DRV-T": { "kind": "driver", "pins": {"out": "1", "ref": "2"}, "r_source": "1 ohm", "r_sink": "0.5 ohm",
    "i_source_peak": "8 A", "i_sink_peak": "8 A", "v_on": "15 V", "v_off": "-5 V" },
  "RES-T": { "kind": "resistor", "p_rated": "0.5 W", "tolerance": 0.01,
    "pulse": [["0.01 us", "400 W"], ["1 us", "80 W"], ["10 us", "25 W"], ["1 ms", "2 W"]] },
  "DZ-T": { "kind": "zener", "match": {"model": ["DZ18"]}, "v_breakdown": "18 V" } } })";

TEST(ParallelCheck, ReportIsTheSameForEveryThreadCount) {
  TempDir dir("gateloop-parallel-");
  writeFile(dir.path() / "legs.cir", deckOfLegs(400)); // 800 loops
  writeFile(dir.path() / "parts.json", kParts);
  writeFile(dir.path() / "gateloop.json", R"({ "schema": "gateloop/1", "parts": ["parts.json"], "designs": [
    { "name": "legs", "netlist": "legs.cir", "assign": {"Vdrv*": "DRV-T", "Rg*": "RES-T"},
      "operating": {"v_bus": "400 V", "f_sw": "50 kHz", "t_ambient": "50 degC"} } ] })");
  const std::string env = "GATELOOP_TODAY=2026-12-01 NO_COLOR=1 GATELOOP_THREADS=";
  RunResult one = runGateloop(dir.path(), "check gateloop.json --format json", env + "1");
  ASSERT_EQ(one.status, 1) << one.err;
  EXPECT_NE(one.out.find("\"gate-clamp\""), std::string::npos) << "the deck should produce findings to merge";
  EXPECT_NE(one.out.find("\"rg-range\""), std::string::npos) << "and findings of more than one rule";
  // Per-loop rules run on blocks of loops; their notes about the design as a whole come once.
  auto count = [&](const std::string &text) {
    std::size_t n = 0;
    for (auto at = one.out.find(text); at != std::string::npos; at = one.out.find(text, at + 1)) ++n;
    return n;
  };
  EXPECT_EQ(count("no layout sidecar: every loop's damping"), 1u);
  EXPECT_EQ(count("no layout sidecar gives the gate-loop lengths"), 1u);
  for (const char *threads : {"2", "3", "8"}) {
    RunResult many = runGateloop(dir.path(), "check gateloop.json --format json", env + threads);
    EXPECT_EQ(many.status, one.status) << threads << " threads";
    EXPECT_EQ(many.out, one.out) << threads << " threads";
    EXPECT_EQ(many.err, one.err) << threads << " threads";
  }
}

} // namespace
