/// \file
/// The gate-loop model (spec section 5): for each switch, the paths from its gate to driver
/// outputs through series passives, which of them conduct turn-on and turn-off current, the shunt
/// elements between gate and reference, the driver's reference connection and the half-bridge
/// partner. Pure topology: numbers are added by loop_physics.
#pragma once

#include "checker/core/diagnostics.h"
#include "checker/model/circuit.h"
#include "checker/model/parts.h"

#include <string>
#include <string_view>
#include <vector>

namespace gateloop {

/// What a component is for the gate-loop walk: the part kind where a part is assigned, else the
/// element kind.
enum class LoopRole { Resistor, Inductor, Ferrite, Diode, Zener, Tvs, Capacitor, Switch, Driver, Other };

LoopRole loopRole(const Component &c, const PartLibrary &lib);

/// Which way a driver output pin drives the gate.
enum class OutputKind { Source, Sink, Bidirectional };

/// One series path from a driver output pin to the switch gate.
struct GatePath {
  ComponentId driver = kNone;
  std::string driverPin;               ///< pin name on the driver
  OutputKind output = OutputKind::Bidirectional;
  std::vector<ComponentId> elements;   ///< series elements in order from the driver to the gate
  std::vector<NetId> nets;             ///< nets from the driver output net to the gate net
  bool conductsOn = false;             ///< turn-on current (driver -> gate) can flow
  bool conductsOff = false;            ///< turn-off current (gate -> driver) can flow
  bool blockedByDiode = false;         ///< a diode blocks the direction the output pin drives
};

enum class ShuntKind {
  PullDown,     ///< resistor gate -> reference
  ZenerClamp,   ///< single Zener or TVS gate -> reference
  ClampPair,    ///< back-to-back Zeners/TVS or a bidirectional TVS
  DiodeClamp,   ///< plain diode gate -> reference
  Capacitor,    ///< external C_ge
  DriverClamp,  ///< driver clamp pin wired to the gate side
};

const char *shuntKindName(ShuntKind k);

/// An element between the gate side of the loop and the reference net.
struct Shunt {
  ShuntKind kind;
  std::vector<ComponentId> elements;   ///< one, or two for a series pair
  /// For single Zeners/diodes: true when the cathode is on the gate side (clamps positive
  /// gate voltage by breakdown, negative by forward conduction).
  bool cathodeOnGate = true;
};

/// How the driver's reference pin reaches the switch.
enum class DriverReference { Kelvin, PowerTerminal, Other, Unknown };

struct GateLoop {
  std::string id;                      ///< the switch's hierarchical name
  ComponentId switchId = kNone;
  NetId gateNet = kNone;
  NetId emitterNet = kNone;            ///< power emitter/source
  NetId kelvinNet = kNone;             ///< kNone when the part has no Kelvin pin
  bool kelvinConnected = false;
  NetId refNet = kNone;                ///< Kelvin net when connected, else emitter
  NetId collectorNet = kNone;
  std::vector<GatePath> paths;
  std::vector<Shunt> shunts;
  ComponentId driver = kNone;          ///< the driver of the first path, kNone when none
  NetId driverRefNet = kNone;
  DriverReference driverReference = DriverReference::Unknown;
  ComponentId halfBridgePartner = kNone;
  bool pathLimitHit = false;           ///< the walk stopped at its bound; paths may be missing
};

/// Extracts every gate loop of switches that have a switch part, in the order of the switches'
/// component ids (rules look loops up by switch with a binary search). Components that are hidden
/// or Subcircuit instances without a part are ignored.
std::vector<GateLoop> extractGateLoops(const Circuit &circuit, const PartLibrary &lib);

/// Net of the part pin with \p role on \p c (for example "gate"), or kNone when the part does not
/// name that role or the component has no such pin. Accepts role aliases (emitter/source,
/// collector/drain).
NetId rolePinNet(const Circuit &circuit, const Component &c, const Part &part, std::string_view role);

} // namespace gateloop
