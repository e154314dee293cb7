/// \file
/// Series RLC step response; see rlc_step.h and docs/physics.md section 2.
#include "checker/physics/rlc_step.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numbers>

namespace gateloop {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kInf = std::numeric_limits<double>::infinity();
constexpr double kPi = std::numbers::pi;

// Width of the critical branch: closer to zeta = 1 than this, phi/sqrt|1 - zeta^2| is 0/0 in
// floating point and its Taylor series (exact to 1e-18 here) replaces it.
constexpr double kCriticalBand = 1e-6;

// sin(x)/x and sinh(x)/x without the division at x = 0; the plain quotient is accurate to the
// last bit for every other x because sin and sinh are accurate relative to their argument.
double sinc(double x) { return x == 0.0 ? 1.0 : std::sin(x) / x; }
double sinhc(double x) { return x == 0.0 ? 1.0 : std::sinh(x) / x; }

// sqrt(zeta^2 - 1) for zeta > 1: the factored form keeps full relative precision just above 1,
// the scaled form avoids overflowing zeta^2 for a nearly inductance-free loop.
double overdampedRoot(double zeta) {
  return zeta < 1e8 ? std::sqrt((zeta - 1.0) * (zeta + 1.0))
                    : zeta * std::sqrt(1.0 - 1.0 / (zeta * zeta));
}

// g(zeta) = w0 * t_pk(current) = phi / sqrt|1 - zeta^2| with phi = acos(zeta) or acosh(zeta).
// Near zeta = 1 both branches share the series 1 - d/3 + 2 d^2/15 in d = zeta - 1 (from
// u/sinh(u) with cosh(u) = zeta, continued analytically below 1).
double peakPhase(double zeta) {
  const double d = zeta - 1.0;
  if (std::abs(d) < kCriticalBand)
    return 1.0 - d / 3.0 + 2.0 * d * d / 15.0;
  if (zeta < 1.0)
    return std::acos(zeta) / std::sqrt((1.0 - zeta) * (1.0 + zeta));
  return std::acosh(zeta) / overdampedRoot(zeta);
}

bool finiteNonNegative(double x) { return std::isfinite(x) && x >= 0.0; }

RlcStep invalidStep() {
  RlcStep s;
  s.valid = false;
  s.zeta = kNaN;
  s.fNatural = Hertz(kNaN);
  s.overshoot = kNaN;
  s.iPeak = Ampere(kNaN);
  s.tPeak = Second(kNaN);
  s.rCritical = Ohm(kNaN);
  s.settling2pct = Second(kNaN);
  return s;
}

bool loopValuesValid(Ohm r, Henry l, Farad c) {
  return finiteNonNegative(r.si()) && finiteNonNegative(l.si()) && std::isfinite(c.si()) &&
         c.si() > 0.0 && !(r.si() == 0.0 && l.si() == 0.0);
}

// Error 1 - v/dV of the normalised step; it decreases monotonically between the extrema at
// w0 t = k pi / wd, which the settling search relies on.
double voltageError(double zeta, double w0t) { return 1.0 - capacitorVoltageFraction(zeta, w0t); }

// Bisection for |e(x)| = band on [lo, hi] where |e| falls monotonically through band.
double bisectBand(double zeta, double band, double lo, double hi) {
  for (int i = 0; i < 200 && hi - lo > 1e-15 * hi; ++i) {
    const double mid = 0.5 * (lo + hi);
    if (std::abs(voltageError(zeta, mid)) > band)
      lo = mid;
    else
      hi = mid;
  }
  return 0.5 * (lo + hi);
}

} // namespace

