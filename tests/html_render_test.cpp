/// \file
/// Renders the HTML report in headless Chromium and checks that a real screenshot comes out:
/// the page is one self-contained file that a browser opens offline. Skips when
/// /usr/bin/chromium is not installed (Debian: apt-get install -y chromium). Set
/// GATELOOP_KEEP_RENDER=DIR to keep the page and the PNG for a look. Data invented for the test.
#include "checker/physics/rlc_step.h"
#include "checker/report/formatters.h"

#include <gtest/gtest.h>

#include <sys/wait.h>

#include <cmath>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

using namespace gateloop;
namespace fs = std::filesystem;

namespace {

constexpr const char *kChromium = "/usr/bin/chromium";

struct TempDir {
  fs::path path;
  TempDir() {
    std::string tmpl = (fs::temp_directory_path() / "gateloop-html-XXXXXX").string();
    path = mkdtemp(tmpl.data());
  }
  ~TempDir() {
    std::error_code ec;
    fs::remove_all(path, ec);
  }
};

std::string quoted(const std::string &s) {
  std::string q = "'";
  for (char c : s) q += c == '\'' ? std::string("'\\''") : std::string(1, c);
  return q + "'";
}

// Two loops of a half-bridge: the high side rings on turn-off (zeta 0.3), the low side is well
// damped; plus one loop without layout data, which gets a text instead of a plot.
struct RenderReport {
  FileTable files;
  Circuit circuit;
  PartLibrary parts;
  RunReport report;

  static EdgeAnalysis edge(double rExt, double rTotal, double l, double c, double step) {
    // Consistent with the series-RLC model (seriesRlcStep; Nilsson & Riedel 2015 ch. 8).
    RlcStep s = seriesRlcStep(Ohm(rTotal), Henry(l), Farad(c), Volt(step));
    EdgeAnalysis e;
    e.hasPath = true;
    e.rExternal = Ohm(rExt);
    e.rTotal = Ohm(rTotal);
    e.lLoop = Henry(l);
    e.zeta = s.zeta;
    e.fRing = s.fRing;
    e.iPeak = Ampere(std::fabs(s.iPeak.si())); // the analysis keeps magnitudes
    e.overshoot = s.overshoot;
    return e;
  }

