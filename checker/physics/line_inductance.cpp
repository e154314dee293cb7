/// \file
/// Closed-form conductor and line inductances; see line_inductance.h and docs/physics.md.
#include "checker/physics/line_inductance.h"

#include <cmath>
#include <limits>
#include <numbers>

namespace gateloop {
namespace {

constexpr double kPi = std::numbers::pi;
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
// mu0 = 4 pi 1e-7 H/m; the 2019 SI value differs by 5.5e-10 relative, far below any tolerance.
constexpr double kMu0 = 4e-7 * kPi;
constexpr double kMu0Over2Pi = 2e-7;
constexpr double kMu0Over4Pi = 1e-7;

bool positiveFinite(double x) { return std::isfinite(x) && x > 0.0; }
bool nonNegativeFinite(double x) { return std::isfinite(x) && x >= 0.0; }

double agm(double a, double b) {
  // Converges quadratically; 40 rounds are far more than double precision needs.
  for (int i = 0; i < 40 && std::abs(a - b) > 1e-16 * a; ++i) {
    const double mean = 0.5 * (a + b);
    b = std::sqrt(a * b);
    a = mean;
  }
  return 0.5 * (a + b);
}

} // namespace

Henry roundWireSelfInductance(Meter length, Meter radius, bool includeInternal) {
  const double l = length.si(), r = radius.si();
  if (!positiveFinite(l) || !positiveFinite(r))
    return Henry(kNaN);
  const double internal = includeInternal ? 0.25 : 0.0;
  return Henry(kMu0Over2Pi * l *
               (std::asinh(l / r) - std::sqrt(1.0 + (r / l) * (r / l)) + r / l + internal));
}

Henry roundWireSelfInductanceApprox(Meter length, Meter radius, bool includeInternal) {
  const double l = length.si(), r = radius.si();
  if (!positiveFinite(l) || !positiveFinite(r))
    return Henry(kNaN);
  const double internal = includeInternal ? 0.25 : 0.0;
  return Henry(kMu0Over2Pi * l * (std::log(2.0 * l / r) - 1.0 + internal));
}

HenryPerMeter twoWireLineInductance(Meter centreDistance, Meter radius, bool includeInternal) {
  const double d = centreDistance.si(), r = radius.si();
  if (!positiveFinite(r) || !std::isfinite(d) || !(d > 2.0 * r))
    return HenryPerMeter(kNaN);
  const double internal = includeInternal ? kMu0Over4Pi : 0.0;
  return HenryPerMeter(kMu0 / kPi * std::acosh(d / (2.0 * r)) + internal);
}

HenryPerMeter twoWireLineInductanceApprox(Meter centreDistance, Meter radius) {
  const double d = centreDistance.si(), r = radius.si();
  if (!positiveFinite(r) || !std::isfinite(d) || !(d > 2.0 * r))
    return HenryPerMeter(kNaN);
  return HenryPerMeter(kMu0 / kPi * std::log(d / r));
}

HenryPerMeter wireOverPlaneInductance(Meter height, Meter radius) {
  const double h = height.si(), r = radius.si();
  if (!positiveFinite(r) || !std::isfinite(h) || !(h > r))
    return HenryPerMeter(kNaN);
  return HenryPerMeter(kMu0Over2Pi * std::acosh(h / r));
}

HenryPerMeter microstripInductanceHammerstadJensen(Meter width, Meter height, Meter thickness) {
  const double w = width.si(), h = height.si(), t = thickness.si();
  if (!positiveFinite(w) || !positiveFinite(h) || !nonNegativeFinite(t))
    return HenryPerMeter(kNaN);
  double u = w / h;
  if (t > 0.0) {
    // H-J's width correction for strip thickness (the air-line form, no dielectric term).
    const double T = t / h;
    const double th = std::tanh(std::sqrt(6.517 * u));
    u += T / kPi * std::log(1.0 + 4.0 * std::numbers::e * th * th / T);
  }
  const double f = 6.0 + (2.0 * kPi - 6.0) * std::exp(-std::pow(30.666 / u, 0.7528));
  // The air impedance Z01 = (eta0/2pi) ln(...) over c0 leaves mu0/2pi times the logarithm.
  return HenryPerMeter(kMu0Over2Pi * std::log(f / u + std::sqrt(1.0 + 4.0 / (u * u))));
}

HenryPerMeter microstripInductanceWheeler(Meter width, Meter height) {
  const double w = width.si(), h = height.si();
  if (!positiveFinite(w) || !positiveFinite(h))
    return HenryPerMeter(kNaN);
  const double a = 8.0 * h / w;
  return HenryPerMeter(kMu0Over4Pi *
                       std::log(1.0 + (4.0 * h / w) * (a + std::sqrt(a * a + kPi * kPi))));
}

std::optional<HenryPerMeter> microstripInductanceIpc2141(Meter width, Meter height,
                                                         Meter thickness) {
  const double w = width.si(), h = height.si(), t = thickness.si();
  if (!positiveFinite(w) || !positiveFinite(h) || !nonNegativeFinite(t))
    return std::nullopt;
  const double arg = 5.98 * h / (0.8 * w + t);
  if (!(arg > 1.0))
    return std::nullopt;
  return HenryPerMeter(kMu0Over2Pi * std::log(arg));
}

std::optional<Ohm> microstripImpedanceIpc2141(Meter width, Meter height, Meter thickness,
                                              double relativePermittivity) {
  const double w = width.si(), h = height.si(), t = thickness.si();
  if (!positiveFinite(w) || !positiveFinite(h) || !nonNegativeFinite(t) ||
      !(relativePermittivity >= 1.0))
    return std::nullopt;
  const double arg = 5.98 * h / (0.8 * w + t);
  if (!(arg > 1.0))
    return std::nullopt;
  return Ohm(87.0 / std::sqrt(relativePermittivity + 1.41) * std::log(arg));
}

bool ipc2141InRange(Meter width, Meter height) {
  if (!positiveFinite(height.si()))
    return false;
  const double u = width.si() / height.si();
  return u >= 0.1 && u <= 2.0;
}

HenryPerMeter parallelPlateInductance(Meter width, Meter gap) {
  if (!positiveFinite(width.si()) || !positiveFinite(gap.si()))
    return HenryPerMeter(kNaN);
  return HenryPerMeter(kMu0 * gap.si() / width.si());
}

HenryPerMeter stackedPairInductance(Meter width, Meter gap, MicrostripModel model) {
  // The mid-plane between equal, opposite currents is a perfect conductor by symmetry.
  const Meter half = gap / 2.0;
  const HenryPerMeter one = model == MicrostripModel::Wheeler
                                ? microstripInductanceWheeler(width, half)
                                : microstripInductanceHammerstadJensen(width, half);
  return one * 2.0;
}

HenryPerMeter coplanarStripsInductance(Meter width, Meter gap) {
  const double w = width.si(), s = gap.si();
  if (!positiveFinite(w) || !positiveFinite(s))
    return HenryPerMeter(kNaN);
  // k and k' both formed directly so neither loses digits when the other is close to 1.
  const double k = s / (s + 2.0 * w);
  const double kPrime = 2.0 * std::sqrt(w * (s + w)) / (s + 2.0 * w);
  return HenryPerMeter(kMu0 * ellipticKFromComplement(kPrime) / ellipticKFromComplement(k));
}

double ellipticKFromComplement(double kPrime) {
  if (!(kPrime >= 0.0 && kPrime <= 1.0))
    return kNaN;
  if (kPrime == 0.0)
    return std::numeric_limits<double>::infinity();
  return kPi / (2.0 * agm(1.0, kPrime));
}

double ellipticK(double k) {
  if (!(k >= 0.0 && k <= 1.0))
    return kNaN;
  return ellipticKFromComplement(std::sqrt((1.0 - k) * (1.0 + k)));
}

Meter skinDepth(Hertz f, double resistivityOhmMeter, double relativePermeability) {
  if (!positiveFinite(f.si()) || !positiveFinite(resistivityOhmMeter) ||
      !positiveFinite(relativePermeability))
    return Meter(kNaN);
  return Meter(std::sqrt(resistivityOhmMeter / (kPi * f.si() * kMu0 * relativePermeability)));
}

} // namespace gateloop
