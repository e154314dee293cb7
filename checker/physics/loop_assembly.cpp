/// \file
/// Partial-inductance sum over a loop, parallel over pair rows.
#include "checker/physics/loop_assembly.h"

#include <algorithm>
#include <atomic>
#include <cmath>
#include <cstdio>
#include <system_error>
#include <thread>

namespace gateloop {

namespace {

constexpr std::size_t kRowsPerTask = 4;
constexpr std::size_t kMinSegmentsForThreads = 64;
constexpr unsigned kMaxThreads = 64;

bool finite(Point3 p) { return std::isfinite(p.x) && std::isfinite(p.y) && std::isfinite(p.z); }

std::string mm(double metres) {
  char buf[48];
  std::snprintf(buf, sizeof buf, "%.6g mm", metres * 1e3);
  return buf;
}

/// Half of the section's extent along z: how far the body reaches above and below the axis.
double halfExtentAlongZ(const Conductor &c) {
  const double dx = c.b.x - c.a.x, dy = c.b.y - c.a.y, dz = c.b.z - c.a.z;
  const double len = std::sqrt(dx * dx + dy * dy + dz * dz);
  if (len <= 0) return 0.0;
  const double uz = dz / len;
  if (c.section == CrossSection::Round) return 0.5 * c.width.si() * std::sqrt(std::max(0.0, 1 - uz * uz));
  // Width is horizontal, so only the thickness direction has a z component: |t_z| = sqrt(1-uz^2).
  const double horizontal = std::sqrt(dx * dx + dy * dy) / len;
  if (horizontal < 1e-6) return 0.0; // vertical: the section lies in the x-y plane
  return 0.5 * c.thickness.si() * horizontal;
}

struct RowSums {
  double mutual = 0.0; ///< sum over j > i of s_i s_j Mp(i, j)
  double image = 0.0;  ///< sum over j >= i of w s_i s_j Mp(i, j*), w = 1 on the diagonal, else 2
};

} // namespace

std::vector<LoopGeometryProblem> checkLoopGeometry(const std::vector<LoopSegment> &segments,
                                                   std::optional<Meter> imagePlaneZ) {
  std::vector<LoopGeometryProblem> problems;
  auto add = [&](std::size_t i, std::string m) { problems.push_back({i, std::move(m)}); };
  if (imagePlaneZ && !std::isfinite(imagePlaneZ->si()))
    add(0, "image plane height is not a finite number");
  double side = 0.0; // +1: loop above the plane, -1: below
  for (std::size_t i = 0; i < segments.size(); ++i) {
    const LoopSegment &s = segments[i];
    const Conductor &c = s.conductor;
    if (!finite(c.a) || !finite(c.b)) {
      add(i, "segment " + std::to_string(i) + " has a coordinate that is not a finite number");
      continue;
    }
    const double w = c.width.si(), t = c.thickness.si();
    if (!(std::isfinite(w) && w > 0))
      add(i, "segment " + std::to_string(i) + " has width " + mm(w) + ", must be positive");
    if (c.section == CrossSection::Rectangle && !(std::isfinite(t) && t > 0))
      add(i, "segment " + std::to_string(i) + " has thickness " + mm(t) + ", must be positive");
    if (s.sign != 1 && s.sign != -1)
      add(i, "segment " + std::to_string(i) + " has current sign " + std::to_string(s.sign) +
                 ", must be +1 or -1");
    if (!imagePlaneZ || !std::isfinite(imagePlaneZ->si())) continue;
    const double z0 = imagePlaneZ->si();
    const double mid = 0.5 * (c.a.z + c.b.z) - z0;
    if (side == 0.0 && mid != 0.0) side = mid > 0 ? 1.0 : -1.0;
    const double need = halfExtentAlongZ(c);
    const double tol = 1e-12 + 1e-9 * std::max({std::abs(c.a.z), std::abs(c.b.z), std::abs(z0)});
    const double ha = side * (c.a.z - z0), hb = side * (c.b.z - z0);
    if (side == 0.0 || std::min(ha, hb) < need - tol)
      add(i, "segment " + std::to_string(i) + " reaches through the return plane at z = " +
                 mm(z0) + " (ends at z = " + mm(c.a.z) + " and " + mm(c.b.z) + ")");
  }
  return problems;
}

Conductor mirrorInPlane(const Conductor &c, Meter planeZ) {
  Conductor m = c;
  m.a.z = 2.0 * planeZ.si() - c.a.z;
  m.b.z = 2.0 * planeZ.si() - c.b.z;
  return m;
}

std::optional<LoopInductance> loopInductance(const std::vector<LoopSegment> &segments,
                                             std::optional<Meter> imagePlaneZ,
                                             const LoopOptions &options) {
  if (!checkLoopGeometry(segments, imagePlaneZ).empty()) return std::nullopt;
  const std::size_t n = segments.size();
  std::vector<PreparedConductor> drawn(n), mirrored;
  std::vector<double> sign(n);
  LoopInductance out;
  out.segments = n;
  double outgoingSelf = 0.0, returnSelf = 0.0, length = 0.0;
  for (std::size_t i = 0; i < n; ++i) {
    drawn[i] = PreparedConductor(segments[i].conductor);
    sign[i] = segments[i].sign;
    const double self = selfPartial(drawn[i]).si();
    (segments[i].part == LoopPart::Outgoing ? outgoingSelf : returnSelf) += self;
    length += drawn[i].length().si();
  }
  if (imagePlaneZ) {
    mirrored.resize(n);
    for (std::size_t i = 0; i < n; ++i)
      mirrored[i] = PreparedConductor(mirrorInPlane(segments[i].conductor, *imagePlaneZ));
  }

  std::vector<RowSums> rows(n);
  auto computeRow = [&](std::size_t i) {
    RowSums r;
    for (std::size_t j = i + 1; j < n; ++j)
      r.mutual +=
          sign[i] * sign[j] * mutualPartialDetailed(drawn[i], drawn[j], options.mutual).value.si();
    if (!mirrored.empty()) {
      // The image current is the mirror copy's current reversed: Mp(i, j*) = -Mp(i, j').
      for (std::size_t j = i; j < n; ++j) {
        const double m = -mutualPartialDetailed(drawn[i], mirrored[j], options.mutual).value.si();
        r.image += (j == i ? 1.0 : 2.0) * sign[i] * sign[j] * m;
      }
    }
    rows[i] = r;
  };
  std::atomic<std::size_t> next{0};
  auto worker = [&] {
    for (;;) {
      const std::size_t i0 = next.fetch_add(kRowsPerTask);
      if (i0 >= n) return;
      for (std::size_t i = i0; i < std::min(n, i0 + kRowsPerTask); ++i) computeRow(i);
    }
  };
  const unsigned threads =
      n < kMinSegmentsForThreads ? 1u : std::clamp(options.threads, 1u, kMaxThreads);
  std::vector<std::thread> pool;
  for (unsigned k = 1; k < threads; ++k) {
    try {
      pool.emplace_back(worker);
    } catch (const std::system_error &) {
      break; // no more threads available: the calling thread does the remaining rows
    }
  }
  worker();
  for (std::thread &t : pool) t.join();

  // Summed in row order so that the result does not depend on the thread schedule.
  double mutual = 0.0, image = 0.0;
  for (const RowSums &r : rows) {
    mutual += 2.0 * r.mutual;
    image += r.image;
  }
  out.outgoingSelf = Henry(outgoingSelf);
  out.returnSelf = Henry(returnSelf);
  out.image = Henry(image);
  out.mutual = Henry(mutual + image);
  out.total = Henry(outgoingSelf + returnSelf + mutual + image);
  out.length = Meter(length);
  return out;
}

std::vector<LoopSegment> subdivideSegments(const std::vector<LoopSegment> &segments,
                                           unsigned pieces) {
  pieces = std::max(1u, pieces);
  std::vector<LoopSegment> out;
  out.reserve(segments.size() * pieces);
  for (const LoopSegment &s : segments) {
    const Point3 a = s.conductor.a, b = s.conductor.b;
    auto at = [&](unsigned k) {
      const double f = double(k) / pieces;
      // The last piece ends exactly at b so that consecutive segments still meet.
      if (k == pieces) return b;
      return Point3{a.x + f * (b.x - a.x), a.y + f * (b.y - a.y), a.z + f * (b.z - a.z)};
    };
    for (unsigned k = 0; k < pieces; ++k) {
      LoopSegment piece = s;
      piece.conductor.a = at(k);
      piece.conductor.b = at(k + 1);
      out.push_back(piece);
    }
  }
  return out;
}

std::vector<LoopSegment> polylineSegments(const std::vector<std::pair<double, double>> &pointsM,
                                          Meter z, Meter width, Meter thickness, LoopPart part,
                                          bool closed) {
  std::vector<LoopSegment> out;
  const std::size_t n = pointsM.size();
  if (n < 2) return out;
  auto addSegment = [&](const std::pair<double, double> &p, const std::pair<double, double> &q) {
    if (p == q) return;
    LoopSegment s;
    s.conductor = Conductor::bar({p.first, p.second, z.si()}, {q.first, q.second, z.si()}, width,
                                 thickness);
    s.part = part;
    out.push_back(s);
  };
  for (std::size_t i = 0; i + 1 < n; ++i) addSegment(pointsM[i], pointsM[i + 1]);
  if (closed) addSegment(pointsM[n - 1], pointsM[0]);
  return out;
}

} // namespace gateloop
