// turnoff-overshoot: the L di/dt spike at turn-off within the switch's derated voltage. See docs/rules/turnoff-overshoot.md.
#include "checker/physics/gate_drive.h"
#include "rules/all_rules.h"
#include "rules/rule_support.h"

#include <fmt/format.h>

namespace gateloop {

namespace {

class TurnoffOvershootRule final : public Rule {
public:
  const RuleInfo &info() const override {
    static const RuleInfo kInfo{
        "turnoff-overshoot",
        "bus voltage plus the power-loop L di/dt spike at turn-off stays within the switch's rated voltage times a "
        "derating",
        Severity::Warning,
        {{"derating", Dimension::Dimensionless, "0.8", "fraction of v_rated allowed for the transient peak"}}};
    return kInfo;
  }

  bool perLoop() const override { return true; }

  void check(const DesignContext &design, const RuleOptions &options, FindingSink &sink) const override {
    double derating = options.number("derating", 0.8);
    const OperatingPoint &op = design.operating;
    for (std::size_t i : design.loopIndexes()) {
      const GateLoop &loop = design.loops[i];
      const Part &sw = switchPart(design, loop);
      std::optional<AmperePerSecond> didt = op.diDt;
      std::string basis = "operating.di_dt";
      if (!didt && op.iLoad && sw.tFall && sw.tFall->si() > 0) {
        // IGBT turn-off di/dt is set largely by the device: I_L / t_f (common practice, no single source).
        didt = AmperePerSecond(op.iLoad->si() / sw.tFall->si());
        basis = "i_load / t_fall";
      }
      if (!op.vBus || !op.lPowerLoop || !didt || !sw.vRated) {
        sink.report(missingDataNote(info(), design, loop,
                                    "operating.v_bus, operating.l_power_loop, the turn-off di/dt (operating.di_dt, or "
                                    "operating.i_load with the part's t_fall) and the part's v_rated"));
        continue;
      }
      Volt peak = turnOffPeakVoltage(*op.vBus, *op.lPowerLoop, *didt);
      double limit = sw.vRated->si() * derating;
      if (peak.si() <= limit) continue;
      Finding f = makeLoopFinding(info(), Severity::Warning, design, loop, {loop.switchId},
                                  fmt::format("turn-off of {} peaks at {} ({} bus + {} x {}), over {} ({} x v_rated {})",
                                              loop.id, eng(peak.si(), "V"), eng(op.vBus->si(), "V"),
                                              eng(op.lPowerLoop->si(), "H"), eng(didt->si() * 1e-6, "A/us"),
                                              eng(limit, "V"), derating, eng(sw.vRated->si(), "V")));
      f.values = {{"v_peak", peak.si(), "V"}, {"v_limit", limit, "V"}, {"di_dt", didt->si(), "A/s"}};
      double lMax = (limit - op.vBus->si()) / didt->si();
      f.fix = lMax > 0 ? fmt::format("cut the power-loop inductance to {} or slow the turn-off (raise R_off)",
                                     eng(lMax, "H"))
                       : "the bus voltage alone exceeds the derated rating: use a higher-voltage switch";
      sink.report(std::move(f));
    }
  }
};

} // namespace

std::unique_ptr<Rule> makeTurnoffOvershootRule() { return std::make_unique<TurnoffOvershootRule>(); }

} // namespace gateloop
