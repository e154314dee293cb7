/// \file
/// Gate-drive equations against the check values of docs/physics.md "Gate drive" (physics.md
/// sections 3.1-3.6 and the worked example 3.8 built on the spec's example parts; values of type
/// (b): computed from the published formulas with the inputs shown).
#include "checker/physics/gate_drive.h"
#include "checker/physics/line_inductance.h"
#include "checker/physics/rlc_step.h"

#include <gtest/gtest.h>

#include <cmath>

using namespace gateloop;
using namespace gateloop::literals;

namespace {

// Spec section 4.3 example parts, as used by physics.md 3.8: 1200 V 300 A IGBT module with
// Q_G = 2.4 uC over -8..+15 V, R_G,int = 2.5 ohm; driver 1.5 ohm source / 0.7 ohm sink;
// f_sw = 16 kHz; R_ext,on = 4.7 ohm, R_ext,off = 2.2 ohm (assumed in physics.md).
struct Example38 {
  Coulomb qG = 2.4_uC;
  Volt swing = Volt(15.0 - (-8.0));
  Hertz fSw = 16.0_kHz;
  Ohm rOn = totalGateResistance(1.5_ohm, 4.7_ohm, 2.5_ohm);
  Ohm rOff = totalGateResistance(0.7_ohm, 2.2_ohm, 2.5_ohm);
  Farad cEff = effectiveGateCapacitance(2.4_uC, Volt(23.0));
};

} // namespace

TEST(PhysicsGateDrive, WorkedExample38) {
  const Example38 x;
  EXPECT_EQ(x.swing.si(), 23.0);                                           // physics.md 3.8: dV
  EXPECT_NEAR(x.cEff.si(), 104.3478e-9, 1e-13);                            // physics.md 3.8: C_G,eff
  EXPECT_NEAR(gateDrivePower(x.qG, x.swing, x.fSw).si(), 0.8832, 1e-10);   // physics.md 3.8: P_drv
  EXPECT_NEAR(x.rOn.si(), 8.7, 1e-12);                                     // physics.md 3.8: R_tot,on
  EXPECT_NEAR(x.rOff.si(), 5.4, 1e-12);                                    // physics.md 3.8: R_tot,off
  // physics.md 3.8: P_Rext,on / P_Rext,off
  const Watt pOn = resistorAveragePower(x.qG, x.swing, x.fSw, 4.7_ohm, x.rOn);
  const Watt pOff = resistorAveragePower(x.qG, x.swing, x.fSw, 2.2_ohm, x.rOff);
  EXPECT_NEAR(pOn.si(), 0.238566, 1e-6);
  EXPECT_NEAR(pOff.si(), 0.179911, 1e-6);
  // physics.md 3.8: energy per pulse 14.9103 uJ / 11.2444 uJ
  EXPECT_NEAR(resistorEnergyPerEdge(x.qG, x.swing, 4.7_ohm, x.rOn).si(), 14.9103e-6, 1e-10);
  EXPECT_NEAR(resistorEnergyPerEdge(x.qG, x.swing, 2.2_ohm, x.rOff).si(), 11.2444e-6, 1e-10);
  // physics.md 3.8: I_G,pk on / off without L
  const Ampere iOn = peakGateCurrentNoInductance(x.swing, x.rOn);
  const Ampere iOff = peakGateCurrentNoInductance(x.swing, x.rOff);
  EXPECT_NEAR(iOn.si(), 2.643678, 1e-6);
  EXPECT_NEAR(iOff.si(), 4.259259, 1e-6);
  // physics.md 3.8: tau on / off, t_eq on
  const Second tauOn = gateTimeConstant(x.rOn, x.cEff);
  EXPECT_NEAR(tauOn.si(), 0.907826e-6, 1e-12);
  EXPECT_NEAR(gateTimeConstant(x.rOff, x.cEff).si(), 0.563478e-6, 1e-12);
  const Second tEq = equivalentPulseWidth(tauOn);
  EXPECT_NEAR(tEq.si(), 0.453913e-6, 1e-12);
  // physics.md 3.8: P_pk in R_ext,on / R_ext,off
  const Watt pkOn = resistorPeakPower(iOn, 4.7_ohm);
  EXPECT_NEAR(pkOn.si(), 32.8485, 1e-4);
  EXPECT_NEAR(resistorPeakPower(iOff, 2.2_ohm).si(), 39.9108, 1e-4);
  // physics.md 3.8 consistency check: P_pk t_eq f_sw = P_Rext,on (exact identity).
  EXPECT_NEAR(pkOn.si() * tEq.si() * x.fSw.si(), pOn.si(), 1e-12);
}

