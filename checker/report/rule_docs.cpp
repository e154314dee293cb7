#include "checker/report/rule_docs.h"

namespace gateloop {

const RuleDoc *findRuleDoc(std::string_view ruleId) {
  for (const auto &d : embeddedRuleDocs())
    if (d.id == ruleId) return &d;
  return nullptr;
}

std::string ruleDocSummary(std::string_view md) {
  auto pos = md.find("## Summary");
  if (pos == std::string_view::npos) return {};
  pos = md.find('\n', pos);
  if (pos == std::string_view::npos) return {};
  while (pos < md.size() && (md[pos] == '\n' || md[pos] == ' ')) ++pos;
  auto end = md.find("\n\n", pos);
  std::string out(md.substr(pos, end == std::string_view::npos ? md.size() - pos : end - pos));
  for (char &c : out)
    if (c == '\n') c = ' ';
  return out;
}

} // namespace gateloop
