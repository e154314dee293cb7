/// \file
/// Typed access to a rule's parameters from the project file (`rules.<id>.<key>`). Unknown keys
/// and values of the wrong dimension are input errors naming the field path.
#pragma once

#include "checker/core/diagnostics.h"
#include "checker/core/quantity_text.h"

#include <nlohmann/json.hpp>

#include <map>
#include <optional>
#include <string>
#include <vector>

namespace gateloop {

class RuleOptions {
public:
  RuleOptions() = default;
  RuleOptions(std::string ruleId, nlohmann::json params) : ruleId_(std::move(ruleId)), params_(std::move(params)) {}

  /// A quantity parameter: the project's value converted to SI, or \p fallback when absent.
  double quantity(const std::string &key, Dimension dim, double fallback) const;
  double number(const std::string &key, double fallback) const { return quantity(key, Dimension::Dimensionless, fallback); }
  bool has(const std::string &key) const { return params_.is_object() && params_.contains(key); }

  /// Checks the parameters against the keys a rule declares (plus the common `severity`),
  /// reporting unknown keys and unreadable values to \p diags at `rules.<id>.<key>`.
  void validate(const std::vector<std::pair<std::string, Dimension>> &known, FileId projectFile,
                InputDiagnostics &diags) const;

  /// The `severity` parameter ("off", "error", "warning", "note"), if given.
  std::optional<std::string> severityOverride() const;

private:
  std::string ruleId_;
  nlohmann::json params_;
};

} // namespace gateloop
