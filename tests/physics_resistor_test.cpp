/// \file
/// Resistor ratings against docs/physics.md "Resistor ratings" (physics.md 4.1 derating after
/// IEC 60115-1 / IEC 60115-8, 4.2 voltage limits, 4.4 pulse-load model with the spec's example
/// 0603 pulse curve; values of type (b), computed from the formulas with the inputs shown).
#include "checker/physics/gate_drive.h"
#include "checker/physics/resistor_rating.h"

#include <gtest/gtest.h>

#include <cmath>
#include <vector>

using namespace gateloop;
using namespace gateloop::literals;

namespace {

// The spec's example 0603 pulse curve (spec 4.3, part RES-0603-TF; invented demo data).
const std::vector<PulsePoint> kCurve0603 = {
    {1.0_us, 25.0_W}, {Second(10e-6), 9.0_W}, {Second(100e-6), 3.0_W}, {Second(1e-3), 1.0_W}};

} // namespace

TEST(PhysicsResistor, Derating41) {
  // physics.md 4.1 check (b), IEC 60115-1 curve: P_r 0.1 W, knee 70 C, UCT 155 C.
  EXPECT_NEAR(deratedPower(0.1_W, 70.0_degC, 155.0_degC, 55.0_degC).si(), 0.1, 1e-15);
  EXPECT_NEAR(deratedPower(0.1_W, 70.0_degC, 155.0_degC, 100.0_degC).si(), 0.0647059, 1e-7);
  // physics.md 4.1: P_r 0.25 W at 125 C -> 0.0882353 W; at 155 C -> 0.
  EXPECT_NEAR(deratedPower(0.25_W, 70.0_degC, 155.0_degC, 125.0_degC).si(), 0.0882353, 1e-7);
  EXPECT_EQ(deratedPower(0.25_W, 70.0_degC, 155.0_degC, 155.0_degC).si(), 0.0);
  EXPECT_EQ(deratedPower(0.25_W, 70.0_degC, 155.0_degC, 200.0_degC).si(), 0.0);
  // At the knee exactly the full rating applies (IEC 60115-1 curve is continuous there).
  EXPECT_EQ(deratedPower(0.25_W, 70.0_degC, 155.0_degC, 70.0_degC).si(), 0.25);
  EXPECT_TRUE(std::isnan(deratedPower(0.25_W, 155.0_degC, 70.0_degC, 25.0_degC).si()));
}

TEST(PhysicsResistor, VoltageLimits42) {
  // physics.md 4.2 check (b), IEC 60115-1 definitions: R_crit = U_max^2 / P_r.
  EXPECT_NEAR(criticalResistance(50.0_V, 0.1_W).si(), 25e3, 1e-9);
  EXPECT_NEAR(criticalResistance(200.0_V, 0.25_W).si(), 160e3, 1e-9);
  // physics.md 4.2: 4.7 ohm at 0.1 W -> U_r = 0.68557 V.
  EXPECT_NEAR(ratedVoltage(0.1_W, 4.7_ohm, 50.0_V).si(), 0.68557, 1e-5);
  // Above R_crit the element voltage limits: 1 Mohm at 0.1 W would allow 316 V, U_max is 50 V.
  EXPECT_EQ(ratedVoltage(0.1_W, Ohm(1e6), 50.0_V).si(), 50.0);
  EXPECT_TRUE(std::isnan(criticalResistance(50.0_V, 0.0_W).si()));
}

TEST(PhysicsResistor, PulseCurveInterpolation44) {
  // physics.md 4.4 check (b), log-log interpolation of the 0603 example curve, P_r = 0.1 W.
  const Watt pr = 0.1_W;
  auto at = [&](double t) { return singlePulseLimit(kCurve0603, Second(t), pr); };
  ASSERT_TRUE(at(3e-6).has_value());
  EXPECT_NEAR(at(3e-6)->limit.si(), 15.3547, 1e-4);      // physics.md 4.4: P^(3 us)
  EXPECT_FALSE(at(3e-6)->belowCurve);
  EXPECT_FALSE(at(3e-6)->aboveCurve);
  EXPECT_NEAR(at(30e-6)->limit.si(), 5.3284, 1e-4);      // physics.md 4.4: P^(30 us)
  EXPECT_NEAR(at(0.5e-3)->limit.si(), 1.3920, 1e-4);     // physics.md 4.4: P^(0.5 ms)
  // physics.md 4.4: P^(0.4539 us) = 25 W, clamped to the first point, and flagged.
  EXPECT_EQ(at(0.4539e-6)->limit.si(), 25.0);
  EXPECT_TRUE(at(0.4539e-6)->belowCurve);
  // physics.md 4.4: P^(2 ms) = 0.1 W, clamped to the (derated) continuous rating, and flagged.
  EXPECT_EQ(at(2e-3)->limit.si(), 0.1);
  EXPECT_TRUE(at(2e-3)->aboveCurve);
  // On a curve point the point itself, and the end points are inside the curve.
  EXPECT_EQ(at(10e-6)->limit.si(), 9.0);
  EXPECT_FALSE(at(1e-6)->belowCurve);
  EXPECT_FALSE(at(1e-3)->aboveCurve);
  EXPECT_EQ(at(1e-3)->limit.si(), 1.0);
}

