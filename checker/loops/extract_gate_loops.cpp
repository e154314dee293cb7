#include "checker/loops/gate_loop.h"

#include "checker/core/parallel.h"

#include <boost/graph/compressed_sparse_row_graph.hpp>

#include <algorithm>
#include <span>
#include <unordered_map>

namespace gateloop {

namespace {

// Bounds keep the walk linear in practice: real gate paths have one to four series elements, and a
// net with hundreds of branches is a supply rail, not part of a gate loop.
constexpr std::size_t kMaxPathElements = 8;
constexpr std::size_t kMaxPathsPerSwitch = 64;

struct SeriesEdge {
  ComponentId component = kNone;
};

// Nets are vertices, two-pin series-capable elements (R, L, ferrite, diode) are edges, stored
// once in each direction. A compressed-sparse-row graph is built in one go from the edge list:
// no allocation per net, and a net's edges lie together in memory for the path walk.
using SeriesGraph = boost::compressed_sparse_row_graph<boost::directedS, boost::no_property, SeriesEdge,
                                                      boost::no_property, NetId, std::uint32_t>;

struct PinRef {
  ComponentId component;
  std::uint16_t pin;
};

struct DriverOutput {
  ComponentId driver;
  std::string pin;
  OutputKind kind;
};

bool isSeriesRole(LoopRole r) {
  return r == LoopRole::Resistor || r == LoopRole::Inductor || r == LoopRole::Ferrite ||
         r == LoopRole::Diode;
}

const Part *partOf(const Component &c, const PartLibrary &lib) {
  return c.part == kNone ? nullptr : &lib.parts[c.part];
}

bool visible(const Component &c, const PartLibrary &lib) {
  if (c.hidden) return false;
  // A subcircuit instance without a part is only structure; its contents carry the circuit.
  return !(c.kind == ElementKind::Subcircuit && c.part == kNone);
}

class Extractor {
public:
  Extractor(const Circuit &circuit, const PartLibrary &lib)
      : circuit_(circuit), lib_(lib) {
    const auto &comps = circuit_.components();
    std::vector<std::pair<NetId, NetId>> edges;
    std::vector<SeriesEdge> edgeComponents;
    roles_.resize(comps.size(), LoopRole::Other);
    // Pins by net in one flat array (counted, then filled): a vector per net would cost one
    // allocation for each of a large deck's hundreds of thousands of nets.
    pinStart_.assign(circuit_.nets().size() + 1, 0);
    for (ComponentId id = 0; id < comps.size(); ++id) {
      const Component &c = comps[id];
      if (!visible(c, lib_)) continue;
      roles_[id] = loopRole(c, lib_);
      for (NetId n : circuit_.pins(c)) ++pinStart_[n + 1];
      auto pins = circuit_.pins(c);
      if (isSeriesRole(roles_[id]) && pins.size() == 2 && pins[0] != pins[1]) {
        edges.emplace_back(pins[0], pins[1]);
        edges.emplace_back(pins[1], pins[0]);
        edgeComponents.push_back({id});
        edgeComponents.push_back({id});
      }
      if (roles_[id] == LoopRole::Driver) indexDriverOutputs(id, c);
    }
    graph_ = SeriesGraph(boost::edges_are_unsorted_multi_pass, edges.begin(), edges.end(), edgeComponents.begin(),
                         circuit_.nets().size());
    for (std::size_t n = 1; n < pinStart_.size(); ++n) pinStart_[n] += pinStart_[n - 1];
    pinRefs_.resize(pinStart_.back());
    std::vector<std::uint32_t> fill(pinStart_.begin(), pinStart_.end() - 1);
    for (ComponentId id = 0; id < comps.size(); ++id) {
      if (!visible(comps[id], lib_)) continue;
      auto pins = circuit_.pins(comps[id]);
      for (std::uint16_t p = 0; p < pins.size(); ++p) pinRefs_[fill[pins[p]]++] = {id, p};
    }
  }

  const std::vector<DriverOutput> *driverOutputsAt(NetId n) const {
    if (outputListOf_.empty() || outputListOf_[n] == 0) return nullptr;
    return &outputLists_[outputListOf_[n] - 1];
  }

