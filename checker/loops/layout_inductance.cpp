#include "checker/loops/layout_inductance.h"

#include "checker/core/eng_format.h"
#include "checker/loops/loop_geometry.h"
#include "checker/loops/loop_physics.h"
#include "checker/physics/line_inductance.h"

#include <algorithm>
#include <cmath>
#include <set>

namespace gateloop {

namespace {

Meter layerCopper(const Layout &layout, const std::string &layer) {
  const StackupLayer *l = layout.layer(layer);
  return l ? l->copper : Meter(35e-6);
}

std::optional<Meter> layerZ(const Layout &layout, const std::string &layer) {
  const StackupLayer *l = layout.layer(layer);
  if (!l) return std::nullopt;
  return l->z;
}

// The routing entry that names \p net as its pair partner (a one-sided pair declaration).
const NetRouting *pairedBy(const Layout &layout, const std::string &net) {
  for (const auto &r : layout.nets)
    if (r.ret.kind == NetReturn::Kind::Pair && equalsIgnoreCase(r.ret.target, net)) return &r;
  return nullptr;
}

class Accumulator {
public:
  Accumulator(const Layout &layout, const OperatingPoint &op) : layout_(layout), op_(op) {}

  void addNet(std::string_view netName) {
    const std::string net(netName);
    if (done_.count(toLower(net))) return;
    done_.insert(toLower(net));
    if (const WireLead *w = wireFor(net)) return addWire(*w);
    const NetRouting *r = layout_.routing(net);
    const NetRouting *partner = nullptr;
    if (r && r->ret.kind == NetReturn::Kind::Pair) partner = layout_.routing(r->ret.target);
    else if (const NetRouting *by = pairedBy(layout_, net)) {
      partner = r;
      r = by;
    }
    if (r && partner) return addPair(*r, *partner);
    if (r) return addSingle(*r);
    out_.missing.push_back("net " + net + " is not in the layout sidecar");
  }

  NetsInductance finish() {
    if (methods_.empty()) {
      out_.method = "none";
    } else if (methods_.size() == 1) {
      out_.method = *methods_.begin();
    } else {
      out_.method = "mixed";
    }
    return std::move(out_);
  }

private:
  const WireLead *wireFor(const std::string &net) const {
    for (const auto &w : layout_.wires)
      for (const auto &n : w.nets)
        if (equalsIgnoreCase(n, net)) return &w;
    return nullptr;
  }

  void addLength(Meter m) { out_.length = out_.length ? *out_.length + m : m; }

  void addWire(const WireLead &w) {
    for (const auto &n : w.nets) done_.insert(toLower(n));
    // Two-wire line (physics.md 1.7); a twisted pair uses the same formula with the wire length
    // (common practice, no single source).
    HenryPerMeter perLength = twoWireLineInductance(w.spacing, w.diameter / 2.0);
    out_.inductance += Henry(perLength.si() * w.length.si());
    addLength(w.length);
    methods_.insert("wires");
  }

  void addPair(const NetRouting &a, const NetRouting &b) {
    done_.insert(toLower(a.net));
    done_.insert(toLower(b.net));
    // A pair is one line, counted once over the longer of the two lengths.
    std::optional<Meter> len = a.length;
    if (b.length && (!len || *b.length > *len)) len = b.length;
    if (!len) {
      out_.missing.push_back("nets " + a.net + " and " + b.net + " have no length in the layout sidecar");
      return;
    }
    std::optional<Meter> width = a.width;
    if (b.width && (!width || *b.width < *width)) width = b.width;
    if (!width) return addAssumed(a.net + "/" + b.net, *len, "no width");
    HenryPerMeter perLength;
    if (equalsIgnoreCase(a.layer, b.layer) || a.layer.empty() || b.layer.empty()) {
      Meter gap = a.ret.gap ? *a.ret.gap : b.ret.gap ? *b.ret.gap : *width;
      if (!a.ret.gap && !b.ret.gap)
        out_.assumptions.push_back("pair " + a.net + "/" + b.net + " on one layer has no 'gap'; edge gap of " +
                                   eng(gap.si(), "m") + " (one trace width) assumed");
      perLength = coplanarStripsInductance(*width, gap);
    } else {
      auto za = layerZ(layout_, a.layer), zb = layerZ(layout_, b.layer);
      if (!za || !zb) return addAssumed(a.net + "/" + b.net, *len, "layer depth unknown");
      perLength = stackedPairInductance(*width, Meter(std::fabs(za->si() - zb->si())));
    }
    out_.inductance += Henry(perLength.si() * len->si());
    addLength(*len);
    methods_.insert("nets");
  }

