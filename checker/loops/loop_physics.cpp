#include "checker/loops/loop_physics.h"

#include "checker/core/eng_format.h"
#include "checker/loops/layout_inductance.h"
#include "checker/physics/gate_drive.h"
#include "checker/physics/resistor_rating.h"
#include "checker/physics/rlc_step.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace gateloop {

namespace {

constexpr double kDefaultAmbientC = 25.0;

const Part *partOf(const Circuit &circuit, const PartLibrary &lib, ComponentId id) {
  const Component &c = circuit.component(id);
  return c.part == kNone ? nullptr : &lib.parts[c.part];
}

struct PathNumbers {
  std::optional<Ohm> resistance;   ///< sum of series resistances; empty when one is unknown
  Henry inductance;                ///< series L, ferrite L and resistor ESL
  Henry layoutInductance;          ///< of the path's own nets from the sidecar
};

/// The note for a resistor part without its derating knee, made once per part id and thread:
/// every loop with such a resistor carries it. (Keyed by the id, which is all the text depends on;
/// a part's address could be reused by another library.)
const std::string &kneeAssumption(const Part &p) {
  thread_local std::vector<std::pair<std::string, std::string>> made;
  for (const auto &[id, text] : made)
    if (id == p.id) return text;
  if (made.size() > 64) made.clear(); // a bound for runs over many libraries (audit)
  made.emplace_back(p.id, "resistor part " + p.id + " lacks t_knee/t_max; 70/155 degC assumed (typical thick film)");
  return made.back().second;
}

class LoopCalculator {
public:
  LoopCalculator(const GateLoop &loop, const Circuit &circuit, const PartLibrary &lib, const Layout *layout,
                 const OperatingPoint &op)
      : loop_(loop), circuit_(circuit), lib_(lib), layout_(layout), op_(op),
        sw_(loop.switchId == kNone ? nullptr : partOf(circuit, lib, loop.switchId)),
        drv_(loop.driver == kNone ? nullptr : partOf(circuit, lib, loop.driver)) {}

  LoopAnalysis run() {
    railVoltages();
    gateCapacitance();
    a_.lFixed = sw_ && sw_->lGateInternal ? *sw_->lGateInternal : Henry(0.0);
    if (sw_ && !sw_->lGateInternal) note(missing_, "l_gate_internal of the switch part (taken as 0)");
    loopLength();
    edge(true, a_.on);
    edge(false, a_.off);
    shareResistorsAcrossEdges();
    // Sorted and without repeats, as reports list them.
    std::sort(assumptions_.begin(), assumptions_.end());
    std::sort(missing_.begin(), missing_.end());
    a_.assumptions = std::move(assumptions_);
    a_.missing = std::move(missing_);
    return std::move(a_);
  }

private:
  // A loop collects a handful of notes, many of them the same for every resistor: a scan finds
  // a repeat before any string is made.
  static void note(std::vector<std::string> &into, std::string_view text) {
    if (std::find(into.begin(), into.end(), text) == into.end()) into.emplace_back(text);
  }

  void railVoltages() {
    a_.vOn = op_.driveVOn ? op_.driveVOn : drv_ ? drv_->vOn : std::nullopt;
    a_.vOff = op_.driveVOff ? op_.driveVOff : drv_ ? drv_->vOff : std::nullopt;
    if (!a_.vOn) note(missing_, "drive on-voltage (operating.drive.v_on or the driver's v_on)");
    if (!a_.vOff) note(missing_, "drive off-voltage (operating.drive.v_off or the driver's v_off)");
  }

  std::optional<Volt> swing() const {
    if (!a_.vOn || !a_.vOff) return std::nullopt;
    return *a_.vOn - *a_.vOff;
  }

