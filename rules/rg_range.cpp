// rg-range: external gate resistance within the switch maker's recommended range. See docs/rules/rg-range.md.
#include "rules/all_rules.h"
#include "rules/rule_support.h"

#include <fmt/format.h>

#include <algorithm>

namespace gateloop {

namespace {

class RgRangeRule final : public Rule {
public:
  const RuleInfo &info() const override {
    static const RuleInfo kInfo{
        "rg-range",
        "external turn-on and turn-off gate resistance lies inside the switch's recommended range, also at the "
        "resistor tolerance extremes",
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
      for (bool on : {true, false}) {
        const EdgeAnalysis &e = on ? a.on : a.off;
        // A path without a gate resistor is a connectivity error; a 0 ohm range finding would repeat it.
        if (!e.hasPath || e.resistors.empty()) continue;
        const auto &range = on ? sw.rgRecommendedOn : sw.rgRecommendedOff;
        if (!range) {
          sink.report(missingDataNote(info(), design, loop,
                                      fmt::format("r_g_recommended.{} of switch part {}", edgeName(on), sw.id)));
          continue;
        }
        if (!e.rExternal) {
          sink.report(missingDataNote(info(), design, loop, "a value for every gate resistor", e.resistors));
          continue;
        }
        checkEdge(design, loop, e, *range, on, sink);
      }
    }
  }

private:
  // The widest tolerance among the edge's resistors; resistors without a part are taken as exact,
  // and a note says so.
  std::optional<double> tolerance(const DesignContext &design, const EdgeAnalysis &e) const {
    double tol = 0.0;
    for (ComponentId id : e.resistors) {
      const Part *p = design.partOf(id);
      if (!p || !p->tolerance) return std::nullopt;
      tol = std::max(tol, *p->tolerance);
    }
    return tol;
  }

  void checkEdge(const DesignContext &design, const GateLoop &loop, const EdgeAnalysis &e, const Range<Ohm> &range,
                 bool on, FindingSink &sink) const {
    double r = e.rExternal->si(), lo = range.low.si(), hi = range.high.si();
    auto tol = tolerance(design, e);
    double t = tol.value_or(0.0);
    double rMin = r * (1 - t), rMax = r * (1 + t);
    // Messages are built only for failing edges: a large design checks tens of thousands.
    auto what = [&] { return fmt::format("turn-{} resistance of {} ({})", edgeName(on), loop.id, eng(r, "ohm")); };
    auto rangeText = [&] { return eng(lo, "ohm") + " to " + eng(hi, "ohm"); };
    Severity sev;
    std::string message;
    if (r < lo || r > hi) {
      sev = Severity::Error;
      message = fmt::format("{} is outside the recommended {}", what(), rangeText());
    } else if (rMin < lo || rMax > hi) {
      sev = Severity::Warning;
      message = fmt::format("{} leaves the recommended {} at its {:.0f} % tolerance ({} to {})", what(), rangeText(),
                            t * 100, eng(rMin, "ohm"), eng(rMax, "ohm"));
    } else {
      if (!tol)
        sink.report(missingDataNote(info(), design, loop,
                                    fmt::format("tolerance extremes of the turn-{} resistors (no resistor part with "
                                                "'tolerance'); the nominal value is inside the range",
                                                edgeName(on)),
                                    e.resistors));
      return;
    }
    Finding f = makeLoopFinding(info(), sev, design, loop, e.resistors, message);
    f.values = {{"r_external", r, "ohm"}, {"r_min", lo, "ohm"}, {"r_max", hi, "ohm"}, {"tolerance", t, ""}};
    // Suggest the preferred value that stays inside the range at its tolerance extremes.
    if (rMin < lo)
      f.fix = fmt::format("raise the turn-{} resistance to {}", edgeName(on), preferredAtOrAbove(lo / (1 - t)));
    else
      f.fix = fmt::format("lower the turn-{} resistance to {}", edgeName(on), preferredAtOrBelow(hi / (1 + t)));
    sink.report(std::move(f));
  }
};

} // namespace

std::unique_ptr<Rule> makeRgRangeRule() { return std::make_unique<RgRangeRule>(); }

} // namespace gateloop
