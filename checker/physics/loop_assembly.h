/// \file
/// Loop inductance of a current loop drawn as straight segments, by summing partial inductances
/// (A. E. Ruehli 1972; C. R. Paul 2010; physics.md 1.1):
///   L = sum_i sum_j s_i s_j Mp_ij,   Mp_ii = Lp_ii,   s_i = +1 when the loop current flows a -> b.
/// A return current in a solid plane is modelled by images (physics.md 1.1 and 1.8): every segment
/// gets its mirror image with the components parallel to the plane reversed and the normal one
/// kept, and L = sum_ij s_i s_j (Mp(i,j) + Mp(i,j*)), half of the trace-plus-image system.
///
/// The N(N+1)/2 distinct pairs are evaluated once each (Mp_ij = Mp_ji) on up to
/// LoopOptions::threads threads; the result does not depend on the thread count.
#pragma once

#include "checker/physics/partial_inductance.h"

#include <cstddef>
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace gateloop {

/// Which side of the loop a segment belongs to; only used to split the result for reports.
enum class LoopPart { Outgoing, Return };

/// One straight piece of the loop.
struct LoopSegment {
  Conductor conductor;
  int sign = +1; ///< +1: the loop current flows from conductor.a to conductor.b; -1: b to a
  LoopPart part = LoopPart::Outgoing;
};

/// Loop inductance and its parts: total = outgoingSelf + returnSelf + mutual.
struct LoopInductance {
  Henry total;
  Henry outgoingSelf; ///< sum of the outgoing segments' self partial inductances
  Henry returnSelf;   ///< sum of the drawn return segments' self partial inductances
  Henry mutual;       ///< everything else: mutuals between segments plus the image terms
  Henry image;        ///< the image-plane part of `mutual` (zero without a plane)
  Meter length;       ///< total length of the drawn segments
  std::size_t segments = 0;
};

/// Tuning of the computation (not of the physics).
struct LoopOptions {
  /// Worker threads for the pair sum (at most 64); 0 or 1 runs on the calling thread. Small
  /// loops (under 64 segments) always run on the calling thread.
  unsigned threads = 2;
  /// Formula choices for the pairs; MutualOptions{false} gives the slower reference evaluation.
  MutualOptions mutual;
};

/// A reason why a loop cannot be computed, naming the segment (0-based index in the input).
struct LoopGeometryProblem {
  std::size_t segment = 0;
  std::string message; ///< lowercase, no trailing period, values with units
};

/// Checks the input of loopInductance: finite coordinates, positive finite width and thickness,
/// sign +1 or -1, and with an image plane every segment's body on one side of the plane (a
/// segment may end on the plane). Zero-length segments are allowed and contribute nothing.
/// Returns every problem found; empty when the loop can be computed.
std::vector<LoopGeometryProblem> checkLoopGeometry(const std::vector<LoopSegment> &segments,
                                                   std::optional<Meter> imagePlaneZ);

/// Loop inductance of \p segments, with the return current in a perfectly conducting plane at
/// z = \p imagePlaneZ when given (then the drawn segments are usually all outgoing, and the
/// image terms form `image`). The loop should be closed (through component bodies and pins, or
/// through the plane); an open chain gives the partial inductance of the drawn pieces only.
/// std::nullopt when checkLoopGeometry reports a problem. An empty loop gives zero.
std::optional<LoopInductance> loopInductance(const std::vector<LoopSegment> &segments,
                                             std::optional<Meter> imagePlaneZ = std::nullopt,
                                             const LoopOptions &options = {});

/// Splits every segment into \p pieces equal collinear segments with the same section, sign and
/// part (for convergence studies); \p pieces = 0 is treated as 1.
std::vector<LoopSegment> subdivideSegments(const std::vector<LoopSegment> &segments,
                                           unsigned pieces);

/// Bars along the polyline \p pointsM (x, y in metres) at height \p z (the centre of the copper),
/// one per pair of consecutive points, current in the order of the points; repeated points are
/// skipped. \p closed adds the segment from the last point back to the first.
std::vector<LoopSegment> polylineSegments(const std::vector<std::pair<double, double>> &pointsM,
                                          Meter z, Meter width, Meter thickness, LoopPart part,
                                          bool closed = false);

/// Mirror copy of \p c in the plane z = \p planeZ (same section, end points mirrored; the
/// copy's reference direction is the mirrored a -> b, i.e. not yet the image current).
Conductor mirrorInPlane(const Conductor &c, Meter planeZ);

} // namespace gateloop
