/// \file
/// Small helpers shared by rules: missing-data notes, fix suggestions with preferred values.
#pragma once

#include "checker/physics/eseries.h"
#include "rules/rule.h"

#include <optional>
#include <string>
#include <vector>

namespace gateloop {

/// A note saying the rule could not check \p loop because \p what is missing. Never a silent pass.
Finding missingDataNote(const RuleInfo &info, const DesignContext &design, const GateLoop &loop, std::string what,
                        std::vector<ComponentId> refs = {});

/// A note about the whole design (no loop), located at the netlist, for data missing everywhere:
/// one note instead of one per loop.
Finding designNote(const RuleInfo &info, const DesignContext &design, std::string message, std::string fix);

/// "on" or "off".
inline const char *edgeName(bool on) { return on ? "on" : "off"; }

/// The preferred value of \p series at or above \p ohms, formatted "6.8 ohm (E24)".
std::string preferredAtOrAbove(double ohms, ESeries series = ESeries::E24);
std::string preferredAtOrBelow(double ohms, ESeries series = ESeries::E24);

/// Names of components for messages: "R1", "R1 and R2", "R1, R2 and R3".
std::string joinNames(const DesignContext &design, const std::vector<ComponentId> &ids);

/// The switch part of a loop (rules only see loops of switches that have one).
const Part &switchPart(const DesignContext &design, const GateLoop &loop);

/// Index of the loop of switch \p switchId, or nothing when it has none. Loops come in the
/// order of their switches (extractGateLoops), so this is a binary search.
std::optional<std::size_t> loopOfSwitch(const DesignContext &design, ComponentId switchId);

/// The driver part of a loop, or nullptr.
const Part *driverPart(const DesignContext &design, const GateLoop &loop);

/// Maximum/minimum gate voltage rating of a switch, when given.
inline std::optional<Volt> gateMax(const Part &p) { return p.vGateMax; }
inline std::optional<Volt> gateMin(const Part &p) { return p.vGateMin; }

} // namespace gateloop
