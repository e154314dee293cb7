// onoff-paths: separate, correctly steered turn-on and turn-off paths. See docs/rules/onoff-paths.md.
#include "rules/all_rules.h"
#include "rules/rule_support.h"

#include <fmt/format.h>

namespace gateloop {

namespace {

class OnOffPathsRule final : public Rule {
public:
  const RuleInfo &info() const override {
    static const RuleInfo kInfo{"onoff-paths",
                                "the gate has a turn-on and a turn-off path, separately tunable, with every steering "
                                "diode oriented to conduct",
                                Severity::Warning,
                                {}};
    return kInfo;
  }

  bool perLoop() const override { return true; }

  void check(const DesignContext &design, const RuleOptions &, FindingSink &sink) const override {
    for (std::size_t i : design.loopIndexes()) {
      const GateLoop &loop = design.loops[i];
      if (loop.paths.empty()) continue; // connectivity reports a gate without a driver
      bool anyOn = false, anyOff = false, anySeparate = false;
      for (const GatePath &p : loop.paths) {
        anyOn |= p.conductsOn;
        anyOff |= p.conductsOff;
        anySeparate |= p.conductsOn != p.conductsOff;
        if (!p.conductsOn && !p.conductsOff) reportDeadPath(design, loop, p, sink);
      }
      for (bool on : {true, false}) {
        if (on ? anyOn : anyOff) continue;
        std::vector<ComponentId> refs;
        for (const GatePath &p : loop.paths) refs.insert(refs.end(), p.elements.begin(), p.elements.end());
        Finding f = makeLoopFinding(info(), Severity::Error, design, loop, refs,
                                    fmt::format("gate of {} has no turn-{} path: no driver output drives it {} through "
                                                "a conducting path",
                                                loop.id, edgeName(on), on ? "high" : "low"));
        f.fix = on ? "connect the gate to the driver's source output, or turn the steering diode so it conducts "
                     "from driver to gate"
                   : "connect the gate to the driver's sink output, or turn the steering diode so it conducts from "
                     "gate to driver";
        sink.report(std::move(f));
      }
      if (anyOn && anyOff && !anySeparate) {
        std::vector<ComponentId> refs;
        for (const GatePath &p : loop.paths) refs.insert(refs.end(), p.elements.begin(), p.elements.end());
        Finding f = makeLoopFinding(info(), Severity::Warning, design, loop, refs,
                                    fmt::format("turn-on and turn-off current of {} share one path, so turn-on and "
                                                "turn-off speed cannot be tuned separately",
                                                loop.id));
        f.fix = "use the driver's split source/sink outputs with separate resistors, or add a diode-steered "
                "turn-off resistor in parallel";
        sink.report(std::move(f));
      }
    }
  }

private:
  void reportDeadPath(const DesignContext &design, const GateLoop &loop, const GatePath &p, FindingSink &sink) const {
    std::vector<ComponentId> diodes;
    for (ComponentId id : p.elements)
      if (loopRole(design.component(id), design.parts) == LoopRole::Diode) diodes.push_back(id);
    Finding f = makeLoopFinding(info(), Severity::Warning, design, loop, diodes.empty() ? p.elements : diodes,
                                fmt::format("path from {} pin {} to the gate of {} conducts no current: {} blocks "
                                            "the direction the pin drives",
                                            design.component(p.driver).name, p.driverPin, loop.id,
                                            diodes.empty() ? std::string("a diode") : joinNames(design, diodes)));
    f.fix = "turn the steering diode round, or connect the path to the other driver output";
    sink.report(std::move(f));
  }
};

} // namespace

std::unique_ptr<Rule> makeOnOffPathsRule() { return std::make_unique<OnOffPathsRule>(); }

} // namespace gateloop
