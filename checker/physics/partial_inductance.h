/// \file
/// Partial inductances of straight conductors (A. E. Ruehli's partial-element method, 1972), the
/// building blocks of a gate loop's inductance computed from drawn layout geometry.
///
/// A conductor is a straight bar of rectangular cross-section (a trace, a pin, a bus bar) or a
/// round wire, carrying a uniform (DC) current from its end `a` to its end `b`. The formulas and
/// the choice between them are documented in docs/inductance-geometry.md; in short:
/// - self partial inductance of a bar: Hoer & Love's exact expression (1965) evaluated in long
///   double while it is well conditioned, Grover's approximation (1946) beyond;
/// - mutual partial inductance of parallel bars: Hoer & Love when they are close, the parallel
///   filament formula (Grover) plus a second-order cross-section correction when they are apart;
/// - filaments at an angle: Grover/Campbell closed form for coplanar segments (touching or not);
///   skew segments: Gauss-Legendre integration of the Neumann integral, subdivided when close;
/// - far pairs (distance several times their lengths): a fourth-order expansion of the pair
///   integral, or low-order Gauss-Legendre, on the cross-section-corrected Neumann kernel, for
///   about 1e-9 relative error.
///
/// Everything is in SI units (metres, henry) with mu0 = 4 pi 1e-7 H/m, non-magnetic materials.
#pragma once

#include "checker/core/units.h"

#include <cstddef>

namespace gateloop {

/// A point in space, in metres. Any right-handed frame works; traces are assumed to lie in planes
/// of constant z (their thickness is measured along z).
struct Point3 {
  double x = 0.0, y = 0.0, z = 0.0;
};

/// Shape of a conductor's cross-section.
enum class CrossSection { Rectangle, Round };

/// A straight conductor with uniform current flowing from \p a to \p b (the reference direction).
///
/// Rectangle: \p width is measured perpendicular to the axis and parallel to the x-y plane, and
/// \p thickness perpendicular to both (along z for a trace). For a conductor along z (a via or a
/// pin) width lies along x and thickness along y. `a` and `b` are the centres of the end faces.
/// Round: a wire of diameter \p width (\p thickness equals \p width).
struct Conductor {
  Point3 a, b;
  Meter width, thickness;
  CrossSection section = CrossSection::Rectangle;

