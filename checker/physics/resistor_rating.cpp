/// \file
/// Resistor ratings; see resistor_rating.h and docs/physics.md.
#include "checker/physics/resistor_rating.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace gateloop {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

bool positiveFinite(double x) { return std::isfinite(x) && x > 0.0; }

} // namespace

Watt deratedPower(Watt pRated, Celsius tKnee, Celsius tMax, Celsius tAmbient) {
  if (!(tKnee < tMax) || !(pRated.si() >= 0.0) || !std::isfinite(tAmbient.si()))
    return Watt(kNaN);
  if (tAmbient <= tKnee)
    return pRated;
  if (tAmbient >= tMax)
    return Watt(0.0);
  return pRated * ((tMax - tAmbient) / (tMax - tKnee));
}

Volt ratedVoltage(Watt pRated, Ohm r, Volt uMax) {
  if (pRated.si() < 0.0 || r.si() < 0.0 || uMax.si() < 0.0)
    return Volt(kNaN);
  return Volt(std::min(std::sqrt(pRated.si() * r.si()), uMax.si()));
}

Ohm criticalResistance(Volt uMax, Watt pRated) {
  if (!(pRated.si() > 0.0))
    return Ohm(kNaN);
  return Ohm(uMax.si() * uMax.si() / pRated.si());
}

bool isValidPulseCurve(std::span<const PulsePoint> curve) {
  if (curve.empty())
    return false;
  for (std::size_t i = 0; i < curve.size(); ++i) {
    if (!positiveFinite(curve[i].width.si()) || !positiveFinite(curve[i].power.si()))
      return false;
    if (i > 0 && !(curve[i - 1].width < curve[i].width))
      return false;
  }
  return true;
}

std::optional<PulseLimit> singlePulseLimit(std::span<const PulsePoint> curve, Second width,
                                           Watt continuousLimit) {
  if (!isValidPulseCurve(curve) || !positiveFinite(width.si()))
    return std::nullopt;
  // Both ends are the conservative choice: a shorter pulse may well tolerate more than the first
  // point, and beyond the last point the curve tends to the continuous rating.
  if (width < curve.front().width)
    return PulseLimit{curve.front().power, true, false};
  if (width > curve.back().width)
    return PulseLimit{continuousLimit, false, true};
  auto upper = std::lower_bound(curve.begin(), curve.end(), width,
                                [](const PulsePoint &p, Second w) { return p.width < w; });
  if (upper->width == width)
    return PulseLimit{upper->power, false, false};
  const PulsePoint &hi = *upper;
  const PulsePoint &lo = *(upper - 1);
  // Makers draw these curves as straight segments on log-log paper.
  const double x = std::log(width / lo.width) / std::log(hi.width / lo.width);
  const double lnP = std::log(lo.power.si()) + (std::log(hi.power.si()) - std::log(lo.power.si())) * x;
  return PulseLimit{Watt(std::exp(lnP)), false, false};
}

double pulseDutyCycle(Second width, Hertz fRepeat) { return width.si() * fRepeat.si(); }

Watt repetitivePulseLimit(Watt singlePulse, Watt pRated, double dutyCycle, double deratingFactor) {
  if (!(dutyCycle >= 0.0 && dutyCycle <= 1.0) || !std::isfinite(singlePulse.si()) ||
      !(singlePulse.si() >= 0.0) || !positiveFinite(pRated.si()) ||
      !(deratingFactor >= 0.0 && std::isfinite(deratingFactor)))
    return Watt(kNaN);
  const double d = dutyCycle;
  // A zero single-pulse allowance (ambient at or above the upper category temperature, where the
  // continuous limit is zero) leaves nothing for repetitive pulses either.
  if (singlePulse.si() == 0.0)
    return Watt(d == 1.0 ? deratingFactor * pRated.si() : 0.0);
  return Watt(deratingFactor / (d / pRated.si() + (1.0 - d) / singlePulse.si()));
}

} // namespace gateloop
