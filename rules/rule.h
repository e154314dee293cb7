/// \file
/// The rule interface. A rule reads one analysed design and reports findings to a sink; it never
/// prints and never computes layout physics itself (that is done once in checker/loops).
#pragma once

#include "checker/core/eng_format.h"
#include "checker/core/finding.h"
#include "checker/loops/gate_loop.h"
#include "checker/loops/loop_physics.h"
#include "checker/model/circuit.h"
#include "checker/model/layout.h"
#include "checker/model/parts.h"
#include "checker/model/project.h"
#include "rules/rule_options.h"

#include <algorithm>
#include <ranges>
#include <string>
#include <string_view>
#include <vector>

namespace gateloop {

/// Everything a rule may read about one design.
struct DesignContext {
  std::string name;
  const Circuit &circuit;
  const PartLibrary &parts;
  const Layout *layout;                  ///< null when the design has no sidecar
  const OperatingPoint &operating;
  const std::vector<GateLoop> &loops;
  const std::vector<LoopAnalysis> &analyses; ///< parallel to loops
  FileId netlistFile = 0;
  /// The loops this run of a rule reports on: [firstLoop, endLoop). A rule that says perLoop()
  /// is handed the loops in blocks, so one block's data serves every rule while it is in the
  /// cache; it may still read any other loop (a half-bridge partner). Findings about the design
  /// as a whole belong to the block that starts at loop 0 (wholeDesignBlock()).
  std::size_t firstLoop = 0;
  std::size_t endLoop = static_cast<std::size_t>(-1);

  auto loopIndexes() const { return std::views::iota(firstLoop, std::max(firstLoop, std::min(endLoop, loops.size()))); }
  bool wholeDesignBlock() const { return firstLoop == 0; }

  const Component &component(ComponentId id) const { return circuit.component(id); }
  const Part *partOf(ComponentId id) const {
    const Component &c = circuit.component(id);
    return c.part == kNone ? nullptr : &parts.parts[c.part];
  }
};

/// A rule parameter, for `gateloop explain` and validation.
struct OptionSpec {
  std::string key;
  Dimension dimension = Dimension::Dimensionless;
  std::string defaultText;
  std::string help;
};

/// The single source of a rule's metadata.
struct RuleInfo {
  std::string id;
  std::string title;                     ///< one line; equals the docs' Summary
  Severity defaultSeverity = Severity::Warning;
  std::vector<OptionSpec> options;
};

class Rule {
public:
  virtual ~Rule() = default;
  virtual const RuleInfo &info() const = 0;
  /// Checks \p design and reports every finding to \p sink. \p options holds validated
  /// parameters (defaults applied). Findings carry the severity the rule decides; the caller
  /// applies user overrides afterwards.
  virtual void check(const DesignContext &design, const RuleOptions &options, FindingSink &sink) const = 0;
  /// True when check() reports only on the loops of design.loopIndexes() (and on the design as a
  /// whole in the wholeDesignBlock()), so the runner may hand it the loops block by block.
  virtual bool perLoop() const { return false; }
};

/// Helper for rules: a finding about one loop, located at the switch and fingerprinted.
Finding makeLoopFinding(const RuleInfo &info, Severity severity, const DesignContext &design,
                        const GateLoop &loop, std::vector<ComponentId> refs, std::string message);


} // namespace gateloop
