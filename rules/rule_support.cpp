#include "rules/rule_support.h"

#include <algorithm>

namespace gateloop {

Finding missingDataNote(const RuleInfo &info, const DesignContext &design, const GateLoop &loop, std::string what,
                        std::vector<ComponentId> refs) {
  if (refs.empty()) refs.push_back(loop.switchId);
  Finding f = makeLoopFinding(info, Severity::Note, design, loop, std::move(refs),
                              "not checked: " + std::move(what));
  f.fix = "add the missing data to the parts library, layout sidecar or project file";
  return f;
}

Finding designNote(const RuleInfo &info, const DesignContext &design, std::string message, std::string fix) {
  Finding f;
  f.rule = info.id;
  f.severity = Severity::Note;
  f.design = design.name;
  f.message = std::move(message);
  f.fix = std::move(fix);
  f.where = {design.netlistFile, 0, 0};
  return f;
}

std::string preferredAtOrAbove(double ohms, ESeries series) {
  return eng(nextPreferredAtOrAbove(ohms, series), "ohm") + " (" + std::string(eseriesName(series)) + ")";
}

std::string preferredAtOrBelow(double ohms, ESeries series) {
  return eng(nextPreferredAtOrBelow(ohms, series), "ohm") + " (" + std::string(eseriesName(series)) + ")";
}

std::string joinNames(const DesignContext &design, const std::vector<ComponentId> &ids) {
  std::string out;
  for (std::size_t i = 0; i < ids.size(); ++i) {
    if (i) out += i + 1 == ids.size() ? " and " : ", ";
    out += design.circuit.component(ids[i]).name;
  }
  return out;
}

const Part &switchPart(const DesignContext &design, const GateLoop &loop) { return *design.partOf(loop.switchId); }

std::optional<std::size_t> loopOfSwitch(const DesignContext &design, ComponentId switchId) {
  const auto &loops = design.loops;
  auto it = std::lower_bound(loops.begin(), loops.end(), switchId,
                             [](const GateLoop &l, ComponentId id) { return l.switchId < id; });
  if (it == loops.end() || it->switchId != switchId) return std::nullopt;
  return static_cast<std::size_t>(it - loops.begin());
}

const Part *driverPart(const DesignContext &design, const GateLoop &loop) {
  return loop.driver == kNone ? nullptr : design.partOf(loop.driver);
}

} // namespace gateloop