TEST(PhysicsResistor, PulseCurveRejectsBadCurves) {
  EXPECT_FALSE(isValidPulseCurve({}));
  const std::vector<PulsePoint> unsorted = {{Second(10e-6), 9.0_W}, {1.0_us, 25.0_W}};
  EXPECT_FALSE(isValidPulseCurve(unsorted));
  EXPECT_FALSE(singlePulseLimit(unsorted, 3.0_us, 0.1_W).has_value());
  const std::vector<PulsePoint> zeroPower = {{1.0_us, 0.0_W}, {Second(10e-6), 9.0_W}};
  EXPECT_FALSE(isValidPulseCurve(zeroPower));
  EXPECT_TRUE(isValidPulseCurve(kCurve0603));
  EXPECT_FALSE(singlePulseLimit(kCurve0603, Second(0.0), 0.1_W).has_value());
  // A single point is a valid (if coarse) curve.
  const std::vector<PulsePoint> one = {{1.0_us, 25.0_W}};
  EXPECT_EQ(singlePulseLimit(one, 1.0_us, 0.1_W)->limit.si(), 25.0);
}

TEST(PhysicsResistor, RepetitivePulseExample38) {
  // physics.md 4.4 step 3 check (b): 3.8 on-resistor, t_eq = 0.453913 us at 16 kHz,
  // D = 0.0072626, k_T = 1 at 55 C, P^ = 25 W (clamped) -> P^_rep = 8.9019 W.
  const Second tEq(0.453913e-6);
  const double d = pulseDutyCycle(tEq, 16.0_kHz);
  EXPECT_NEAR(d, 0.0072626, 1e-7);
  const Watt pr = 0.1_W;
  const double kT = deratedPower(pr, 70.0_degC, 155.0_degC, 55.0_degC) / pr;
  EXPECT_EQ(kT, 1.0);
  const auto single = singlePulseLimit(kCurve0603, tEq, pr);
  ASSERT_TRUE(single.has_value());
  const Watt rep = repetitivePulseLimit(single->limit, pr, d, kT);
  EXPECT_NEAR(rep.si(), 8.9019, 1e-4);
  // physics.md 4.4: against P_pk = 32.8485 W the 0603 fails; average 0.238566 W against
  // 0.5 x 0.1 W fails as well.
  EXPECT_GT(32.8485, rep.si());
  EXPECT_GT(0.238566, 0.5 * deratedPower(pr, 70.0_degC, 155.0_degC, 55.0_degC).si());
  // Limits of the composite: D = 0 gives k_T P^, D = 1 gives k_T P_r (continuous).
  EXPECT_NEAR(repetitivePulseLimit(25.0_W, pr, 0.0, 0.5).si(), 12.5, 1e-12);
  EXPECT_NEAR(repetitivePulseLimit(25.0_W, pr, 1.0, 0.5).si(), 0.05, 1e-15);
  EXPECT_TRUE(std::isnan(repetitivePulseLimit(25.0_W, pr, 1.5, 1.0).si()));
  // Above the upper category temperature nothing is allowed, and no NaN comes out: the pulse
  // curve's long end is the derated continuous limit, 0 W at 160 C (IEC 60115-1 curve, 4.1).
  const Watt hot = deratedPower(pr, 70.0_degC, 155.0_degC, Celsius(160.0));
  const auto longPulse = singlePulseLimit(kCurve0603, Second(5e-3), hot);
  ASSERT_TRUE(longPulse.has_value());
  EXPECT_EQ(longPulse->limit.si(), 0.0);
  EXPECT_EQ(repetitivePulseLimit(longPulse->limit, pr, 0.01, hot / pr).si(), 0.0);
}
