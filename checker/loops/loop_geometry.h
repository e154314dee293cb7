/// \file
/// The drawn geometry of one gate loop from the layout sidecar's `traces`: the outgoing path
/// (driver output to gate) and the return path (Kelvin reference back to the driver), chained
/// into one closed outline. Gaps between traces are component bodies and pins, closed with
/// straight pieces, because a partial inductance only means something for a closed loop.
#pragma once

#include "checker/core/units.h"
#include "checker/model/circuit.h"
#include "checker/model/layout.h"
#include "checker/physics/loop_assembly.h"

#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace gateloop {

struct PlacedTrace {
  const TracePath *trace = nullptr;
  bool reversed = false;    ///< walked from its last point to its first
  LoopPart part = LoopPart::Outgoing;
};

struct LoopGeometry {
  std::vector<PlacedTrace> traces;          ///< in loop order
  std::vector<std::pair<double, double>> outline; ///< closed outline in metres (x, y), for drawing
  std::optional<Meter> planeDepth;          ///< return by image in this plane (no drawn return)
  std::vector<LoopSegment> segments;        ///< ready for loopInductance
  Meter drawnLength;                        ///< length of the drawn traces (closures excluded)
};

/// Builds the loop from the traces of \p outgoingNets and \p returnNet. Empty when no outgoing
/// net has traces. Without return traces, the return is the image in the outgoing nets' return
/// plane (`nets.<net>.return.plane`), when one is named.
std::optional<LoopGeometry> buildLoopGeometry(const std::vector<std::string> &outgoingNets,
                                              const std::string &returnNet, const Layout &layout);

} // namespace gateloop
