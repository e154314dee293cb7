/// \file
/// Series RLC step response against the published second-order figures (Ogata 2010 sec. 5-3),
/// the check table and worked examples of docs/physics.md section "Series RLC step" (values of
/// type (b): computed from the formulas and confirmed by a 200 000-step RK4 simulation) and an
/// independent RK4 integration of the loop equations written here.
#include "checker/physics/rlc_step.h"

#include <gtest/gtest.h>

#include <cmath>
#include <limits>
#include <numbers>

using namespace gateloop;
using namespace gateloop::literals;

namespace {

// Loop with w0 = 1 rad/s and sqrt(C/L) = 1 (L = C = 1), so R = 2 zeta and a unit step gives
// the normalised columns of the check table directly.
RlcStep normalisedStep(double zeta) { return seriesRlcStep(Ohm(2.0 * zeta), Henry(1.0), Farad(1.0), Volt(1.0)); }

struct TableRow {
  double zeta, overshoot, iPerDvOverR, iPerDvSqrtCL, w0tPeakCurrent, w0tPeakVoltage, exactSettling;
};

// physics.md section 2, check table (b); the settling column is printed to 0.01.
constexpr TableRow kTable[] = {
    {0.3, 0.372326, 0.402928, 0.671547, 1.327237, 3.293284, 11.23},
    {0.5, 0.163034, 0.546293, 0.546293, 1.209200, 3.627599, 8.08},
    {0.7071068, 0.043214, 0.644794, 0.455938, 1.110721, 4.442883, 5.96},
};

// Independent reference: classical RK4 on L di/dt = dV - R i - v, C dv/dt = i.
struct Rk4Peak {
  double iMax, tAtIMax, vMax, vEnd;
};
Rk4Peak integrateRk4(double R, double L, double C, double dV, double tEnd, int steps) {
  auto f = [&](double i, double v, double &di, double &dv) {
    di = (dV - R * i - v) / L;
    dv = i / C;
  };
  double i = 0, v = 0, h = tEnd / steps;
  Rk4Peak p{0, 0, 0, 0};
  for (int n = 0; n < steps; ++n) {
    double k1i, k1v, k2i, k2v, k3i, k3v, k4i, k4v;
    f(i, v, k1i, k1v);
    f(i + 0.5 * h * k1i, v + 0.5 * h * k1v, k2i, k2v);
    f(i + 0.5 * h * k2i, v + 0.5 * h * k2v, k3i, k3v);
    f(i + h * k3i, v + h * k3v, k4i, k4v);
    i += h / 6 * (k1i + 2 * k2i + 2 * k3i + k4i);
    v += h / 6 * (k1v + 2 * k2v + 2 * k3v + k4v);
    if (i > p.iMax) {
      p.iMax = i;
      p.tAtIMax = (n + 1) * h;
    }
    p.vMax = std::max(p.vMax, v);
  }
  p.vEnd = v;
  return p;
}

} // namespace

TEST(PhysicsRlc, CheckTableNormalised) {
  for (const TableRow &row : kTable) {
    SCOPED_TRACE(row.zeta);
    const RlcStep s = normalisedStep(row.zeta);
    ASSERT_TRUE(s.valid);
    // physics.md 2, check table (b): one unit in the last printed digit.
    EXPECT_NEAR(s.overshoot, row.overshoot, 1e-6);
    EXPECT_NEAR(s.iPeak.si() / (1.0 / (2.0 * row.zeta)), row.iPerDvOverR, 1e-6);
    EXPECT_NEAR(s.iPeak.si(), row.iPerDvSqrtCL, 1e-6);
    EXPECT_NEAR(s.tPeak.si(), row.w0tPeakCurrent, 1e-6);
    // Voltage peak time t_p = pi / wd (Ogata 2010 sec. 5-3); physics.md 2 table column.
    ASSERT_TRUE(s.fRing.has_value());
    EXPECT_NEAR(0.5 / s.fRing->si(), row.w0tPeakVoltage, 1e-6);
    // physics.md 2 table, "exact 2 % w0*t_s" column, printed to 0.01.
    EXPECT_NEAR(s.settling2pct.si(), row.exactSettling, 0.005);
    EXPECT_NEAR(normalizedSettlingTime(row.zeta, 0.02), row.exactSettling, 0.005);
    // Ogata's envelope estimate 4/(zeta w0), tested as a formula (physics.md 2).
    EXPECT_NEAR(settlingEstimate2pct(row.zeta, s.fNatural).si(), 4.0 / row.zeta, 1e-12);
    EXPECT_NEAR(settlingEstimate5pct(row.zeta, s.fNatural).si(), 3.0 / row.zeta, 1e-12);
  }
}