  /// The pins on net \p n.
  std::span<const PinRef> pinsOnNet(NetId n) const {
    return {pinRefs_.data() + pinStart_[n], pinStart_[n + 1] - pinStart_[n]};
  }

  std::vector<GateLoop> run() const {
    std::vector<ComponentId> switches;
    for (ComponentId id = 0; id < roles_.size(); ++id)
      if (roles_[id] == LoopRole::Switch) switches.push_back(id);
    std::vector<GateLoop> loops(switches.size());
    parallelFor(switches.size(), [&](std::size_t i) { loops[i] = buildLoop(switches[i]); });
    pairHalfBridges(loops);
    return loops;
  }

private:
  void indexDriverOutputs(ComponentId id, const Component &c) {
    const Part &part = lib_.parts[c.part];
    static const std::pair<const char *, OutputKind> kRoles[] = {
        {"out_source", OutputKind::Source}, {"out_sink", OutputKind::Sink}, {"out", OutputKind::Bidirectional}};
    for (const auto &[role, kind] : kRoles) {
      auto it = part.pins.find(role);
      if (it == part.pins.end()) continue;
      NetId n = circuit_.pinNet(c, it->second);
      if (n == kNone) continue;
      if (outputListOf_.empty()) outputListOf_.assign(circuit_.nets().size(), 0);
      if (outputListOf_[n] == 0) {
        outputLists_.emplace_back();
        outputListOf_[n] = static_cast<std::uint32_t>(outputLists_.size());
      }
      outputLists_[outputListOf_[n] - 1].push_back({id, it->second, kind});
    }
  }

  GateLoop buildLoop(ComponentId id) const {
    const Component &sw = circuit_.component(id);
    const Part &part = lib_.parts[sw.part];
    GateLoop loop;
    loop.id = sw.name;
    loop.switchId = id;
    loop.gateNet = rolePinNet(circuit_, sw, part, "gate");
    loop.emitterNet = rolePinNet(circuit_, sw, part, "emitter");
    loop.collectorNet = rolePinNet(circuit_, sw, part, "collector");
    loop.kelvinNet = rolePinNet(circuit_, sw, part, "kelvin");
    loop.kelvinConnected = loop.kelvinNet != kNone && netReachesOtherComponent(loop.kelvinNet, id);
    loop.refNet = loop.kelvinConnected ? loop.kelvinNet : loop.emitterNet;
    if (loop.gateNet == kNone) return loop;

    loop.paths.reserve(2); // on and off
    loop.shunts.reserve(3); // pull-down and a clamp or two
    walkPaths(loop);
    collectShunts(loop);
    if (!loop.paths.empty()) {
      loop.driver = loop.paths.front().driver;
      classifyDriverReference(loop);
    }
    return loop;
  }

  bool netReachesOtherComponent(NetId net, ComponentId self) const {
    for (const auto &p : pinsOnNet(net))
      if (p.component != self) return true;
    return false;
  }

  bool isTerminalNet(const GateLoop &loop, NetId n) const {
    const Net &net = circuit_.netAt(n);
    return net.ground || n == loop.refNet || n == loop.emitterNet || n == loop.collectorNet;
  }

  // Depth-first enumeration of simple paths from the gate through series elements to any net that
  // holds a driver output pin.
  void walkPaths(GateLoop &loop) const {
    thread_local std::vector<ComponentId> elements;
    thread_local std::vector<NetId> nets;
    elements.clear();
    nets.assign(1, loop.gateNet);
    // A driver output wired straight to the gate is a path with no series element.
    recordPathsAt(loop, loop.gateNet, elements, nets);
    dfs(loop, loop.gateNet, elements, nets);
  }

  // The path is at most kMaxPathElements long, so looking for a net on it is a short scan.
  void dfs(GateLoop &loop, NetId at, std::vector<ComponentId> &elements, std::vector<NetId> &nets) const {
    if (elements.size() >= kMaxPathElements) return;
    for (auto [e, end] = boost::out_edges(at, graph_); e != end; ++e) {
      if (loop.paths.size() >= kMaxPathsPerSwitch) {
        loop.pathLimitHit = true;
        return;
      }
      NetId next = static_cast<NetId>(boost::target(*e, graph_));
      ComponentId comp = graph_[*e].component;
      if (std::find(nets.begin(), nets.end(), next) != nets.end() || isTerminalNet(loop, next)) continue;
      if (std::find(elements.begin(), elements.end(), comp) != elements.end()) continue;
      elements.push_back(comp);
      nets.push_back(next);
      if (driverOutputsAt(next)) {
        recordPathsAt(loop, next, elements, nets);
      } else {
        dfs(loop, next, elements, nets);
      }
      nets.pop_back();
      elements.pop_back();
    }
  }