  /// A bar of rectangular section \p width x \p thickness.
  static Conductor bar(Point3 a, Point3 b, Meter width, Meter thickness);
  /// A round wire of \p radius.
  static Conductor wire(Point3 a, Point3 b, Meter radius);
  /// Distance from a to b.
  Meter length() const;
};

// ---- self partial inductance ----------------------------------------------------------------

/// Hoer & Love's exact self partial inductance of a bar \p width x \p thickness x \p length
/// (J. Res. NBS 69C(2), 1965, eq. 20), evaluated in long double. Well conditioned while
/// length <= 1000 sqrt(width thickness); beyond that round-off grows (use barSelfPartial).
/// All sizes must be positive; otherwise the result is NaN.
Henry hoerLoveSelf(Meter width, Meter thickness, Meter length);

/// Grover's approximation (mu0 l / 2 pi) [ln(2l/(w+t)) + 1/2 + 0.2235 (w+t)/l] (Grover 1946).
/// Within 0.15 % of the exact value when l/(w+t) >= 20. NaN for non-positive sizes.
Henry groverBarSelf(Meter width, Meter thickness, Meter length);

/// Self partial inductance of a rectangular bar: hoerLoveSelf while
/// length <= 1000 sqrt(width thickness), groverBarSelf beyond (physics.md 1.3).
Henry barSelfPartial(Meter width, Meter thickness, Meter length);

/// Self partial inductance of \p c: barSelfPartial for a bar; for a round wire Rosa's form
/// (mu0 l / 2 pi) [asinh(l/r) - sqrt(1 + (r/l)^2) + r/l + 1/4] including the DC internal term.
/// Zero for a zero-length conductor; NaN for a non-finite coordinate or a section size that is
/// not positive (loop_assembly.h checks its input for these).
Henry selfPartial(const Conductor &c);

// ---- mutual partial inductance: parallel conductors -------------------------------------------

/// An axis-aligned box: x in [x0, x0 + dx], y in [y0, y0 + dy], z in [z0, z0 + dz]; the current
/// flows along +z uniformly over the section dx x dy.
struct BarBox {
  Meter x0, y0, z0;
  Meter dx, dy, dz;
};

/// Hoer & Love's exact mutual partial inductance of two parallel bars along z (J. Res. NBS
/// 69C(2), 1965, eq. 14), any relative position (offset, touching, overlapping; with the same box
/// twice it gives the self inductance). Evaluated in long double; accurate to about 1e-9
/// relative while every axial coordinate difference is below 1000 times the smaller section's
/// sqrt(dx dy). NaN when a size is not positive.
Henry hoerLoveMutual(const BarBox &bar1, const BarBox &bar2);

/// Mutual partial inductance of two parallel filaments (Grover 1946, offset filaments):
/// filament 1 along the axis from 0 to \p l1, filament 2 at perpendicular \p distance from it,
/// from \p offset to \p offset + \p l2 along the same direction; both currents point the same
/// way. A collinear pair (\p distance = 0) that does not overlap gives the collinear formula;
/// overlapping collinear filaments give +infinity.
Henry filamentMutualParallel(Meter l1, Meter l2, Meter offset, Meter distance);

/// Collinear filaments of lengths \p l1 then \p l2, same direction, \p gap >= 0 between the end
/// of the first and the start of the second (Grover 1946; physics.md 1.4).
Henry filamentMutualCollinear(Meter l1, Meter l2, Meter gap);

// ---- mutual partial inductance: filaments at an angle ---------------------------------------

/// Two filaments of lengths \p l and \p m starting at a common point, both directed away from it,
/// \p epsRad the angle between them (Grover 1946; Campbell 1915):
/// (mu0/2 pi) cos(eps) [l atanh(m/(l+R)) + m atanh(l/(m+R))], R the distance of the free ends.
Henry filamentMutualTouchingAngle(Meter l, Meter m, double epsRad);

/// Two coplanar, non-parallel filaments. Their lines meet at O; filament 1 lies at signed
/// distances [\p a1, \p a2] along unit vector u1 from O and filament 2 at [\p b1, \p b2] along u2,
/// \p epsRad = angle between u1 and u2 (0 < eps < pi); the currents flow along +u1 and +u2.
/// Inclusion-exclusion over the touching-angle formula (physics.md 1.5).
Henry filamentMutualCoplanar(Meter a1, Meter a2, Meter b1, Meter b2, double epsRad);

/// Neumann integral (mu0/4 pi) int int dl1.dl2 / r for filaments a1->b1 and a2->b2 in any
/// position, by tensor Gauss-Legendre quadrature with recursive subdivision where the filaments
/// come close (relative error about 1e-9 unless they touch or cross, where the subdivision depth
/// is capped and the error stays below about 1e-7 of the result).
Henry filamentMutualNeumann(Point3 a1, Point3 b1, Point3 a2, Point3 b2);

// ---- the dispatcher --------------------------------------------------------------------------

/// Which formula the dispatcher used for a pair (for tests and reports).
enum class MutualMethod {
  Zero,             ///< perpendicular currents or a zero-length conductor
  HoerLove,         ///< close parallel bars
  ParallelFilament, ///< parallel conductors apart: filament formula + cross-section correction
  CoplanarFilament, ///< close, coplanar, at an angle: closed form for filaments
  Neumann,          ///< at an angle, not far: adaptive Gauss-Legendre
  FarField,         ///< distant pair: fourth-order expansion or fixed-order Gauss-Legendre
};

/// Name of \p m for messages ("hoer-love", "far-field", ...).
const char *mutualMethodName(MutualMethod m);

/// A mutual partial inductance and the formula it came from.
struct MutualPartial {
  Henry value;
  MutualMethod method = MutualMethod::Zero;
};

/// Choices of the dispatcher that trade speed for nothing but round-off (for validation).
struct MutualOptions {
  /// Use the fixed-order Gauss-Legendre rules and the fourth-order expansion for distant pairs
  /// (relative error about 1e-9). false evaluates every pair by the near-pair formulas (closed
  /// forms and adaptive quadrature of the same model), a slower reference.
  bool farField = true;
};

/// A conductor with its derived geometry computed once (unit axis, section frame, length,
/// midpoint), for evaluating many pairs. Cheap to copy.
class PreparedConductor {
public:
  PreparedConductor() = default;
  explicit PreparedConductor(const Conductor &c);

  const Conductor &conductor() const { return c_; }
  Meter length() const { return Meter(len_); }

private:
  friend Henry selfPartial(const PreparedConductor &);
  friend class PairEvaluator;

  Conductor c_;
  double a_[3] = {0, 0, 0}, b_[3] = {0, 0, 0}, mid_[3] = {0, 0, 0};
  double u_[3] = {0, 0, 0};       // unit axis a -> b
  double wdir_[3] = {0, 0, 0};    // unit width direction
  double tdir_[3] = {0, 0, 0};    // unit thickness direction
  double len_ = 0.0, half_ = 0.0, invHalf_ = 0.0; // length, half length, 1/half length
  double w_ = 0.0, t_ = 0.0;      // section sizes (round: both the diameter)
  double maxDim_ = 0.0;           // largest section dimension
  double cov_[6] = {0, 0, 0, 0, 0, 0}; // section covariance xx, yy, zz, xy, xz, yz (m^2)
  bool valid_ = false;            // finite coordinates, positive finite section
};

/// Self partial inductance of a prepared conductor (same as selfPartial(const Conductor&)).
Henry selfPartial(const PreparedConductor &c);

/// Mutual partial inductance of two conductors with their reference directions, choosing the
/// formula by geometry (see docs/inductance-geometry.md, "Which formula when"): perpendicular ->
/// 0; far apart -> expansion or Gauss-Legendre; parallel -> Hoer & Love when close, else the
/// filament formula with a cross-section correction; at an angle and close -> closed form when
/// coplanar, else adaptive Gauss-Legendre. Symmetric: M(p, q) = M(q, p) to about 1e-9. Round
/// wires close to a parallel conductor are treated as squares of equal geometric mean distance.
/// Use selfPartial for a conductor's own term. NaN for invalid conductors (see selfPartial).
MutualPartial mutualPartialDetailed(const PreparedConductor &p, const PreparedConductor &q,
                                    const MutualOptions &options = {});

/// mutualPartialDetailed(p, q).value for unprepared conductors.
Henry mutualPartial(const Conductor &p, const Conductor &q);

} // namespace gateloop
