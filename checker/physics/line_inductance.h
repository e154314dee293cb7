/// \file
/// Closed-form inductance of gate-loop conductors (docs/physics.md "Conductor inductance"):
/// self partial inductance of a straight round wire, and inductance per unit length of the
/// two-dimensional lines a gate loop is made of: two-wire line, wire over a plane, microstrip
/// (trace over a plane), two stacked strips and coplanar strips; plus the skin depth that decides
/// between the DC (uniform current) and high-frequency (surface current) values.
///
/// All functions assume non-magnetic conductors and surroundings and use mu0 = 4 pi 1e-7 H/m.
/// A geometry outside a formula's domain (a non-positive size, wires that overlap) gives NaN.
#pragma once

#include "checker/core/units.h"

#include <optional>

namespace gateloop {

/// Resistivity of annealed copper at room temperature, ohm metre (the value used for the skin
/// depth figures in docs/physics.md).
inline constexpr double kCopperResistivityOhmMeter = 1.72e-8;

// ---- straight round wire (self partial inductance) -------------------------------------------

/// Self partial inductance of a straight round wire of \p length and \p radius, "exact" form
/// (E. B. Rosa 1908; F. W. Grover 1946; C. R. Paul 2010 ch. 5):
/// (mu0 l / 2 pi) [asinh(l/r) - sqrt(1 + (r/l)^2) + r/l + 1/4]. The 1/4 is the DC internal
/// inductance; pass \p includeInternal = false for the high-frequency value. The external part
/// is that of a thin tube, so below l/r ~ 2 the result is itself approximate.
Henry roundWireSelfInductance(Meter length, Meter radius, bool includeInternal = true);

/// Long-wire approximation (mu0 l / 2 pi) [ln(2l/r) - 3/4] (- 1 without the internal term);
/// within 0.1 % of roundWireSelfInductance for l/r >= 200, 15 % low at l/r = 4.
Henry roundWireSelfInductanceApprox(Meter length, Meter radius, bool includeInternal = true);

// ---- lines, inductance per unit length -------------------------------------------------------

/// Two parallel round wires (go and return), centre distance \p centreDistance, radius
/// \p radius: (mu0/pi) acosh(D / 2r) (C. R. Paul 2008 ch. 4; Ramo, Whinnery, Van Duzer 1994).
/// \p includeInternal adds mu0/(4 pi) per metre (both wires' DC internal inductance). Valid for
/// D > 2r and a length much larger than D; NaN for D <= 2r. Used for twisted pairs as well
/// (common practice).
HenryPerMeter twoWireLineInductance(Meter centreDistance, Meter radius,
                                    bool includeInternal = false);

/// Thin-wire approximation of twoWireLineInductance: (mu0/pi) ln(D/r), for D >> r.
HenryPerMeter twoWireLineInductanceApprox(Meter centreDistance, Meter radius);

/// Round wire whose axis is \p height above a perfectly conducting plane (image method; Paul
/// 2008/2010): (mu0 / 2 pi) acosh(h / r). NaN for h <= r.
HenryPerMeter wireOverPlaneInductance(Meter height, Meter radius);

/// Which closed form to use for a strip over a plane.
enum class MicrostripModel { HammerstadJensen, Wheeler };

/// Microstrip (trace over a return plane), Hammerstad & Jensen 1980 (IEEE MTT-S Digest,
/// 407-409): L' = Z01 / c0 with the air impedance Z01, with H-J's thickness correction of the
/// width. \p height is from the plane to the underside of the strip. Valid for any w/h; about
/// 0.01-0.03 % from the exact zero-thickness impedance. The best general choice.
HenryPerMeter microstripInductanceHammerstadJensen(Meter width, Meter height,
                                                   Meter thickness = Meter(0.0));

/// Microstrip, zero thickness, Wheeler 1977 (IEEE Trans. MTT-25(8), 631-647):
/// (mu0/4 pi) ln(1 + (4h/w)[8h/w + sqrt((8h/w)^2 + pi^2)]). Within about 1 % of
/// Hammerstad-Jensen everywhere; used as a cross-check.
HenryPerMeter microstripInductanceWheeler(Meter width, Meter height);

/// Microstrip inductance from the IPC-2141A impedance form: (mu0 / 2 pi) ln(5.98h / (0.8w + t)).
/// Cross-check only: it is 3-13 % low against Hammerstad-Jensen inside its range
/// 0.1 <= w/h <= 2 (see ipc2141InRange) and meaningless outside; empty when the logarithm's
/// argument is <= 1 (the form would give zero or a negative inductance).
std::optional<HenryPerMeter> microstripInductanceIpc2141(Meter width, Meter height,
                                                         Meter thickness);

/// IPC-2141A microstrip impedance 87/sqrt(er + 1.41) ln(5.98h/(0.8w + t)); empty as above.
std::optional<Ohm> microstripImpedanceIpc2141(Meter width, Meter height, Meter thickness,
                                              double relativePermittivity);

/// True when w/h lies in the IPC-2141A form's range 0.1 .. 2.
bool ipc2141InRange(Meter width, Meter height);

/// Parallel-plate limit mu0 h / w for two wide strips \p gap apart (any field text, e.g. Ramo
/// et al. 1994). Ignores fringing, so it over-estimates L' (17 % at w/h = 10).
HenryPerMeter parallelPlateInductance(Meter width, Meter gap);

/// Two equal strips of \p width on adjacent layers, \p gap between the facing surfaces, carrying
/// opposite currents: by symmetry two microstrips of height gap/2 in series (Wheeler 1965, IEEE
/// Trans. MTT-13(2)), L' = 2 L'_microstrip(w, h/2), zero thickness.
HenryPerMeter stackedPairInductance(Meter width, Meter gap,
                                    MicrostripModel model = MicrostripModel::HammerstadJensen);

/// Two coplanar zero-thickness strips of \p width with edge gap \p gap, no ground plane
/// (conformal mapping; Gupta, Garg, Bahl, Bhartia 1996 ch. 7; Wen 1969):
/// L' = mu0 K(k)/K(k'), k = s/(s + 2w). A plane closer than about s lowers the real value.
HenryPerMeter coplanarStripsInductance(Meter width, Meter gap);

/// Complete elliptic integral of the first kind K(k), modulus \p k in [0, 1), by the
/// arithmetic-geometric mean K = pi / (2 AGM(1, sqrt(1 - k^2))) (Abramowitz & Stegun 1964,
/// sec. 17.6). +infinity at k = 1, NaN outside [0, 1].
double ellipticK(double k);

/// K expressed through the complementary modulus \p kPrime = sqrt(1 - k^2): pi / (2 AGM(1, k')).
/// Accurate when k is close to 1 and k' is known directly.
double ellipticKFromComplement(double kPrime);

/// Skin depth delta = sqrt(rho / (pi f mu0 mu_r)) at frequency \p f for resistivity
/// \p resistivityOhmMeter (copper by default). NaN for f <= 0.
Meter skinDepth(Hertz f, double resistivityOhmMeter = kCopperResistivityOhmMeter,
                double relativePermeability = 1.0);

} // namespace gateloop
