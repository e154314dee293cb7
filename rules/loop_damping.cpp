// loop-damping: the series R-L-C gate loop must be damped enough not to ring. See docs/rules/loop-damping.md.
#include "checker/physics/rlc_step.h"
#include "rules/all_rules.h"
#include "rules/rule_support.h"

#include <fmt/format.h>

namespace gateloop {

namespace {

class LoopDampingRule final : public Rule {
public:
  const RuleInfo &info() const override {
    static const RuleInfo kInfo{
        "loop-damping",
        "damping ratio of the turn-on and turn-off gate loop is at or above the thresholds",
        Severity::Error,
        {{"zeta_warn", Dimension::Dimensionless, "0.7", "warning below this damping ratio"},
         {"zeta_error", Dimension::Dimensionless, "0.4", "error below this damping ratio"}}};
    return kInfo;
  }

  bool perLoop() const override { return true; }

  void check(const DesignContext &design, const RuleOptions &options, FindingSink &sink) const override {
    double zetaWarn = options.number("zeta_warn", 0.7);
    double zetaError = options.number("zeta_error", 0.4);
    if (!design.layout && !design.loops.empty() && design.wholeDesignBlock())
      sink.report(designNote(info(), design,
                             "no layout sidecar: every loop's damping is computed with part-internal inductance only, "
                             "so it is optimistic",
                             "give the design a layout sidecar with the lengths of its gate-loop nets"));
    for (std::size_t i : design.loopIndexes()) {
      const GateLoop &loop = design.loops[i];
      const LoopAnalysis &a = design.analyses[i];
      for (bool on : {true, false}) {
        const EdgeAnalysis &e = on ? a.on : a.off;
        if (!e.hasPath) continue; // onoff-paths reports a missing path
        if (!e.zeta || !e.lLoop || !e.rTotal || !a.cGate) {
          sink.report(missingDataNote(info(), design, loop,
                                      fmt::format("turn-{} damping needs the gate resistance, gate charge and drive "
                                                  "voltages ({})",
                                                  edgeName(on), a.missing.empty() ? "see loops" : a.missing.front()),
                                      e.resistors));
          continue;
        }
        if (design.layout && a.inductanceMethod == "none" && on)
          sink.report(missingDataNote(info(), design, loop,
                                      "loop inductance from the layout (damping computed with part-internal "
                                      "inductance only, so it is optimistic)"));
        if (*e.zeta >= zetaWarn) continue;
        Severity sev = *e.zeta < zetaError ? Severity::Error : Severity::Warning;
        Finding f = makeLoopFinding(
            info(), sev, design, loop, e.resistors,
            fmt::format("turn-{} gate loop of {} is underdamped: zeta {:.2f} below {} ({} overshoot, rings at {})",
                        edgeName(on), loop.id, *e.zeta, sev == Severity::Error ? zetaError : zetaWarn,
                        fmt::format("{:.0f} %", e.overshoot.value_or(0) * 100),
                        e.fRing ? eng(e.fRing->si(), "Hz") : std::string("n/a")));
        f.values = {{"zeta", *e.zeta, ""},
                    {sev == Severity::Error ? "zeta_error" : "zeta_warn", sev == Severity::Error ? zetaError : zetaWarn, ""},
                    {"r_total", e.rTotal->si(), "ohm"},
                    {"l_loop", e.lLoop->si(), "H"},
                    {"c_gate", a.cGate->si(), "F"}};
        // R needed for zeta_warn: R = 2 zeta sqrt(L/C); the external part is what the designer changes.
        Ohm rNeeded = resistanceForDamping(*e.lLoop, *a.cGate, zetaWarn);
        double rExternalNeeded = e.rExternal->si() + (rNeeded - *e.rTotal).si();
        Henry lMax = maxInductanceForDamping(*e.rTotal, *a.cGate, zetaWarn);
        f.fix = fmt::format("raise the turn-{} resistance to {} for a damping ratio of {}, or cut the loop "
                            "inductance from {} to {}",
                            edgeName(on), preferredAtOrAbove(rExternalNeeded), zetaWarn, eng(e.lLoop->si(), "H"),
                            eng(lMax.si(), "H"));
        sink.report(std::move(f));
      }
    }
  }
};

} // namespace

std::unique_ptr<Rule> makeLoopDampingRule() { return std::make_unique<LoopDampingRule>(); }

} // namespace gateloop
