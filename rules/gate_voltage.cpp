// gate-voltage: drive levels and predicted peaks within the gate's absolute maximum. See docs/rules/gate-voltage.md.
#include "rules/all_rules.h"
#include "rules/rule_support.h"

#include <fmt/format.h>

namespace gateloop {

namespace {

class GateVoltageRule final : public Rule {
public:
  const RuleInfo &info() const override {
    static const RuleInfo kInfo{"gate-voltage",
                                "drive voltages and the predicted overshoot peaks stay within the gate's absolute "
                                "maximum ratings",
                                Severity::Error,
                                {}};
    return kInfo;
  }

  bool perLoop() const override { return true; }

  void check(const DesignContext &design, const RuleOptions &, FindingSink &sink) const override {
    for (std::size_t i : design.loopIndexes()) {
      const GateLoop &loop = design.loops[i];
      const LoopAnalysis &a = design.analyses[i];
      const Part &sw = switchPart(design, loop);
      if (!sw.vGateMax || !sw.vGateMin) {
        sink.report(missingDataNote(info(), design, loop, "v_ge_max/v_ge_min (or v_gs_*) of switch part " + sw.id));
        continue;
      }
      if (!a.vOn || !a.vOff) {
        sink.report(missingDataNote(info(), design, loop, "the drive voltages v_on and v_off"));
        continue;
      }
      double vMax = sw.vGateMax->si(), vMin = sw.vGateMin->si();
      if (a.vOn->si() > vMax)
        report(design, loop, {loop.driver}, fmt::format("on-state drive of {} exceeds the gate maximum {}",
                                                        eng(a.vOn->si(), "V"), eng(vMax, "V")),
               a.vOn->si(), vMax, "v_on", "lower the driver's positive supply", sink);
      if (a.vOff->si() < vMin)
        report(design, loop, {loop.driver}, fmt::format("off-state drive of {} is below the gate minimum {}",
                                                        eng(a.vOff->si(), "V"), eng(vMin, "V")),
               a.vOff->si(), vMin, "v_off", "raise the driver's negative supply toward 0 V", sink);
      if (a.on.vPeak && a.on.vPeak->si() > vMax && a.vOn->si() <= vMax)
        report(design, loop, a.on.resistors,
               fmt::format("turn-on ringing peaks at {} ({:.0f} % overshoot), over the gate maximum {}",
                           eng(a.on.vPeak->si(), "V"), a.on.overshoot.value_or(0) * 100, eng(vMax, "V")),
               a.on.vPeak->si(), vMax, "v_peak_on",
               "damp the turn-on loop (raise R_on or shorten the loop; see loop-damping) or add a gate clamp", sink);
      if (a.off.vPeak && a.off.vPeak->si() < vMin && a.vOff->si() >= vMin)
        report(design, loop, a.off.resistors,
               fmt::format("turn-off ringing undershoots to {} ({:.0f} % overshoot), below the gate minimum {}",
                           eng(a.off.vPeak->si(), "V"), a.off.overshoot.value_or(0) * 100, eng(vMin, "V")),
               a.off.vPeak->si(), vMin, "v_peak_off",
               "damp the turn-off loop (raise R_off or shorten the loop; see loop-damping) or add a gate clamp", sink);
    }
  }

private:
  void report(const DesignContext &design, const GateLoop &loop, std::vector<ComponentId> refs, std::string what,
              double value, double limit, const char *name, const char *fix, FindingSink &sink) const {
    if (refs.empty() || refs.front() == kNone) refs = {loop.switchId};
    Finding f = makeLoopFinding(info(), Severity::Error, design, loop, refs, "gate of " + loop.id + ": " + what);
    f.values = {{name, value, "V"}, {"limit", limit, "V"}};
    f.fix = fix;
    sink.report(std::move(f));
  }
};

} // namespace

std::unique_ptr<Rule> makeGateVoltageRule() { return std::make_unique<GateVoltageRule>(); }

} // namespace gateloop
