/// \file
/// Gate-drive design equations; see gate_drive.h and docs/physics.md.
#include "checker/physics/gate_drive.h"

#include <cmath>
#include <limits>

namespace gateloop {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

bool chargeModelValid(const GateChargeModel &m) {
  const double off = m.vOff.si(), th = m.vThreshold.si(), pl = m.vPlateau.si(), on = m.vOn.si();
  return off < th && th < pl && pl < on && m.cIss.si() > 0.0 && m.qGd.si() > 0.0;
}

} // namespace

Farad effectiveGateCapacitance(Coulomb qG, Volt datasheetSwing) {
  if (!(datasheetSwing.si() > 0.0))
    return Farad(kNaN);
  return Farad(qG.si() / datasheetSwing.si());
}

Coulomb rescaleGateCharge(Coulomb qG, Volt datasheetSwing, Volt appSwing) {
  if (!(datasheetSwing.si() > 0.0))
    return Coulomb(kNaN);
  return Coulomb(qG.si() * appSwing.si() / datasheetSwing.si());
}

Watt gateDrivePower(Coulomb qG, Volt swing, Hertz fSwitch) {
  return Watt(qG.si() * swing.si() * fSwitch.si());
}

Ohm totalGateResistance(Ohm rDriver, Ohm rExternal, Ohm rGateInternal) {
  return rDriver + rExternal + rGateInternal;
}

Joule resistorEnergyPerEdge(Coulomb qG, Volt swing, Ohm rExternal, Ohm rTotal) {
  if (!(rTotal.si() > 0.0))
    return Joule(kNaN);
  // Each edge loses 0.5 Q dV whatever the resistance; the series resistors share it by value.
  return Joule(0.5 * qG.si() * swing.si() * (rExternal / rTotal));
}

Watt resistorAveragePower(Coulomb qG, Volt swing, Hertz fSwitch, Ohm rExternal, Ohm rTotal) {
  return Watt(resistorEnergyPerEdge(qG, swing, rExternal, rTotal).si() * fSwitch.si());
}

Watt sharedResistorAveragePower(Coulomb qG, Volt swing, Hertz fSwitch, Ohm rExternal,
                                Ohm rTotalOn, Ohm rTotalOff) {
  return resistorAveragePower(qG, swing, fSwitch, rExternal, rTotalOn) +
         resistorAveragePower(qG, swing, fSwitch, rExternal, rTotalOff);
}

Ampere peakGateCurrentNoInductance(Volt swing, Ohm rTotal) {
  if (!(rTotal.si() > 0.0))
    return Ampere(kNaN);
  return Ampere(swing.si() / rTotal.si());
}

Second gateTimeConstant(Ohm rTotal, Farad cEff) { return Second(rTotal.si() * cEff.si()); }

Second equivalentPulseWidth(Second tau) {
  // The exponential pulse P_pk exp(-2t/tau) carries P_pk tau/2, the same as a rectangle tau/2 wide.
  return tau / 2.0;
}

Watt resistorPeakPower(Ampere iPeak, Ohm r) { return Watt(iPeak.si() * iPeak.si() * r.si()); }

std::optional<SwitchingIntervals> switchingIntervals(const GateChargeModel &m, Ohm rTotalOn,
                                                     Ohm rTotalOff) {
  if (!chargeModelValid(m) || !(rTotalOn.si() > 0.0) || !(rTotalOff.si() > 0.0))
    return std::nullopt;
  const double on = m.vOn.si(), off = m.vOff.si(), th = m.vThreshold.si(), pl = m.vPlateau.si();
  const double tauOn = rTotalOn.si() * m.cIss.si();
  const double tauOff = rTotalOff.si() * m.cIss.si();
  SwitchingIntervals s;
  // Turn-on: the gate charges exponentially towards V_on through threshold and plateau; during
  // the plateau the whole gate current flows into C_GD.
  s.turnOnDelay = Second(tauOn * std::log((on - off) / (on - th)));
  s.currentRise = Second(tauOn * std::log((on - th) / (on - pl)));
  s.voltageFall = Second(m.qGd.si() * rTotalOn.si() / (on - pl));
  // Turn-off: the mirror image, discharging towards V_off.
  s.voltageRise = Second(m.qGd.si() * rTotalOff.si() / (pl - off));
  s.currentFall = Second(tauOff * std::log((pl - off) / (th - off)));
  s.dvdtOn = VoltPerSecond(m.vBlocking.si() / s.voltageFall.si());
  s.dvdtOff = VoltPerSecond(m.vBlocking.si() / s.voltageRise.si());
  s.didtOn = AmperePerSecond(m.iLoad.si() / s.currentRise.si());
  s.didtOff = AmperePerSecond(m.iLoad.si() / s.currentFall.si());
  return s;
}

std::optional<AmperePerSecond> turnOnDiDtWithSourceInductance(const GateChargeModel &m,
                                                              Ohm rTotalOn, Henry lSource) {
  if (!chargeModelValid(m) || !(rTotalOn.si() > 0.0) || lSource.si() < 0.0 ||
      !(m.iLoad.si() > 0.0))
    return std::nullopt;
  const double th = m.vThreshold.si(), pl = m.vPlateau.si();
  const double gfs = m.iLoad.si() / (pl - th); // linearised transfer characteristic
  const double vgs = 0.5 * (th + pl);
  // L_S feeds the source voltage drop back against the gate drive, adding to the R C/g_fs term.
  return AmperePerSecond((m.vOn.si() - vgs) /
                         (rTotalOn.si() * m.cIss.si() / gfs + lSource.si()));
}

Volt millerVoltageResistive(Ohm rTotalOff, Farad cRes, VoltPerSecond dvdt) {
  return Volt(rTotalOff.si() * cRes.si() * dvdt.si());
}

Volt millerVoltageWithGateRc(Ohm rTotalOff, Farad cRes, Farad cIss, VoltPerSecond dvdt, Volt dvDs,
                             Farad cGeExternal) {
  if (!(dvdt.si() > 0.0))
    return Volt(kNaN);
  const double tau = rTotalOff.si() * (cIss.si() + cGeExternal.si());
  const double duration = dvDs.si() / dvdt.si();
  const double steady = millerVoltageResistive(rTotalOff, cRes, dvdt).si();
  if (tau <= 0.0)
    return Volt(steady);
  // The displacement current C_res dv/dt charges R || C_iss for the duration of the edge.
  return Volt(steady * -std::expm1(-duration / tau));
}

Volt millerVoltageDivider(Volt dvDs, Farad cRes, Farad cIss, Farad cGeExternal) {
  const double cTotal = cIss.si() + cGeExternal.si();
  if (!(cTotal > 0.0))
    return Volt(kNaN);
  return Volt(dvDs.si() * cRes.si() / cTotal);
}

double millerChargeRatio(Coulomb qGd, Coulomb qGsThreshold) {
  if (!(qGsThreshold.si() > 0.0))
    return kNaN;
  return qGd.si() / qGsThreshold.si();
}

Volt turnOffPeakVoltage(Volt vBus, Henry lStray, AmperePerSecond didt) {
  return Volt(vBus.si() + lStray.si() * std::abs(didt.si()));
}

Coulomb supplyChargePerCycle(Coulomb qG, Ampere iQuiescent, Second tOnMax) {
  return Coulomb(qG.si() + iQuiescent.si() * tOnMax.si());
}

Farad minDecouplingCapacitance(Coulomb qTotal, Volt ripple, double margin) {
  if (!(ripple.si() > 0.0))
    return Farad(kNaN);
  return Farad(margin * qTotal.si() / ripple.si());
}

} // namespace gateloop