TEST(PhysicsRlc, OgataPrintedOvershoot) {
  // Ogata 2010 sec. 5-3 prints about 16.3 % overshoot at zeta 0.5 and 4.3 % at 0.707 (from memory).
  EXPECT_NEAR(normalisedStep(0.5).overshoot, 0.163, 0.0005);
  EXPECT_NEAR(normalisedStep(0.707).overshoot, 0.043, 0.0005);
}

TEST(PhysicsRlc, CriticalAndOverDampedRows) {
  // physics.md 2 table (b): zeta 1 -> I_pk = (2/e) dV/R = 0.735759 dV/R, w0 t_pk = 1.
  const RlcStep crit = normalisedStep(1.0);
  EXPECT_NEAR(crit.iPeak.si() * 2.0, 0.735759, 1e-6);
  EXPECT_NEAR(crit.iPeak.si(), 0.367879, 1e-6);
  EXPECT_NEAR(crit.tPeak.si(), 1.0, 1e-12);
  EXPECT_EQ(crit.overshoot, 0.0);
  EXPECT_FALSE(crit.fRing.has_value());
  // physics.md 2 table (b): zeta 2 -> 0.874242 dV/R, 0.218561 dV sqrt(C/L), w0 t_pk 0.760346.
  const RlcStep over = normalisedStep(2.0);
  EXPECT_NEAR(over.iPeak.si() * 4.0, 0.874242, 1e-6);
  EXPECT_NEAR(over.iPeak.si(), 0.218561, 1e-6);
  EXPECT_NEAR(over.tPeak.si(), 0.760346, 1e-6);
  EXPECT_EQ(over.overshoot, 0.0);
  EXPECT_FALSE(over.fRing.has_value());
}

TEST(PhysicsRlc, ContinuousThroughCriticalDamping) {
  // The series branch for |zeta - 1| < 1e-6 must join the closed forms without a step: compare
  // against 2/e (Nilsson & Riedel 2015 ch. 8 critically damped current, peak at t = 2L/R).
  const double twoOverE = 2.0 / std::numbers::e;
  for (double d : {-1e-3, -2e-6, -1e-6, -5e-7, -1e-9, 0.0, 1e-9, 5e-7, 1e-6, 2e-6, 1e-3}) {
    SCOPED_TRACE(d);
    const RlcStep s = normalisedStep(1.0 + d);
    const double perDvOverR = s.iPeak.si() * 2.0 * (1.0 + d);
    // d(I_pk R/dV)/dzeta at zeta = 1 is finite (about 0.25), so the change is of order |d|.
    EXPECT_NEAR(perDvOverR, twoOverE, 0.3 * std::abs(d) + 1e-15);
    EXPECT_NEAR(s.tPeak.si(), 1.0, 0.4 * std::abs(d) + 1e-15);
  }
  // Across each edge of the band the value moves only by slope (about 0.25) x the zeta step.
  const double step = 2e-9, slopeBound = 0.3 * step + 1e-13;
  EXPECT_NEAR(normalisedStep(1.0 + 0.999e-6).iPeak.si(), normalisedStep(1.0 + 1.001e-6).iPeak.si(), slopeBound);
  EXPECT_NEAR(normalisedStep(1.0 - 0.999e-6).iPeak.si(), normalisedStep(1.0 - 1.001e-6).iPeak.si(), slopeBound);
}

