#include "checker/physics/switching_slope.h"

#include <cmath>

namespace gateloop {

VoltPerSecond plateauSlewRate(Volt vOn, Volt vPlateau, Ohm rTotal, Farad cRes) {
  double drive = (vOn - vPlateau).si();
  if (!(drive > 0.0) || !(rTotal.si() > 0.0) || !(cRes.si() > 0.0)) return VoltPerSecond(std::nan(""));
  return VoltPerSecond(drive / (rTotal.si() * cRes.si()));
}

} // namespace gateloop
