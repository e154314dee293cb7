#include "checker/loops/loop_geometry.h"

#include <algorithm>
#include <cmath>
#include <limits>

namespace gateloop {

namespace {

using Pt = std::pair<double, double>;

double dist(Pt a, Pt b) { return std::hypot(a.first - b.first, a.second - b.second); }

// Height of a layer's copper centre, z up, top surface at 0: top copper sits above the surface,
// bottom copper below the board, inner layers at their depth.
double copperCentreZ(const Layout &layout, const std::string &layerName) {
  const StackupLayer *l = layout.layer(layerName);
  if (!l) return 0.0;
  double depth = l->z.si(), t = l->copper.si();
  double deepest = 0.0;
  for (const auto &s : layout.stackup) deepest = std::max(deepest, s.z.si());
  if (depth <= 0.0) return t / 2;
  if (depth >= deepest && deepest > 0.0) return -(depth + t / 2);
  return -depth;
}

Pt startOf(const PlacedTrace &p) { return p.reversed ? p.trace->pointsM.back() : p.trace->pointsM.front(); }
Pt endOf(const PlacedTrace &p) { return p.reversed ? p.trace->pointsM.front() : p.trace->pointsM.back(); }

std::vector<Pt> pointsInOrder(const PlacedTrace &p) {
  std::vector<Pt> pts = p.trace->pointsM;
  if (p.reversed) std::reverse(pts.begin(), pts.end());
  return pts;
}

} // namespace

std::optional<LoopGeometry> buildLoopGeometry(const std::vector<std::string> &outgoingNets,
                                              const std::string &returnNet, const Layout &layout) {
  std::vector<PlacedTrace> pool;
  for (const auto &t : layout.traces) {
    if (t.pointsM.size() < 2) continue;
    bool out = false;
    for (const auto &n : outgoingNets) out |= equalsIgnoreCase(n, t.net);
    if (out) pool.push_back({&t, false, LoopPart::Outgoing});
    else if (!returnNet.empty() && equalsIgnoreCase(returnNet, t.net)) pool.push_back({&t, false, LoopPart::Return});
  }
  auto firstOut = std::find_if(pool.begin(), pool.end(), [](const auto &p) { return p.part == LoopPart::Outgoing; });
  if (firstOut == pool.end()) return std::nullopt;

  LoopGeometry g;
  // Greedy chaining by nearest end point, outgoing traces first: the drawn pieces are joined the
  // way the copper is, and the direction of travel does not change a loop's self inductance.
  g.traces.push_back(*firstOut);
  pool.erase(firstOut);
  while (!pool.empty()) {
    Pt end = endOf(g.traces.back());
    bool outgoingLeft = std::any_of(pool.begin(), pool.end(), [](const auto &p) { return p.part == LoopPart::Outgoing; });
    double best = std::numeric_limits<double>::infinity();
    std::size_t bestIndex = 0;
    bool bestReversed = false;
    for (std::size_t i = 0; i < pool.size(); ++i) {
      if (outgoingLeft && pool[i].part != LoopPart::Outgoing) continue;
      double dStart = dist(end, pool[i].trace->pointsM.front()), dEnd = dist(end, pool[i].trace->pointsM.back());
      if (std::min(dStart, dEnd) < best) {
        best = std::min(dStart, dEnd);
        bestIndex = i;
        bestReversed = dEnd < dStart;
      }
    }
    PlacedTrace next = pool[bestIndex];
    next.reversed = bestReversed;
    g.traces.push_back(next);
    pool.erase(pool.begin() + static_cast<std::ptrdiff_t>(bestIndex));
  }

  bool drawnReturn = std::any_of(g.traces.begin(), g.traces.end(), [](const auto &p) { return p.part == LoopPart::Return; });
  if (!drawnReturn) {
    for (const auto &n : outgoingNets) {
      const NetRouting *r = layout.routing(n);
      if (r && r->ret.kind == NetReturn::Kind::Plane)
        if (const StackupLayer *plane = layout.layer(r->ret.target)) {
          g.planeDepth = plane->z;
          break;
        }
    }
  }

  for (std::size_t i = 0; i < g.traces.size(); ++i) {
    const PlacedTrace &p = g.traces[i];
    const TracePath &t = *p.trace;
    const StackupLayer *l = layout.layer(t.layer);
    Meter thickness = l ? l->copper : Meter(35e-6);
    Meter z(copperCentreZ(layout, t.layer));
    auto pts = pointsInOrder(p);
    for (std::size_t k = 1; k < pts.size(); ++k) g.drawnLength += Meter(dist(pts[k - 1], pts[k]));
    g.outline.insert(g.outline.end(), pts.begin(), pts.end());
    auto segs = polylineSegments(pts, z, t.width, thickness, p.part);
    g.segments.insert(g.segments.end(), segs.begin(), segs.end());
    // Close the gap to the next trace (or back to the start) through the component body.
    bool last = i + 1 == g.traces.size();
    if (last && g.planeDepth) break; // the ends go down to the plane through the vias below
    Pt from = pts.back(), to = last ? startOf(g.traces.front()) : startOf(g.traces[i + 1]);
    if (dist(from, to) > 0.0) {
      auto gap = polylineSegments({from, to}, z, t.width, thickness, p.part);
      g.segments.insert(g.segments.end(), gap.begin(), gap.end());
    }
  }
  if (g.planeDepth) {
    // Vias from both ends of the drawn path down to the plane; the image continues them.
    Pt a = startOf(g.traces.front()), b = endOf(g.traces.back());
    const TracePath &t0 = *g.traces.front().trace;
    double zTop0 = copperCentreZ(layout, t0.layer), zTop1 = copperCentreZ(layout, g.traces.back().trace->layer);
    double zPlane = -g.planeDepth->si();
    Meter w = t0.width, th(35e-6);
    g.segments.push_back({Conductor::bar({b.first, b.second, zTop1}, {b.first, b.second, zPlane}, w, th), +1,
                          LoopPart::Outgoing});
    g.segments.push_back({Conductor::bar({a.first, a.second, zPlane}, {a.first, a.second, zTop0}, w, th), +1,
                          LoopPart::Outgoing});
  }
  return g;
}

} // namespace gateloop
