// gate-pulldown: a resistor from gate to reference holds the switch off. See docs/rules/gate-pulldown.md.
#include "rules/all_rules.h"
#include "rules/rule_support.h"

#include <fmt/format.h>

namespace gateloop {

namespace {

class GatePulldownRule final : public Rule {
public:
  const RuleInfo &info() const override {
    static const RuleInfo kInfo{
        "gate-pulldown",
        "a pull-down resistor from gate to reference holds the switch off while the driver is unpowered",
        Severity::Warning,
        {{"min", Dimension::Resistance, "1 kohm", "lowest accepted pull-down"},
         {"max", Dimension::Resistance, "100 kohm", "highest accepted pull-down"}}};
    return kInfo;
  }

  bool perLoop() const override { return true; }

  void check(const DesignContext &design, const RuleOptions &options, FindingSink &sink) const override {
    double rMin = options.quantity("min", Dimension::Resistance, 1e3);
    double rMax = options.quantity("max", Dimension::Resistance, 100e3);
    for (std::size_t i : design.loopIndexes()) {
      const GateLoop &loop = design.loops[i];
      std::vector<ComponentId> pulldowns;
      for (const Shunt &s : loop.shunts)
        if (s.kind == ShuntKind::PullDown) pulldowns.push_back(s.elements.front());
      if (pulldowns.empty()) {
        Finding f = makeLoopFinding(info(), Severity::Warning, design, loop, {loop.switchId},
                                    fmt::format("gate of {} has no pull-down resistor to its reference", loop.id));
        f.fix = "add a 10 kohm resistor from gate to the Kelvin emitter/source, close to the switch";
        sink.report(std::move(f));
        continue;
      }
      for (ComponentId id : pulldowns) {
        const Component &r = design.component(id);
        if (!r.hasValue()) {
          sink.report(missingDataNote(info(), design, loop, "the value of pull-down " + std::string(r.name), {id}));
          continue;
        }
        if (r.value >= rMin && r.value <= rMax) continue;
        Finding f = makeLoopFinding(info(), Severity::Warning, design, loop, {id},
                                    fmt::format("pull-down {} of {} is {}, outside {} to {}", r.name, loop.id,
                                                eng(r.value, "ohm"), eng(rMin, "ohm"), eng(rMax, "ohm")));
        f.values = {{"r", r.value, "ohm"}, {"min", rMin, "ohm"}, {"max", rMax, "ohm"}};
        f.fix = r.value < rMin ? "raise it to about 10 kohm: a low pull-down loads the driver and slows turn-on"
                               : "lower it to about 10 kohm so it holds the gate against leakage and dv/dt";
        sink.report(std::move(f));
      }
    }
  }
};

} // namespace

std::unique_ptr<Rule> makeGatePulldownRule() { return std::make_unique<GatePulldownRule>(); }

} // namespace gateloop