TEST(PhysicsGateDrive, WorkedExample38WithLoopInductance) {
  const Example38 x;
  // physics.md 3.8: L_loop = 9.3826 nH (38 mm microstrip, 1.8) + 8 nH internal + 0.4 nH ESL.
  const HenryPerMeter perLength = microstripInductanceHammerstadJensen(0.5_mm, 0.2_mm, 35.0_um);
  const Henry trace(perLength.si() * 38e-3);
  EXPECT_NEAR(trace.si(), 9.3826e-9, 1e-13);
  const Henry loop = trace + 8.0_nH + 0.4_nH;
  EXPECT_NEAR(loop.si(), 17.7826e-9, 1e-13);
  // physics.md 3.8: zeta_on 10.5374, I_pk,on 2.613320 A with that L (section 2 formula).
  const RlcStep on = seriesRlcStep(x.rOn, loop, x.cEff, x.swing);
  EXPECT_NEAR(on.zeta, 10.5374, 1e-4);
  EXPECT_NEAR(on.iPeak.si(), 2.613320, 2e-6);
  // physics.md 3.8: with L = 31 nH: zeta_on 7.98087, I_pk,on 2.596451 A.
  const RlcStep on31 = seriesRlcStep(x.rOn, 31.0_nH, x.cEff, x.swing);
  EXPECT_NEAR(on31.zeta, 7.98087, 1e-5);
  EXPECT_NEAR(on31.iPeak.si(), 2.596451, 1e-6);
}

TEST(PhysicsGateDrive, SharedResistorCarriesBothEdges) {
  // physics.md 3.1: with one resistor for both edges the halves add; with equal totals
  // P_Rext = P_drv R_ext / R_tot.
  const Example38 x;
  const Watt pDrv = gateDrivePower(x.qG, x.swing, x.fSw);
  EXPECT_NEAR(sharedResistorAveragePower(x.qG, x.swing, x.fSw, 4.7_ohm, x.rOn, x.rOn).si(),
              pDrv.si() * 4.7 / 8.7, 1e-12);
  // Different totals: the 3.8 on-edge share 0.238566 W plus the same 4.7 ohm resistor's share
  // 0.5 P_drv 4.7/7.9 of an off edge through the 0.7 ohm sink (0.7 + 4.7 + 2.5 = 7.9 ohm).
  const Ohm rOffShared = totalGateResistance(0.7_ohm, 4.7_ohm, 2.5_ohm);
  EXPECT_NEAR(sharedResistorAveragePower(x.qG, x.swing, x.fSw, 4.7_ohm, x.rOn, rOffShared).si(),
              0.238566 + 0.5 * 0.8832 * 4.7 / 7.9, 1e-6);
}