double capacitorVoltageFraction(double zeta, double w0t) {
  if (!finiteNonNegative(zeta) || !finiteNonNegative(w0t))
    return kNaN;
  const double decay = std::exp(-zeta * w0t);
  if (zeta <= 1.0) {
    // Ogata 2010 sec. 5-3; sin(wd t)/wd written as t*sinc so zeta = 1 needs no special case.
    const double wd = std::sqrt((1.0 - zeta) * (1.0 + zeta));
    return 1.0 - decay * (std::cos(wd * w0t) + zeta * w0t * sinc(wd * w0t));
  }
  const double q = overdampedRoot(zeta);
  if (q * w0t < 1.0)
    return 1.0 - decay * (std::cosh(q * w0t) + zeta * w0t * sinhc(q * w0t));
  // Separate exponentials so that cosh does not overflow for a heavily over-damped loop;
  // q - zeta = -1/(zeta + q) avoids the cancellation of the slow root.
  const double slow = std::exp(-w0t / (zeta + q));
  const double fast = std::exp(-(zeta + q) * w0t);
  return 1.0 - 0.5 * ((slow + fast) + zeta * (slow - fast) / q);
}

double loopCurrentFraction(double zeta, double w0t) {
  if (!finiteNonNegative(zeta) || !finiteNonNegative(w0t))
    return kNaN;
  const double decay = std::exp(-zeta * w0t);
  if (zeta <= 1.0) {
    // Nilsson & Riedel 2015 ch. 8: i = dV/(wd L) e^(-alpha t) sin(wd t), normalised.
    const double wd = std::sqrt((1.0 - zeta) * (1.0 + zeta));
    return decay * w0t * sinc(wd * w0t);
  }
  const double q = overdampedRoot(zeta);
  if (q * w0t < 1.0)
    return decay * w0t * sinhc(q * w0t);
  const double slow = std::exp(-w0t / (zeta + q));
  const double fast = std::exp(-(zeta + q) * w0t);
  return (slow - fast) / (2.0 * q);
}

double normalizedSettlingTime(double zeta, double band) {
  if (!finiteNonNegative(zeta) || !(band > 0.0 && band < 1.0))
    return kNaN;
  if (zeta == 0.0)
    return kInf;
  if (zeta < 1.0) {
    // |e| peaks at w0 t = k pi/wd with height PO^k; the last crossing of the band follows the
    // last peak that is still outside it, before the next zero of e.
    const double wd = std::sqrt((1.0 - zeta) * (1.0 + zeta));
    const double x = std::log(1.0 / band) * wd / (kPi * zeta); // PO^x = band
    const double k = std::max(0.0, std::ceil(x) - 1.0);
    const double lo = k * kPi / wd;
    const double hi = ((k + 1.0) * kPi - std::acos(zeta)) / wd;
    return bisectBand(zeta, band, lo, hi);
  }
  // Monotone approach: bracket, then bisect.
  double hi = 1.0;
  while (std::abs(voltageError(zeta, hi)) > band && hi < 1e300)
    hi *= 2.0;
  return bisectBand(zeta, band, 0.0, hi);
}

Second settlingEstimate2pct(double zeta, Hertz fNatural) {
  return Second(4.0 / (zeta * 2.0 * kPi * fNatural.si()));
}

Second settlingEstimate5pct(double zeta, Hertz fNatural) {
  return Second(3.0 / (zeta * 2.0 * kPi * fNatural.si()));
}