  void gateCapacitance() {
    std::optional<Farad> c;
    if (sw_ && sw_->qG) {
      if (sw_->qGSwing) {
        c = effectiveGateCapacitance(*sw_->qG, sw_->qGSwing->high - sw_->qGSwing->low);
      } else if (auto dv = swing()) {
        c = effectiveGateCapacitance(*sw_->qG, *dv);
        note(assumptions_, "q_g_swing not given; q_g taken over the drive swing");
      }
    } else if (sw_ && sw_->cIes) {
      c = *sw_->cIes;
      note(assumptions_, "q_g not given; c_ies used as the gate capacitance (it underestimates the charge)");
    } else {
      note(missing_, "q_g (or c_ies) of the switch part");
    }
    if (!c) return;
    for (const Shunt &s : loop_.shunts) {
      if (s.kind != ShuntKind::Capacitor) continue;
      const Component &cap = circuit_.component(s.elements.front());
      const Part *p = partOf(circuit_, lib_, s.elements.front());
      if (p && p->capacitance) *c += *p->capacitance;
      else if (cap.hasValue()) *c += Farad(cap.value);
    }
    a_.cGate = c;
  }

  void loopLength() {
    std::vector<NetId> outgoing;
    for (const auto &p : loop_.paths)
      for (NetId n : p.nets)
        if (std::find(outgoing.begin(), outgoing.end(), n) == outgoing.end()) outgoing.push_back(n);
    NetsInductance all = layoutInductance(outgoing, loop_.refNet, circuit_, layout_, op_);
    a_.length = all.length;
    a_.inductanceMethod = all.method;
    a_.lLayout = all.inductance;
    if (all.split) {
      a_.lOutgoingSelf = all.split->outgoingSelf;
      a_.lReturnSelf = all.split->returnSelf;
      a_.lMutual = all.split->mutual;
    }
    for (auto &s : all.assumptions) note(assumptions_, s);
    for (auto &s : all.missing) note(missing_, s);
  }

  // A path that carries both edges is computed once: with drawn traces its layout inductance is
  // a partial-element sum over every pair of segments.
  const PathNumbers &cachedPathNumbers(std::size_t pathIndex) {
    if (pathIndex < kInlinePaths) {
      auto &slot = inlinePathCache_[pathIndex];
      if (!slot) slot = pathNumbers(loop_.paths[pathIndex]);
      return *slot;
    }
    if (pathCache_.empty()) pathCache_.resize(loop_.paths.size());
    auto &slot = pathCache_[pathIndex];
    if (!slot) slot = pathNumbers(loop_.paths[pathIndex]);
    return *slot;
  }

  PathNumbers pathNumbers(const GatePath &path) {
    PathNumbers pn;
    double r = 0.0;
    bool known = true;
    for (ComponentId id : path.elements) {
      const Component &c = circuit_.component(id);
      const Part *p = partOf(circuit_, lib_, id);
      LoopRole role = loopRole(c, lib_);
      if (role == LoopRole::Resistor) {
        if (c.hasValue()) r += c.value;
        else {
          known = false;
          note(missing_, "value of gate resistor " + std::string(c.name));
        }
        if (p && p->esl) pn.inductance += *p->esl;
      } else if (role == LoopRole::Inductor && c.hasValue()) {
        pn.inductance += Henry(c.value);
      } else if (role == LoopRole::Ferrite) {
        if (p && p->rDc) r += p->rDc->si();
        if (p && p->inductance) pn.inductance += *p->inductance;
        else if (c.hasValue()) pn.inductance += Henry(c.value);
      }
    }
    if (known) pn.resistance = Ohm(r);
    // The loop's notes on layout data come from loopLength(); here only the number is needed.
    if (layout_) pn.layoutInductance = layoutInductance(path.nets, loop_.refNet, circuit_, layout_, op_).inductance;
    return pn;
  }

