// kelvin-return: the driver reference returns to the Kelvin pin. See docs/rules/kelvin-return.md.
#include "rules/all_rules.h"
#include "rules/rule_support.h"

#include <fmt/format.h>

namespace gateloop {

namespace {

class KelvinReturnRule final : public Rule {
public:
  const RuleInfo &info() const override {
    static const RuleInfo kInfo{"kelvin-return",
                                "the driver reference is tied to the switch's Kelvin emitter/source where it has one",
                                Severity::Warning,
                                {}};
    return kInfo;
  }

  bool perLoop() const override { return true; }

  void check(const DesignContext &design, const RuleOptions &, FindingSink &sink) const override {
    for (std::size_t i : design.loopIndexes()) {
      const GateLoop &loop = design.loops[i];
      if (loop.kelvinNet == kNone || loop.driver == kNone) continue; // no Kelvin pin: nothing to tie
      const Circuit &c = design.circuit;
      if (!loop.kelvinConnected) {
        Finding f = makeLoopFinding(info(), Severity::Warning, design, loop, {loop.switchId},
                                    fmt::format("Kelvin pin of {} is not connected; the gate loop returns through the "
                                                "power emitter/source",
                                                loop.id));
        f.fix = "route the driver reference to the Kelvin pin so the load current's di/dt stays out of the gate loop";
        sink.report(std::move(f));
        continue;
      }
      switch (loop.driverReference) {
      case DriverReference::Kelvin: break;
      case DriverReference::Unknown:
        sink.report(missingDataNote(info(), design, loop,
                                    "the driver part's 'ref' pin, to see where the driver reference goes",
                                    {loop.driver}));
        break;
      case DriverReference::PowerTerminal:
      case DriverReference::Other: {
        Finding f = makeLoopFinding(
            info(), Severity::Warning, design, loop, {loop.driver},
            fmt::format("driver {} references net {}, not the Kelvin net {} of {}", c.component(loop.driver).name,
                        c.netAt(loop.driverRefNet).name, c.netAt(loop.kelvinNet).name, loop.id));
        f.fix = fmt::format("connect the driver reference of {} to net {}", c.component(loop.driver).name,
                            c.netAt(loop.kelvinNet).name);
        sink.report(std::move(f));
        break;
      }
      }
    }
  }
};

} // namespace

std::unique_ptr<Rule> makeKelvinReturnRule() { return std::make_unique<KelvinReturnRule>(); }

} // namespace gateloop
