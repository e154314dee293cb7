/// \file
/// A finding: what a rule reports about a design. A plain value; formatters render it, rules
/// never print.
#pragma once

#include "checker/core/diagnostics.h"
#include "checker/core/source_location.h"

#include <string>
#include <utility>
#include <vector>

namespace gateloop {

/// A computed number shown with a finding. `unit` is the SI unit symbol ("ohm", "H", "" for a
/// ratio), so text output can add engineering prefixes and JSON keeps SI.
struct FindingValue {
  std::string name;
  double value = 0.0;
  std::string unit;
};

struct Finding {
  std::string rule;
  Severity severity = Severity::Warning;
  std::string design;
  std::string loop;                    ///< loop id (switch name); empty for design-wide findings
  std::vector<std::string> refs;       ///< components involved
  std::string message;                 ///< one line, lowercase start, no trailing period
  std::vector<FindingValue> values;
  std::string fix;                     ///< a concrete remedy; may be empty for notes
  SourceLocation where;
  std::string fingerprint;             ///< stable across line moves (rule, design, loop, refs)
  bool baseline = false;               ///< accepted in the baseline file
  bool waived = false;
  std::string waiverReason;
};

/// Where rules put their findings.
class FindingSink {
public:
  virtual ~FindingSink() = default;
  virtual void report(Finding f) = 0;
};

class CollectingSink final : public FindingSink {
public:
  void report(Finding f) override { findings_.push_back(std::move(f)); }
  std::vector<Finding> &findings() { return findings_; }

private:
  std::vector<Finding> findings_;
};

/// Fingerprint from rule, design, loop and sorted refs: stable when lines move.
std::string findingFingerprint(const Finding &f);

} // namespace gateloop
