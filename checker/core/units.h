/// \file
/// Strongly typed physical quantities. Every value is stored in SI base units; the type says
/// which dimension it is, so a resistance can never be passed where an inductance is expected.
#pragma once

namespace gateloop {

/// A value of one physical dimension, stored in SI base units.
template <class Tag> class Quantity {
public:
  constexpr Quantity() = default;
  constexpr explicit Quantity(double si) : si_(si) {}
  constexpr double si() const { return si_; }

  constexpr Quantity operator+(Quantity o) const { return Quantity(si_ + o.si_); }
  constexpr Quantity operator-(Quantity o) const { return Quantity(si_ - o.si_); }
  constexpr Quantity operator*(double k) const { return Quantity(si_ * k); }
  constexpr Quantity operator/(double k) const { return Quantity(si_ / k); }
  constexpr double operator/(Quantity o) const { return si_ / o.si_; }
  constexpr Quantity operator-() const { return Quantity(-si_); }
  Quantity &operator+=(Quantity o) { si_ += o.si_; return *this; }
  Quantity &operator-=(Quantity o) { si_ -= o.si_; return *this; }
  constexpr bool operator<(Quantity o) const { return si_ < o.si_; }
  constexpr bool operator>(Quantity o) const { return si_ > o.si_; }
  constexpr bool operator<=(Quantity o) const { return si_ <= o.si_; }
  constexpr bool operator>=(Quantity o) const { return si_ >= o.si_; }
  constexpr bool operator==(Quantity o) const { return si_ == o.si_; }
  constexpr bool operator!=(Quantity o) const { return si_ != o.si_; }

private:
  double si_ = 0.0;
};

template <class Tag> constexpr Quantity<Tag> operator*(double k, Quantity<Tag> q) { return q * k; }

using Ohm = Quantity<struct ResistanceTag>;
using Farad = Quantity<struct CapacitanceTag>;
using Henry = Quantity<struct InductanceTag>;
using Volt = Quantity<struct VoltageTag>;
using Ampere = Quantity<struct CurrentTag>;
using Watt = Quantity<struct PowerTag>;
using Joule = Quantity<struct EnergyTag>;
using Coulomb = Quantity<struct ChargeTag>;
using Second = Quantity<struct TimeTag>;
using Hertz = Quantity<struct FrequencyTag>;
using Meter = Quantity<struct LengthTag>;
using HenryPerMeter = Quantity<struct InductancePerLengthTag>;
using VoltPerSecond = Quantity<struct SlewTag>;
using AmperePerSecond = Quantity<struct CurrentSlewTag>;
/// Temperatures are kept in degrees Celsius because every datasheet and derating curve uses them.
using Celsius = Quantity<struct CelsiusTag>;

namespace literals {
constexpr Ohm operator""_ohm(long double v) { return Ohm(double(v)); }
constexpr Ohm operator""_kohm(long double v) { return Ohm(double(v) * 1e3); }
constexpr Farad operator""_nF(long double v) { return Farad(double(v) * 1e-9); }
constexpr Farad operator""_pF(long double v) { return Farad(double(v) * 1e-12); }
constexpr Farad operator""_uF(long double v) { return Farad(double(v) * 1e-6); }
constexpr Henry operator""_nH(long double v) { return Henry(double(v) * 1e-9); }
constexpr Volt operator""_V(long double v) { return Volt(double(v)); }
constexpr Ampere operator""_A(long double v) { return Ampere(double(v)); }
constexpr Watt operator""_W(long double v) { return Watt(double(v)); }
constexpr Coulomb operator""_nC(long double v) { return Coulomb(double(v) * 1e-9); }
constexpr Coulomb operator""_uC(long double v) { return Coulomb(double(v) * 1e-6); }
constexpr Second operator""_ns(long double v) { return Second(double(v) * 1e-9); }
constexpr Second operator""_us(long double v) { return Second(double(v) * 1e-6); }
constexpr Hertz operator""_kHz(long double v) { return Hertz(double(v) * 1e3); }
constexpr Hertz operator""_MHz(long double v) { return Hertz(double(v) * 1e6); }
constexpr Meter operator""_mm(long double v) { return Meter(double(v) * 1e-3); }
constexpr Meter operator""_um(long double v) { return Meter(double(v) * 1e-6); }
constexpr Celsius operator""_degC(long double v) { return Celsius(double(v)); }
} // namespace literals

} // namespace gateloop
