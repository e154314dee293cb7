/// \file
/// The middle of the pipeline: loaded design -> gate loops -> physics -> rules -> findings, with
/// waivers applied. Baselines are applied by the caller, across designs.
#pragma once

#include "checker/app/run_inputs.h"
#include "checker/report/report.h"
#include "rules/registry.h"

#include <map>
#include <string>

namespace gateloop {

/// Wall-clock seconds of each stage of analyzeDesign, for the benchmark (bench/bench_check).
struct StageSeconds {
  double extraction = 0, physics = 0, census = 0, rules = 0;
};

/// Analyses one design and runs every enabled rule on it.
DesignReport analyzeDesign(const LoadedDesign &design, const Project &project,
                           const std::map<std::string, SeverityOverride> &overrides, const std::string &today,
                           StageSeconds *seconds = nullptr);

/// Marks findings matched by an unexpired waiver; an expired waiver is reported as a warning
/// finding and no longer waives; a waiver that matches nothing becomes a note.
void applyWaivers(std::vector<DesignReport> &designs, const Project &project, const std::string &today);

/// Today's date as YYYY-MM-DD (UTC), or GATELOOP_TODAY when set (for reproducible tests).
std::string todayIso();

} // namespace gateloop
