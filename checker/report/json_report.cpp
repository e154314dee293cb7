#include "checker/report/formatters.h"

#include <nlohmann/json.hpp>

namespace gateloop {

namespace {

using nlohmann::ordered_json;

template <class Q> ordered_json si(const std::optional<Q> &q) {
  return q ? ordered_json(q->si()) : ordered_json(nullptr);
}
ordered_json num(const std::optional<double> &v) { return v ? ordered_json(*v) : ordered_json(nullptr); }

ordered_json edgeJson(const DesignReport &d, const EdgeAnalysis &e) {
  ordered_json j;
  ordered_json resistors = ordered_json::array();
  for (ComponentId id : e.resistors) resistors.push_back(d.circuit->component(id).name);
  j["resistors"] = resistors;
  j["r_external"] = si(e.rExternal);
  j["r_total"] = si(e.rTotal);
  j["l_loop"] = si(e.lLoop);
  j["zeta"] = num(e.zeta);
  j["f_ring"] = si(e.fRing);
  j["overshoot"] = num(e.overshoot);
  j["i_peak"] = si(e.iPeak);
  j["v_peak"] = si(e.vPeak);
  j["p_avg"] = si(e.pAvg);
  j["e_pulse"] = si(e.ePulse);
  j["t_pulse"] = si(e.tPulse);
  return j;
}

ordered_json loopJson(const DesignReport &d, std::size_t i) {
  const GateLoop &loop = d.loops[i];
  const LoopAnalysis &a = d.analyses[i];
  const Circuit &c = *d.circuit;
  auto netName = [&](NetId n) { return n == kNone ? ordered_json(nullptr) : ordered_json(c.netAt(n).name); };
  ordered_json j;
  j["id"] = loop.id;
  j["switch"] = c.component(loop.switchId).name;
  j["driver"] = loop.driver == kNone ? ordered_json(nullptr) : ordered_json(c.component(loop.driver).name);
  j["gate_net"] = netName(loop.gateNet);
  j["ref_net"] = netName(loop.refNet);
  j["c_gate"] = si(a.cGate);
  std::optional<Henry> lMax = a.on.lLoop;
  if (a.off.lLoop && (!lMax || *a.off.lLoop > *lMax)) lMax = a.off.lLoop;
  j["l_loop"] = si(lMax);
  j["length"] = si(a.length);
  j["half_bridge_with"] = loop.halfBridgePartner == kNone ? ordered_json(nullptr)
                                                          : ordered_json(c.component(loop.halfBridgePartner).name);
  j["inductance_method"] = a.inductanceMethod;
  j["l_layout"] = a.lLayout.si();
  j["l_internal"] = a.lFixed.si();
  if (a.lOutgoingSelf)
    j["l_split"] = {{"outgoing_self", a.lOutgoingSelf->si()}, {"return_self", si(a.lReturnSelf)}, {"mutual", si(a.lMutual)}};
  else
    j["l_split"] = nullptr;
  j["on"] = edgeJson(d, a.on);
  j["off"] = edgeJson(d, a.off);
  j["assumptions"] = a.assumptions;
  j["missing"] = a.missing;
  return j;
}

ordered_json findingJson(const Finding &f, const FileTable &files) {
  ordered_json j;
  j["rule"] = f.rule;
  j["severity"] = severityName(f.severity);
  j["loop"] = f.loop.empty() ? ordered_json(nullptr) : ordered_json(f.loop);
  j["refs"] = f.refs;
  j["message"] = f.message;
  ordered_json values = ordered_json::object();
  for (const auto &v : f.values) values[v.name] = v.value;
  j["values"] = values;
  j["fix"] = f.fix;
  if (f.where.file != 0) {
    ordered_json loc;
    loc["file"] = files.name(f.where.file);
    loc["line"] = f.where.line == 0 ? ordered_json(nullptr) : ordered_json(f.where.line);
    loc["column"] = f.where.column == 0 ? ordered_json(nullptr) : ordered_json(f.where.column);
    j["location"] = loc;
  } else {
    j["location"] = nullptr;
  }
  j["fingerprint"] = f.fingerprint;
  j["baseline"] = f.baseline;
  j["waived"] = f.waived;
  if (f.waived) j["waiver_reason"] = f.waiverReason;
  return j;
}

ordered_json runJson(const RunReport &report, bool withFindings) {
  ordered_json root;
  root["tool"] = {{"name", "gateloop"}, {"version", report.toolVersion}};
  ordered_json designs = ordered_json::array();
  for (const auto &d : report.designs) {
    ordered_json dj;
    dj["name"] = d.name;
    ordered_json loops = ordered_json::array();
    for (std::size_t i = 0; i < d.loops.size(); ++i) loops.push_back(loopJson(d, i));
    dj["loops"] = loops;
    if (withFindings) {
      ordered_json findings = ordered_json::array();
      for (const auto &f : d.findings) findings.push_back(findingJson(f, *report.files));
      dj["findings"] = findings;
      ordered_json fixed = ordered_json::array();
      for (const auto &f : d.fixed) fixed.push_back({{"rule", f.rule}, {"loop", f.loop}, {"fingerprint", f.fingerprint}});
      dj["fixed"] = fixed;
    }
    designs.push_back(dj);
  }
  root["designs"] = designs;
  if (withFindings) {
    root["summary"] = {{"errors", report.summary.errors},     {"warnings", report.summary.warnings},
                       {"notes", report.summary.notes},       {"baseline", report.summary.baseline},
                       {"waived", report.summary.waived},     {"fixed", report.summary.fixed}};
  }
  root["caution"] = kSafetyCaution;
  return root;
}

} // namespace

// Names come from user files; invalid UTF-8 in them is replaced rather than thrown on.
void writeJsonReport(const RunReport &report, std::ostream &out) {
  out << runJson(report, true).dump(2, ' ', false, nlohmann::ordered_json::error_handler_t::replace) << '\n';
}

void writeJsonLoops(const RunReport &report, std::ostream &out) {
  out << runJson(report, false).dump(2, ' ', false, nlohmann::ordered_json::error_handler_t::replace) << '\n';
}

} // namespace gateloop
