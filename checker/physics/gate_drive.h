/// \file
/// Gate-drive design equations (docs/physics.md "Gate drive"): effective gate capacitance, drive
/// power and its share in each resistor, peak current and pulse shape, switching intervals from
/// the gate-charge curve, dv/dt-induced (Miller) gate voltage, turn-off overvoltage and supply
/// decoupling. Sources: L. Balogh, *Fundamentals of MOSFET and IGBT Gate Driver Circuits*, 2002
/// (rev. 2017/18); A. Wintrich, U. Nicolai, W. Tursky, T. Reimann, *Application Manual Power
/// Semiconductors*, 2nd ed., 2015; N. Mohan, T. Undeland, W. Robbins, *Power Electronics*, 3rd
/// ed., 2003; B. J. Baliga, *Fundamentals of Power Semiconductor Devices*, 2nd ed., 2019;
/// A. Lidow et al., *GaN Transistors for Efficient Power Conversion*, 3rd ed., 2019. Formulas
/// marked "common practice" have no single published origin.
///
/// All functions are pure. Values outside a formula's domain (a zero swing, a threshold above the
/// plateau, ...) give NaN or an empty optional as documented, never an exception.
#pragma once

#include "checker/core/units.h"

#include <optional>

namespace gateloop {

// ---- 3.1 gate charge, effective capacitance, drive power -----------------------------------

/// Large-signal gate capacitance C_G,eff = Q_G / swing, where \p qG is the datasheet gate charge
/// and \p datasheetSwing the gate-voltage swing the datasheet measured it over (for example
/// 23 V for a -8..+15 V curve). This is the capacitance the driver actually charges; C_iss
/// underestimates it because of the Miller plateau. NaN for a swing <= 0.
Farad effectiveGateCapacitance(Coulomb qG, Volt datasheetSwing);

/// Gate charge over the application's swing \p appSwing when the datasheet gives \p qG over
/// \p datasheetSwing: linear rescaling Q_app = Q_G * appSwing / datasheetSwing, i.e. the charge
/// of C_G,eff over the new swing. An approximation: the real Q-V curve is not linear (the plateau
/// charge is the same for any swing that crosses it), so prefer a datasheet value for the actual
/// swing when one exists. NaN for a datasheet swing <= 0.
Coulomb rescaleGateCharge(Coulomb qG, Volt datasheetSwing, Volt appSwing);

/// Total gate-drive power drawn from the driver supplies, both edges: P = Q_G dV f_sw (Balogh
/// 2002). \p qG must be the charge over \p swing.
Watt gateDrivePower(Coulomb qG, Volt swing, Hertz fSwitch);

/// Series resistance of one edge: driver output resistance + external + internal gate resistance.
Ohm totalGateResistance(Ohm rDriver, Ohm rExternal, Ohm rGateInternal);

/// Energy dissipated in the external resistor \p rExternal during one edge: half of Q_G dV is
/// lost per edge, split among the series resistances in proportion to their value (exact for a
/// linear capacitance; common practice, no single source). NaN for rTotal <= 0.
Joule resistorEnergyPerEdge(Coulomb qG, Volt swing, Ohm rExternal, Ohm rTotal);

/// Average power in an external resistor that carries only one edge (separate turn-on and
/// turn-off resistors): resistorEnergyPerEdge * f_sw.
Watt resistorAveragePower(Coulomb qG, Volt swing, Hertz fSwitch, Ohm rExternal, Ohm rTotal);

/// Average power in one external resistor that carries both edges, with series totals
/// \p rTotalOn and \p rTotalOff (driver source and sink resistances differ): the two edge
/// shares add. With equal totals this is P_drv * R_ext / R_tot.
Watt sharedResistorAveragePower(Coulomb qG, Volt swing, Hertz fSwitch, Ohm rExternal,
                                Ohm rTotalOn, Ohm rTotalOff);

// ---- 3.2 peak current and pulse shape ------------------------------------------------------

/// Peak gate current with the loop inductance neglected: dV / R_tot (an upper bound; with L use
/// seriesRlcStep). NaN for rTotal <= 0.
Ampere peakGateCurrentNoInductance(Volt swing, Ohm rTotal);

/// Gate R-C time constant tau = R_tot C_G,eff.
Second gateTimeConstant(Ohm rTotal, Farad cEff);

/// Width of the rectangular pulse at the same peak power that carries the same energy as the
/// exponential current pulse: t_eq = tau / 2 (resistor makers' pulse-load practice).
Second equivalentPulseWidth(Second tau);

/// Peak power in a resistor: I_pk^2 R.
Watt resistorPeakPower(Ampere iPeak, Ohm r);

// ---- 3.3 switching intervals from the gate-charge curve -------------------------------------

/// Gate-charge description of a switch at its operating point (MOSFET-type model, clamped
/// inductive load; Balogh 2002, Baliga 2019).
struct GateChargeModel {
  Volt vOn;         ///< driver on-level
  Volt vOff;        ///< driver off-level
  Volt vThreshold;  ///< gate threshold V_th
  Volt vPlateau;    ///< Miller plateau V_pl
  Farad cIss;       ///< input capacitance C_iss
  Coulomb qGd;      ///< gate-drain (Miller) charge Q_GD
  Volt vBlocking;   ///< voltage switched across the device, V_DS or V_CE
  Ampere iLoad;     ///< load current I_L
};

/// Switching intervals and slopes of one switch for given on and off loop resistances.
struct SwitchingIntervals {
  Second turnOnDelay;       ///< t_d = R C_iss ln((V_on - V_off)/(V_on - V_th))
  Second currentRise;       ///< t_ri = R C_iss ln((V_on - V_th)/(V_on - V_pl))
  Second voltageFall;       ///< t_fv = Q_GD R / (V_on - V_pl)
  Second voltageRise;       ///< t_rv = Q_GD R_off / (V_pl - V_off)
  Second currentFall;       ///< t_fi = R_off C_iss ln((V_pl - V_off)/(V_th - V_off))
  VoltPerSecond dvdtOn;     ///< V / t_fv
  VoltPerSecond dvdtOff;    ///< V / t_rv
  AmperePerSecond didtOn;   ///< I_L / t_ri
  AmperePerSecond didtOff;  ///< I_L / t_fi
};

/// Switching intervals of \p m with turn-on series resistance \p rTotalOn and turn-off
/// resistance \p rTotalOff (docs/physics.md 3.3, Balogh 2002). Empty unless
/// V_off < V_th < V_pl < V_on, both resistances and C_iss, Q_GD are positive.
std::optional<SwitchingIntervals> switchingIntervals(const GateChargeModel &m, Ohm rTotalOn,
                                                     Ohm rTotalOff);

/// Turn-on current slope with a common source/emitter inductance \p lSource:
/// di/dt = (V_on - V_GS) / (R C_iss / g_fs + L_S), g_fs = I_L / (V_pl - V_th), evaluated at
/// V_GS = (V_th + V_pl)/2 (derived in docs/physics.md 3.3; the same form appears in makers' notes).
/// Empty under the same conditions as switchingIntervals or for a negative lSource.
std::optional<AmperePerSecond> turnOnDiDtWithSourceInductance(const GateChargeModel &m,
                                                              Ohm rTotalOn, Henry lSource);

// ---- 3.4 dv/dt-induced (Miller) gate voltage --------------------------------------------------

/// (1) Resistive estimate of the gate voltage induced by the partner switch's dv/dt:
/// dV_G = R_tot,off C_res dv/dt (Balogh 2002; Wintrich et al. 2015).
Volt millerVoltageResistive(Ohm rTotalOff, Farad cRes, VoltPerSecond dvdt);

/// (2) Same with the gate's own R-C (first-order node, constant capacitances; derived in
/// docs/physics.md 3.4): R C_res dv/dt (1 - exp(-T / (R (C_iss + C_ge)))), T = dV_DS / (dv/dt).
/// \p cGeExternal is an added external gate-emitter capacitor. NaN for dvdt <= 0.
Volt millerVoltageWithGateRc(Ohm rTotalOff, Farad cRes, Farad cIss, VoltPerSecond dvdt,
                             Volt dvDs, Farad cGeExternal = Farad(0.0));

/// (3) Capacitive-divider bound (R -> infinity): dV_DS C_res / (C_iss + C_ge).
Volt millerVoltageDivider(Volt dvDs, Farad cRes, Farad cIss, Farad cGeExternal = Farad(0.0));

/// Miller charge ratio Q_GD / Q_GS(th); a GaN rule of thumb asks for < 1 (Lidow et al. 2019).
double millerChargeRatio(Coulomb qGd, Coulomb qGsThreshold);

// ---- 3.5 turn-off overvoltage ---------------------------------------------------------------

/// Peak switch voltage at turn-off: V_bus + L_sigma |di/dt| (Mohan et al. 2003; Wintrich et al.
/// 2015). \p lStray is the commutation-loop stray inductance; the sign of \p didt is ignored.
Volt turnOffPeakVoltage(Volt vBus, Henry lStray, AmperePerSecond didt);

// ---- 3.6 supply decoupling --------------------------------------------------------------------

/// Charge drawn from a bootstrap or driver supply capacitor per on-period: Q_G + I_q t_on,max
/// (the leading terms of Balogh 2002's budget).
Coulomb supplyChargePerCycle(Coulomb qG, Ampere iQuiescent, Second tOnMax);

/// Smallest decoupling capacitance for a ripple \p ripple: C >= k Q_total / dV_ripple, margin
/// \p margin commonly 2-10 (common practice, no single source). NaN for ripple <= 0.
Farad minDecouplingCapacitance(Coulomb qTotal, Volt ripple, double margin);

} // namespace gateloop
