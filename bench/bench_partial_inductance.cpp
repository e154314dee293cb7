/// \file
/// Timing of the partial-inductance loop sum (checker/physics/loop_assembly.h) on generated PCB
/// loops of 100, 1,000 and 5,000 segments; prints wall time per size, the growth exponent
/// between sizes and the 1-thread / 2-thread comparison. Target: 5,000 segments in under 1 s.
///
/// Loops are persistent random walks on a 0.05 mm grid with 0/45/90-degree turns and 0.5-3 mm
/// segments (invented geometry, seeded, so every run times the same loops):
///   stacked  gate trace on the top layer, return on the layer 0.4 mm below along the same path,
///            closed by two vias;
///   beside   return on the same layer, offset 1 mm to the side (mitred), closed at both ends;
///   plane    gate trace only, 0.2 mm above a solid return plane (image method), vias to the
///            plane at both ends.
/// Usage: bench_partial_inductance [--quick]   (--quick: sizes 100 and 1000 only)
#include "checker/physics/loop_assembly.h"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <ctime>
#include <optional>
#include <random>
#include <string>
#include <thread>
#include <utility>
#include <vector>

using namespace gateloop;

namespace {

constexpr double kGrid = 0.05e-3;
constexpr double kWidth = 0.5e-3, kCopper = 35e-6;

using Path = std::vector<std::pair<double, double>>;

/// Persistent random walk with \p steps segments on 45-degree directions.
Path randomWalk(std::size_t steps, unsigned seed) {
  std::mt19937 rng(seed);
  std::uniform_real_distribution<double> u(0.0, 1.0);
  std::uniform_int_distribution<int> len(10, 60);
  static const int dirs[8][2] = {{1, 0}, {1, 1}, {0, 1}, {-1, 1}, {-1, 0}, {-1, -1}, {0, -1}, {1, -1}};
  Path p{{0.0, 0.0}};
  int d = 0;
  long x = 0, y = 0;
  for (std::size_t i = 0; i < steps; ++i) {
    const double r = u(rng);
    int turn = 0;
    if (r < 0.15) turn = 1;
    else if (r < 0.30) turn = -1;
    else if (r < 0.35) turn = 2;
    else if (r < 0.40) turn = -2;
    // A straight continuation would merge with the previous segment; always turn after step 0.
    if (i > 0 && turn == 0) turn = u(rng) < 0.5 ? 1 : -1;
    d = (d + turn + 8) % 8;
    const int k = len(rng);
    x += dirs[d][0] * k;
    y += dirs[d][1] * k;
    p.push_back({x * kGrid, y * kGrid});
  }
  return p;
}

/// Polyline offset by \p dist to the left with mitred corners.
Path offsetPath(const Path &p, double dist) {
  Path out;
  const std::size_t n = p.size();
  auto normal = [&](std::size_t i) { // left normal of segment i -> i+1
    const double dx = p[i + 1].first - p[i].first, dy = p[i + 1].second - p[i].second;
    const double l = std::hypot(dx, dy);
    return std::pair<double, double>{-dy / l, dx / l};
  };
  for (std::size_t i = 0; i < n; ++i) {
    std::pair<double, double> nv;
    if (i == 0) nv = normal(0);
    else if (i == n - 1) nv = normal(n - 2);
    else {
      const auto a = normal(i - 1), b = normal(i);
      const double k = 1.0 + a.first * b.first + a.second * b.second;
      nv = {(a.first + b.first) / k, (a.second + b.second) / k};
    }
    out.push_back({p[i].first + dist * nv.first, p[i].second + dist * nv.second});
  }
  return out;
}

LoopSegment via(double x, double y, double z0, double z1, int sign, LoopPart part) {
  LoopSegment s;
  s.conductor = Conductor::bar({x, y, z0}, {x, y, z1}, Meter(0.3e-3), Meter(0.3e-3));
  s.sign = sign;
  s.part = part;
  return s;
}

struct Case {
  std::vector<LoopSegment> segments;
  std::optional<Meter> plane;
};

/// A loop of about \p total segments of the given kind.
Case makeCase(const std::string &kind, std::size_t total, unsigned seed) {
  Case c;
  if (kind == "plane") {
    const Path p = randomWalk(total - 2, seed);
    const double h = 0.2e-3 + 0.5 * kCopper; // copper centre above the plane
    c.plane = Meter(0.0);
    c.segments.push_back(via(p.front().first, p.front().second, 0.0, h, +1, LoopPart::Outgoing));
    for (auto &s : polylineSegments(p, Meter(h), Meter(kWidth), Meter(kCopper), LoopPart::Outgoing))
      c.segments.push_back(s);
    c.segments.push_back(via(p.back().first, p.back().second, h, 0.0, +1, LoopPart::Outgoing));
    return c;
  }
  const std::size_t half = (total - 2) / 2;
  const Path go = randomWalk(half, seed);
  const double zGo = 0.0;
  const double zBack = kind == "stacked" ? -0.4e-3 : 0.0;
  const Path back = kind == "stacked" ? go : offsetPath(go, 1e-3);
  for (auto &s : polylineSegments(go, Meter(zGo), Meter(kWidth), Meter(kCopper), LoopPart::Outgoing))
    c.segments.push_back(s);
  // Return segments are drawn in the same order as the gate trace; the current runs backwards.
  for (auto s : polylineSegments(back, Meter(zBack), Meter(kWidth), Meter(kCopper), LoopPart::Return)) {
    s.sign = -1;
    c.segments.push_back(s);
  }
  if (kind == "stacked") {
    c.segments.push_back(via(go.back().first, go.back().second, zGo, zBack, +1, LoopPart::Outgoing));
    c.segments.push_back(via(go.front().first, go.front().second, zBack, zGo, +1, LoopPart::Return));
  } else {
    auto link = [&](std::pair<double, double> a, std::pair<double, double> b, LoopPart part) {
      LoopSegment s;
      s.conductor = Conductor::bar({a.first, a.second, zGo}, {b.first, b.second, zGo}, Meter(kWidth),
                                   Meter(kCopper));
      s.part = part;
      c.segments.push_back(s);
    };
    link(go.back(), back.back(), LoopPart::Outgoing);
    link(back.front(), go.front(), LoopPart::Return);
  }
  return c;
}

struct Timing {
  double wall = 1e30, cpu = 1e30; ///< seconds; cpu = process CPU time over all threads
};

void timeOnce(const Case &c, unsigned threads, LoopInductance &result, Timing &best) {
  LoopOptions o;
  o.threads = threads;
  const std::clock_t c0 = std::clock();
  const auto t0 = std::chrono::steady_clock::now();
  auto r = loopInductance(c.segments, c.plane, o);
  const auto t1 = std::chrono::steady_clock::now();
  const std::clock_t c1 = std::clock();
  if (!r) {
    std::fprintf(stderr, "error: generated loop rejected by checkLoopGeometry\n");
    std::exit(1);
  }
  result = *r;
  best.wall = std::min(best.wall, std::chrono::duration<double>(t1 - t0).count());
  best.cpu = std::min(best.cpu, double(c1 - c0) / CLOCKS_PER_SEC);
}

/// The 1-minute load average, or a negative value where /proc is not available. Other processes
/// on a 2-core machine stretch the wall time, not the CPU time.
double loadAverage() {
  std::FILE *f = std::fopen("/proc/loadavg", "r");
  if (!f) return -1.0;
  double l = -1.0;
  if (std::fscanf(f, "%lf", &l) != 1) l = -1.0;
  std::fclose(f);
  return l;
}

} // namespace

