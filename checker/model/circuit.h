/// \file
/// The circuit model: the one structure every stage after the readers works on. A netlist of
/// components whose pins connect to nets, flattened (hierarchical names joined by '.'), with the
/// source location of every element and net. Compact on purpose: decks of millions of elements
/// must fit in a few times their own size.
#pragma once

#include "checker/core/source_location.h"

#include <cmath>
#include <cstdint>
#include <limits>
#include <span>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

namespace gateloop {

using NetId = std::uint32_t;
using ComponentId = std::uint32_t;
using StringId = std::uint32_t; ///< index into Circuit's string pool; 0 is the empty string
constexpr std::uint32_t kNone = std::numeric_limits<std::uint32_t>::max();

/// What an element is electrically. SPICE decides it by the first letter (and for X instances by
/// the subcircuit); XML by the `type` attribute or the part.
enum class ElementKind : std::uint8_t {
  Resistor,
  Capacitor,
  Inductor,
  Coupling,       ///< K: mutual coupling between inductors (no pins of its own)
  Diode,
  Zener,
  Tvs,
  Ferrite,
  Bjt,            ///< SPICE Q (also an IGBT model when a part says so)
  Mosfet,         ///< SPICE M
  Jfet,           ///< SPICE J
  Mesfet,         ///< SPICE Z
  Switch,         ///< SPICE S/W
  TransmissionLine,
  VoltageSource,
  CurrentSource,
  ControlledSource, ///< E F G H
  BehavioralSource, ///< B
  Subcircuit,     ///< an X instance; its pins are the subcircuit's ports
  Generic,        ///< anything else (simulator-specific elements, XML parts without a type)
};

const char *elementKindName(ElementKind k);

/// One element of the flattened netlist.
struct Component {
  std::string name;              ///< full hierarchical name as written, e.g. "X1.XH.R5"
  ElementKind kind = ElementKind::Generic;
  std::uint16_t pinCount = 0;
  std::uint32_t firstPin = 0;    ///< index into Circuit::pinNet()
  std::uint32_t pinNames = 0;    ///< index of the pin-name list (Circuit::pinNameList)
  double value = std::numeric_limits<double>::quiet_NaN(); ///< R ohm, C F, L H, K factor; NaN = none
  StringId model = 0;            ///< .model or subcircuit name (SPICE), empty otherwise
  StringId partHint = 0;         ///< part id named directly by the input (XML `part`), empty otherwise
  ComponentId parent = kNone;    ///< the X instance this element was flattened out of
  std::uint32_t part = kNone;    ///< index into the resolved parts list (set by part resolution)
  bool hidden = false;           ///< inside a subcircuit that is modelled by a part as a whole
  SourceLocation where;

  bool hasValue() const { return !std::isnan(value); }
};

/// A net: a set of pins at one potential.
struct Net {
  std::string name;        ///< hierarchical name as first written ("X1.GATE"); ground is "0"
  bool ground = false;     ///< node 0, gnd
  bool global = false;     ///< declared .global
  SourceLocation where;    ///< first place it was mentioned
};

/// The flattened circuit of one design.
class Circuit {
public:
  Circuit();

  std::string title;

  /// Gets or creates the net \p name (case-insensitive; "0" and "gnd" are the same ground net).
  NetId net(std::string_view name, SourceLocation where);
  /// The net called \p name (case-insensitive), or kNone.
  NetId findNet(std::string_view name) const;
  /// Marks a net as global (SPICE .global).
  void markGlobal(NetId id) { nets_[id].global = true; }

  /// Interns a string (model names, part hints); equal strings give equal ids.
  StringId intern(std::string_view s);
  std::string_view str(StringId id) const { return strings_[id]; }

  /// Interns a pin-name list; identical lists share one id.
  std::uint32_t internPinNames(const std::vector<std::string> &names);
  const std::vector<std::string> &pinNameList(std::uint32_t id) const { return pinNameLists_[id]; }

  /// Appends a component connected to \p nets (in pin order) and returns its id. The pin-name
  /// list must have as many names as there are nets.
  ComponentId addComponent(Component c, std::span<const NetId> nets, std::uint32_t pinNamesId);

  const std::vector<Component> &components() const { return components_; }
  std::vector<Component> &components() { return components_; }
  const std::vector<Net> &nets() const { return nets_; }
  const Component &component(ComponentId id) const { return components_[id]; }
  const Net &netAt(NetId id) const { return nets_[id]; }

  /// The nets a component's pins connect to, in pin order.
  std::span<const NetId> pins(const Component &c) const {
    return {pinNets_.data() + c.firstPin, c.pinCount};
  }
  const std::vector<std::string> &pinNames(const Component &c) const {
    return pinNameLists_[c.pinNames];
  }
  /// Net of the pin called \p pinName (case-insensitive), or kNone.
  NetId pinNet(const Component &c, std::string_view pinName) const;

  /// The component called \p name (case-insensitive), or kNone. Builds an index on first use.
  ComponentId findComponent(std::string_view name) const;

  /// Reserve room when the caller knows roughly how big the circuit will be.
  void reserve(std::size_t components, std::size_t nets);

private:
  std::vector<Component> components_;
  std::vector<NetId> pinNets_;
  std::vector<Net> nets_;
  std::unordered_map<std::string, NetId> netIndex_; // key: lower-case name
  std::vector<std::string> strings_;
  std::unordered_map<std::string, StringId> stringIndex_;
  std::vector<std::vector<std::string>> pinNameLists_;
  std::unordered_map<std::string, std::uint32_t> pinNameListIndex_;
  mutable std::unordered_map<std::string, ComponentId> componentIndex_;
};

/// Lower-cases ASCII letters; SPICE names are case-insensitive.
std::string toLower(std::string_view s);
bool equalsIgnoreCase(std::string_view a, std::string_view b);

/// The standard pin names of a primitive SPICE element with \p count pins
/// (R/C/L: "1","2"; D: "a","k"; M: "d","g","s","b"; Q: "c","b","e","s"; others "1".."n").
std::vector<std::string> standardPinNames(ElementKind kind, std::size_t count);

} // namespace gateloop
