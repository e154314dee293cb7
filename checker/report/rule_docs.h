/// \file
/// The rule documentation pages (docs/rules/<id>.md), compiled into the binary so that
/// `gateloop explain`, `gateloop rules` and the SARIF rule help all read one source.
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace gateloop {

struct RuleDoc {
  std::string_view id;
  std::string_view markdown;
};

const std::vector<RuleDoc> &embeddedRuleDocs();

/// The page of \p ruleId, or nullptr.
const RuleDoc *findRuleDoc(std::string_view ruleId);

/// The first paragraph under the "## Summary" heading (one sentence), or empty.
std::string ruleDocSummary(std::string_view markdown);

} // namespace gateloop