TEST(PhysicsGateDrive, GateChargeRescaling) {
  // physics.md 3.1: C_G,eff = Q_G / (datasheet swing), and the charge over another swing is
  // rescaled linearly. 2.4 uC over 23 V -> 15 V swing: 2.4 x 15/23 uC (value from the formula).
  EXPECT_NEAR(rescaleGateCharge(2.4_uC, Volt(23.0), 15.0_V).si(), 2.4e-6 * 15.0 / 23.0, 1e-18);
  EXPECT_NEAR(rescaleGateCharge(2.4_uC, Volt(23.0), 15.0_V).si() / 15.0,
              effectiveGateCapacitance(2.4_uC, Volt(23.0)).si(), 1e-18);
  EXPECT_TRUE(std::isnan(effectiveGateCapacitance(2.4_uC, Volt(0.0)).si()));
  EXPECT_TRUE(std::isnan(peakGateCurrentNoInductance(15.0_V, Ohm(0.0)).si()));
}

TEST(PhysicsGateDrive, SwitchingIntervals33) {
  // physics.md 3.3 check (b): Q_GD 20 nC, R_tot 10 ohm, V_on 12 V, V_off 0, V_pl 5 V, V_th 3.5 V,
  // C_iss 2 nF, V_DS 400 V, I_L 20 A (Balogh 2002 / Baliga 2019 formulas).
  GateChargeModel m;
  m.vOn = 12.0_V;
  m.vOff = 0.0_V;
  m.vPlateau = 5.0_V;
  m.vThreshold = 3.5_V;
  m.cIss = 2.0_nF;
  m.qGd = 20.0_nC;
  m.vBlocking = 400.0_V;
  m.iLoad = 20.0_A;
  const auto s = switchingIntervals(m, 10.0_ohm, 10.0_ohm);
  ASSERT_TRUE(s.has_value());
  EXPECT_NEAR(s->voltageFall.si(), 28.5714e-9, 1e-13);   // physics.md 3.3: t_fv
  EXPECT_NEAR(s->dvdtOn.si(), 14.0e9, 1e3);              // physics.md 3.3: 14.0 V/ns
  EXPECT_NEAR(s->voltageRise.si(), 40.0e-9, 1e-15);      // physics.md 3.3: t_rv
  EXPECT_NEAR(s->dvdtOff.si(), 10.0e9, 1e3);             // physics.md 3.3: 10.0 V/ns
  EXPECT_NEAR(s->turnOnDelay.si(), 6.8968e-9, 1e-13);    // physics.md 3.3: t_d
  EXPECT_NEAR(s->currentRise.si(), 3.88312e-9, 1e-14);   // physics.md 3.3: t_ri
  EXPECT_NEAR(s->didtOn.si(), 5.1505e9, 1e5);            // physics.md 3.3: 5.1505 A/ns
  EXPECT_NEAR(s->currentFall.si(), 7.13350e-9, 1e-14);   // physics.md 3.3: t_fi
  EXPECT_NEAR(s->didtOff.si(), 2.80367e9, 1e4);          // physics.md 3.3: 2.80367 A/ns
  // physics.md 3.3: di/dt 5.1667 A/ns with L_S = 0, 1.7222 A/ns with L_S = 3 nH.
  const auto d0 = turnOnDiDtWithSourceInductance(m, 10.0_ohm, Henry(0.0));
  const auto d3 = turnOnDiDtWithSourceInductance(m, 10.0_ohm, Henry(3e-9));
  ASSERT_TRUE(d0 && d3);
  EXPECT_NEAR(d0->si(), 5.1667e9, 1e5);
  EXPECT_NEAR(d3->si(), 1.7222e9, 1e5);
  // Threshold above the plateau: no intervals, no NaN leaking out.
  GateChargeModel bad = m;
  bad.vThreshold = 6.0_V;
  EXPECT_FALSE(switchingIntervals(bad, 10.0_ohm, 10.0_ohm).has_value());
  EXPECT_FALSE(turnOnDiDtWithSourceInductance(bad, 10.0_ohm, Henry(0.0)).has_value());
  EXPECT_FALSE(switchingIntervals(m, Ohm(0.0), 10.0_ohm).has_value());
}

