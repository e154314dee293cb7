// miller-bounce: dv/dt-induced gate voltage in a half bridge stays below threshold. See docs/rules/miller-bounce.md.
#include "checker/physics/gate_drive.h"
#include "checker/physics/switching_slope.h"
#include "rules/all_rules.h"
#include "rules/rule_support.h"

#include <fmt/format.h>

#include <cmath>
#include <unordered_map>

namespace gateloop {

namespace {

class MillerBounceRule final : public Rule {
public:
  const RuleInfo &info() const override {
    static const RuleInfo kInfo{
        "miller-bounce",
        "in a half bridge, the gate voltage induced by the partner switch's dv/dt stays below the threshold with "
        "margin",
        Severity::Error,
        {{"margin", Dimension::Dimensionless, "0.2", "fraction of v_th_min kept free"}}};
    return kInfo;
  }

  bool perLoop() const override { return true; }

  void check(const DesignContext &design, const RuleOptions &options, FindingSink &sink) const override {
    double margin = options.number("margin", 0.2);
    for (std::size_t i : design.loopIndexes()) {
      const GateLoop &loop = design.loops[i];
      if (loop.halfBridgePartner == kNone || loop.paths.empty()) continue;
      checkLoop(design, i, loopOfSwitch(design, loop.halfBridgePartner), margin, sink);
    }
  }

private:
  // The slope the partner makes at turn-on: given by the operating point, else from the partner's
  // own gate drive on its Miller plateau.
  std::optional<VoltPerSecond> partnerSlope(const DesignContext &design, std::optional<std::size_t> j,
                                            const char *&basis) const {
    if (design.operating.dvDt) {
      basis = "operating.dv_dt";
      return design.operating.dvDt;
    }
    if (!j) return std::nullopt;
    const Part *p = design.partOf(design.loops[*j].switchId);
    const LoopAnalysis &pa = design.analyses[*j];
    if (!p || !p->vPlateau || !p->cRes || !pa.vOn || !pa.on.rTotal) return std::nullopt;
    VoltPerSecond s = plateauSlewRate(*pa.vOn, *p->vPlateau, *pa.on.rTotal, *p->cRes);
    if (std::isnan(s.si())) return std::nullopt;
    basis = "the partner's Miller plateau";
    return s;
  }

  void checkLoop(const DesignContext &design, std::size_t i, std::optional<std::size_t> partner, double margin,
                 FindingSink &sink) const {
    const GateLoop &loop = design.loops[i];
    const LoopAnalysis &a = design.analyses[i];
    const Part &sw = switchPart(design, loop);
    if (!sw.cRes || !sw.vThMin || !a.vOff || !a.off.rTotal) {
      sink.report(missingDataNote(info(), design, loop,
                                  "c_res and v_th_min of the switch part, the off-drive voltage and the turn-off "
                                  "resistance"));
      return;
    }
    const char *basis = "";
    auto slope = partnerSlope(design, partner, basis);
    if (!slope) {
      sink.report(missingDataNote(info(), design, loop,
                                  "the partner's dv/dt: set operating.dv_dt or give the partner's v_plateau and c_res"));
      return;
    }
    // Mitigations: an active clamp pin bypasses the external off resistance; an external C_ge adds
    // to the gate's own capacitance.
    Ohm rOff = *a.off.rTotal;
    bool clampPin = false;
    Farad cGe(0.0);
    for (const Shunt &s : loop.shunts) {
      if (s.kind == ShuntKind::DriverClamp) clampPin = true;
      if (s.kind == ShuntKind::Capacitor) {
        const Component &c = design.component(s.elements.front());
        const Part *cp = design.partOf(s.elements.front());
        if (cp && cp->capacitance) cGe += *cp->capacitance;
        else if (c.hasValue()) cGe += Farad(c.value);
      }
    }
    if (clampPin) rOff = *a.off.rTotal - *a.off.rExternal;
    Farad cIss = sw.cIes ? *sw.cIes : a.cGate ? *a.cGate - cGe : Farad(0.0);
    Volt induced = design.operating.vBus && cIss.si() > 0
                       ? millerVoltageWithGateRc(rOff, *sw.cRes, cIss, *slope, *design.operating.vBus, cGe)
                       : millerVoltageResistive(rOff, *sw.cRes, *slope);
    double peak = a.vOff->si() + induced.si();
    double limit = sw.vThMin->si() * (1.0 - margin);
    if (peak < limit) return;
    std::vector<ComponentId> refs = a.off.resistors.empty() ? std::vector<ComponentId>{loop.switchId} : a.off.resistors;
    Finding f = makeLoopFinding(
        info(), Severity::Error, design, loop, refs,
        fmt::format("partner {} switching at {} (from {}) lifts the off-state gate of {} to {}, above {} "
                    "({:.0f} % below v_th_min {})",
                    design.component(loop.halfBridgePartner).name, eng(slope->si() * 1e-9, "V/ns"), basis, loop.id,
                    eng(peak, "V"), eng(limit, "V"), margin * 100, eng(sw.vThMin->si(), "V")));
    f.values = {{"dv_dt", slope->si(), "V/s"},
                {"v_induced", induced.si(), "V"},
                {"v_gate_peak", peak, "V"},
                {"v_limit", limit, "V"},
                {"r_off_total", rOff.si(), "ohm"}};
    f.fix = clampPin ? "use a negative off-voltage, or add a gate-emitter capacitor"
                     : "lower the turn-off resistance, use a negative off-voltage, or use a driver with an active "
                       "Miller clamp pin";
    sink.report(std::move(f));
  }
};

} // namespace

std::unique_ptr<Rule> makeMillerBounceRule() { return std::make_unique<MillerBounceRule>(); }

} // namespace gateloop
