#include "rules/rule_options.h"

#include "checker/core/text_util.h"

namespace gateloop {

double RuleOptions::quantity(const std::string &key, Dimension dim, double fallback) const {
  if (!has(key)) return fallback;
  std::string error;
  auto v = parseQuantityJson(params_.at(key), dim, &error);
  // validate() has already reported unreadable values; the documented default keeps rules running.
  return v ? *v : fallback;
}

std::optional<std::string> RuleOptions::severityOverride() const {
  if (!has("severity") || !params_.at("severity").is_string()) return std::nullopt;
  return params_.at("severity").get<std::string>();
}

void RuleOptions::validate(const std::vector<std::pair<std::string, Dimension>> &known, FileId projectFile,
                           InputDiagnostics &diags) const {
  if (params_.is_null()) return;
  std::string base = "rules." + ruleId_;
  if (!params_.is_object()) {
    diags.fieldError({projectFile, 0, 0}, base, "expected an object of rule parameters");
    return;
  }
  for (const auto &[key, value] : params_.items()) {
    if (key == "severity") {
      static const std::vector<std::string> kLevels{"off", "error", "warning", "note"};
      if (!value.is_string() || std::find(kLevels.begin(), kLevels.end(), value.get<std::string>()) == kLevels.end())
        diags.fieldError({projectFile, 0, 0}, base + ".severity", "expected one of off, error, warning, note");
      continue;
    }
    auto it = std::find_if(known.begin(), known.end(), [&](const auto &k) { return k.first == key; });
    if (it == known.end()) {
      std::vector<std::string> names{"severity"};
      for (const auto &k : known) names.push_back(k.first);
      diags.fieldError({projectFile, 0, 0}, base + "." + key,
                       "unknown parameter" + didYouMean(key, names));
      continue;
    }
    std::string error;
    if (!parseQuantityJson(value, it->second, &error))
      diags.fieldError({projectFile, 0, 0}, base + "." + key, error);
  }
}

} // namespace gateloop
