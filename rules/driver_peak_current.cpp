// driver-peak-current: the gate current peak within the driver's rating. See docs/rules/driver-peak-current.md.
#include "rules/all_rules.h"
#include "rules/rule_support.h"

#include <fmt/format.h>

namespace gateloop {

namespace {

class DriverPeakCurrentRule final : public Rule {
public:
  const RuleInfo &info() const override {
    static const RuleInfo kInfo{"driver-peak-current",
                                "peak source and sink gate current stays within the driver's rating",
                                Severity::Warning,
                                {}};
    return kInfo;
  }

  bool perLoop() const override { return true; }

  void check(const DesignContext &design, const RuleOptions &, FindingSink &sink) const override {
    for (std::size_t i : design.loopIndexes()) {
      const GateLoop &loop = design.loops[i];
      const LoopAnalysis &a = design.analyses[i];
      const Part *drv = driverPart(design, loop);
      if (!drv) continue; // connectivity reports a gate without a driver
      for (bool on : {true, false}) {
        const EdgeAnalysis &e = on ? a.on : a.off;
        if (!e.hasPath) continue;
        std::optional<Ampere> rating = on ? drv->iSourcePeak : drv->iSinkPeak;
        if (!rating) {
          sink.report(missingDataNote(info(), design, loop,
                                      fmt::format("{} of driver part {}", on ? "i_source_peak" : "i_sink_peak", drv->id),
                                      {loop.driver}));
          continue;
        }
        if (!e.iPeak) {
          sink.report(missingDataNote(info(), design, loop,
                                      fmt::format("turn-{} peak current needs gate charge, drive voltages and "
                                                  "resistances",
                                                  edgeName(on)),
                                      {loop.driver}));
          continue;
        }
        if (*e.iPeak <= *rating) continue;
        std::vector<ComponentId> refs{loop.driver};
        refs.insert(refs.end(), e.resistors.begin(), e.resistors.end());
        Finding f = makeLoopFinding(info(), Severity::Warning, design, loop, refs,
                                    fmt::format("turn-{} gate current of {} peaks at {}, over the {} {} rating of {}",
                                                edgeName(on), loop.id, eng(e.iPeak->si(), "A"),
                                                eng(rating->si(), "A"), on ? "source" : "sink",
                                                design.component(loop.driver).name));
        f.values = {{"i_peak", e.iPeak->si(), "A"}, {"i_rating", rating->si(), "A"}};
        // Without inductance the peak is dV/R_total (physics.md 3.2), an upper bound: the R_total that
        // brings that bound to the rating is a safe fix.
        if (a.vOn && a.vOff && e.rTotal && e.rExternal) {
          double rTotalNeeded = (*a.vOn - *a.vOff).si() / rating->si();
          double rExternal = e.rExternal->si() + rTotalNeeded - e.rTotal->si();
          f.fix = fmt::format("raise the turn-{} resistance to {}, or use a driver rated for {}", edgeName(on),
                              preferredAtOrAbove(rExternal), eng(e.iPeak->si(), "A"));
        } else {
          f.fix = fmt::format("raise the turn-{} resistance, or use a stronger driver", edgeName(on));
        }
        sink.report(std::move(f));
      }
    }
  }
};

} // namespace

std::unique_ptr<Rule> makeDriverPeakCurrentRule() { return std::make_unique<DriverPeakCurrentRule>(); }

} // namespace gateloop
