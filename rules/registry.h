/// \file
/// The one explicit list of built-in rules, and running them over a design.
#pragma once

#include "rules/rule.h"

#include <map>
#include <memory>
#include <optional>
#include <string>
#include <vector>

namespace gateloop {

/// Every built-in rule, sorted by id.
const std::vector<std::unique_ptr<Rule>> &builtinRules();

/// The rule with \p id, or nullptr.
const Rule *findRule(const std::string &id);

/// All rule ids, for "did you mean".
std::vector<std::string> ruleIds();

/// A user's severity choice for one rule: off, or a fixed level.
struct SeverityOverride {
  bool off = false;
  Severity level = Severity::Warning;
};

/// Parses "off|error|warning|note".
std::optional<SeverityOverride> parseSeverityOverride(const std::string &text);

/// Validates `rules.<id>` parameters of the project: unknown rule ids (with "did you mean"),
/// unknown keys, values of the wrong dimension. Problems go to \p diags.
void validateRuleParams(const std::map<std::string, nlohmann::json> &params, FileId projectFile,
                        InputDiagnostics &diags);

/// Runs every enabled rule over \p design. \p overrides (command line) win over the project's
/// `rules.<id>.severity`, which wins over the rule's own choice.
std::vector<Finding> runRules(const DesignContext &design, const std::map<std::string, nlohmann::json> &params,
                              const std::map<std::string, SeverityOverride> &overrides);

} // namespace gateloop
