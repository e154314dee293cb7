/// \file
/// The drain/collector voltage slope a switch makes while its gate sits on the Miller plateau.
#pragma once

#include "checker/core/units.h"

namespace gateloop {

/// dv/dt during the Miller plateau of turn-on: the gate current (V_on - V_pl)/R_tot flows into
/// C_GD (= C_res), so dv/dt = (V_on - V_pl) / (R_tot C_res) (Balogh 2002; physics.md 3.3).
/// NaN when the plateau is at or above V_on or an argument is not positive.
VoltPerSecond plateauSlewRate(Volt vOn, Volt vPlateau, Ohm rTotal, Farad cRes);

} // namespace gateloop