  void recordPathsAt(GateLoop &loop, NetId driverNet, const std::vector<ComponentId> &gateToDriver,
                     const std::vector<NetId> &netsGateToDriver) const {
    const std::vector<DriverOutput> *outputs = driverOutputsAt(driverNet);
    if (!outputs) return;
    for (const DriverOutput &out : *outputs) {
      GatePath path;
      path.driver = out.driver;
      path.driverPin = out.pin;
      path.output = out.kind;
      path.elements.assign(gateToDriver.rbegin(), gateToDriver.rend());
      path.nets.assign(netsGateToDriver.rbegin(), netsGateToDriver.rend());
      decideConduction(path);
      loop.paths.push_back(std::move(path));
    }
  }

  // On current flows driver -> gate, off current gate -> driver; each diode must be forward in
  // that direction, i.e. its anode on the upstream net.
  void decideConduction(GatePath &path) const {
    bool forwardOn = true, forwardOff = true;
    for (std::size_t i = 0; i < path.elements.size(); ++i) {
      ComponentId id = path.elements[i];
      if (roles_[id] != LoopRole::Diode) continue;
      NetId driverSide = path.nets[i];
      NetId anode = anodeNet(circuit_.component(id));
      if (anode == driverSide) forwardOff = false;
      else forwardOn = false;
    }
    bool drivesOn = path.output != OutputKind::Sink;
    bool drivesOff = path.output != OutputKind::Source;
    path.conductsOn = drivesOn && forwardOn;
    path.conductsOff = drivesOff && forwardOff;
    path.blockedByDiode = (drivesOn && !forwardOn) || (drivesOff && !forwardOff);
  }

  NetId anodeNet(const Component &c) const {
    if (const Part *p = partOf(c, lib_)) {
      auto it = p->pins.find("anode");
      if (it != p->pins.end()) return circuit_.pinNet(c, it->second);
    }
    // SPICE D and XML diodes list the anode first.
    NetId n = circuit_.pinNet(c, "a");
    return n != kNone ? n : circuit_.pins(c)[0];
  }

  void collectShunts(GateLoop &loop) const {
    if (loop.refNet == kNone) return;
    // The gate side: the gate net and every net between it and the driver outputs (at most
    // kMaxPathsPerSwitch paths of kMaxPathElements nets, so a scan finds repeats).
    thread_local std::vector<NetId> gateSide;
    gateSide.assign(1, loop.gateNet);
    auto onGateSide = [&](NetId n) { return std::find(gateSide.begin(), gateSide.end(), n) != gateSide.end(); };
    for (const auto &p : loop.paths)
      for (std::size_t i = 1; i < p.nets.size(); ++i)
        if (!onGateSide(p.nets[i])) gateSide.push_back(p.nets[i]);
    // Each component once, where it is first met. A gate-side net has a handful of pins; in a
    // broken netlist it may have thousands, so past a few dozen repeats are found by sorting.
    thread_local std::vector<std::pair<PinRef, NetId>> met;
    thread_local std::vector<std::uint32_t> byComponent;
    thread_local std::vector<char> repeat;
    met.clear();
    for (NetId g : gateSide)
      for (const PinRef &pr : pinsOnNet(g)) met.push_back({pr, g});
    repeat.assign(met.size(), 0);
    if (met.size() <= 32) {
      for (std::size_t k = 1; k < met.size(); ++k)
        for (std::size_t j = 0; j < k && !repeat[k]; ++j)
          repeat[k] = met[j].first.component == met[k].first.component;
    } else {
      byComponent.resize(met.size());
      for (std::uint32_t k = 0; k < byComponent.size(); ++k) byComponent[k] = k;
      std::stable_sort(byComponent.begin(), byComponent.end(), [&](std::uint32_t a, std::uint32_t b) {
        return met[a].first.component < met[b].first.component;
      });
      for (std::size_t k = 1; k < byComponent.size(); ++k)
        if (met[byComponent[k]].first.component == met[byComponent[k - 1]].first.component) repeat[byComponent[k]] = 1;
    }
    for (std::size_t k = 0; k < met.size(); ++k) {
      if (repeat[k]) continue;
      const auto &[pr, g] = met[k];
      const Component &c = circuit_.component(pr.component);
      LoopRole role = roles_[pr.component];
      if (role == LoopRole::Driver) {
        addDriverClamp(loop, pr.component, c, g);
        continue;
      }
      auto pins = circuit_.pins(c);
      if (pins.size() != 2) continue;
      NetId other = pins[pr.pin == 0 ? 1 : 0];
      if (other == loop.refNet) {
        addDirectShunt(loop, pr.component, c, role, g);
      } else if ((role == LoopRole::Zener || role == LoopRole::Tvs) && !onGateSide(other)) {
        addSeriesClampPair(loop, pr.component, other);
      }
    }
  }

