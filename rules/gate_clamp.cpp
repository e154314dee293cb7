// gate-clamp: a clamp between gate and reference for each drive polarity. See docs/rules/gate-clamp.md.
#include "rules/all_rules.h"
#include "rules/rule_support.h"

#include <fmt/format.h>

#include <cmath>

namespace gateloop {

namespace {

// Forward drop of a clamp diode in the conducting direction: a typical silicon value (common
// practice, no single source); a part's v_f wins.
constexpr double kDefaultForwardDrop = 0.7;

/// The voltages at which a clamp starts to conduct, positive and negative (gate minus reference).
struct ClampLevels {
  std::optional<double> positive, negative; ///< negative is a negative number
  const std::vector<ComponentId> *elements = nullptr; ///< the shunt's, which outlives the check
  std::string missing;
};

class GateClampRule final : public Rule {
public:
  const RuleInfo &info() const override {
    static const RuleInfo kInfo{"gate-clamp",
                                "a clamp between gate and reference breaks down above the on-drive and below the "
                                "gate maximum (and likewise for a negative off-drive)",
                                Severity::Warning,
                                {}};
    return kInfo;
  }

  bool perLoop() const override { return true; }

  void check(const DesignContext &design, const RuleOptions &, FindingSink &sink) const override {
    for (std::size_t i : design.loopIndexes()) {
      const GateLoop &loop = design.loops[i];
      const LoopAnalysis &a = design.analyses[i];
      const Part &sw = switchPart(design, loop);
      if (!a.vOn || !a.vOff || !sw.vGateMax || !sw.vGateMin) {
        sink.report(missingDataNote(info(), design, loop, "drive voltages and the switch's v_ge_max/v_ge_min"));
        continue;
      }
      thread_local std::vector<ClampLevels> clamps;
      clamps.clear();
      for (const Shunt &s : loop.shunts)
        if (s.kind == ShuntKind::ZenerClamp || s.kind == ShuntKind::ClampPair || s.kind == ShuntKind::DiodeClamp)
          clamps.push_back(levels(design, s));
      checkPolarity(design, loop, clamps, true, a.vOn->si(), sw.vGateMax->si(), sink);
      if (a.vOff->si() < 0) checkPolarity(design, loop, clamps, false, a.vOff->si(), sw.vGateMin->si(), sink);
    }
  }

private:
  ClampLevels levels(const DesignContext &design, const Shunt &s) const {
    ClampLevels c;
    c.elements = &s.elements;
    auto breakdown = [&](ComponentId id) -> std::optional<double> {
      const Part *p = design.partOf(id);
      if (p && p->vBreakdown) return p->vBreakdown->si();
      c.missing = "v_breakdown of " + std::string(design.component(id).name);
      return std::nullopt;
    };
    auto forward = [&](ComponentId id) {
      const Part *p = design.partOf(id);
      return p && p->vForward ? p->vForward->si() : kDefaultForwardDrop;
    };
    ComponentId first = s.elements.front();
    switch (s.kind) {
    case ShuntKind::ClampPair:
      if (s.elements.size() == 2) {
        // Back-to-back: one breaks down while the other conducts forward.
        auto b1 = breakdown(s.elements[0]), b2 = breakdown(s.elements[1]);
        if (b1 && b2) {
          c.positive = std::max(*b1, *b2) + kDefaultForwardDrop;
          c.negative = -(std::max(*b1, *b2) + kDefaultForwardDrop);
        }
      } else if (auto b = breakdown(first)) { // bidirectional TVS
        c.positive = *b;
        c.negative = -*b;
      }
      break;
    case ShuntKind::ZenerClamp:
      if (auto b = breakdown(first)) {
        c.positive = s.cathodeOnGate ? *b : forward(first);
        c.negative = s.cathodeOnGate ? -forward(first) : -*b;
      }
      break;
    case ShuntKind::DiodeClamp:
      if (s.cathodeOnGate) c.negative = -forward(first);
      else c.positive = forward(first);
      break;
    default: break;
    }
    return c;
  }

  void checkPolarity(const DesignContext &design, const GateLoop &loop, const std::vector<ClampLevels> &clamps,
                     bool positive, double vDrive, double vLimit, FindingSink &sink) const {
    const char *polarity = positive ? "positive" : "negative";
    bool good = false;
    for (const ClampLevels &c : clamps) {
      std::optional<double> level = positive ? c.positive : c.negative;
      if (!level) {
        if (!c.missing.empty())
          sink.report(missingDataNote(info(), design, loop, c.missing, *c.elements));
        continue;
      }
      double mag = std::fabs(*level), drive = std::fabs(vDrive), limit = std::fabs(vLimit);
      if (mag > drive && mag < limit) {
        good = true;
        continue;
      }
      Finding f = makeLoopFinding(info(), Severity::Warning, design, loop, *c.elements,
                                  mag <= drive
                                      ? fmt::format("{} clamps the {} gate voltage of {} at {}, inside the drive "
                                                    "level of {}: it conducts during normal drive",
                                                    joinNames(design, *c.elements), polarity, loop.id, eng(*level, "V"),
                                                    eng(vDrive, "V"))
                                      : fmt::format("{} clamps the {} gate voltage of {} only at {}, beyond the gate "
                                                    "limit of {}",
                                                    joinNames(design, *c.elements), polarity, loop.id, eng(*level, "V"),
                                                    eng(vLimit, "V")));
      f.values = {{"v_clamp", *level, "V"}, {"v_drive", vDrive, "V"}, {"v_limit", vLimit, "V"}};
      f.fix = fmt::format("use a clamp that conducts between {} and {} in the {} direction (e.g. a bidirectional "
                          "TVS or back-to-back Zeners)",
                          eng(std::fabs(vDrive), "V"), eng(std::fabs(vLimit), "V"), polarity);
      sink.report(std::move(f));
    }
    if (good) return;
    bool anyAtAll = false;
    for (const ClampLevels &c : clamps) anyAtAll |= (positive ? c.positive : c.negative).has_value();
    if (anyAtAll) return; // a wrongly sized clamp was reported above
    Finding f = makeLoopFinding(info(), Severity::Warning, design, loop, {loop.switchId},
                                fmt::format("gate of {} has no {} clamp to its reference", loop.id, polarity));
    f.values = {{"v_drive", vDrive, "V"}, {"v_limit", vLimit, "V"}};
    f.fix = fmt::format("add a Zener/TVS from gate to the Kelvin reference that conducts between {} and {}{}",
                        eng(std::fabs(vDrive), "V"), eng(std::fabs(vLimit), "V"),
                        positive ? "" : " (bidirectional, since the off-drive is negative)");
    sink.report(std::move(f));
  }
};

} // namespace

std::unique_ptr<Rule> makeGateClampRule() { return std::make_unique<GateClampRule>(); }

} // namespace gateloop