TEST(PhysicsGateDrive, MillerInducedVoltage34) {
  // physics.md 3.4 check (b): SiC leg, C_res 10 pF, C_iss 2 nF, R_tot,off 0.7 + 2.0 + 3.0 ohm,
  // dv/dt 50 V/ns, dV_DS 800 V (Balogh 2002; Wintrich et al. 2015).
  const Ohm rOff = totalGateResistance(0.7_ohm, 2.0_ohm, 3.0_ohm);
  const VoltPerSecond dvdt(50e9);
  const Volt v1 = millerVoltageResistive(rOff, 10.0_pF, dvdt);
  EXPECT_NEAR(v1.si(), 2.85, 1e-12);                                                // (1)
  EXPECT_NEAR(millerVoltageWithGateRc(rOff, 10.0_pF, 2.0_nF, dvdt, 800.0_V).si(), 2.14966, 1e-5); // (2)
  EXPECT_NEAR(millerVoltageDivider(800.0_V, 10.0_pF, 2.0_nF).si(), 4.0, 1e-12);    // (3)
  // physics.md 3.4: with V_off = -4 V the gate peaks at -1.15 V by (1).
  EXPECT_NEAR(-4.0 + v1.si(), -1.15, 1e-12);
  // physics.md 3.4: Miller ratio Q_GD 20 nC / Q_GS(th) 8 nC = 2.5.
  EXPECT_NEAR(millerChargeRatio(20.0_nC, 8.0_nC), 2.5, 1e-15);
  // An external C_GE lowers both (2) and (3) (physics.md 3.4); 2 nF extra halves (3).
  EXPECT_NEAR(millerVoltageDivider(800.0_V, 10.0_pF, 2.0_nF, 2.0_nF).si(), 2.0, 1e-12);
  EXPECT_LT(millerVoltageWithGateRc(rOff, 10.0_pF, 2.0_nF, dvdt, 800.0_V, 2.0_nF).si(), 2.14966);
  // (2) tends to (1) for a long edge and to (3) for a large resistance.
  EXPECT_NEAR(millerVoltageWithGateRc(rOff, 10.0_pF, 2.0_nF, dvdt, Volt(1e6)).si(), 2.85, 1e-9);
  EXPECT_NEAR(millerVoltageWithGateRc(Ohm(1e9), 10.0_pF, 2.0_nF, dvdt, 800.0_V).si(), 4.0, 1e-6);
}

TEST(PhysicsGateDrive, TurnOffOvervoltage35) {
  // physics.md 3.5 check (b) (Mohan et al. 2003): 800 V, 25 nH, 150 A in 100 ns -> 837.5 V.
  EXPECT_NEAR(turnOffPeakVoltage(800.0_V, 25.0_nH, AmperePerSecond(-150.0 / 100e-9)).si(), 837.5, 1e-9);
  // physics.md 3.5: 30 nH at 5 kA/us -> 950 V.
  EXPECT_NEAR(turnOffPeakVoltage(800.0_V, 30.0_nH, AmperePerSecond(5e9)).si(), 950.0, 1e-9);
}

TEST(PhysicsGateDrive, Decoupling36) {
  // physics.md 3.6 check (b): Q_G 2.4 uC, ripple 0.5 V: k = 1 -> 4.8 uF, k = 10 -> 48 uF.
  EXPECT_NEAR(minDecouplingCapacitance(2.4_uC, 0.5_V, 1.0).si(), 4.8e-6, 1e-15);
  EXPECT_NEAR(minDecouplingCapacitance(2.4_uC, 0.5_V, 10.0).si(), 48e-6, 1e-14);
  // Balogh 2002 budget, leading terms: Q_G + I_q t_on,max (1 mA for 50 us adds 50 nC).
  EXPECT_NEAR(supplyChargePerCycle(2.4_uC, Ampere(1e-3), 50.0_us).si(), 2.45e-6, 1e-18);
  EXPECT_TRUE(std::isnan(minDecouplingCapacitance(2.4_uC, 0.0_V, 1.0).si()));
}