TEST(PhysicsRlc, WorkedExampleSiMosfet) {
  // physics.md 2, worked example (a): dV 15 V, R 3 ohm, L 20 nH, C 5 nF.
  const RlcStep s = seriesRlcStep(3.0_ohm, 20.0_nH, 5.0_nF, 15.0_V);
  ASSERT_TRUE(s.valid);
  EXPECT_NEAR(s.zeta, 0.75, 1e-12);                       // physics.md 2, example (a)
  EXPECT_NEAR(s.fNatural.si(), 15.9155e6, 100.0);          // physics.md 2, example (a)
  ASSERT_TRUE(s.fRing.has_value());
  EXPECT_NEAR(s.fRing->si(), 10.5271e6, 100.0);            // physics.md 2, example (a)
  EXPECT_NEAR(s.overshoot, 0.028375, 1e-6);                // physics.md 2, example (a)
  EXPECT_NEAR(turnOnPeakGateVoltage(0.0_V, 15.0_V, s.overshoot).si(), 15.4256, 1e-4); // example (a)
  EXPECT_NEAR(s.iPeak.si(), 3.304878, 1e-6);               // physics.md 2, example (a)
  EXPECT_NEAR(s.tPeak.si(), 10.9267e-9, 1e-13);            // physics.md 2, example (a)
  EXPECT_NEAR(s.rCritical.si(), 4.0, 1e-12);               // physics.md 2, example (a)
  EXPECT_NEAR(resistanceForDamping(20.0_nH, 5.0_nF, 1.0).si(), 4.0, 1e-12); // R_crit again
}

TEST(PhysicsRlc, WorkedExampleGan) {
  // physics.md 2, worked example (b): dV 6 V, R 2 ohm, L 10 nH, C 1 nF.
  const RlcStep s = seriesRlcStep(2.0_ohm, 10.0_nH, 1.0_nF, 6.0_V);
  ASSERT_TRUE(s.valid);
  EXPECT_NEAR(s.zeta, 0.316228, 1e-6);                     // physics.md 2, example (b)
  EXPECT_NEAR(s.overshoot, 0.350920, 1e-6);                // physics.md 2, example (b)
  EXPECT_NEAR(turnOnPeakGateVoltage(0.0_V, 6.0_V, s.overshoot).si(), 8.1055, 1e-4); // example (b)
  EXPECT_NEAR(s.iPeak.si(), 1.251219, 1e-6);               // physics.md 2, example (b)
  EXPECT_NEAR(s.tPeak.si(), 4.1635e-9, 1e-13);             // physics.md 2, example (b)
  ASSERT_TRUE(s.fRing.has_value());
  EXPECT_NEAR(s.fRing->si(), 47.746e6, 1e3);               // physics.md 2, example (b)
  EXPECT_NEAR(s.rCritical.si(), 6.3246, 1e-4);             // physics.md 2, example (b)
}

TEST(PhysicsRlc, DerivedLimitsGanExample) {
  // physics.md 2, derived limits check (b): GaN example, zeta_min 0.7 -> L_max 2.0408 nH.
  const Henry lMax = maxInductanceForDamping(2.0_ohm, 1.0_nF, 0.7);
  EXPECT_NEAR(lMax.si(), 2.0408e-9, 1e-13);
  // physics.md 2: L_fixed 0.5 nH, L' 260.625 nH/m -> len_max 5.912 mm.
  const Meter len = maxTraceLength(lMax, 0.5_nH, HenryPerMeter(260.625e-9));
  EXPECT_NEAR(len.si(), 5.912e-3, 1e-6);
  // The inductance found gives back exactly zeta_min (definition of zeta).
  EXPECT_NEAR(seriesRlcStep(2.0_ohm, lMax, 1.0_nF, 6.0_V).zeta, 0.7, 1e-12);
  // Budget already used up by the fixed part: no trace length left, never a negative length.
  EXPECT_EQ(maxTraceLength(0.4_nH, 0.5_nH, HenryPerMeter(260e-9)).si(), 0.0);
  EXPECT_TRUE(std::isinf(maxInductanceForDamping(2.0_ohm, 1.0_nF, 0.0).si()));
  EXPECT_TRUE(std::isnan(maxTraceLength(lMax, 0.5_nH, HenryPerMeter(0.0)).si()));
}

TEST(PhysicsRlc, TurnOffUndershoot) {
  // physics.md 2: undershoot on turn-off V_off - dV PO_off; with the Si example loop on a
  // 15 / -8 V drive the off edge swings 23 V.
  const double po = seriesRlcStep(3.0_ohm, 20.0_nH, 5.0_nF, Volt(-23.0)).overshoot;
  // PO printed to 1e-6, so the tolerance is 23 V x 1e-6.
  EXPECT_NEAR(turnOffMinGateVoltage(15.0_V, Volt(-8.0), po).si(), -8.0 - 23.0 * 0.028375, 23e-6);
  // A negative step carries its sign into the peak current (3.304878 A x 23/15).
  EXPECT_NEAR(seriesRlcStep(3.0_ohm, 20.0_nH, 5.0_nF, Volt(-23.0)).iPeak.si(), -3.304878 * 23.0 / 15.0, 1e-5);
}

