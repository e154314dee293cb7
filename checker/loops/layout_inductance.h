/// \file
/// Inductance and length of a set of gate-loop nets from the layout sidecar (spec 4.4): per net
/// the most detailed data wins (traces, then `nets` entries, then an assumed inductance per
/// metre); pairs and wire leads are counted once.
#pragma once

#include "checker/core/units.h"
#include "checker/model/circuit.h"
#include "checker/model/layout.h"
#include "checker/model/project.h"

#include <optional>
#include <string>
#include <vector>

namespace gateloop {

/// The split of a loop inductance computed from drawn traces (partial-element method).
struct InductanceSplit {
  Henry outgoingSelf, returnSelf, mutual;
  std::size_t segments = 0;
};

struct NetsInductance {
  Henry inductance;
  std::optional<InductanceSplit> split;  ///< only for the "traces" method
  std::optional<Meter> length;        ///< empty when no net had a length
  std::string method;                 ///< "traces", "nets", "wires", "assumed", "mixed" or "none"
  std::vector<std::string> assumptions;
  std::vector<std::string> missing;
};

/// Inductance of the loop formed by \p outgoing (the nets from the driver output to the gate) and
/// the reference net \p ref. When the sidecar draws traces for the outgoing nets, the closed loop
/// is built from them and computed by partial inductances; otherwise each net is summed from its
/// `nets`/`wires` entry or an assumed inductance per metre. \p layout may be null.
NetsInductance layoutInductance(const std::vector<NetId> &outgoing, NetId ref, const Circuit &circuit,
                                const Layout *layout, const OperatingPoint &op);

} // namespace gateloop
