/// \file
/// The layout sidecar (`gateloop-layout/1`): what the board layout knows about the gate loops.
#pragma once

#include "checker/core/source_location.h"
#include "checker/core/units.h"

#include <optional>
#include <string>
#include <vector>

namespace gateloop {

struct StackupLayer {
  std::string name;
  Meter z;       ///< depth of the layer from the top surface
  Meter copper;  ///< copper thickness (35 um where not given)
};

/// How a net's current returns.
struct NetReturn {
  enum class Kind { None, Plane, Pair } kind = Kind::None;
  std::string target; ///< plane layer name, or the partner net
  std::optional<Meter> gap; ///< edge-to-edge gap of a same-layer pair (`return.gap`)
};

/// Per-net summary: a length and optionally the cross-section and return path.
struct NetRouting {
  std::string net;
  std::optional<Meter> length, width;
  std::string layer;
  NetReturn ret;
  std::string fieldPath; ///< "nets.G_A"
};

/// A drawn polyline of one net on one layer. Points are stored in metres.
struct TracePath {
  std::string net;
  std::string layer;
  Meter width;
  std::vector<std::pair<double, double>> pointsM;
  std::string fieldPath; ///< "traces[0]"
};

/// An off-board lead pair (two-wire line).
struct WireLead {
  std::vector<std::string> nets;
  Meter length, diameter, spacing;
  bool twisted = false;
  std::string fieldPath; ///< "wires[0]"
};

struct Layout {
  FileId file = 0;
  std::vector<StackupLayer> stackup;
  std::vector<NetRouting> nets;
  std::vector<TracePath> traces;
  std::vector<WireLead> wires;

  const StackupLayer *layer(const std::string &name) const;
  /// Routing entry of \p net (case-insensitive), or nullptr.
  const NetRouting *routing(const std::string &net) const;
};

} // namespace gateloop
