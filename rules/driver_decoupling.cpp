// driver-decoupling: enough bypass capacitance on the driver supply. See docs/rules/driver-decoupling.md.
#include "checker/physics/gate_drive.h"
#include "rules/all_rules.h"
#include "rules/rule_support.h"

#include <fmt/format.h>

#include <algorithm>
#include <map>
#include <set>

namespace gateloop {

namespace {

class DriverDecouplingRule final : public Rule {
public:
  const RuleInfo &info() const override {
    static const RuleInfo kInfo{
        "driver-decoupling",
        "driver supply bypass capacitance is at least k x gate charge / allowed ripple",
        Severity::Warning,
        {{"k", Dimension::Dimensionless, "5", "margin factor on the gate charge"},
         {"ripple", Dimension::Voltage, "0.5 V", "allowed supply droop per gate charge"}}};
    return kInfo;
  }

  void check(const DesignContext &design, const RuleOptions &options, FindingSink &sink) const override {
    double k = options.number("k", 5.0);
    double ripple = options.quantity("ripple", Dimension::Voltage, 0.5);
    // One check per driver, sized for the largest gate charge it drives: entries sorted by driver
    // and, within a driver, largest charge first (earliest loop on a tie).
    std::vector<DriverLoop> byDriver;
    for (std::size_t i = 0; i < design.loops.size(); ++i)
      if (design.loops[i].driver != kNone) byDriver.push_back({design.loops[i].driver, i, charge(design.analyses[i])});
    if (byDriver.empty()) return;
    std::sort(byDriver.begin(), byDriver.end(), [](const DriverLoop &a, const DriverLoop &b) {
      if (a.driver != b.driver) return a.driver < b.driver;
      return a.charge != b.charge ? a.charge > b.charge : a.loop < b.loop;
    });
    std::vector<DriverLoop> worstLoop;
    const Circuit &c = design.circuit;
    for (const DriverLoop &entry : byDriver) {
      if (!worstLoop.empty() && worstLoop.back().driver == entry.driver) continue;
      worstLoop.push_back(entry);
      const Part &part = *design.partOf(entry.driver);
      worstLoop.back().supply = rolePinNet(c, c.component(entry.driver), part, "supply");
      worstLoop.back().ref = rolePinNet(c, c.component(entry.driver), part, "ref");
    }
    // Capacitors across a driver's supply and reference, found in one pass over the circuit: the
    // net pairs wanted are sorted first, and only capacitors bridging one of them are kept.
    std::vector<std::pair<NetId, NetId>> wanted;
    for (const DriverLoop &d : worstLoop)
      if (d.supply != kNone && d.ref != kNone) wanted.push_back(std::minmax(d.supply, d.ref));
    std::sort(wanted.begin(), wanted.end());
    CapacitorsByNets caps;
    if (!wanted.empty()) {
      for (ComponentId id = 0; id < c.components().size(); ++id) {
        const Component &comp = c.component(id);
        if (comp.hidden || loopRole(comp, design.parts) != LoopRole::Capacitor) continue;
        auto pins = c.pins(comp);
        if (pins.size() != 2) continue;
        std::pair<NetId, NetId> nets = std::minmax(pins[0], pins[1]);
        if (std::binary_search(wanted.begin(), wanted.end(), nets)) caps[nets].push_back(id);
      }
    }
    std::vector<const Part *> partsWithoutPins;
    for (const DriverLoop &d : worstLoop) checkDriver(design, caps, d, k, ripple, partsWithoutPins, sink);
  }

private:
  using CapacitorsByNets = std::map<std::pair<NetId, NetId>, std::vector<ComponentId>>;

  struct DriverLoop {
    ComponentId driver;
    std::size_t loop;
    double charge;
    NetId supply = kNone, ref = kNone;
  };

  static double charge(const LoopAnalysis &a) {
    if (!a.cGate || !a.vOn || !a.vOff) return 0.0;
    return a.cGate->si() * (*a.vOn - *a.vOff).si();
  }

  void checkDriver(const DesignContext &design, const CapacitorsByNets &bypass, const DriverLoop &d, double k,
                   double ripple, std::vector<const Part *> &partsWithoutPins, FindingSink &sink) const {
    const ComponentId driver = d.driver;
    const GateLoop &loop = design.loops[d.loop];
    const Circuit &c = design.circuit;
    const Component &drv = c.component(driver);
    const Part &part = *design.partOf(driver);
    const NetId supply = d.supply, ref = d.ref;
    const double q = d.charge;
    if (supply == kNone || ref == kNone) {
      // Missing pins are a property of the part: say it once per part, not once per driver.
      if (std::find(partsWithoutPins.begin(), partsWithoutPins.end(), &part) == partsWithoutPins.end()) {
        partsWithoutPins.push_back(&part);
        sink.report(designNote(info(), design,
                               "not checked: driver part " + part.id + " names no 'supply' and 'ref' pins (or they are "
                               "not connected), so its bypass capacitors cannot be found",
                               "add the supply and reference pins to the driver part's 'pins'"));
      }
      return;
    }
    if (q <= 0.0) {
      sink.report(missingDataNote(info(), design, loop, "the gate charge of the switch and the drive voltages",
                                  {driver}));
      return;
    }
    std::vector<ComponentId> caps;
    double total = 0.0;
    auto found = bypass.find(std::minmax(supply, ref));
    for (ComponentId id : found == bypass.end() ? std::vector<ComponentId>{} : found->second) {
      const Component &comp = c.component(id);
      const Part *p = design.partOf(id);
      double value = p && p->capacitance ? p->capacitance->si() : comp.hasValue() ? comp.value : 0.0;
      total += value;
      caps.push_back(id);
    }
    Farad needed = minDecouplingCapacitance(Coulomb(q), Volt(ripple), k);
    if (total >= needed.si()) return;
    std::vector<ComponentId> refs{driver};
    refs.insert(refs.end(), caps.begin(), caps.end());
    Finding f = makeLoopFinding(info(), Severity::Warning, design, loop, refs,
                                fmt::format("driver {} has {} of bypass capacitance between {} and {}, below {} "
                                            "({} x {} gate charge / {} ripple)",
                                            drv.name, eng(total, "F"), c.netAt(supply).name, c.netAt(ref).name,
                                            eng(needed.si(), "F"), k, eng(q, "C"), eng(ripple, "V")));
    f.values = {{"c_bypass", total, "F"}, {"c_needed", needed.si(), "F"}, {"q_gate", q, "C"}};
    f.fix = fmt::format("add at least {} of low-ESR ceramic capacitance between the driver's {} and {} pins, next "
                        "to the driver",
                        eng(needed.si() - total, "F"), part.pins.at("supply"), part.pins.at("ref"));
    sink.report(std::move(f));
  }
};

} // namespace

std::unique_ptr<Rule> makeDriverDecouplingRule() { return std::make_unique<DriverDecouplingRule>(); }

} // namespace gateloop
