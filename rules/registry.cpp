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
  // Rules only read the design, so they run side by side; their findings are merged in the
  // registry's order, which keeps the output the same however the work was shared out.
  const auto &rules = builtinRules();
  std::vector<std::vector<Finding>> perRule(rules.size());
  parallelFor(
      rules.size(),
      [&](std::size_t r) {
        const Rule &rule = *rules[r];
        const std::string &id = rule.info().id;
        auto p = params.find(id);
        RuleOptions options(id, p == params.end() ? nlohmann::json() : p->second);
        std::optional<SeverityOverride> level;
        if (auto s = options.severityOverride()) level = parseSeverityOverride(*s);
        if (auto o = overrides.find(id); o != overrides.end()) level = o->second;
        if (level && level->off) return;

        CollectingSink ruleSink;
        rule.check(design, options, ruleSink);
        for (Finding &f : ruleSink.findings()) {
          // A fixed level replaces the rule's own grading, except for notes about missing data,
          // which must stay notes: they say the check could not be made, not that it failed.
          if (level && f.severity != Severity::Note) f.severity = level->level;
          if (f.fingerprint.empty()) f.fingerprint = findingFingerprint(f);
        }
        perRule[r] = std::move(ruleSink.findings());
      },
      /*grain=*/1);
  CollectingSink sink;
  for (auto &findings : perRule)
    for (Finding &f : findings) sink.report(std::move(f));
  return std::move(sink.findings());
}

} // namespace gateloop