  void addDriverClamp(GateLoop &loop, ComponentId id, const Component &c, NetId gateSideNet) const {
    const Part &part = lib_.parts[c.part];
    auto it = part.pins.find("clamp");
    if (it == part.pins.end()) return;
    if (circuit_.pinNet(c, it->second) == gateSideNet) loop.shunts.push_back({ShuntKind::DriverClamp, {id}, true});
  }

  void addDirectShunt(GateLoop &loop, ComponentId id, const Component &c, LoopRole role, NetId gateSideNet) const {
    switch (role) {
    case LoopRole::Resistor: loop.shunts.push_back({ShuntKind::PullDown, {id}, true}); break;
    case LoopRole::Capacitor: loop.shunts.push_back({ShuntKind::Capacitor, {id}, true}); break;
    case LoopRole::Zener:
    case LoopRole::Tvs: {
      const Part *p = partOf(c, lib_);
      bool bidirectional = p && p->bidirectional;
      loop.shunts.push_back({bidirectional ? ShuntKind::ClampPair : ShuntKind::ZenerClamp, {id},
                             anodeNet(c) != gateSideNet});
      break;
    }
    case LoopRole::Diode:
      loop.shunts.push_back({ShuntKind::DiodeClamp, {id}, anodeNet(c) != gateSideNet});
      break;
    default: break;
    }
  }

  // Back-to-back Zeners: gate -> Z1 -> mid -> Z2 -> reference, with nothing else on mid.
  void addSeriesClampPair(GateLoop &loop, ComponentId first, NetId mid) const {
    auto onMid = pinsOnNet(mid);
    if (onMid.size() != 2) return;
    const PinRef &second = onMid[0].component == first ? onMid[1] : onMid[0];
    LoopRole r2 = roles_[second.component];
    if (r2 != LoopRole::Zener && r2 != LoopRole::Tvs) return;
    auto pins = circuit_.pins(circuit_.component(second.component));
    if (pins.size() != 2) return;
    NetId far = pins[second.pin == 0 ? 1 : 0];
    if (far != loop.refNet) return;
    loop.shunts.push_back({ShuntKind::ClampPair, {first, second.component}, true});
  }

  void classifyDriverReference(GateLoop &loop) const {
    const Component &drv = circuit_.component(loop.driver);
    const Part &part = lib_.parts[drv.part];
    loop.driverRefNet = rolePinNet(circuit_, drv, part, "ref");
    if (loop.driverRefNet == kNone) loop.driverReference = DriverReference::Unknown;
    else if (loop.kelvinNet != kNone && loop.driverRefNet == loop.kelvinNet) loop.driverReference = DriverReference::Kelvin;
    else if (loop.driverRefNet == loop.emitterNet) loop.driverReference = DriverReference::PowerTerminal;
    else loop.driverReference = DriverReference::Other;
  }

