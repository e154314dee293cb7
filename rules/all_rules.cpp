#include "rules/all_rules.h"

namespace gateloop {

std::vector<std::unique_ptr<Rule>> makeBuiltinRules() {
  std::vector<std::unique_ptr<Rule>> rules;
  rules.push_back(makeConnectivityRule());
  rules.push_back(makeDriverDecouplingRule());
  rules.push_back(makeDriverPeakCurrentRule());
  rules.push_back(makeGateClampRule());
  rules.push_back(makeGatePulldownRule());
  rules.push_back(makeGateVoltageRule());
  rules.push_back(makeKelvinReturnRule());
  rules.push_back(makeLeadLengthRule());
  rules.push_back(makeLoopDampingRule());
  rules.push_back(makeMillerBounceRule());
  rules.push_back(makeOnOffPathsRule());
  rules.push_back(makeRgPowerRule());
  rules.push_back(makeRgPulseRule());
  rules.push_back(makeRgRangeRule());
  rules.push_back(makeTurnoffOvershootRule());
  return rules;
}

} // namespace gateloop