TEST(PhysicsRlc, ZeroInductanceIsTheRcLimit) {
  // physics.md 2: I_pk -> dV/R as zeta -> infinity; L = 0 must not divide by zero.
  const RlcStep s = seriesRlcStep(8.7_ohm, Henry(0.0), Farad(104.3478e-9), 23.0_V);
  ASSERT_TRUE(s.valid);
  EXPECT_TRUE(std::isinf(s.zeta));
  EXPECT_FALSE(s.fRing.has_value());
  EXPECT_EQ(s.overshoot, 0.0);
  EXPECT_NEAR(s.iPeak.si(), 23.0 / 8.7, 1e-12);
  EXPECT_EQ(s.tPeak.si(), 0.0);
  EXPECT_EQ(s.rCritical.si(), 0.0);
  // R-C settling to 2 %: RC ln 50 (first-order step response).
  EXPECT_NEAR(s.settling2pct.si(), 8.7 * 104.3478e-9 * std::log(50.0), 1e-15);
  // A tiny but non-zero L approaches the same limit smoothly (zeta ~ 1e6 here).
  const RlcStep tiny = seriesRlcStep(8.7_ohm, Henry(1e-17), Farad(104.3478e-9), 23.0_V);
  EXPECT_NEAR(tiny.iPeak.si(), 23.0 / 8.7, 1e-9);
  EXPECT_GT(tiny.zeta, 1e5);
  EXPECT_NEAR(tiny.settling2pct.si(), s.settling2pct.si(), 1e-6 * s.settling2pct.si());
}

TEST(PhysicsRlc, UndampedLoop) {
  // R = 0: zeta 0, overshoot 1, I_pk = dV sqrt(C/L) at w0 t = pi/2 (physics.md 2 limits).
  const RlcStep s = seriesRlcStep(Ohm(0.0), Henry(1.0), Farad(1.0), Volt(1.0));
  ASSERT_TRUE(s.valid);
  EXPECT_EQ(s.zeta, 0.0);
  EXPECT_NEAR(s.overshoot, 1.0, 1e-15);
  EXPECT_NEAR(s.iPeak.si(), 1.0, 1e-15);
  EXPECT_NEAR(s.tPeak.si(), std::numbers::pi / 2.0, 1e-15);
  EXPECT_TRUE(std::isinf(s.settling2pct.si()));
}

TEST(PhysicsRlc, InvalidInputIsFlaggedNotThrown) {
  EXPECT_FALSE(seriesRlcStep(Ohm(0.0), Henry(0.0), 1.0_nF, 1.0_V).valid);
  EXPECT_FALSE(seriesRlcStep(Ohm(-1.0), 10.0_nH, 1.0_nF, 1.0_V).valid);
  EXPECT_FALSE(seriesRlcStep(1.0_ohm, Henry(-1e-9), 1.0_nF, 1.0_V).valid);
  EXPECT_FALSE(seriesRlcStep(1.0_ohm, 10.0_nH, Farad(0.0), 1.0_V).valid);
  const RlcStep nanR = seriesRlcStep(Ohm(std::nan("")), 10.0_nH, 1.0_nF, 1.0_V);
  EXPECT_FALSE(nanR.valid);
  EXPECT_TRUE(std::isnan(nanR.iPeak.si()));
  EXPECT_TRUE(stepWaveform(Ohm(0.0), Henry(0.0), 1.0_nF, 0.0_V, 1.0_V, 1.0_us, 10).empty());
  EXPECT_TRUE(stepWaveform(1.0_ohm, 10.0_nH, 1.0_nF, 0.0_V, 1.0_V, 1.0_us, 1).empty());
  EXPECT_TRUE(std::isnan(capacitorVoltageFraction(-0.1, 1.0)));
  EXPECT_TRUE(std::isnan(normalizedSettlingTime(0.5, 1.5)));
}

