// rg-power: average power in each gate resistor within its derated rating. See docs/rules/rg-power.md.
#include "rules/all_rules.h"
#include "rules/rule_support.h"

#include <fmt/format.h>

#include <set>

namespace gateloop {

namespace {

class RgPowerRule final : public Rule {
public:
  const RuleInfo &info() const override {
    static const RuleInfo kInfo{
        "rg-power",
        "average power in each gate resistor stays within its rating derated to the ambient temperature, times a "
        "margin",
        Severity::Error,
        {{"margin", Dimension::Dimensionless, "0.5", "fraction of the derated rating that may be used"}}};
    return kInfo;
  }

  bool perLoop() const override { return true; }

  void check(const DesignContext &design, const RuleOptions &options, FindingSink &sink) const override {
    double margin = options.number("margin", 0.5);
    for (std::size_t i : design.loopIndexes()) {
      const GateLoop &loop = design.loops[i];
      const LoopAnalysis &a = design.analyses[i];
      std::set<ComponentId> seen;
      for (bool on : {true, false}) {
        const EdgeAnalysis &e = on ? a.on : a.off;
        if (!e.hasPath) continue;
        if (e.loads.empty() && !e.resistors.empty()) {
          sink.report(missingDataNote(info(), design, loop,
                                      fmt::format("turn-{} resistor power needs gate charge, drive voltages, resistor "
                                                  "values and operating.f_sw",
                                                  edgeName(on)),
                                      e.resistors));
          continue;
        }
        for (const ResistorLoad &l : e.loads) {
          if (!seen.insert(l.id).second) continue; // a shared resistor's load already covers both edges
          checkLoad(design, loop, l, margin, sink);
        }
      }
    }
  }

private:
  void checkLoad(const DesignContext &design, const GateLoop &loop, const ResistorLoad &l, double margin,
                 FindingSink &sink) const {
    const std::string name(design.component(l.id).name);
    if (l.pulseRate.si() <= 0.0) {
      sink.report(missingDataNote(info(), design, loop, "operating.f_sw (switching frequency)", {l.id}));
      return;
    }
    if (!l.deratedPower) {
      sink.report(missingDataNote(info(), design, loop, "a resistor part with p_rated for " + name, {l.id}));
      return;
    }
    double allowed = l.deratedPower->si() * margin;
    if (l.averagePower.si() <= allowed) return;
    const Part *p = design.partOf(l.id);
    Finding f = makeLoopFinding(info(), Severity::Error, design, loop, {l.id},
                                fmt::format("{} dissipates {} on average, over {} ({} x the rating of {} derated to "
                                            "the ambient temperature)",
                                            name, eng(l.averagePower.si(), "W"), eng(allowed, "W"), margin,
                                            eng(l.deratedPower->si(), "W")));
    f.values = {{"p_avg", l.averagePower.si(), "W"},
                {"p_allowed", allowed, "W"},
                {"p_derated", l.deratedPower->si(), "W"},
                {"margin", margin, ""}};
    // The rating needed scales with the derating factor of this part's curve at this ambient.
    double derating = p && p->pRated && p->pRated->si() > 0 ? l.deratedPower->si() / p->pRated->si() : 1.0;
    double needed = l.averagePower.si() / margin / (derating > 0 ? derating : 1.0);
    f.fix = fmt::format("use a resistor rated at least {} (at 70 degC), or share the power among parallel "
                        "resistors{}",
                        eng(needed, "W"), l.sharedByBothEdges ? ", or split turn-on and turn-off resistors" : "");
    sink.report(std::move(f));
  }
};

} // namespace

std::unique_ptr<Rule> makeRgPowerRule() { return std::make_unique<RgPowerRule>(); }

} // namespace gateloop