  // A leg: one switch's emitter/source net is the other's collector/drain net.
  static void pairHalfBridges(std::vector<GateLoop> &loops) {
    std::unordered_map<NetId, std::size_t> byCollector;
    for (std::size_t i = 0; i < loops.size(); ++i)
      if (loops[i].collectorNet != kNone) byCollector.emplace(loops[i].collectorNet, i);
    for (std::size_t i = 0; i < loops.size(); ++i) {
      auto it = byCollector.find(loops[i].emitterNet);
      if (loops[i].emitterNet == kNone || it == byCollector.end() || it->second == i) continue;
      GateLoop &low = loops[it->second];
      if (loops[i].halfBridgePartner != kNone || low.halfBridgePartner != kNone) continue;
      loops[i].halfBridgePartner = low.switchId;
      low.halfBridgePartner = loops[i].switchId;
    }
  }

  const Circuit &circuit_;
  const PartLibrary &lib_;
  SeriesGraph graph_;
  std::vector<std::uint32_t> pinStart_;  ///< net n's pins are pinRefs_[pinStart_[n] .. pinStart_[n+1])
  std::vector<PinRef> pinRefs_;
  std::vector<LoopRole> roles_;
  // Driver output pins by net, as a flat per-net index: the path walk asks at every net it reaches.
  std::vector<std::uint32_t> outputListOf_;            ///< per net: 1 + index into outputLists_, 0 = none
  std::vector<std::vector<DriverOutput>> outputLists_;
};

} // namespace

LoopRole loopRole(const Component &c, const PartLibrary &lib) {
  if (const Part *p = partOf(c, lib)) {
    switch (p->kind) {
    case PartKind::Igbt:
    case PartKind::Mosfet: return LoopRole::Switch;
    case PartKind::Driver: return LoopRole::Driver;
    case PartKind::Resistor: return LoopRole::Resistor;
    case PartKind::Capacitor: return LoopRole::Capacitor;
    case PartKind::Diode: return LoopRole::Diode;
    case PartKind::Zener: return LoopRole::Zener;
    case PartKind::Tvs: return LoopRole::Tvs;
    case PartKind::Ferrite: return LoopRole::Ferrite;
    }
  }
  switch (c.kind) {
  case ElementKind::Resistor: return LoopRole::Resistor;
  case ElementKind::Inductor: return LoopRole::Inductor;
  case ElementKind::Ferrite: return LoopRole::Ferrite;
  case ElementKind::Diode: return LoopRole::Diode;
  case ElementKind::Zener: return LoopRole::Zener;
  case ElementKind::Tvs: return LoopRole::Tvs;
  case ElementKind::Capacitor: return LoopRole::Capacitor;
  default: return LoopRole::Other;
  }
}

const char *shuntKindName(ShuntKind k) {
  switch (k) {
  case ShuntKind::PullDown: return "pull-down";
  case ShuntKind::ZenerClamp: return "zener-clamp";
  case ShuntKind::ClampPair: return "clamp-pair";
  case ShuntKind::DiodeClamp: return "diode-clamp";
  case ShuntKind::Capacitor: return "gate-capacitor";
  case ShuntKind::DriverClamp: return "driver-clamp";
  }
  return "pull-down";
}

NetId rolePinNet(const Circuit &circuit, const Component &c, const Part &part, std::string_view role) {
  // Emitter/source and collector/drain name the same terminal of an IGBT or a MOSFET.
  std::string_view alias = role == "emitter"     ? "source"
                           : role == "source"    ? "emitter"
                           : role == "collector" ? "drain"
                           : role == "drain"     ? "collector"
                                                 : "";
  auto it = part.pins.find(role);
  if (it == part.pins.end() && !alias.empty()) it = part.pins.find(alias);
  if (it != part.pins.end()) return circuit.pinNet(c, it->second);
  // Parts without a pin map on primitive SPICE transistors use the element's own pin order.
  bool mos = c.kind == ElementKind::Mosfet, bjt = c.kind == ElementKind::Bjt;
  if (!mos && !bjt) return kNone;
  if (role == "gate") return circuit.pinNet(c, mos ? "g" : "b");
  if (role == "emitter" || role == "source") return circuit.pinNet(c, mos ? "s" : "e");
  if (role == "collector" || role == "drain") return circuit.pinNet(c, mos ? "d" : "c");
  return kNone;
}

std::vector<GateLoop> extractGateLoops(const Circuit &circuit, const PartLibrary &lib) {
  return Extractor(circuit, lib).run();
}

} // namespace gateloop
