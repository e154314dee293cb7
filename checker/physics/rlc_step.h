/// \file
/// Step response of the series R-L-C gate loop (docs/physics.md "Series RLC step"): a driver
/// output steps by dV into the total gate resistance R, the loop inductance L and the effective
/// gate capacitance C. Sources: K. Ogata, *Modern Control Engineering*, 5th ed., 2010, sec. 5-3
/// (overshoot, peak time, settling); J. W. Nilsson, S. A. Riedel, *Electric Circuits*, 10th ed.,
/// 2015, ch. 8 (series RLC step currents). The closed-form peak current is derived from the
/// Nilsson & Riedel currents by differentiation (see docs/physics.md section 2).
///
/// Everything here is pure: no state, no I/O. Inputs that make no physical sense return a result
/// whose `valid` flag is false rather than throwing.
#pragma once

#include "checker/core/units.h"

#include <optional>
#include <vector>

namespace gateloop {

/// Step response figures of a series R-L-C loop.
///
/// With L = 0 the loop is a plain R-C: zeta is +infinity, fNatural is +infinity, there is no
/// ringing (fRing empty), no overshoot, the current peaks at dV/R at t = 0 and settles with the
/// R-C time constant.
struct RlcStep {
  bool valid = false;          ///< false when the inputs were rejected; every number is then NaN
  double zeta = 0.0;           ///< damping ratio (R/2) sqrt(C/L)
  Hertz fNatural;              ///< undamped natural frequency 1/(2 pi sqrt(LC))
  std::optional<Hertz> fRing;  ///< damped ringing frequency; empty when zeta >= 1
  double overshoot = 0.0;      ///< fractional overshoot of the capacitor voltage; 0 when zeta >= 1
  Ampere iPeak;                ///< exact peak loop current
  Second tPeak;                ///< time of the current peak after the step
  Ohm rCritical;               ///< series resistance for zeta = 1: 2 sqrt(L/C)
  Second settling2pct;         ///< exact time after which the capacitor voltage stays within 2 %
};

/// Step response of series \p r, \p l, \p c driven by a voltage step of \p step (= V_on - V_off;
/// the sign of the step carries into iPeak). Exact for all damping ratios: under-damped,
/// critically damped (a series form is used for |zeta - 1| < 1e-6 so nothing divides by zero)
/// and over-damped; l = 0 gives the R-C limit (see RlcStep).
///
/// Requirements: r >= 0, l >= 0, c > 0, not both r and l zero, all finite; otherwise the result
/// has `valid == false`. r = 0 gives an undamped loop (overshoot 1, infinite settling time).
///
/// The exact settling time needs a root search; \p withSettling = false skips it (settling2pct
/// is then NaN) for callers that check thousands of loops and never show it.
RlcStep seriesRlcStep(Ohm r, Henry l, Farad c, Volt step, bool withSettling = true);

/// Normalised capacitor voltage v(t)/dV (0 before the step, tending to 1) of a series RLC step at
/// normalised time \p w0t = w0 * t, for a finite damping ratio \p zeta >= 0 (Ogata 2010 sec. 5-3
/// for zeta < 1; the critically and over-damped forms follow from the same ODE). Returns NaN for
/// a negative or non-finite zeta or a negative time.
double capacitorVoltageFraction(double zeta, double w0t);

/// Normalised loop current i(t) / (dV sqrt(C/L)) at \p w0t = w0 * t (Nilsson & Riedel 2015
/// ch. 8). Same domain as capacitorVoltageFraction.
double loopCurrentFraction(double zeta, double w0t);

/// Exact settling time of the capacitor voltage, normalised as w0 * t_s: the last time the
/// voltage is \p band (fraction, e.g. 0.02) away from its final value. Finite zeta >= 0 and
/// 0 < band < 1; returns +infinity for zeta = 0 and NaN for invalid input.
double normalizedSettlingTime(double zeta, double band);

/// Ogata's envelope estimate of the 2 % settling time, 4 / (zeta w0) (Ogata 2010 sec. 5-3).
/// Only an estimate: it is 1-19 % off the exact value for 0.3 <= zeta <= 0.7. +infinity for
/// zeta = 0.
Second settlingEstimate2pct(double zeta, Hertz fNatural);

/// Ogata's 5 % settling estimate, 3 / (zeta w0).
Second settlingEstimate5pct(double zeta, Hertz fNatural);

/// One sample of a step waveform.
struct StepSample {
  Second time;    ///< time after the step
  Volt gate;      ///< capacitor (gate) voltage
  Ampere current; ///< loop current, positive in the direction of the step
};

/// Gate voltage and loop current after a step of the driver from \p vFrom to \p vTo, the gate
/// starting at \p vFrom with no current, at \p points equally spaced times from 0 to \p tEnd
/// (for plots). Handles l = 0 as an R-C exponential. Returns an empty vector for invalid loop
/// values (as seriesRlcStep), points < 2 or tEnd <= 0.
std::vector<StepSample> stepWaveform(Ohm r, Henry l, Farad c, Volt vFrom, Volt vTo, Second tEnd,
                                     int points);

/// Highest gate voltage after a turn-on step from \p vOff to \p vOn with fractional overshoot
/// \p overshoot: V_off + dV (1 + PO) (docs/physics.md section 2, Ogata 2010).
Volt turnOnPeakGateVoltage(Volt vOff, Volt vOn, double overshoot);

/// Lowest gate voltage after a turn-off step from \p vOn to \p vOff with fractional overshoot
/// \p overshootOff of the off loop: V_off - dV PO_off.
Volt turnOffMinGateVoltage(Volt vOn, Volt vOff, double overshootOff);

/// Largest loop inductance that keeps the damping ratio at or above \p zetaMin:
/// L_max = R^2 C / (4 zeta_min^2) (from the definition of zeta). +infinity when zetaMin <= 0;
/// NaN for negative r or c.
Henry maxInductanceForDamping(Ohm r, Farad c, double zetaMin);

/// Series resistance that gives damping ratio \p zeta: R = 2 zeta sqrt(L/C). NaN for negative
/// inputs or c <= 0.
Ohm resistanceForDamping(Henry l, Farad c, double zeta);

/// Longest conductor of inductance \p perLength per metre that fits into the budget \p lMax
/// after the fixed part \p lFixed (package and ESL): (L_max - L_fixed) / L'. Zero when the fixed
/// part alone reaches the budget; +infinity when lMax is infinite; NaN when perLength <= 0.
Meter maxTraceLength(Henry lMax, Henry lFixed, HenryPerMeter perLength);

} // namespace gateloop