  void addSingle(const NetRouting &r) {
    if (!r.length) {
      out_.missing.push_back("net " + r.net + " has no length in the layout sidecar");
      return;
    }
    if (r.ret.kind == NetReturn::Kind::Plane && r.width) {
      auto zTrace = layerZ(layout_, r.layer), zPlane = layerZ(layout_, r.ret.target);
      if (zTrace && zPlane && std::fabs(zTrace->si() - zPlane->si()) > 0) {
        // Trace over a plane: Hammerstad-Jensen microstrip (physics.md 1.8), h = layer distance.
        Meter h(std::fabs(zTrace->si() - zPlane->si()));
        HenryPerMeter perLength = microstripInductanceHammerstadJensen(*r.width, h, layerCopper(layout_, r.layer));
        out_.inductance += Henry(perLength.si() * r.length->si());
        addLength(*r.length);
        methods_.insert("nets");
        return;
      }
    }
    addAssumed(r.net, *r.length, r.ret.kind == NetReturn::Kind::None ? "no return path given" : "incomplete geometry");
  }

  void addAssumed(const std::string &what, Meter length, const std::string &why) {
    double perLength = op_.assumedInductancePerLength ? op_.assumedInductancePerLength->si() : kDefaultInductancePerMeter;
    out_.inductance += Henry(perLength * length.si());
    addLength(length);
    out_.assumptions.push_back(what + ": " + why + "; " + eng(perLength, "H/m") + " assumed over " +
                               eng(length.si(), "m"));
    methods_.insert("assumed");
  }

  const Layout &layout_;
  const OperatingPoint &op_;
  NetsInductance out_;
  std::set<std::string> done_;
  std::set<std::string> methods_;
};

// The drawn loop by partial inductances (physics.md 1.1): the most detailed data wins.
std::optional<NetsInductance> traceInductance(const std::vector<NetId> &outgoing, NetId ref, const Circuit &circuit,
                                              const Layout &layout) {
  std::vector<std::string> outNames;
  for (NetId n : outgoing)
    if (n != kNone) outNames.emplace_back(circuit.netAt(n).name);
  std::string refName = ref == kNone ? std::string() : std::string(circuit.netAt(ref).name);
  auto geometry = buildLoopGeometry(outNames, refName, layout);
  if (!geometry) return std::nullopt;
  std::optional<Meter> planeZ;
  if (geometry->planeDepth) planeZ = Meter(-geometry->planeDepth->si());
  auto l = loopInductance(geometry->segments, planeZ);
  if (!l) return std::nullopt;
  NetsInductance out;
  out.inductance = l->total;
  out.split = InductanceSplit{l->outgoingSelf, l->returnSelf, l->mutual, l->segments};
  out.length = geometry->drawnLength;
  out.method = "traces";
  std::vector<std::string> all = outNames;
  if (!refName.empty()) all.push_back(refName);
  for (const auto &n : all) {
    bool drawn = std::any_of(layout.traces.begin(), layout.traces.end(),
                             [&](const TracePath &t) { return equalsIgnoreCase(t.net, n); });
    if (!drawn && !(n == refName && geometry->planeDepth))
      out.assumptions.push_back("net " + n + " has no traces; the loop is closed across it with a straight piece");
  }
  return out;
}

} // namespace

NetsInductance layoutInductance(const std::vector<NetId> &outgoing, NetId ref, const Circuit &circuit,
                                const Layout *layout, const OperatingPoint &op) {
  if (!layout) {
    NetsInductance none;
    none.method = "none";
    none.missing.push_back("no layout sidecar: the loop inductance covers part-internal inductance only");
    return none;
  }
  if (!layout->traces.empty()) {
    if (auto fromTraces = traceInductance(outgoing, ref, circuit, *layout)) return std::move(*fromTraces);
  }
  Accumulator acc(*layout, op);
  for (NetId n : outgoing)
    if (n != kNone) acc.addNet(circuit.netAt(n).name);
  if (ref != kNone) acc.addNet(circuit.netAt(ref).name);
  return acc.finish();
}

} // namespace gateloop
