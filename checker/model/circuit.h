/// \file
/// The circuit model: the one structure every stage after the readers works on. A netlist of
/// components whose pins connect to nets, flattened (hierarchical names joined by '.'), with the
/// source location of every element and net. Compact on purpose: decks of millions of elements
/// must fit in a few times their own size.
#pragma once

#include "checker/core/huge_pages.h"
#include "checker/core/source_location.h"
#include "checker/core/text_util.h"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <limits>
#include <memory>
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

/// One element of the flattened netlist. 64 bytes: a million-element deck must fit in a few
/// times its own size (docs/performance.md).
struct Component {
  /// Full hierarchical name as written, e.g. "X1.XH.R5". Once added, it views the circuit's own
  /// name storage; before that, whatever the caller's string is (addComponent copies it).
  std::string_view name;
  double value = std::numeric_limits<double>::quiet_NaN(); ///< R ohm, C F, L H, K factor; NaN = none
  SourceLocation where;
  std::uint32_t firstPin = 0;    ///< index into Circuit::pinNet()
  std::uint32_t pinNames = 0;    ///< index of the pin-name list (Circuit::pinNameList)
  StringId model = 0;            ///< .model or subcircuit name (SPICE), empty otherwise
  StringId partHint = 0;         ///< part id named directly by the input (XML `part`), empty otherwise
  ComponentId parent = kNone;    ///< the X instance this element was flattened out of
  std::uint32_t part = kNone;    ///< index into the resolved parts list (set by part resolution)
  std::uint16_t pinCount = 0;
  ElementKind kind = ElementKind::Generic;
  bool hidden = false;           ///< inside a subcircuit that is modelled by a part as a whole

  bool hasValue() const { return !std::isnan(value); }
};

/// A net: a set of pins at one potential.
struct Net {
  std::string_view name;   ///< hierarchical name as first written ("X1.GATE"); ground is "0"
  SourceLocation where;    ///< first place it was mentioned
  bool ground = false;     ///< node 0, gnd
  bool global = false;     ///< declared .global
};

/// Append-only storage for names. Blocks never move, so views handed out stay valid for the
/// storage's life; one allocation per block instead of one per name.
class NameStorage {
public:
  std::string_view store(std::string_view s);

private:
  static constexpr std::size_t kBlockBytes = std::size_t{1} << 20;
  std::vector<std::unique_ptr<char[]>> blocks_;
  char *next_ = nullptr;
  std::size_t left_ = 0;
};

/// Open-addressing index from case-insensitive names to ids (net or component numbers). It keeps
/// only the id and 32 bits of the hash per slot; the names themselves stay where they are, and
/// the caller supplies them when comparing. Eight bytes a slot instead of a node with its own
/// string per entry in a node-based map.
class NameIndex {
public:
  NameIndex() = default;
  NameIndex(NameIndex &&) noexcept = default;
  NameIndex &operator=(NameIndex &&) noexcept = default;

  /// Finds the id whose name equals \p name ignoring case; \p nameOf(id) gives an id's name.
  template <class NameOf>
  std::uint32_t find(std::string_view name, std::uint64_t hash, NameOf &&nameOf) const {
    if (slotCount_ == 0) return kNone;
    const std::size_t mask = slotCount_ - 1;
    const auto tag = static_cast<std::uint32_t>(hash >> 32);
    for (std::size_t i = hash & mask;; i = (i + 1) & mask) {
      const std::uint64_t s = slots_[i];
      const auto id = static_cast<std::uint32_t>(s);
      if (id == kNone) return kNone;
      if (static_cast<std::uint32_t>(s >> 32) == tag && equalsIgnoreCase(nameOf(id), name)) return id;
    }
  }
  /// Adds \p id under \p hash; the caller has checked that the name is not there yet.
  template <class NameOf> void insert(std::uint32_t id, std::uint64_t hash, NameOf &&nameOf) {
    if (!roomFor(count_ + 1)) grow(slotsFor(count_ + 1), nameOf);
    place(id, hash);
    ++count_;
  }
  template <class NameOf> void reserve(std::size_t n, NameOf &&nameOf) {
    if (!roomFor(n)) grow(slotsFor(n), nameOf);
  }
  void clear() {
    slots_.reset();
    slotCount_ = 0;
    count_ = 0;
  }
  std::size_t size() const { return count_; }

private:
  static constexpr std::uint64_t kEmpty = ~std::uint64_t{0}; // id kNone
  // Linear probing with a hash tag stays cheap up to this load: the probes of one lookup mostly
  // share a cache line.
  bool roomFor(std::size_t n) const { return n * 10 <= slotCount_ * 7; }
  static std::size_t slotsFor(std::size_t n) {
    std::size_t want = 16;
    while (want * 7 < n * 10) want *= 2;
    return want;
  }
  void place(std::uint32_t id, std::uint64_t hash) {
    const std::size_t mask = slotCount_ - 1;
    std::size_t i = hash & mask;
    while (static_cast<std::uint32_t>(slots_[i]) != kNone) i = (i + 1) & mask;
    slots_[i] = (hash >> 32 << 32) | id;
  }
  template <class NameOf> void grow(std::size_t slotCount, NameOf &&nameOf) {
    std::unique_ptr<std::uint64_t[]> old = std::move(slots_);
    const std::size_t oldCount = slotCount_;
    // Uninitialised on purpose: the huge-page advice only helps before the first touch.
    slots_ = std::make_unique_for_overwrite<std::uint64_t[]>(slotCount);
    adviseHugePages(slots_.get(), slotCount * sizeof(std::uint64_t));
    std::fill_n(slots_.get(), slotCount, kEmpty);
    slotCount_ = slotCount;
    for (std::size_t i = 0; i < oldCount; ++i) {
      const auto id = static_cast<std::uint32_t>(old[i]);
      if (id != kNone) place(id, hashIgnoreCase(nameOf(id)));
    }
  }

