/// \file
/// The numbers of each gate loop (spec section 5): resistances, gate capacitance, loop inductance
/// from the layout, damping and step response, and the load on every external gate resistor.
/// Missing data leaves the quantity empty and says why in `missing`; assumed data is listed in
/// `assumptions`. Nothing here judges a value: that is the rules' job.
#pragma once

#include "checker/core/units.h"
#include "checker/loops/gate_loop.h"
#include "checker/model/layout.h"
#include "checker/model/project.h"

#include <optional>
#include <string>
#include <vector>

namespace gateloop {

/// Load on one external gate resistor for one edge (or both, when shared).
struct ResistorLoad {
  ComponentId id = kNone;
  Ohm resistance;
  bool sharedByBothEdges = false;
  Hertz pulseRate;        ///< pulses per second in this resistor (f_sw, or 2 f_sw when shared)
  Watt averagePower;      ///< over both edges when shared
  Joule energyPerPulse;
  Ampere peakCurrent;     ///< through this resistor (its share of the edge's peak)
  Watt peakPower;
  Second pulseWidth;      ///< equivalent rectangular pulse width, tau/2
  /// Rated power derated to the ambient temperature (IEC 60115-1 curve); empty without data.
  std::optional<Watt> deratedPower;
  /// Permissible repetitive peak power at this pulse width and rate, from the part's pulse curve.
  std::optional<Watt> pulseLimit;
  bool pulseOutsideCurve = false;  ///< the pulse width lies outside the curve's range
};

/// One switching edge (turn-on or turn-off) of a loop.
struct EdgeAnalysis {
  bool hasPath = false;
  std::vector<ComponentId> resistors;      ///< external resistors on conducting paths
  std::optional<Ohm> rExternal;            ///< parallel combination of the conducting paths
  std::optional<Ohm> rDriver;
  std::optional<Ohm> rTotal;               ///< driver + external + internal gate resistance
  std::optional<Henry> lLoop;              ///< largest inductance among the conducting paths
  std::optional<double> zeta;
  std::optional<Hertz> fRing;              ///< empty when not oscillatory (zeta >= 1)
  std::optional<double> overshoot;         ///< fraction of the step
  std::optional<Ampere> iPeak;             ///< exact series-RLC peak
  std::optional<Second> tPeak;
  std::optional<Volt> vPeak;               ///< on: highest gate voltage; off: lowest
  std::optional<Watt> pAvg;                ///< in all external resistors of this edge
  std::optional<Joule> ePulse;             ///< per transition, in all external resistors
  std::optional<Second> tPulse;            ///< equivalent rectangular pulse width
  std::vector<ResistorLoad> loads;
};

struct LoopAnalysis {
  std::optional<Volt> vOn, vOff;           ///< drive rails (operating point overrides the driver)
  std::optional<Farad> cGate;              ///< q_g / swing plus external C_ge
  std::optional<Meter> length;             ///< loop length from the layout (pairs counted once)
  Henry lLayout;                           ///< from the layout: traces, nets, wires, assumptions
  Henry lFixed;                            ///< part-internal gate inductance
  std::string inductanceMethod;            ///< "traces", "nets", "wires", "assumed", "mixed", "none"
  /// Split of lLayout when it comes from drawn traces (partial-element method).
  std::optional<Henry> lOutgoingSelf, lReturnSelf, lMutual;
  EdgeAnalysis on, off;
  std::vector<std::string> assumptions;    ///< values assumed for lack of data
  std::vector<std::string> missing;        ///< data that would be needed but is absent
};

/// Default inductance per metre for a net whose layout gives only a length: about 1 nH/mm, the
/// trade's rule of thumb for an isolated conductor (common practice, no single source).
inline constexpr double kDefaultInductancePerMeter = 1e-6;

/// Computes the numbers of \p loop. \p layout may be null (no sidecar).
LoopAnalysis analyzeLoop(const GateLoop &loop, const Circuit &circuit, const PartLibrary &lib,
                         const Layout *layout, const OperatingPoint &op);

} // namespace gateloop
