/// \file
/// The explicit list of built-in rules (no static self-registration). Each rule lives in
/// rules/<id>.cpp and exposes one factory.
#pragma once

#include "rules/rule.h"

#include <memory>
#include <vector>

namespace gateloop {

std::unique_ptr<Rule> makeConnectivityRule();
std::unique_ptr<Rule> makeDriverDecouplingRule();
std::unique_ptr<Rule> makeDriverPeakCurrentRule();
std::unique_ptr<Rule> makeGateClampRule();
std::unique_ptr<Rule> makeGatePulldownRule();
std::unique_ptr<Rule> makeGateVoltageRule();
std::unique_ptr<Rule> makeKelvinReturnRule();
std::unique_ptr<Rule> makeLeadLengthRule();
std::unique_ptr<Rule> makeLoopDampingRule();
std::unique_ptr<Rule> makeMillerBounceRule();
std::unique_ptr<Rule> makeOnOffPathsRule();
std::unique_ptr<Rule> makeRgPowerRule();
std::unique_ptr<Rule> makeRgPulseRule();
std::unique_ptr<Rule> makeRgRangeRule();
std::unique_ptr<Rule> makeTurnoffOvershootRule();

std::vector<std::unique_ptr<Rule>> makeBuiltinRules();

} // namespace gateloop
