/// \file
/// Cross-check of the closed-form series RLC step (checker/physics/rlc_step.h) against an
/// independent reference: ngspice transient simulation of the same loop. Each case writes a small
/// SPICE deck (driver step with a 10 ps rise into series R, L, C; the capacitor starts at V_off
/// from the DC operating point), runs `ngspice -b`, reads the `.meas` results and compares peak
/// gate voltage (overshoot), peak loop current, its time, two waveform samples and the gate
/// voltage at the computed 2 % settling time, within 2 %.
/// Skipped when ngspice is not installed (Debian package `ngspice`).
#include "checker/physics/rlc_step.h"

#include <gtest/gtest.h>

#include <unistd.h>

#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <map>
#include <numbers>
#include <optional>
#include <ostream>
#include <regex>
#include <sstream>
#include <string>

using namespace gateloop;

namespace {

namespace fs = std::filesystem;

constexpr double kRiseTime = 10e-12; // far below every loop time constant used here

std::optional<fs::path> findNgspice() {
  const char *path = std::getenv("PATH");
  std::stringstream dirs(path ? path : "");
  std::string dir;
  while (std::getline(dirs, dir, ':')) {
    if (dir.empty())
      continue;
    const fs::path candidate = fs::path(dir) / "ngspice";
    std::error_code ec;
    if (fs::is_regular_file(candidate, ec))
      return candidate;
  }
  if (fs::is_regular_file("/usr/bin/ngspice"))
    return fs::path("/usr/bin/ngspice");
  return std::nullopt;
}

struct Measured {
  double value = 0.0;
  std::optional<double> at; // time of a MAX/MIN measurement
};

// Reads lines such as "imax                =  5.067481e+00 at=  1.093667e-08".
std::map<std::string, Measured> parseMeasurements(const std::string &output) {
  static const std::regex line(
      R"(^\s*([a-z_][a-z0-9_]*)\s*=\s*([-+]?[0-9.]+(?:[eE][-+]?[0-9]+)?)(?:\s+at=\s*([-+]?[0-9.]+(?:[eE][-+]?[0-9]+)?))?\s*$)");
  std::map<std::string, Measured> out;
  std::stringstream in(output);
  std::string text;
  std::smatch m;
  while (std::getline(in, text)) {
    if (!std::regex_match(text, m, line))
      continue;
    Measured x;
    x.value = std::stod(m[2].str());
    if (m[3].matched)
      x.at = std::stod(m[3].str());
    out[m[1].str()] = x;
  }
  return out;
}

std::string runCommand(const std::string &command) {
  std::string output;
  FILE *pipe = popen(command.c_str(), "r");
  if (!pipe)
    return output;
  char buffer[4096];
  std::size_t n;
  while ((n = fread(buffer, 1, sizeof buffer, pipe)) > 0)
    output.append(buffer, n);
  pclose(pipe);
  return output;
}

struct LoopCase {
  const char *name;
  double r, l, c, vOff, vOn;
  double zetaApprox; // documents the intent of the case; checked loosely
};

void PrintTo(const LoopCase &c, std::ostream *os) { *os << c.name; }

class NgspiceRlc : public ::testing::TestWithParam<LoopCase> {};

TEST_P(NgspiceRlc, ClosedFormMatchesSimulation) {
  const auto ngspice = findNgspice();
  if (!ngspice)
    GTEST_SKIP() << "ngspice not installed; install Debian package ngspice";

  const LoopCase &k = GetParam();
  const double dV = k.vOn - k.vOff;
  const RlcStep s = seriesRlcStep(Ohm(k.r), Henry(k.l), Farad(k.c), Volt(dV));
  ASSERT_TRUE(s.valid);
  EXPECT_NEAR(s.zeta, k.zetaApprox, 0.01 * k.zetaApprox);

  // Window: the current peak and well past the 2 % settling time (so an over-damped gate has
  // reached V_on to ~1e-6 and its maximum is the final value), sampled finely.
  const double w0 = 2.0 * std::numbers::pi * s.fNatural.si();
  const double tEnd = 3.0 * s.settling2pct.si() + 5.0 * s.tPeak.si();
  const double maxStep = std::min(s.tPeak.si(), 1.0 / w0) / 1000.0;
  // A linear ramp acts like a step delayed by half its rise time.
  const double shift = 0.5 * kRiseTime;
  const double tA = s.tPeak.si() + shift, tB = 2.5 * s.tPeak.si() + shift;
  const double tSettled = s.settling2pct.si() + shift;

  const fs::path dir = fs::temp_directory_path() /
                       ("gateloop-ngspice-" + std::to_string(getpid()) + "-" + k.name);
  fs::create_directories(dir);
  const fs::path deck = dir / "loop.cir";
  {
    std::ofstream f(deck);
    f.precision(12);
    f << "* gateloop cross-check: series RLC gate loop step (" << k.name << ")\n"
      << "* the DC operating point at t = 0 charges C1 to V_off with no current\n"
      << "V1 drv 0 PWL(0 " << k.vOff << " " << kRiseTime << " " << k.vOn << ")\n"
      << "R1 drv n1 " << k.r << "\n"
      << "L1 n1 gate " << k.l << "\n"
      << "C1 gate 0 " << k.c << "\n"
      << ".tran " << maxStep << " " << tEnd << " 0 " << maxStep << "\n"
      << ".meas tran vmax MAX v(gate)\n"
      << ".meas tran imax MAX i(L1)\n"
      << ".meas tran va FIND v(gate) AT=" << tA << "\n"
      << ".meas tran vb FIND v(gate) AT=" << tB << "\n"
      << ".meas tran vts FIND v(gate) AT=" << tSettled << "\n"
      << ".meas tran vend FIND v(gate) AT=" << tEnd << "\n"
      << ".end\n";
  }
  const std::string output = runCommand("\"" + ngspice->string() + "\" -b \"" + deck.string() + "\" 2>&1");
  std::error_code ec;
  fs::remove_all(dir, ec);

  const auto m = parseMeasurements(output);
  for (const char *key : {"vmax", "imax", "va", "vb", "vts", "vend"})
    ASSERT_TRUE(m.count(key)) << "ngspice gave no '" << key << "' measurement; output:\n" << output;

  // ngspice simulation vs closed form (physics.md section 2), 2 % tolerances.
  const double simOvershoot = (m.at("vmax").value - k.vOn) / dV;
  EXPECT_NEAR(simOvershoot, s.overshoot, 0.02 * s.overshoot + 1e-3) << "peak gate voltage";
  EXPECT_NEAR(m.at("vmax").value, turnOnPeakGateVoltage(Volt(k.vOff), Volt(k.vOn), s.overshoot).si(),
              0.02 * std::abs(dV));
  EXPECT_NEAR(m.at("imax").value, s.iPeak.si(), 0.02 * std::abs(s.iPeak.si())) << "peak current";
  ASSERT_TRUE(m.at("imax").at.has_value());
  EXPECT_NEAR(*m.at("imax").at, s.tPeak.si() + shift, 0.02 * s.tPeak.si()) << "time of peak current";
  // The plotted waveform (stepWaveform) against the simulated gate voltage at two instants.
  for (auto [key, t] : {std::pair<const char *, double>{"va", tA}, {"vb", tB}}) {
    const auto w = stepWaveform(Ohm(k.r), Henry(k.l), Farad(k.c), Volt(k.vOff), Volt(k.vOn),
                                Second(t - shift), 2);
    ASSERT_EQ(w.size(), 2u);
    EXPECT_NEAR(m.at(key).value, w[1].gate.si(), 0.02 * std::abs(dV)) << key;
  }
  // settling2pct is the exact 2 % settling time: there the simulated gate is 2 % of dV from V_on
  // (it crosses the band edge), and at the end of the window it has settled.
  EXPECT_NEAR(std::abs(m.at("vts").value - k.vOn), 0.02 * std::abs(dV), 0.001 * std::abs(dV)) << "settling";
  EXPECT_NEAR(m.at("vend").value, k.vOn, 0.001 * std::abs(dV));
}

// Loops of 20 nH / 5 nF (sqrt(L/C) = 2 ohm, f0 = 15.9 MHz) on a -8 V / +15 V drive, plus the
// GaN worked example of physics.md 2.
INSTANTIATE_TEST_SUITE_P(
    Loops, NgspiceRlc,
    ::testing::Values(LoopCase{"under_zeta_0_3", 1.2, 20e-9, 5e-9, -8.0, 15.0, 0.3},
                      LoopCase{"si_example_zeta_0_75", 3.0, 20e-9, 5e-9, 0.0, 15.0, 0.75},
                      LoopCase{"critical", 4.0, 20e-9, 5e-9, -8.0, 15.0, 1.0},
                      LoopCase{"over_zeta_2", 8.0, 20e-9, 5e-9, -8.0, 15.0, 2.0},
                      LoopCase{"gan_example", 2.0, 10e-9, 1e-9, 0.0, 6.0, 0.316228}),
    [](const ::testing::TestParamInfo<LoopCase> &info) { return std::string(info.param.name); });

} // namespace