  std::unique_ptr<std::uint64_t[]> slots_;
  std::size_t slotCount_ = 0;
  std::size_t count_ = 0;
};

/// The flattened circuit of one design.
class Circuit {
public:
  Circuit();
  // Components and nets view the circuit's own name storage; a copy would view the original's.
  Circuit(const Circuit &) = delete;
  Circuit &operator=(const Circuit &) = delete;
  Circuit(Circuit &&) noexcept = default;
  Circuit &operator=(Circuit &&) noexcept = default;

  std::string title;

  /// Gets or creates the net \p name (case-insensitive; "0" and "gnd" are the same ground net).
  NetId net(std::string_view name, SourceLocation where) {
    return net(name, hashIgnoreCase(name), where);
  }
  /// Where a name handed to the circuit lives: anywhere (the circuit copies it), or inside text
  /// the circuit keeps (keepText), which it then views instead of copying.
  enum class NameIn : std::uint8_t { anywhere, keptText };
  /// The same, for a caller that already has hashIgnoreCase(\p name).
  NetId net(std::string_view name, std::uint64_t hash, SourceLocation where,
            NameIn nameIn = NameIn::anywhere);

  /// Keeps \p text (a netlist file) for the circuit's life and returns a view of it. Names read
  /// verbatim from it can then be handed on with NameIn::keptText: a flat deck's names cost no
  /// second copy.
  std::string_view keepText(std::string text);
  /// The net called \p name (case-insensitive), or kNone.
  NetId findNet(std::string_view name) const;
  /// Marks a net as global (SPICE .global).
  void markGlobal(NetId id) { nets_[id].global = true; }

  /// Interns a string (model names, part hints); equal strings give equal ids.
  StringId intern(std::string_view s);
  std::string_view str(StringId id) const { return strings_[id]; }
  std::size_t stringCount() const { return strings_.size(); }

  /// Interns a pin-name list; identical lists share one id.
  std::uint32_t internPinNames(const std::vector<std::string> &names);
  const std::vector<std::string> &pinNameList(std::uint32_t id) const { return pinNameLists_[id]; }

  /// Appends a component connected to \p nets (in pin order) and returns its id. The pin-name
  /// list must have as many names as there are nets. The name is copied into the circuit.
  ComponentId addComponent(Component c, std::span<const NetId> nets, std::uint32_t pinNamesId,
                           NameIn nameIn = NameIn::anywhere);

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
  bool inKeptText(std::string_view name) const;

  std::vector<std::unique_ptr<std::string>> keptTexts_;
  NameStorage names_;
  std::vector<Component> components_;
  std::vector<NetId> pinNets_;
  std::vector<Net> nets_;
  NetId ground_ = kNone;
  NameIndex netIndex_; // every net but ground, which "0" and "gnd" both name
  std::vector<std::string> strings_;
  std::unordered_map<std::string, StringId> stringIndex_;
  std::vector<std::vector<std::string>> pinNameLists_;
  std::unordered_map<std::string, std::uint32_t> pinNameListIndex_;
  mutable NameIndex componentIndex_;
};

/// The standard pin names of a primitive SPICE element with \p count pins
/// (R/C/L: "1","2"; D: "a","k"; M: "d","g","s","b"; Q: "c","b","e","s"; others "1".."n").
std::vector<std::string> standardPinNames(ElementKind kind, std::size_t count);

} // namespace gateloop
