/// \file
/// Resistor ratings (docs/physics.md "Resistor ratings"): the IEC 60115-1 / IEC 60115-8 power
/// derating curve, rated voltage and critical resistance, and a pulse-load check built on the
/// maker's single-pulse curve (peak power against rectangular pulse width). The repetitive-pulse
/// composite is derived in docs/physics.md 4.4 from the usual thermal-impedance approximation.
#pragma once

#include "checker/core/units.h"

#include <optional>
#include <span>

namespace gateloop {

/// Permissible continuous dissipation at ambient \p tAmbient (IEC 60115-1 derating curve): the
/// rated power \p pRated up to the knee \p tKnee, falling linearly to zero at the upper category
/// temperature \p tMax, zero above. NaN unless tKnee < tMax and pRated >= 0.
Watt deratedPower(Watt pRated, Celsius tKnee, Celsius tMax, Celsius tAmbient);

/// Rated voltage U_r = min(sqrt(P_r R), U_max) (IEC 60115-1 definitions). NaN for negative
/// inputs.
Volt ratedVoltage(Watt pRated, Ohm r, Volt uMax);

/// Critical resistance R_crit = U_max^2 / P_r: above it a resistor is voltage-limited, below it
/// power-limited (IEC 60115-1 definitions). NaN for pRated <= 0.
Ohm criticalResistance(Volt uMax, Watt pRated);

/// One point of a maker's single-pulse curve: permissible peak power of one rectangular pulse.
struct PulsePoint {
  Second width;
  Watt power;
};

/// Result of reading a pulse curve.
struct PulseLimit {
  Watt limit;               ///< permissible single-pulse peak power
  bool belowCurve = false;  ///< pulse shorter than the first point: the first point's power used
  bool aboveCurve = false;  ///< pulse longer than the last point: the continuous limit used
};

/// True when \p curve has at least one point, widths strictly increasing, and every width and
/// power positive and finite.
bool isValidPulseCurve(std::span<const PulsePoint> curve);

/// Permissible single-pulse peak power for a rectangular pulse of \p width, by log-log
/// interpolation between the curve points (docs/physics.md 4.4, step 2). Outside the curve the
/// conservative ends are used and flagged: shorter than the first point -> the first point's
/// power; longer than the last point -> \p continuousLimit (the derated continuous rating).
/// Empty for an invalid curve (see isValidPulseCurve) or a width <= 0.
std::optional<PulseLimit> singlePulseLimit(std::span<const PulsePoint> curve, Second width,
                                           Watt continuousLimit);

/// Duty cycle D = t_i f_rep of rectangular pulses of width \p width repeated at \p fRepeat
/// (f_sw for a separate on- or off-resistor, 2 f_sw for one carrying both edges).
double pulseDutyCycle(Second width, Hertz fRepeat);

/// Permissible repetitive peak power when only the single-pulse curve exists (docs/physics.md 4.4,
/// step 3): P_rep = k_T / (D / P_r + (1 - D) / P_single), with Z(t, D) ~ D R_th + (1 - D) Z_th(t)
/// and k_T = P_max(T_amb)/P_r the ambient derating factor. A zero \p singlePulse (nothing allowed,
/// e.g. above the upper category temperature) gives 0 W. NaN for \p dutyCycle outside [0, 1], a
/// negative singlePulse, pRated <= 0 or a negative factor.
Watt repetitivePulseLimit(Watt singlePulse, Watt pRated, double dutyCycle, double deratingFactor);

} // namespace gateloop