  void edge(bool on, EdgeAnalysis &e) {
    thread_local std::vector<std::pair<const GatePath *, const PathNumbers *>> paths;
    paths.clear();
    for (std::size_t i = 0; i < loop_.paths.size(); ++i) {
      const GatePath &p = loop_.paths[i];
      if (on ? p.conductsOn : p.conductsOff) paths.emplace_back(&p, &cachedPathNumbers(i));
    }
    e.hasPath = !paths.empty();
    if (!e.hasPath) return;

    double conductance = 0.0;
    bool resistanceKnown = true;
    Henry lMax(0.0);
    for (const auto &[path, pn] : paths) {
      for (ComponentId id : path->elements)
        if (loopRole(circuit_.component(id), lib_) == LoopRole::Resistor) e.resistors.push_back(id);
      if (!pn->resistance) resistanceKnown = false;
      else conductance += pn->resistance->si() > 0 ? 1.0 / pn->resistance->si() : std::numeric_limits<double>::infinity();
      // The largest path inductance is the conservative one for damping.
      lMax = std::max(lMax, pn->inductance + pn->layoutInductance);
    }
    std::sort(e.resistors.begin(), e.resistors.end());
    e.resistors.erase(std::unique(e.resistors.begin(), e.resistors.end()), e.resistors.end());
    if (resistanceKnown) e.rExternal = Ohm(std::isinf(conductance) ? 0.0 : 1.0 / conductance);
    e.lLoop = lMax + a_.lFixed;

    std::optional<Ohm> rDriver = drv_ ? (on ? drv_->rSource : drv_->rSink) : std::nullopt;
    if (drv_ && !rDriver && paths.front().first->output == OutputKind::Bidirectional)
      rDriver = on ? drv_->rSink : drv_->rSource;
    if (!rDriver) {
      note(assumptions_, std::string("driver ") + (on ? "source" : "sink") +
                             " resistance unknown; 0 ohm assumed (worst case for damping and peak current)");
      rDriver = Ohm(0.0);
    }
    e.rDriver = rDriver;
    Ohm rInt(0.0);
    if (sw_ && sw_->rGInt) rInt = *sw_->rGInt;
    else if (sw_) note(assumptions_, "r_g_int of the switch unknown; 0 ohm assumed (worst case for damping)");
    if (!e.rExternal) return;
    e.rTotal = totalGateResistance(*rDriver, *e.rExternal, rInt);

    auto dv = swing();
    if (!a_.cGate || !dv || e.rTotal->si() <= 0.0) return;
    RlcStep step = seriesRlcStep(*e.rTotal, *e.lLoop, *a_.cGate, *dv, /*withSettling=*/false);
    if (!step.valid) return;
    e.zeta = step.zeta;
    e.fRing = step.fRing;
    e.overshoot = step.overshoot;
    e.iPeak = Ampere(std::fabs(step.iPeak.si()));
    e.tPeak = step.tPeak;
    e.vPeak = on ? turnOnPeakGateVoltage(*a_.vOff, *a_.vOn, step.overshoot)
                 : turnOffMinGateVoltage(*a_.vOn, *a_.vOff, step.overshoot);

    Second tau = gateTimeConstant(*e.rTotal, *a_.cGate);
    e.tPulse = equivalentPulseWidth(tau);
    Coulomb q(a_.cGate->si() * dv->si());
    Joule eExternal = resistorEnergyPerEdge(q, *dv, *e.rExternal, *e.rTotal);
    e.ePulse = eExternal;
    if (op_.fSw) e.pAvg = Watt(eExternal.si() * op_.fSw->si());
    else note(missing_, "switching frequency operating.f_sw");

    e.loads.reserve(e.resistors.size());
    for (const auto &[path, pn] : paths) {
      if (!pn->resistance || pn->resistance->si() <= 0.0) continue;
      double pathShare = e.rExternal->si() / pn->resistance->si(); // current fraction in this path
      for (ComponentId id : path->elements) {
        const Component &c = circuit_.component(id);
        if (loopRole(c, lib_) != LoopRole::Resistor || !c.hasValue()) continue;
        ResistorLoad load;
        load.id = id;
        load.resistance = Ohm(c.value);
        load.energyPerPulse = Joule(eExternal.si() * pathShare * c.value / pn->resistance->si());
        load.peakCurrent = Ampere(e.iPeak->si() * pathShare);
        load.peakPower = resistorPeakPower(load.peakCurrent, load.resistance);
        load.pulseWidth = *e.tPulse;
        load.pulseRate = op_.fSw ? *op_.fSw : Hertz(0.0);
        load.averagePower = Watt(load.energyPerPulse.si() * load.pulseRate.si());
        e.loads.push_back(load);
      }
    }
  }

