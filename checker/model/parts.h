/// \file
/// The parts library (`gateloop-parts/1`): electrical data of switches, drivers and passives.
/// Every datasheet value is optional: a rule that needs a missing value reports a note saying so.
#pragma once

#include "checker/core/source_location.h"
#include "checker/core/units.h"
#include "checker/physics/resistor_rating.h" // PulsePoint

#include <map>
#include <optional>
#include <string>
#include <utility>
#include <vector>

namespace gateloop {

enum class PartKind { Igbt, Mosfet, Driver, Resistor, Capacitor, Diode, Zener, Tvs, Ferrite };

const char *partKindName(PartKind k);
inline bool isSwitch(PartKind k) { return k == PartKind::Igbt || k == PartKind::Mosfet; }

template <class Q> struct Range {
  Q low;
  Q high;
};

/// One part. Fields are grouped by the part kind that uses them.
struct Part {
  std::string id;
  PartKind kind = PartKind::Resistor;
  FileId file = 0;                       ///< library file it came from
  std::string fieldPath;                 ///< "parts.<id>", for messages
  std::vector<std::string> matchSubckt;  ///< subcircuit names (case-insensitive)
  std::vector<std::string> matchModel;   ///< .model names (case-insensitive)
  /// Pin roles to pin names: switch roles gate, emitter|source, kelvin, collector|drain (stored
  /// in the kind's own words: emitter/collector for an IGBT, source/drain for a MOSFET); driver
  /// roles out_source, out_sink, out, ref, supply, clamp; diode, Zener and TVS roles anode, cathode.
  std::map<std::string, std::string, std::less<>> pins; ///< role -> pin name; found by string_view

  // Switches (igbt, mosfet). v_gs_* and v_ge_* are the same fields.
  std::optional<Volt> vGateMax, vGateMin, vThMin, vPlateau;
  std::optional<Farad> cIes, cRes;
  std::optional<Coulomb> qG;
  std::optional<Range<Volt>> qGSwing;    ///< gate swing the datasheet q_g was measured over
  std::optional<Ohm> rGInt;
  std::optional<Range<Ohm>> rgRecommendedOn, rgRecommendedOff;
  std::optional<Volt> vRated;
  std::optional<Ampere> iRated;
  std::optional<Henry> lGateInternal;
  std::optional<Second> tFall;           ///< current fall time at turn-off (IGBT datasheets)

  // Drivers.
  std::optional<Ampere> iSourcePeak, iSinkPeak;
  std::optional<Ohm> rSource, rSink;
  std::optional<Volt> vOn, vOff;

  // Resistors.
  std::string caseCode;
  std::optional<Watt> pRated;
  std::optional<double> tolerance;       ///< fraction, 0.01 = 1 %
  std::optional<Celsius> tKnee, tMax;
  std::optional<Henry> esl;
  std::optional<Volt> vMaxElement;       ///< limiting element voltage U_max
  std::vector<PulsePoint> pulse;         ///< sorted by width

  // Capacitors.
  std::optional<Farad> capacitance;

  // Diodes, Zeners, TVS.
  std::optional<Volt> vForward, vBreakdown, vClamp;
  bool bidirectional = false;

  // Ferrites.
  std::optional<Ohm> rDc;
  std::optional<Henry> inductance;
};

/// All parts of a design, from one or more library files, keyed by id.
struct PartLibrary {
  std::vector<Part> parts;
  /// Index of the part with this id (exact, case-sensitive as written), or -1.
  int find(const std::string &id) const;
};

} // namespace gateloop
