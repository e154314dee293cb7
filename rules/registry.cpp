#include "rules/registry.h"

#include "checker/core/parallel.h"
#include "checker/core/text_util.h"
#include "rules/all_rules.h"

#include <algorithm>

namespace gateloop {

const std::vector<std::unique_ptr<Rule>> &builtinRules() {
  static const std::vector<std::unique_ptr<Rule>> rules = [] {
    auto list = makeBuiltinRules();
    std::sort(list.begin(), list.end(), [](const auto &a, const auto &b) { return a->info().id < b->info().id; });
    return list;
  }();
  return rules;
}

const Rule *findRule(const std::string &id) {
  for (const auto &r : builtinRules())
    if (r->info().id == id) return r.get();
  return nullptr;
}

std::vector<std::string> ruleIds() {
  std::vector<std::string> ids;
  for (const auto &r : builtinRules()) ids.push_back(r->info().id);
  return ids;
}

std::optional<SeverityOverride> parseSeverityOverride(const std::string &text) {
  if (text == "off") return SeverityOverride{true, Severity::Note};
  if (text == "error") return SeverityOverride{false, Severity::Error};
  if (text == "warning") return SeverityOverride{false, Severity::Warning};
  if (text == "note") return SeverityOverride{false, Severity::Note};
  return std::nullopt;
}

void validateRuleParams(const std::map<std::string, nlohmann::json> &params, FileId projectFile,
                        InputDiagnostics &diags) {
  for (const auto &[id, json] : params) {
    const Rule *rule = findRule(id);
    if (!rule) {
      diags.fieldError({projectFile, 0, 0}, "rules." + id, "unknown rule id" + didYouMean(id, ruleIds()));
      continue;
    }
    std::vector<std::pair<std::string, Dimension>> known;
    for (const auto &o : rule->info().options) known.emplace_back(o.key, o.dimension);
    RuleOptions(id, json).validate(known, projectFile, diags);
  }
}

std::vector<Finding> runRules(const DesignContext &design, const std::map<std::string, nlohmann::json> &params,
                              const std::map<std::string, SeverityOverride> &overrides) {
  const auto &rules = builtinRules();
  struct Setup {
    RuleOptions options;
    std::optional<SeverityOverride> level;
  };
  std::vector<Setup> setup(rules.size());
  std::vector<std::size_t> wholeDesign, loopByLoop; // rule indexes
  for (std::size_t r = 0; r < rules.size(); ++r) {
    const std::string &id = rules[r]->info().id;
    auto p = params.find(id);
    setup[r].options = RuleOptions(id, p == params.end() ? nlohmann::json() : p->second);
    if (auto s = setup[r].options.severityOverride()) setup[r].level = parseSeverityOverride(*s);
    if (auto o = overrides.find(id); o != overrides.end()) setup[r].level = o->second;
    if (setup[r].level && setup[r].level->off) continue;
    (rules[r]->perLoop() ? loopByLoop : wholeDesign).push_back(r);
  }

  // Rules only read the design, so they run side by side: each whole-design rule is one task,
  // and the per-loop rules run block by block (every rule on one block of loops while its data is
  // in the cache, instead of every rule streaming through all loops). Findings are merged in the
  // registry's order and, within a rule, in block order: the output is the same however the work
  // was shared out.
  constexpr std::size_t kLoopsPerBlock = 256;
  const std::size_t blocks = std::max<std::size_t>(1, (design.loops.size() + kLoopsPerBlock - 1) / kLoopsPerBlock);
  std::vector<std::vector<Finding>> wholeFindings(rules.size());
  std::vector<std::vector<std::vector<Finding>>> blockFindings(blocks, std::vector<std::vector<Finding>>(rules.size()));
  auto runRule = [&](std::size_t r, const DesignContext &context, std::vector<Finding> &out) {
    CollectingSink sink;
    rules[r]->check(context, setup[r].options, sink);
    for (Finding &f : sink.findings()) {
      // A fixed level replaces the rule's own grading, except for notes about missing data,
      // which must stay notes: they say the check could not be made, not that it failed.
      if (setup[r].level && f.severity != Severity::Note) f.severity = setup[r].level->level;
      if (f.fingerprint.empty()) f.fingerprint = findingFingerprint(f);
    }
    out = std::move(sink.findings());
  };
  parallelFor(
      wholeDesign.size() + blocks,
      [&](std::size_t task) {
        if (task < wholeDesign.size()) {
          runRule(wholeDesign[task], design, wholeFindings[wholeDesign[task]]);
          return;
        }
        const std::size_t b = task - wholeDesign.size();
        DesignContext block = design;
        block.firstLoop = b * kLoopsPerBlock;
        block.endLoop = block.firstLoop + kLoopsPerBlock;
        for (std::size_t r : loopByLoop) runRule(r, block, blockFindings[b][r]);
      },
      /*grain=*/1);
  CollectingSink sink;
  for (std::size_t r = 0; r < rules.size(); ++r) {
    for (Finding &f : wholeFindings[r]) sink.report(std::move(f));
    for (auto &perBlock : blockFindings)
      for (Finding &f : perBlock[r]) sink.report(std::move(f));
  }
  return std::move(sink.findings());
}

} // namespace gateloop
