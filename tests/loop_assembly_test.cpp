/// \file
/// Tests of checker/physics/loop_assembly.h: loops assembled from partial inductances against
/// the closed forms of physics.md 1.3, 1.6 and 1.8, convergence under subdivision, the image
/// plane, input checks and thread independence.
#include "checker/physics/loop_assembly.h"

#include <gtest/gtest.h>

#include <cmath>
#include <random>

namespace gateloop {
namespace {

constexpr double kPi = 3.14159265358979323846;

Meter mm(double v) { return Meter(v * 1e-3); }
double nH(Henry h) { return h.si() * 1e9; }
Point3 pmm(double x, double y, double z) { return {x * 1e-3, y * 1e-3, z * 1e-3}; }

::testing::AssertionResult relNear(double got, double want, double rel) {
  if (std::abs(got - want) <= rel * std::abs(want)) return ::testing::AssertionSuccess();
  return ::testing::AssertionFailure() << "got " << got << ", want " << want << " (rel error "
                                       << (got - want) / want << ", allowed " << rel << ")";
}

LoopSegment segment(Conductor c, int sign = +1, LoopPart part = LoopPart::Outgoing) {
  LoopSegment s;
  s.conductor = c;
  s.sign = sign;
  s.part = part;
  return s;
}

/// Grover 1946 rectangle of round wire, physics.md 1.6 (low frequency, with the internal term).
double groverRectangle(double a, double b, double r) {
  const double g = std::hypot(a, b);
  return 4e-7 * (a * std::log(2 * a * b / (r * (a + g))) + b * std::log(2 * a * b / (r * (b + g))) +
                 2 * g - 2 * (a + b) + (a + b) / 4);
}

/// Hammerstad & Jensen 1980 microstrip inductance per length, physics.md 1.8 (air, with the
/// thickness correction). Implemented here so the test does not depend on another module.
double hammerstadJensen(double w, double h, double t) {
  double u = w / h;
  if (t > 0) {
    const double T = t / h, th = std::tanh(std::sqrt(6.517 * u));
    u += (T / kPi) * std::log(1 + 4 * std::exp(1.0) * th * th / T);
  }
  const double f = 6 + (2 * kPi - 6) * std::exp(-std::pow(30.666 / u, 0.7528));
  return 2e-7 * std::log(f / u + std::sqrt(1 + 4 / (u * u)));
}

std::vector<LoopSegment> rectangleOfWire(double a, double b, double r) {
  const Point3 p0 = pmm(0, 0, 0), p1 = pmm(a, 0, 0), p2 = pmm(a, b, 0), p3 = pmm(0, b, 0);
  return {segment(Conductor::wire(p0, p1, mm(r))), segment(Conductor::wire(p1, p2, mm(r))),
          segment(Conductor::wire(p2, p3, mm(r))), segment(Conductor::wire(p3, p0, mm(r)))};
}

/// A gate trace with 45-degree bends 0.2 mm above a plane at z = 0, vias down at both ends.
std::vector<LoopSegment> bentTraceOverPlane() {
  const double h = 0.2 + 0.0175; // copper centre above the plane, mm
  const std::vector<std::pair<double, double>> pts = {
      {0, 0}, {10e-3, 0}, {15e-3, 5e-3}, {15e-3, 20e-3}, {5e-3, 25e-3}, {0, 25e-3}};
  auto segs = polylineSegments(pts, mm(h), mm(0.5), mm(0.035), LoopPart::Outgoing);
  segs.insert(segs.begin(), segment(Conductor::bar(pmm(0, 0, 0), pmm(0, 0, h), mm(0.3), mm(0.3))));
  segs.push_back(segment(Conductor::bar(pmm(0, 25, h), pmm(0, 25, 0), mm(0.3), mm(0.3))));
  return segs;
}

TEST(LoopAssembly, RectangleOfRoundWireMatchesGrover) {
  // physics.md 1.6: the local Grover formula reproduces the page's check values ...
  EXPECT_TRUE(relNear(groverRectangle(0.1, 0.1, 1e-3) * 1e9, 326.4926, 1e-6));
  EXPECT_TRUE(relNear(groverRectangle(0.05, 0.02, 0.5e-3) * 1e9, 99.0390, 1e-5));
  // ... and the partial-inductance loop equals the page's partial sum 2Lp(a) + 2Lp(b) - 2Mp - 2Mp
  // (1.2 exact + 1.4), within Grover's neglected r/l terms of the closed form (0.5 % for
  // r/min(a,b) <= 0.05; the issue asks 2 %).
  const auto square = loopInductance(rectangleOfWire(100, 100, 1));
  ASSERT_TRUE(square);
  EXPECT_TRUE(relNear(nH(square->total), 327.2906, 1e-5));        // physics.md 1.6 (b)
  EXPECT_TRUE(relNear(nH(square->total), 326.4926, 5e-3));        // Grover 1946, physics.md 1.6
  const auto rect = loopInductance(rectangleOfWire(50, 20, 0.5));
  ASSERT_TRUE(rect);
  EXPECT_TRUE(relNear(nH(rect->total), 99.4372, 1e-5));           // physics.md 1.6 (b)
  EXPECT_TRUE(relNear(nH(rect->total), 99.0390, 5e-3));           // Grover 1946, physics.md 1.6
  EXPECT_EQ(square->segments, 4u);
  EXPECT_TRUE(relNear(square->length.si(), 0.4, 1e-12));
}

TEST(LoopAssembly, StackedGoAndReturnPair) {
  // physics.md 1.3 (b): two 1 mm x 35 um x 20 mm traces stacked with a 0.2 mm gap, opposite
  // currents: 2 (Lp - Mp) = 4.275936 nH. The return is drawn a -> b with sign -1.
  const std::vector<LoopSegment> loop = {
      segment(Conductor::bar(pmm(0, 0, 0), pmm(20, 0, 0), mm(1), mm(0.035))),
      segment(Conductor::bar(pmm(0, 0, -0.235), pmm(20, 0, -0.235), mm(1), mm(0.035)), -1,
              LoopPart::Return)};
  const auto r = loopInductance(loop);
  ASSERT_TRUE(r);
  EXPECT_TRUE(relNear(nH(r->total), 4.275936, 1e-6));
  EXPECT_TRUE(relNear(nH(r->outgoingSelf), 16.679768, 1e-6));     // physics.md 1.3 (b)
  EXPECT_TRUE(relNear(nH(r->returnSelf), 16.679768, 1e-6));       // physics.md 1.3 (b)
  EXPECT_TRUE(relNear(nH(r->mutual), -2 * 14.541800, 1e-6));      // physics.md 1.3 (b)
  EXPECT_EQ(r->image.si(), 0.0);
  // Drawing the return b -> a with sign +1 is the same loop.
  const std::vector<LoopSegment> flipped = {
      loop[0], segment(Conductor::bar(pmm(20, 0, -0.235), pmm(0, 0, -0.235), mm(1), mm(0.035)), +1,
                       LoopPart::Return)};
  EXPECT_TRUE(relNear(loopInductance(flipped)->total.si(), r->total.si(), 1e-12));
}

TEST(LoopAssembly, BarOverPlaneByImages) {
  // physics.md 1.8 (b): a 0.5 mm x 35 um x 20 mm bar 0.2 mm above a plane: Lp = 19.283896 nH,
  // Mp(image) = 13.822715 nH, loop 5.461181 nH.
  const std::vector<LoopSegment> bar = {
      segment(Conductor::bar(pmm(0, 0, 0.2175), pmm(20, 0, 0.2175), mm(0.5), mm(0.035)))};
  const auto r = loopInductance(bar, mm(0));
  ASSERT_TRUE(r);
  EXPECT_TRUE(relNear(nH(r->total), 5.461181, 1e-6));
  EXPECT_TRUE(relNear(nH(r->outgoingSelf), 19.283896, 1e-6));
  EXPECT_TRUE(relNear(nH(r->image), -13.822715, 1e-6));
  EXPECT_TRUE(relNear(nH(r->mutual), -13.822715, 1e-6));
  // Only relative positions matter: the same geometry with the plane at z = 5 mm.
  const std::vector<LoopSegment> lifted = {
      segment(Conductor::bar(pmm(0, 0, 5.2175), pmm(20, 0, 5.2175), mm(0.5), mm(0.035)))};
  EXPECT_TRUE(relNear(loopInductance(lifted, mm(5))->total.si(), r->total.si(), 1e-9));
  // A loop below the plane is mirrored the other way.
  const std::vector<LoopSegment> below = {
      segment(Conductor::bar(pmm(0, 0, -0.2175), pmm(20, 0, -0.2175), mm(0.5), mm(0.035)))};
  EXPECT_TRUE(relNear(loopInductance(below, mm(0))->total.si(), r->total.si(), 1e-12));
}

TEST(LoopAssembly, LongTraceOverPlaneAgainstMicrostrip) {
  // The local Hammerstad-Jensen implementation reproduces physics.md 1.8 (b).
  EXPECT_TRUE(relNear(hammerstadJensen(0.5e-3, 0.2e-3, 35e-6) * 1e9, 246.911, 1e-5));
  EXPECT_TRUE(relNear(hammerstadJensen(0.5e-3, 0.2e-3, 0) * 1e9, 260.625, 1e-5));
  EXPECT_TRUE(relNear(hammerstadJensen(0.2e-3, 1.0e-3, 0) * 1e9, 738.025, 1e-5));
  // Partial inductances assume a uniform (DC) current over the trace; Hammerstad-Jensen is the
  // high-frequency value, where the current crowds to minimise the stored energy, so the DC
  // value is the larger one. physics.md 1.8: "5-12 % spread between them is normal" (273 against
  // 246.9 nH/m at 20 mm). Measured here: +9.4 % at l/h = 50 to +11.2 % at l/h = 200. The issue's
  // 5 % cannot hold for this geometry without modelling the current distribution.
  const double w = 0.5, t = 0.035, h = 0.2;
  const double lPrime = hammerstadJensen(w * 1e-3, h * 1e-3, t * 1e-3);
  for (double lengthOverHeight : {50.0, 100.0, 200.0}) {
    const double len = lengthOverHeight * h;
    const std::vector<LoopSegment> trace = {
        segment(Conductor::bar(pmm(0, 0, h + t / 2), pmm(len, 0, h + t / 2), mm(w), mm(t)))};
    const auto r = loopInductance(trace, mm(0));
    ASSERT_TRUE(r);
    const double perLength = r->total.si() / (len * 1e-3);
    EXPECT_GT(perLength, lPrime) << "l/h " << lengthOverHeight;
    EXPECT_LT(perLength, 1.12 * lPrime) << "l/h " << lengthOverHeight;
  }
}

TEST(LoopAssembly, CollinearPiecesReproduceTheUnsplitSelf) {
  // physics.md 1.1: partial inductances add up; a straight bar cut into collinear pieces, with
  // the pieces' mutuals, is the same bar (Hoer & Love self, physics.md 1.3 (b) for 20 mm).
  for (double len : {5.0, 20.0, 100.0}) {
    const std::vector<LoopSegment> bar = {
        segment(Conductor::bar(pmm(0, 0, 0), pmm(len, 0, 0), mm(0.5), mm(0.035)))};
    const double whole = selfPartial(bar[0].conductor).si();
    for (unsigned pieces : {2u, 3u, 8u}) {
      const auto r = loopInductance(subdivideSegments(bar, pieces));
      ASSERT_TRUE(r);
      EXPECT_TRUE(relNear(r->total.si(), whole, 1e-6)) << len << " mm in " << pieces;
      EXPECT_EQ(r->segments, pieces);
    }
  }
  EXPECT_TRUE(relNear(nH(loopInductance(subdivideSegments(
                             {segment(Conductor::bar(pmm(0, 0, 0), pmm(20, 0, 0), mm(0.5), mm(0.035)))},
                             5))->total),
                      19.283896, 1e-6)); // physics.md 1.3 (b)
}

TEST(LoopAssembly, ConvergesUnderSubdivision) {
  // Convergence criterion of the issue: < 0.5 % change from 4x to 8x subdivision.
  const auto overPlane = bentTraceOverPlane();
  const auto l1 = loopInductance(overPlane, mm(0));
  const auto l4 = loopInductance(subdivideSegments(overPlane, 4), mm(0));
  const auto l8 = loopInductance(subdivideSegments(overPlane, 8), mm(0));
  ASSERT_TRUE(l1 && l4 && l8);
  EXPECT_TRUE(relNear(l8->total.si(), l4->total.si(), 5e-3));
  EXPECT_TRUE(relNear(l8->total.si(), l1->total.si(), 5e-3));
  EXPECT_TRUE(relNear(l8->length.si(), l1->length.si(), 1e-12));
  // Same for a go-and-return pair on one layer, 1 mm apart.
  auto loop = polylineSegments({{0, 0}, {10e-3, 0}, {15e-3, 5e-3}, {15e-3, 20e-3}}, mm(0), mm(0.5),
                               mm(0.035), LoopPart::Outgoing);
  auto back = polylineSegments({{0, 1e-3}, {9.586e-3, 1e-3}, {14e-3, 5.414e-3}, {14e-3, 20e-3}},
                               mm(0), mm(0.5), mm(0.035), LoopPart::Return);
  for (auto &s : back) s.sign = -1;
  loop.insert(loop.end(), back.begin(), back.end());
  const auto p4 = loopInductance(subdivideSegments(loop, 4));
  const auto p8 = loopInductance(subdivideSegments(loop, 8));
  ASSERT_TRUE(p4 && p8);
  EXPECT_TRUE(relNear(p8->total.si(), p4->total.si(), 5e-3));
}

TEST(LoopAssembly, PartsAddUp) {
  const auto r = loopInductance(bentTraceOverPlane(), mm(0));
  ASSERT_TRUE(r);
  EXPECT_TRUE(relNear(r->total.si(), (r->outgoingSelf + r->returnSelf + r->mutual).si(), 1e-14));
  EXPECT_EQ(r->returnSelf.si(), 0.0);
  EXPECT_LT(r->image.si(), 0.0);
  EXPECT_GT(r->total.si(), 0.0);
  EXPECT_LT(r->total.si(), r->outgoingSelf.si());
}

TEST(LoopAssembly, ViasReachingThePlaneAreAccepted) {
  // A via ending on the plane continues into its image (normal component kept, physics.md 1.1),
  // which adds inductance: with vias the loop is larger than without.
  auto withVias = bentTraceOverPlane();
  EXPECT_TRUE(checkLoopGeometry(withVias, mm(0)).empty());
  const auto a = loopInductance(withVias, mm(0));
  withVias.erase(withVias.begin());
  withVias.pop_back();
  const auto b = loopInductance(withVias, mm(0));
  ASSERT_TRUE(a && b);
  EXPECT_GT(a->total.si(), b->total.si());
}

TEST(LoopAssembly, ResultDoesNotDependOnThreads) {
  std::mt19937 rng(5);
  std::uniform_int_distribution<int> step(10, 60), turn(-1, 1);
  std::vector<std::pair<double, double>> pts{{0, 0}};
  int dir = 0;
  long x = 0, y = 0;
  static const int dx[8] = {1, 1, 0, -1, -1, -1, 0, 1}, dy[8] = {0, 1, 1, 1, 0, -1, -1, -1};
  for (int i = 0; i < 150; ++i) {
    dir = (dir + (turn(rng) == 0 ? 2 : turn(rng)) + 8) % 8;
    const int k = step(rng);
    x += dx[dir] * k;
    y += dy[dir] * k;
    pts.push_back({x * 5e-5, y * 5e-5});
  }
  const auto segs = polylineSegments(pts, mm(0.2175), mm(0.5), mm(0.035), LoopPart::Outgoing);
  ASSERT_GT(segs.size(), 64u);
  LoopOptions one, two, four;
  one.threads = 1;
  two.threads = 2;
  four.threads = 4;
  const auto r1 = loopInductance(segs, mm(0), one), r2 = loopInductance(segs, mm(0), two),
             r4 = loopInductance(segs, mm(0), four);
  ASSERT_TRUE(r1 && r2 && r4);
  EXPECT_EQ(r1->total.si(), r2->total.si());
  EXPECT_EQ(r1->total.si(), r4->total.si());
  EXPECT_EQ(r1->image.si(), r2->image.si());
}

TEST(LoopAssembly, FastPathEqualsReference) {
  // The far-field rules against the reference evaluation of every pair (LoopOptions.mutual):
  // a go-and-return loop on two layers with 45-degree bends, and the gate trace over a plane.
  auto go = polylineSegments({{0, 0}, {20e-3, 0}, {30e-3, 10e-3}, {30e-3, 40e-3}, {10e-3, 60e-3},
                              {-20e-3, 60e-3}, {-30e-3, 50e-3}, {-30e-3, 10e-3}},
                             mm(0), mm(0.5), mm(0.035), LoopPart::Outgoing);
  go = subdivideSegments(go, 4);
  auto back = go;
  for (auto &s : back) {
    s.conductor.a.z = s.conductor.b.z = -0.4e-3;
    s.sign = -1;
    s.part = LoopPart::Return;
  }
  auto loop = go;
  loop.insert(loop.end(), back.begin(), back.end());
  LoopOptions reference;
  reference.mutual.farField = false;
  const auto fast = loopInductance(loop), slow = loopInductance(loop, std::nullopt, reference);
  ASSERT_TRUE(fast && slow);
  EXPECT_TRUE(relNear(fast->total.si(), slow->total.si(), 1e-8));
  auto trace = go;
  for (auto &s : trace) s.conductor.a.z = s.conductor.b.z = 0.2175e-3;
  const auto fastPlane = loopInductance(trace, mm(0)), slowPlane = loopInductance(trace, mm(0), reference);
  ASSERT_TRUE(fastPlane && slowPlane);
  EXPECT_TRUE(relNear(fastPlane->total.si(), slowPlane->total.si(), 1e-8));
}

TEST(LoopAssembly, TranslationAndRotationInvariant) {
  const auto base = loopInductance(rectangleOfWire(50, 20, 0.5));
  auto moved = rectangleOfWire(50, 20, 0.5);
  const double c = std::cos(0.3), s = std::sin(0.3);
  for (auto &seg : moved) {
    for (Point3 *p : {&seg.conductor.a, &seg.conductor.b}) {
      const Point3 q = *p;
      *p = {c * q.x - s * q.y + 0.123, s * q.x + c * q.y - 0.456, q.z + 0.01};
    }
  }
  EXPECT_TRUE(relNear(loopInductance(moved)->total.si(), base->total.si(), 1e-9));
}

TEST(LoopAssembly, BadGeometryIsReported) {
  const Conductor good = Conductor::bar(pmm(0, 0, 0.2175), pmm(20, 0, 0.2175), mm(0.5), mm(0.035));
  std::vector<LoopSegment> segs = {segment(good),
                                   segment(Conductor::bar(pmm(20, 0, 0.2175), pmm(20, 0, -1), mm(0.3), mm(0.3))),
                                   segment(Conductor::bar(pmm(0, 0, 1), pmm(1, 0, 1), mm(0), mm(0.035))),
                                   segment(good, 0),
                                   segment(Conductor::bar(pmm(0, 0, std::nan("")), pmm(1, 0, 0), mm(1), mm(1)))};
  const auto problems = checkLoopGeometry(segs, mm(0));
  ASSERT_EQ(problems.size(), 4u);
  EXPECT_EQ(problems[0].segment, 1u);
  EXPECT_EQ(problems[0].message,
            "segment 1 reaches through the return plane at z = 0 mm (ends at z = 0.2175 mm and -1 mm)");
  EXPECT_EQ(problems[1].segment, 2u);
  EXPECT_EQ(problems[1].message, "segment 2 has width 0 mm, must be positive");
  EXPECT_EQ(problems[2].message, "segment 3 has current sign 0, must be +1 or -1");
  EXPECT_EQ(problems[3].message, "segment 4 has a coordinate that is not a finite number");
  EXPECT_FALSE(loopInductance(segs, mm(0)));
  // A trace whose copper dips into the plane: centre 10 um above it, 35 um thick.
  const std::vector<LoopSegment> dipping = {
      segment(Conductor::bar(pmm(0, 0, 0.010), pmm(20, 0, 0.010), mm(0.5), mm(0.035)))};
  EXPECT_EQ(checkLoopGeometry(dipping, mm(0)).size(), 1u);
  EXPECT_TRUE(checkLoopGeometry(dipping, std::nullopt).empty());
}

TEST(LoopAssembly, EmptyAndDegenerateLoops) {
  const auto empty = loopInductance({});
  ASSERT_TRUE(empty);
  EXPECT_EQ(empty->total.si(), 0.0);
  EXPECT_EQ(empty->segments, 0u);
  // A zero-length segment contributes nothing.
  std::vector<LoopSegment> segs = rectangleOfWire(50, 20, 0.5);
  const double base = loopInductance(segs)->total.si();
  segs.push_back(segment(Conductor::wire(pmm(50, 0, 0), pmm(50, 0, 0), mm(0.5))));
  EXPECT_EQ(loopInductance(segs)->total.si(), base);
}

TEST(LoopAssembly, PolylineHelper) {
  const auto open = polylineSegments({{0, 0}, {1e-3, 0}, {1e-3, 0}, {1e-3, 2e-3}}, mm(0.1), mm(0.5),
                                     mm(0.035), LoopPart::Return);
  ASSERT_EQ(open.size(), 2u); // the repeated point is skipped
  EXPECT_EQ(open[0].part, LoopPart::Return);
  EXPECT_EQ(open[1].conductor.a.y, 0.0);
  EXPECT_EQ(open[1].conductor.b.y, 2e-3);
  EXPECT_EQ(open[1].conductor.b.z, 1e-4);
  const auto closed = polylineSegments({{0, 0}, {1e-3, 0}, {1e-3, 2e-3}}, mm(0), mm(0.5), mm(0.035),
                                       LoopPart::Outgoing, true);
  ASSERT_EQ(closed.size(), 3u);
  EXPECT_EQ(closed[2].conductor.b.x, 0.0);
  EXPECT_TRUE(polylineSegments({{0, 0}}, mm(0), mm(1), mm(1), LoopPart::Outgoing).empty());
  // Subdivision keeps the end points exact so that consecutive segments still meet.
  const auto parts = subdivideSegments(closed, 3);
  ASSERT_EQ(parts.size(), 9u);
  EXPECT_EQ(parts[2].conductor.b.x, closed[0].conductor.b.x);
  EXPECT_EQ(parts[3].conductor.a.x, closed[1].conductor.a.x);
  EXPECT_EQ(subdivideSegments(closed, 0).size(), 3u);
}

TEST(LoopAssembly, MirrorInPlane) {
  const Conductor c = Conductor::bar(pmm(1, 2, 3), pmm(4, 5, 6), mm(0.5), mm(0.035));
  const Conductor m = mirrorInPlane(c, mm(1));
  EXPECT_DOUBLE_EQ(m.a.z, -1e-3);
  EXPECT_DOUBLE_EQ(m.b.z, -4e-3);
  EXPECT_EQ(m.a.x, c.a.x);
  EXPECT_EQ(m.width.si(), c.width.si());
}

} // namespace
} // namespace gateloop