RlcStep seriesRlcStep(Ohm r, Henry l, Farad c, Volt step, bool withSettling) {
  if (!loopValuesValid(r, l, c) || !std::isfinite(step.si()))
    return invalidStep();
  RlcStep s;
  s.valid = true;
  const double R = r.si(), L = l.si(), C = c.si(), dV = step.si();
  s.rCritical = Ohm(2.0 * std::sqrt(L / C));

  if (L == 0.0) {
    // Pure R-C: the current jumps to dV/R and decays with tau = RC.
    s.zeta = kInf;
    s.fNatural = Hertz(kInf);
    s.overshoot = 0.0;
    s.iPeak = Ampere(dV / R);
    s.tPeak = Second(0.0);
    s.settling2pct = Second(R * C * std::log(50.0));
    return s;
  }

  const double sqrtLC = std::sqrt(L * C);
  const double w0 = 1.0 / sqrtLC;
  const double zeta = 0.5 * R * std::sqrt(C / L);
  s.zeta = zeta;
  s.fNatural = Hertz(w0 / (2.0 * kPi));
  if (zeta < 1.0) {
    const double root = std::sqrt((1.0 - zeta) * (1.0 + zeta));
    s.fRing = Hertz(s.fNatural.si() * root);
    s.overshoot = std::exp(-kPi * zeta / root); // Ogata 2010 sec. 5-3
  }

  // docs/physics.md section 2: I_pk = dV sqrt(C/L) exp(-zeta g), t_pk = g / w0.
  const double g = peakPhase(zeta);
  const double attenuation = std::exp(-zeta * g);
  s.iPeak = zeta <= 1.0 ? Ampere(dV * std::sqrt(C / L) * attenuation)
                        : Ampere(dV / R * 2.0 * zeta * attenuation);
  s.tPeak = Second(g * sqrtLC);
  s.settling2pct = withSettling ? Second(normalizedSettlingTime(zeta, 0.02) * sqrtLC) : Second(kNaN);
  return s;
}

std::vector<StepSample> stepWaveform(Ohm r, Henry l, Farad c, Volt vFrom, Volt vTo, Second tEnd,
                                     int points) {
  std::vector<StepSample> out;
  if (!loopValuesValid(r, l, c) || points < 2 || !(tEnd.si() > 0.0) ||
      !std::isfinite(tEnd.si()) || !std::isfinite(vFrom.si()) || !std::isfinite(vTo.si()))
    return out;
  const double R = r.si(), L = l.si(), C = c.si();
  const double dV = vTo.si() - vFrom.si();
  out.reserve(static_cast<std::size_t>(points));
  for (int i = 0; i < points; ++i) {
    const double t = tEnd.si() * i / (points - 1);
    double frac, current;
    if (L == 0.0) {
      const double decay = std::exp(-t / (R * C));
      frac = 1.0 - decay;
      current = dV / R * decay;
    } else {
      const double w0 = 1.0 / std::sqrt(L * C);
      const double zeta = 0.5 * R * std::sqrt(C / L);
      frac = capacitorVoltageFraction(zeta, w0 * t);
      current = dV * std::sqrt(C / L) * loopCurrentFraction(zeta, w0 * t);
    }
    out.push_back({Second(t), Volt(vFrom.si() + dV * frac), Ampere(current)});
  }
  return out;
}

Volt turnOnPeakGateVoltage(Volt vOff, Volt vOn, double overshoot) {
  return vOff + (vOn - vOff) * (1.0 + overshoot);
}

Volt turnOffMinGateVoltage(Volt vOn, Volt vOff, double overshootOff) {
  return vOff - (vOn - vOff) * overshootOff;
}

Henry maxInductanceForDamping(Ohm r, Farad c, double zetaMin) {
  if (r.si() < 0.0 || c.si() < 0.0)
    return Henry(kNaN);
  if (zetaMin <= 0.0)
    return Henry(kInf);
  return Henry(r.si() * r.si() * c.si() / (4.0 * zetaMin * zetaMin));
}

Ohm resistanceForDamping(Henry l, Farad c, double zeta) {
  if (l.si() < 0.0 || !(c.si() > 0.0) || zeta < 0.0)
    return Ohm(kNaN);
  return Ohm(2.0 * zeta * std::sqrt(l.si() / c.si()));
}

Meter maxTraceLength(Henry lMax, Henry lFixed, HenryPerMeter perLength) {
  if (!(perLength.si() > 0.0))
    return Meter(kNaN);
  if (std::isinf(lMax.si()) && lMax.si() > 0.0)
    return Meter(kInf);
  const double len = (lMax.si() - lFixed.si()) / perLength.si();
  return Meter(len > 0.0 ? len : 0.0);
}

} // namespace gateloop
