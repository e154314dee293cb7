/// \file
/// `gateloop loops --geometry-svg DIR`: one drawing per loop of its traces with the enclosed area
/// shaded, so a layout reviewer sees what the inductance number refers to.
#pragma once

#include "checker/app/run_inputs.h"
#include "checker/report/report.h"

#include <string>

namespace gateloop {

/// Writes DIR/<design>--<loop>.svg for every loop whose nets have traces. Returns an error
/// message, empty on success.
std::string writeLoopGeometrySvgs(const RunReport &report, const RunInputs &inputs, const std::string &dir);

} // namespace gateloop