  RenderReport() {
    FileId deck = files.add("hw/half_bridge.cir");
    Part sic;
    sic.id = "SIC-MOSFET-1200V";
    sic.kind = PartKind::Mosfet;
    sic.vGateMax = Volt(22);
    sic.vGateMin = Volt(-10);
    parts.parts.push_back(sic);
    std::uint32_t swPins = circuit.internPinNames({"d", "g", "s"});
    std::uint32_t drvPins = circuit.internPinNames({"out", "ref"});
    DesignReport d;
    d.name = "half-bridge";
    d.circuit = &circuit;
    d.parts = &parts;
    const char *names[3][2] = {{"XQ.HS", "XU.HS"}, {"XQ.LS", "XU.LS"}, {"XQ.AUX", "XU.AUX"}};
    for (int i = 0; i < 3; ++i) {
      NetId dn = circuit.net(std::string("D") + char('0' + i), {deck, 1, 1});
      NetId g = circuit.net(std::string("G") + char('0' + i), {deck, 1, 1});
      NetId s = circuit.net(std::string("S") + char('0' + i), {deck, 1, 1});
      Component q;
      q.name = names[i][0];
      q.kind = ElementKind::Subcircuit;
      q.part = 0;
      std::vector<NetId> qn = {dn, g, s};
      ComponentId qId = circuit.addComponent(q, qn, swPins);
      Component u;
      u.name = names[i][1];
      u.kind = ElementKind::Subcircuit;
      std::vector<NetId> un = {g, s};
      ComponentId uId = circuit.addComponent(u, un, drvPins);
      GateLoop loop;
      loop.id = names[i][0];
      loop.switchId = qId;
      loop.gateNet = g;
      loop.refNet = s;
      loop.driver = uId;
      d.loops.push_back(loop);
      LoopAnalysis a;
      a.vOn = Volt(18);
      a.vOff = Volt(-4);
      a.cGate = Farad(8e-9);
      if (i == 0) {
        a.on = edge(10, 13, 20e-9, 8e-9, 22);
        a.off = edge(0.5, 0.95, 20e-9, 8e-9, -22); // zeta 0.3
      } else {
        a.on = edge(10, 13, 15e-9, 8e-9, 22);
        a.off = edge(4.7, 6.1, 15e-9, 8e-9, -22);
        if (i == 2) {
          a.on.lLoop.reset();
          a.off.lLoop.reset();
        }
      }
      if (a.on.lLoop) {
        // As loop_physics fills them (physics.md section 2, Ogata 2010).
        a.on.vPeak = turnOnPeakGateVoltage(*a.vOff, *a.vOn, *a.on.overshoot);
        a.off.vPeak = turnOffMinGateVoltage(*a.vOn, *a.vOff, *a.off.overshoot);
      }
      d.analyses.push_back(a);
    }
    d.componentCount = circuit.components().size();
    d.netCount = circuit.nets().size();
    d.switchCount = 3;
    d.driverCount = 3;
    Finding f;
    f.rule = "loop-damping";
    f.severity = Severity::Error;
    f.design = d.name;
    f.loop = "XQ.HS";
    f.message = "off loop damping ratio 0.3 is below 0.5";
    f.values = {{"zeta", 0.3, ""}, {"zeta_error", 0.5, ""}};
    f.fix = "raise the off resistance to 3.3 ohm or shorten the loop";
    f.where = {deck, 17, 1};
    f.fingerprint = findingFingerprint(f);
    d.findings.push_back(f);
    report.toolVersion = "0.1.0";
    report.rules = {{"loop-damping", "gate loop damping ratio", Severity::Error}};
    report.files = &files;
    report.designs.push_back(std::move(d));
    report.summary = summarize(report.designs);
  }
};

TEST(HtmlRender, ChromiumRendersTheReport) {
  if (!fs::exists(kChromium))
    GTEST_SKIP() << "/usr/bin/chromium not installed; apt-get install -y chromium to run this test";
  TempDir tmp;
  RenderReport sample;
  fs::path page = tmp.path / "report.html";
  {
    std::ofstream out(page);
    writeHtmlReport(sample.report, out);
  }
  fs::path png = tmp.path / "report.png";
  fs::path profile = tmp.path / "profile";
  // Flags keep the browser off the network and away from the user's profile.
  std::string cmd = std::string(kChromium) +
                    " --headless --no-sandbox --disable-gpu --disable-quic --no-first-run"
                    " --disable-background-networking --disable-component-update --disable-sync"
                    " --user-data-dir=" + quoted(profile.string()) + " --screenshot=" + quoted(png.string()) +
                    " --window-size=1200,1600 " + quoted("file://" + page.string()) + " > " +
                    quoted((tmp.path / "chromium.log").string()) + " 2>&1";
  int status = std::system(cmd.c_str());
  std::ifstream log(tmp.path / "chromium.log");
  std::string logText((std::istreambuf_iterator<char>(log)), {});
  ASSERT_TRUE(WIFEXITED(status) && WEXITSTATUS(status) == 0) << "chromium failed:\n" << logText;
  ASSERT_TRUE(fs::exists(png)) << logText;

  std::ifstream in(png, std::ios::binary);
  std::string bytes((std::istreambuf_iterator<char>(in)), {});
  ASSERT_GE(bytes.size(), 24u);
  EXPECT_EQ(bytes.substr(0, 8), std::string("\x89PNG\r\n\x1a\n", 8));
  // PNG IHDR: width and height, big-endian, at bytes 16..23.
  auto be32 = [&](std::size_t at) {
    return (std::uint32_t(std::uint8_t(bytes[at])) << 24) | (std::uint32_t(std::uint8_t(bytes[at + 1])) << 16) |
           (std::uint32_t(std::uint8_t(bytes[at + 2])) << 8) | std::uint32_t(std::uint8_t(bytes[at + 3]));
  };
  EXPECT_EQ(be32(16), 1200u);
  EXPECT_EQ(be32(20), 1600u);
  // A blank 1200x1600 page compresses to a few kB; text, tables and two plots do not.
  EXPECT_GT(bytes.size(), 40000u) << "screenshot looks empty";

  if (const char *keep = std::getenv("GATELOOP_KEEP_RENDER")) {
    fs::create_directories(keep);
    fs::copy_file(page, fs::path(keep) / "report.html", fs::copy_options::overwrite_existing);
    fs::copy_file(png, fs::path(keep) / "report.png", fs::copy_options::overwrite_existing);
  }
}

} // namespace
