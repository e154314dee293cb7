// lead-length: the gate loop must be short enough. See docs/rules/lead-length.md.
#include "checker/physics/rlc_step.h"
#include "rules/all_rules.h"
#include "rules/rule_support.h"

#include <fmt/format.h>

#include <cmath>

namespace gateloop {

namespace {

class LeadLengthRule final : public Rule {
public:
  const RuleInfo &info() const override {
    static const RuleInfo kInfo{
        "lead-length",
        "gate-loop length is within the configured maximum and the length that keeps damping at zeta_warn",
        Severity::Warning,
        {{"max", Dimension::Length, "none", "fixed maximum loop length"},
         {"zeta_warn", Dimension::Dimensionless, "0.7", "damping ratio that sets the damping-based maximum"}}};
    return kInfo;
  }

  bool perLoop() const override { return true; }

  void check(const DesignContext &design, const RuleOptions &options, FindingSink &sink) const override {
    double fixedMax = options.quantity("max", Dimension::Length, NAN);
    double zetaWarn = options.number("zeta_warn", 0.7);
    if (!design.layout) {
      if (!design.loops.empty() && design.wholeDesignBlock())
        sink.report(designNote(info(), design, "not checked: no layout sidecar gives the gate-loop lengths",
                               "give the design a layout sidecar with the lengths of its gate-loop nets"));
      return;
    }
    for (std::size_t i : design.loopIndexes()) {
      const GateLoop &loop = design.loops[i];
      const LoopAnalysis &a = design.analyses[i];
      if (loop.paths.empty()) continue;
      if (!a.length || a.length->si() <= 0.0) {
        sink.report(missingDataNote(info(), design, loop, "the gate-loop length (layout sidecar lengths of its nets)"));
        continue;
      }
      double length = a.length->si();
      // The damping-based maximum: the longest loop whose inductance still gives zeta_warn on the
      // weaker edge, with the layout's own inductance per metre (physics.md 2, derived limits).
      double dampingMax = NAN;
      for (const EdgeAnalysis *e : {&a.on, &a.off}) {
        if (!e->rTotal || !a.cGate || !e->lLoop) continue;
        Henry lMax = maxInductanceForDamping(*e->rTotal, *a.cGate, zetaWarn);
        Henry lFixed = *e->lLoop - a.lLayout;
        HenryPerMeter perLength(a.lLayout.si() / length);
        if (perLength.si() <= 0.0) continue;
        double m = std::max(0.0, maxTraceLength(lMax, lFixed, perLength).si());
        dampingMax = std::isnan(dampingMax) ? m : std::min(dampingMax, m);
      }
      double limit = fixedMax;
      std::string basis = "the configured maximum";
      if (!std::isnan(dampingMax) && (std::isnan(limit) || dampingMax < limit)) {
        limit = dampingMax;
        basis = fmt::format("the length at which damping falls to {}", zetaWarn);
      }
      if (std::isnan(limit)) {
        sink.report(missingDataNote(info(), design, loop,
                                    "a maximum: set rules.lead-length.max or give the data for the damping-based limit"));
        continue;
      }
      if (length <= limit) continue;
      Finding f = makeLoopFinding(info(), Severity::Warning, design, loop, {loop.switchId},
                                  fmt::format("gate loop of {} is {} long, over its {} limit ({})", loop.id,
                                              eng(length, "m"), eng(limit, "m"), basis));
      f.values = {{"length", length, "m"}, {"max", limit, "m"}};
      if (!std::isnan(dampingMax)) f.values.push_back({"max_for_damping", dampingMax, "m"});
      f.fix = fmt::format("shorten the gate loop below {} (route the return under the gate trace, or move the "
                          "driver closer to the switch)",
                          eng(limit, "m"));
      sink.report(std::move(f));
    }
  }
};

} // namespace

std::unique_ptr<Rule> makeLeadLengthRule() { return std::make_unique<LeadLengthRule>(); }

} // namespace gateloop
