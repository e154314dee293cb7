#include "rules/rule.h"


namespace gateloop {

Finding makeLoopFinding(const RuleInfo &info, Severity severity, const DesignContext &design,
                        const GateLoop &loop, std::vector<ComponentId> refs, std::string message) {
  Finding f;
  f.rule = info.id;
  f.severity = severity;
  f.design = design.name;
  f.loop = loop.id;
  for (ComponentId id : refs) f.refs.emplace_back(design.circuit.component(id).name);
  f.message = std::move(message);
  // Point at the first named component (the element to edit); else at the switch.
  ComponentId at = refs.empty() ? loop.switchId : refs.front();
  if (at != kNone) f.where = design.circuit.component(at).where;
  return f;
}

} // namespace gateloop
