// rg-pulse: peak power per transition within the resistor's pulse-load curve. See docs/rules/rg-pulse.md.
#include "rules/all_rules.h"
#include "rules/rule_support.h"

#include <fmt/format.h>

#include <set>

namespace gateloop {

namespace {

class RgPulseRule final : public Rule {
public:
  const RuleInfo &info() const override {
    static const RuleInfo kInfo{
        "rg-pulse",
        "peak power of each gate-resistor pulse stays within the resistor's pulse-load curve at that pulse width, "
        "times a margin",
        Severity::Error,
        {{"margin", Dimension::Dimensionless, "0.5", "fraction of the permissible pulse power that may be used"}}};
    return kInfo;
  }

  bool perLoop() const override { return true; }

  void check(const DesignContext &design, const RuleOptions &options, FindingSink &sink) const override {
    double margin = options.number("margin", 0.5);
    for (std::size_t i : design.loopIndexes()) {
      const GateLoop &loop = design.loops[i];
      const LoopAnalysis &a = design.analyses[i];
      for (bool on : {true, false}) {
        const EdgeAnalysis &e = on ? a.on : a.off;
        if (!e.hasPath) continue;
        if (e.loads.empty() && !e.resistors.empty()) {
          sink.report(missingDataNote(info(), design, loop,
                                      fmt::format("turn-{} pulse load needs gate charge, drive voltages and resistor "
                                                  "values",
                                                  edgeName(on)),
                                      e.resistors));
          continue;
        }
        for (const ResistorLoad &l : e.loads) checkLoad(design, loop, l, on, margin, sink);
      }
    }
  }

private:
  void checkLoad(const DesignContext &design, const GateLoop &loop, const ResistorLoad &l, bool on, double margin,
                 FindingSink &sink) const {
    const std::string name(design.component(l.id).name);
    if (!l.pulseLimit) {
      sink.report(missingDataNote(info(), design, loop,
                                  "a pulse-load curve ('pulse') and p_rated in the resistor part of " + name, {l.id}));
      return;
    }
    double allowed = l.pulseLimit->si() * margin;
    if (l.peakPower.si() <= allowed) return;
    Finding f = makeLoopFinding(info(), Severity::Error, design, loop, {l.id},
                                fmt::format("turn-{} pulse in {} peaks at {} for {}, over {} ({} x the permissible "
                                            "repetitive pulse power of {}{})",
                                            edgeName(on), name, eng(l.peakPower.si(), "W"), eng(l.pulseWidth.si(), "s"),
                                            eng(allowed, "W"), margin, eng(l.pulseLimit->si(), "W"),
                                            l.pulseOutsideCurve ? ", pulse width outside the curve: end point used" : ""));
    f.values = {{"p_peak", l.peakPower.si(), "W"},
                {"t_pulse", l.pulseWidth.si(), "s"},
                {"p_pulse_allowed", allowed, "W"},
                {"e_pulse", l.energyPerPulse.si(), "J"}};
    f.fix = fmt::format("use a pulse-proof resistor rated for at least {} at {} pulses, or spread the pulse over "
                        "parallel resistors",
                        eng(l.peakPower.si() / margin, "W"), eng(l.pulseWidth.si(), "s"));
    sink.report(std::move(f));
  }
};

} // namespace

std::unique_ptr<Rule> makeRgPulseRule() { return std::make_unique<RgPulseRule>(); }

} // namespace gateloop