TEST(PhysicsRlc, ClosedFormsAgreeWithRk4) {
  // Independent check of the peak-current closed form, the peak time and the overshoot against
  // an RK4 integration of the loop ODE, across under-, critically and (heavily) over-damped loops.
  for (double zeta : {0.05, 0.3, 0.75, 1.0, 1.0 + 5e-7, 2.0, 20.0}) {
    SCOPED_TRACE(zeta);
    const double R = 2.0 * zeta, L = 1.0, C = 1.0;
    const RlcStep s = seriesRlcStep(Ohm(R), Henry(L), Farad(C), Volt(1.0));
    const double tEnd = 6.0 * s.tPeak.si() + 8.0;
    const Rk4Peak p = integrateRk4(R, L, C, 1.0, tEnd, 400000);
    EXPECT_NEAR(p.iMax, s.iPeak.si(), 1e-8 * s.iPeak.si());
    EXPECT_NEAR(p.tAtIMax, s.tPeak.si(), 2.0 * tEnd / 400000);
    if (zeta < 1.0) { // the voltage maximum inside the window is the first overshoot
      EXPECT_NEAR(p.vMax, 1.0 + s.overshoot, 1e-8);
    }
  }
}

TEST(PhysicsRlc, WaveformMatchesRk4AndPeaks) {
  // The waveform functions against RK4 at the end of the window, and the sampled maxima against
  // the closed-form peaks (Si worked example of physics.md 2 on a -8 V -> 15 V drive).
  const Ohm r = 3.0_ohm;
  const Henry l = 20.0_nH;
  const Farad c = 5.0_nF;
  const auto wave = stepWaveform(r, l, c, Volt(-8.0), 15.0_V, Second(200e-9), 20001);
  ASSERT_EQ(wave.size(), 20001u);
  EXPECT_EQ(wave.front().gate.si(), -8.0);
  EXPECT_EQ(wave.front().current.si(), 0.0);
  double vMax = -1e9, iMax = -1e9;
  for (const StepSample &x : wave) {
    vMax = std::max(vMax, x.gate.si());
    iMax = std::max(iMax, x.current.si());
  }
  const RlcStep s = seriesRlcStep(r, l, c, 23.0_V);
  EXPECT_NEAR(vMax, turnOnPeakGateVoltage(Volt(-8.0), 15.0_V, s.overshoot).si(), 1e-5);
  EXPECT_NEAR(iMax, s.iPeak.si(), 1e-5);
  for (double zeta : {0.3, 1.0, 3.0, 300.0}) {
    SCOPED_TRACE(zeta);
    const double tEnd = 3.0;
    const Rk4Peak p = integrateRk4(2.0 * zeta, 1.0, 1.0, 1.0, tEnd, 300000);
    EXPECT_NEAR(capacitorVoltageFraction(zeta, tEnd), p.vEnd, 1e-9);
  }
  // R-C waveform for L = 0: v = dV (1 - exp(-t/RC)).
  const auto rc = stepWaveform(1.0_ohm, Henry(0.0), 1.0_nF, 0.0_V, 1.0_V, 1.0_ns, 2);
  ASSERT_EQ(rc.size(), 2u);
  EXPECT_NEAR(rc[1].gate.si(), 1.0 - std::exp(-1.0), 1e-15);
  EXPECT_NEAR(rc[0].current.si(), 1.0, 1e-15);
}

TEST(PhysicsRlc, SettlingTimeIsTheLastBandCrossing) {
  // Property of the exact settling time: the error equals the band there and never exceeds it
  // afterwards (checked on a fine grid), for several damping ratios.
  for (double zeta : {0.05, 0.3, 0.6, 0.9, 1.0, 1.5, 10.0}) {
    SCOPED_TRACE(zeta);
    const double ts = normalizedSettlingTime(zeta, 0.02);
    ASSERT_TRUE(std::isfinite(ts));
    EXPECT_NEAR(std::abs(1.0 - capacitorVoltageFraction(zeta, ts)), 0.02, 1e-9);
    for (int k = 1; k <= 2000; ++k) {
      const double t = ts * (1.0 + k * 1e-3);
      ASSERT_LE(std::abs(1.0 - capacitorVoltageFraction(zeta, t)), 0.02 + 1e-12) << t;
    }
  }
}