int main(int argc, char **argv) {
  const bool quick = argc > 1 && std::strcmp(argv[1], "--quick") == 0;
  std::vector<std::size_t> sizes = {100, 1000, 5000};
  if (quick) sizes.pop_back();
  std::printf("partial-inductance loop sum; hardware threads %u; load average at start %.2f\n",
              std::thread::hardware_concurrency(), loadAverage());
  std::printf("%-8s %6s %12s | %10s %9s %10s %9s | %10s %10s\n", "loop", "N", "L (nH)",
              "2 threads", "exponent", "cpu", "exponent", "1 thread", "cpu");
  bool ok = true;
  for (const std::string kind : {"stacked", "beside", "plane"}) {
    double prevT = 0.0, prevCpu = 0.0;
    std::size_t prevN = 0;
    for (std::size_t n : sizes) {
      const Case c = makeCase(kind, n, 12345u + unsigned(n));
      LoopInductance r2, r1;
      // Best of several runs for the small sizes, of two for the largest.
      const int repeats = n <= 100 ? 20 : (n <= 1000 ? 3 : 2);
      Timing t2, t1;
      for (int k = 0; k < repeats; ++k) timeOnce(c, 2, r2, t2);
      for (int k = 0; k < repeats; ++k) timeOnce(c, 1, r1, t1);
      if (r1.total.si() != r2.total.si()) {
        std::printf("  thread count changed the result: %.17g vs %.17g\n", r1.total.si(), r2.total.si());
        ok = false;
      }
      // Growth exponent: log-log slope of the time between this size and the previous one.
      char expo[16] = "-", expoCpu[16] = "-";
      if (prevN) {
        const double sizeRatio = std::log(double(r2.segments) / prevN);
        std::snprintf(expo, sizeof expo, "%.2f", std::log(t2.wall / prevT) / sizeRatio);
        std::snprintf(expoCpu, sizeof expoCpu, "%.2f", std::log(t2.cpu / prevCpu) / sizeRatio);
      }
      std::printf("%-8s %6zu %12.4f | %8.4f s %9s %8.4f s %9s | %8.4f s %8.4f s\n", kind.c_str(),
                  r2.segments, r2.total.si() * 1e9, t2.wall, expo, t2.cpu, expoCpu, t1.wall, t1.cpu);
      if (n >= 5000 && t2.wall >= 1.0) ok = false;
      prevT = t2.wall;
      prevCpu = t2.cpu;
      prevN = r2.segments;
    }
  }
  std::printf("load average at end %.2f\n", loadAverage());
  std::printf(ok ? "target met: 5000 segments < 1 s, results identical for 1 and 2 threads\n"
                 : "TARGET MISSED (see above)\n");
  return ok ? 0 : 1;
}
