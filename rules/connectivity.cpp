// connectivity: every gate driven, every driver output used, gate resistors present, parts known.
// See docs/rules/connectivity.md.
#include "rules/all_rules.h"
#include "rules/rule_support.h"

#include <fmt/format.h>

#include <algorithm>

namespace gateloop {

namespace {

class ConnectivityRule final : public Rule {
public:
  const RuleInfo &info() const override {
    static const RuleInfo kInfo{"connectivity",
                                "every switch gate reaches a driver through a gate resistor, every driver output "
                                "reaches a switch, and switches and drivers have part data",
                                Severity::Error,
                                {}};
    return kInfo;
  }

  bool perLoop() const override { return true; }

  void check(const DesignContext &design, const RuleOptions &, FindingSink &sink) const override {
    for (std::size_t i : design.loopIndexes()) checkLoop(design, design.loops[i], sink);
    if (!design.wholeDesignBlock()) return;
    // Driver outputs and bare transistors are about the design as a whole: every loop's paths.
    UsedOutputs usedOutputs;
    for (const GateLoop &loop : design.loops)
      for (const GatePath &p : loop.paths)
        if (usedOutputs.empty() || usedOutputs.back().first != p.driver ||
            !equalsIgnoreCase(usedOutputs.back().second, p.driverPin))
          usedOutputs.emplace_back(p.driver, p.driverPin);
    std::sort(usedOutputs.begin(), usedOutputs.end(),
              [](const auto &a, const auto &b) { return a.first < b.first; });
    checkDriverOutputs(design, usedOutputs, sink);
    checkUnassignedTransistors(design, sink);
  }

private:
  /// (driver, output pin name as the path names it), sorted by driver.
  using UsedOutputs = std::vector<std::pair<ComponentId, std::string_view>>;

  void checkLoop(const DesignContext &design, const GateLoop &loop, FindingSink &sink) const {
    if (loop.gateNet == kNone) {
      Finding f = makeLoopFinding(info(), Severity::Error, design, loop, {loop.switchId},
                                  fmt::format("switch {} has no gate pin: the part's pin map names a pin the element "
                                              "does not have",
                                              loop.id));
      f.fix = "check the 'pins' of the switch part against the subcircuit ports or netlist pin names";
      sink.report(std::move(f));
      return;
    }
    if (loop.paths.empty()) {
      Finding f = makeLoopFinding(info(), Severity::Error, design, loop, {loop.switchId},
                                  fmt::format("gate of {} (net {}) reaches no driver output through series R, L, "
                                              "ferrite or diode",
                                              loop.id, design.circuit.netAt(loop.gateNet).name));
      f.fix = "connect the gate through a gate resistor to a driver output, and make sure the driver has a "
              "driver part with its output pins";
      sink.report(std::move(f));
      return;
    }
    for (const GatePath &p : loop.paths) {
      bool hasResistor = false;
      for (ComponentId id : p.elements)
        hasResistor |= loopRole(design.component(id), design.parts) == LoopRole::Resistor;
      if (hasResistor) continue;
      Finding f = makeLoopFinding(info(), Severity::Error, design, loop, {p.driver},
                                  fmt::format("driver {} pin {} reaches the gate of {} without a gate resistor",
                                              design.component(p.driver).name, p.driverPin, loop.id));
      f.fix = "insert a gate resistor in the path (start from the switch maker's recommended value)";
      sink.report(std::move(f));
    }
  }

  void checkDriverOutputs(const DesignContext &design, const UsedOutputs &used, FindingSink &sink) const {
    const Circuit &c = design.circuit;
    // Outputs that no gate path starts from; usually none, so the pins per net are only counted
    // when there is one to judge.
    struct Unused {
      ComponentId driver;
      const std::string *pin;
      NetId net;
    };
    std::vector<Unused> unused;
    // Drivers come in id order and `used` is sorted by driver: one cursor walks both.
    auto cursor = used.begin();
    for (ComponentId id = 0; id < c.components().size(); ++id) {
      const Component &comp = c.component(id);
      if (comp.hidden || loopRole(comp, design.parts) != LoopRole::Driver) continue;
      while (cursor != used.end() && cursor->first < id) ++cursor;
      auto usesEnd = cursor;
      while (usesEnd != used.end() && usesEnd->first == id) ++usesEnd;
      const Part &part = *design.partOf(id);
      for (const char *role : {"out_source", "out_sink", "out"}) {
        auto it = part.pins.find(role);
        if (it == part.pins.end()) continue;
        if (std::any_of(cursor, usesEnd, [&](const auto &u) { return equalsIgnoreCase(u.second, it->second); }))
          continue;
        NetId net = c.pinNet(comp, it->second);
        if (net != kNone) unused.push_back({id, &it->second, net});
      }
    }
    if (unused.empty()) return;
    std::vector<std::uint32_t> pinsOnNet(c.nets().size(), 0);
    for (const Component &comp : c.components()) {
      if (comp.hidden || (comp.kind == ElementKind::Subcircuit && comp.part == kNone)) continue;
      for (NetId n : c.pins(comp)) ++pinsOnNet[n];
    }
    for (const Unused &u : unused) {
      if (pinsOnNet[u.net] < 2) continue; // a spare, unconnected output
      const Component &comp = c.component(u.driver);
      Finding f;
      f.rule = info().id;
      f.severity = Severity::Error;
      f.design = design.name;
      f.refs = {std::string(comp.name)};
      f.where = comp.where;
      f.message = fmt::format("output {} of driver {} (net {}) reaches no switch gate", *u.pin, comp.name,
                              c.netAt(u.net).name);
      f.fix = "connect the output through its gate resistor to the switch gate, or check the switch's part "
              "assignment";
      sink.report(std::move(f));
    }
  }

  void checkUnassignedTransistors(const DesignContext &design, FindingSink &sink) const {
    std::vector<const Component *> bare;
    for (const Component &comp : design.circuit.components()) {
      if (comp.hidden || comp.part != kNone) continue;
      if (comp.kind == ElementKind::Mosfet || comp.kind == ElementKind::Bjt) bare.push_back(&comp);
    }
    if (bare.empty()) return;
    std::string names;
    for (std::size_t i = 0; i < bare.size() && i < 5; ++i) names += std::string(i ? ", " : "").append(bare[i]->name);
    if (bare.size() > 5) names += fmt::format(" and {} more", bare.size() - 5);
    Finding f;
    f.rule = info().id;
    f.severity = Severity::Note;
    f.design = design.name;
    f.refs = {std::string(bare.front()->name)};
    f.where = bare.front()->where;
    f.message = fmt::format("{} transistor{} without part data ({}); their gate loops are not checked", bare.size(),
                            bare.size() == 1 ? "" : "s", names);
    f.fix = "assign switch parts (project 'assign' or a part 'match' on the model name) to check them";
    sink.report(std::move(f));
  }
};

} // namespace

std::unique_ptr<Rule> makeConnectivityRule() { return std::make_unique<ConnectivityRule>(); }

} // namespace gateloop