  // A resistor on both the on and the off path sees two pulses per period; its average power is
  // the sum of both edges (physics.md 3.1, shared resistor).
  void shareResistorsAcrossEdges() {
    // A loop has a handful of resistors: sums by scanning, no map.
    auto powerOf = [](const std::vector<ResistorLoad> &loads, ComponentId id, bool &found) {
      double sum = 0.0;
      for (const auto &l : loads)
        if (l.id == id) {
          sum += l.averagePower.si();
          found = true;
        }
      return sum;
    };
    std::vector<double> total;
    for (EdgeAnalysis *e : {&a_.on, &a_.off})
      for (auto &l : e->loads) {
        bool onOn = false, onOff = false;
        double sum = powerOf(a_.on.loads, l.id, onOn) + powerOf(a_.off.loads, l.id, onOff);
        total.push_back(onOn && onOff ? sum : -1.0);
      }
    std::size_t k = 0;
    for (EdgeAnalysis *e : {&a_.on, &a_.off}) {
      for (auto &l : e->loads) {
        bool shared = total[k] >= 0.0;
        l.sharedByBothEdges = shared;
        if (shared) {
          l.averagePower = Watt(total[k]);
          l.pulseRate = l.pulseRate * 2.0;
        }
        ++k;
        ratings(l);
      }
    }
  }

  void ratings(ResistorLoad &l) {
    const Part *p = partOf(circuit_, lib_, l.id);
    if (!p || !p->pRated) return;
    Celsius tAmb = op_.tAmbient ? *op_.tAmbient : Celsius(kDefaultAmbientC);
    if (!op_.tAmbient) note(assumptions_, "operating.t_ambient not given; 25 degC assumed for resistor derating");
    Celsius tKnee = p->tKnee ? *p->tKnee : Celsius(70.0);
    Celsius tMax = p->tMax ? *p->tMax : Celsius(155.0);
    if (!p->tKnee || !p->tMax) note(assumptions_, kneeAssumption(*p));
    l.deratedPower = deratedPower(*p->pRated, tKnee, tMax, tAmb);
    if (p->pulse.empty() || l.pulseWidth.si() <= 0.0) return;
    // Beyond the curve the continuous rating applies; repetitivePulseLimit derates it for ambient.
    auto single = singlePulseLimit(p->pulse, l.pulseWidth, *p->pRated);
    if (!single) return;
    l.pulseOutsideCurve = single->belowCurve || single->aboveCurve;
    double kT = p->pRated->si() > 0 ? l.deratedPower->si() / p->pRated->si() : 0.0;
    double duty = l.pulseRate.si() > 0 ? pulseDutyCycle(l.pulseWidth, l.pulseRate) : 0.0;
    l.pulseLimit = repetitivePulseLimit(single->limit, *p->pRated, std::min(duty, 1.0), kT);
  }

  const GateLoop &loop_;
  const Circuit &circuit_;
  const PartLibrary &lib_;
  const Layout *layout_;
  const OperatingPoint &op_;
  const Part *sw_;
  const Part *drv_;
  LoopAnalysis a_;
  std::vector<std::string> assumptions_, missing_;
  // Path numbers by path index: loops have one to a few paths, kept inline; more go to the vector.
  static constexpr std::size_t kInlinePaths = 4;
  std::optional<PathNumbers> inlinePathCache_[kInlinePaths];
  std::vector<std::optional<PathNumbers>> pathCache_;
};

} // namespace

LoopAnalysis analyzeLoop(const GateLoop &loop, const Circuit &circuit, const PartLibrary &lib, const Layout *layout,
                         const OperatingPoint &op) {
  return LoopCalculator(loop, circuit, lib, layout, op).run();
}

} // namespace gateloop
