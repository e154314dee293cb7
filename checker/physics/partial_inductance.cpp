/// \file
/// Partial inductance formulas and the pair dispatcher. Sources and the reasons for each switch
/// point are in docs/inductance-geometry.md.
#include "checker/physics/partial_inductance.h"

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <vector>

namespace gateloop {

namespace {

constexpr double kMu0Over4Pi = 1e-7; // mu0 = 4 pi 1e-7 H/m (physics.md conventions)
constexpr double kPi = 3.14159265358979323846;
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

// --- switch points of the dispatcher (docs/inductance-geometry.md, "Which formula when") -------

// Hoer-Love cancels terms of order l^5 to leave l w^2 t^2; physics.md 1.3 measured double
// round-off <= 5e-6 up to this ratio (axial extent over sqrt(w t)); in long double it is 7e-10.
constexpr double kHoerLoveMaxRatio = 1000.0;
// Conductors whose bodies are farther apart than this many times the largest section dimension
// are treated as filaments with the second-order section correction; the neglected fourth-order
// term is then below 2e-5 of the pair's value (1.5e-5 measured for 1 mm strips side by side, where
// the plain filament formula is 2.5e-3 off). Closer parallel bars use Hoer-Love.
constexpr double kSectionExpansionRatio = 8.0;
// Below this ratio Hoer-Love runs in double (round-off <= 1e-10, measured against 60-digit
// arithmetic); above it in long double.
constexpr double kHoerLoveDoubleRatio = 50.0;
// Relative error aimed at by the fixed-order Gauss-Legendre rules (Bernstein-ellipse bound
// rho^(-2n), rho = a + sqrt(a^2 - 1) for a singularity a half-lengths from the midpoint).
constexpr double kQuadratureTolerance = 1e-9;
// Pairs this many half-lengths apart use the fourth-order expansion of the pair integral, whose
// truncation (sixth order) is below about a^-6 = 1e-9 there.
constexpr double kExpansionRatio = 32.0;
// Largest order used by the far-field rule; pairs needing more are treated as near pairs.
constexpr int kFarFieldMaxOrder = 6;
// Directions whose cross product is smaller are parallel (PCB coordinates from mm give exact or
// 1e-16 directions; 1e-9 rad changes a mutual by 1e-18 relative).
constexpr double kParallelSin = 1e-9;
// Directions whose dot product is smaller are perpendicular: the mutual is exactly zero.
constexpr double kPerpendicularCos = 1e-12;
// Below this angle the coplanar closed form loses digits (its lines meet far away).
constexpr double kCoplanarMinSin = 0.05;
// Depth cap of the adaptive Neumann integration (touching or crossing filaments), and a cap on
// the number of sub-pairs per pair, so that degenerate input (segments overlapping at a tiny
// angle) costs a bounded time instead of ~length/separation sub-pairs.
constexpr int kMaxSubdivisionDepth = 40;
constexpr int kMaxSubPairs = 4096;

// Round wires in a close parallel pair are replaced by squares with the same geometric mean
// distance (Maxwell): circle r*exp(-1/4), square 0.44705*a.
const double kSquareSidePerRadius = std::exp(-0.25 - (0.5 * std::log(2.0) - std::log(2.0) / 6.0 +
                                                      kPi / 3.0 - 25.0 / 12.0));

// ---- small vector helpers ---------------------------------------------------------------------

struct V3 {
  double x, y, z;
};
inline V3 operator+(V3 a, V3 b) { return {a.x + b.x, a.y + b.y, a.z + b.z}; }
inline V3 operator-(V3 a, V3 b) { return {a.x - b.x, a.y - b.y, a.z - b.z}; }
inline V3 operator*(double k, V3 a) { return {k * a.x, k * a.y, k * a.z}; }
inline double dot(V3 a, V3 b) { return a.x * b.x + a.y * b.y + a.z * b.z; }
inline V3 cross(V3 a, V3 b) {
  return {a.y * b.z - a.z * b.y, a.z * b.x - a.x * b.z, a.x * b.y - a.y * b.x};
}
inline double norm(V3 a) { return std::sqrt(dot(a, a)); }
inline V3 toV(const double *p) { return {p[0], p[1], p[2]}; }
inline V3 toV(Point3 p) { return {p.x, p.y, p.z}; }
inline void store(double *dst, V3 v) { dst[0] = v.x, dst[1] = v.y, dst[2] = v.z; }

/// Symmetric 3x3 matrix stored as xx, yy, zz, xy, xz, yz.
struct Sym3 {
  double m[6] = {0, 0, 0, 0, 0, 0};
  double quad(V3 v) const {
    return m[0] * v.x * v.x + m[1] * v.y * v.y + m[2] * v.z * v.z +
           2.0 * (m[3] * v.x * v.y + m[4] * v.x * v.z + m[5] * v.y * v.z);
  }
  double trace() const { return m[0] + m[1] + m[2]; }
  V3 times(V3 v) const {
    return {m[0] * v.x + m[3] * v.y + m[4] * v.z, m[3] * v.x + m[1] * v.y + m[5] * v.z,
            m[4] * v.x + m[5] * v.y + m[2] * v.z};
  }
};

Sym3 sumCov(const double *a, const double *b) {
  Sym3 s;
  for (int i = 0; i < 6; ++i) s.m[i] = a[i] + b[i];
  return s;
}

// ---- Gauss-Legendre rules ---------------------------------------------------------------------

constexpr int kMaxGaussOrder = 32;

struct GaussRule {
  std::vector<double> x, w;
};

/// Nodes and weights on [-1, 1] by Newton iteration on P_n (standard construction).
GaussRule makeGaussRule(int n) {
  GaussRule r;
  r.x.resize(n);
  r.w.resize(n);
  for (int i = 0; i < n; ++i) {
    double x = std::cos(kPi * (i + 0.75) / (n + 0.5));
    double dp = 1.0;
    for (int it = 0; it < 100; ++it) {
      double p0 = 1.0, p1 = x;
      for (int k = 2; k <= n; ++k) {
        double p2 = ((2.0 * k - 1.0) * x * p1 - (k - 1.0) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      dp = n * (x * p1 - p0) / (x * x - 1.0);
      double dx = p1 / dp;
      x -= dx;
      if (std::abs(dx) < 1e-16) break;
    }
    {
      double p0 = 1.0, p1 = x;
      for (int k = 2; k <= n; ++k) {
        double p2 = ((2.0 * k - 1.0) * x * p1 - (k - 1.0) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      dp = n * (x * p1 - p0) / (x * x - 1.0);
    }
    r.x[i] = x;
    r.w[i] = 2.0 / ((1.0 - x * x) * dp * dp);
  }
  return r;
}

const GaussRule &gaussRule(int n) {
  static const std::array<GaussRule, kMaxGaussOrder + 1> rules = [] {
    std::array<GaussRule, kMaxGaussOrder + 1> a;
    for (int n = 1; n <= kMaxGaussOrder; ++n) a[n] = makeGaussRule(n);
    return a;
  }();
  return rules[std::clamp(n, 1, kMaxGaussOrder)];
}

/// Smallest a (singularity distance in half-lengths from the midpoint) for which order n meets
/// kQuadratureTolerance: rho^(-2n) <= tol with a = cosh(ln rho).
const std::array<double, kMaxGaussOrder + 1> &orderThresholds() {
  static const std::array<double, kMaxGaussOrder + 1> t = [] {
    std::array<double, kMaxGaussOrder + 1> a{};
    a[0] = std::numeric_limits<double>::infinity();
    for (int n = 1; n <= kMaxGaussOrder; ++n)
      a[n] = std::cosh(std::log(1.0 / kQuadratureTolerance) / (2.0 * n));
    return a;
  }();
  return t;
}

/// Order needed for ratio \p a, or 0 when even kMaxOrder is not enough.
int orderFor(double a, int maxOrder) {
  const auto &t = orderThresholds();
  for (int n = 1; n <= maxOrder; ++n)
    if (a >= t[n]) return n;
  return 0;
}

// ---- Hoer & Love ------------------------------------------------------------------------------

/// f(x, y, z) of Hoer & Love eq. (14). f is even in each argument, so it is evaluated at |x|,
/// |y|, |z|, which also keeps ln((x + rho)/...) free of cancellation.
template <class F> F hoerLoveF(F x, F y, F z) {
  x = std::fabs(x);
  y = std::fabs(y);
  z = std::fabs(z);
  const F x2 = x * x, y2 = y * y, z2 = z * z;
  const F rho = std::sqrt(x2 + y2 + z2);
  const int nonZero = (x > 0) + (y > 0) + (z > 0);
  F f = (x2 * x2 + y2 * y2 + z2 * z2 - 3 * x2 * y2 - 3 * y2 * z2 - 3 * z2 * x2) * rho / 60;
  if (nonZero >= 2) {
    if (x > 0) f += (y2 * z2 / 4 - y2 * y2 / 24 - z2 * z2 / 24) * x * std::asinh(x / std::sqrt(y2 + z2));
    if (y > 0) f += (x2 * z2 / 4 - x2 * x2 / 24 - z2 * z2 / 24) * y * std::asinh(y / std::sqrt(x2 + z2));
    if (z > 0) f += (x2 * y2 / 4 - x2 * x2 / 24 - y2 * y2 / 24) * z * std::asinh(z / std::sqrt(x2 + y2));
  }
  if (nonZero == 3) {
    f -= x * y * z2 * z / 6 * std::atan(x * y / (z * rho));
    f -= x * y2 * y * z / 6 * std::atan(x * z / (y * rho));
    f -= x2 * x * y * z / 6 * std::atan(y * z / (x * rho));
  }
  return f;
}

template <class F> struct WeightedArg {
  F v;
  int w;
};

/// Merges the four corner coordinates c[i] with sign (-1)^(i+1) by |value| (f is even), dropping
/// cancelled entries. Returns the number of entries.
template <class F> int mergeCorners(const F c[4], WeightedArg<F> out[4]) {
  int n = 0;
  for (int i = 0; i < 4; ++i) {
    const F v = std::fabs(c[i]);
    const int w = (i % 2 == 0) ? -1 : 1; // (-1)^(i+1) for 1-based i
    int k = 0;
    while (k < n && out[k].v != v) ++k;
    if (k == n) out[n++] = {v, w};
    else out[k].w += w;
  }
  int m = 0;
  for (int k = 0; k < n; ++k)
    if (out[k].w != 0) out[m++] = out[k];
  return m;
}

/// Hoer & Love mutual of two boxes along z in floating type F, lengths in metres.
template <class F>
F hoerLoveMutualT(F x1, F y1, F z1, F a, F b, F l1, F x2, F y2, F z2, F d, F c, F l2) {
  const F E = x2 - x1, P = y2 - y1, l3 = z2 - z1;
  const F q[4] = {E - a, E + d - a, E + d, E};
  const F r[4] = {P - b, P + c - b, P + c, P};
  const F s[4] = {l3 - l1, l3 + l2 - l1, l3 + l2, l3};
  WeightedArg<F> qa[4], ra[4], sa[4];
  const int nq = mergeCorners(q, qa), nr = mergeCorners(r, ra), ns = mergeCorners(s, sa);
  F sum = 0;
  for (int i = 0; i < nq; ++i)
    for (int j = 0; j < nr; ++j) {
      const int wij = qa[i].w * ra[j].w;
      for (int k = 0; k < ns; ++k)
        sum += static_cast<F>(wij * sa[k].w) * hoerLoveF(qa[i].v, ra[j].v, sa[k].v);
    }
  // (-1)^(i+j+k+1) = -(-1)^(i+1)(-1)^(j+1)(-1)^(k+1)
  return -static_cast<F>(kMu0Over4Pi) * sum / (a * b * c * d);
}

long double hoerLoveMutualLd(long double x1, long double y1, long double z1, long double a,
                             long double b, long double l1, long double x2, long double y2,
                             long double z2, long double d, long double c, long double l2) {
  return hoerLoveMutualT<long double>(x1, y1, z1, a, b, l1, x2, y2, z2, d, c, l2);
}

// ---- filaments --------------------------------------------------------------------------------

/// Parallel filaments in the stable form of Grover's offset-filament formula:
/// sum sigma_k [ |u| ln(|u| + R) - R ] - 2 overlap ln d, sigma = (+, -, -, +) for
/// u = (s + l2, s + l2 - l1, s, s - l1), R = sqrt(u^2 + d^2). Equal to
/// sum sigma g(u), g(u) = u asinh(u/d) - R, but finite for collinear pairs without overlap.
double parallelFilamentRaw(double l1, double l2, double s, double d) {
  const double u[4] = {s + l2, s + l2 - l1, s, s - l1};
  const double sg[4] = {1, -1, -1, 1};
  double sum = 0.0;
  for (int k = 0; k < 4; ++k) {
    const double au = std::abs(u[k]);
    const double R = std::hypot(u[k], d);
    sum += sg[k] * ((au > 0 ? au * std::log(au + R) : 0.0) - R);
  }
  const double overlap = std::max(0.0, std::min(l1, s + l2) - std::max(0.0, s));
  if (overlap > 0) {
    if (d <= 0) return std::numeric_limits<double>::infinity();
    sum -= 2.0 * overlap * std::log(d);
  }
  return kMu0Over4Pi * sum;
}

/// Second-order correction of the parallel filament formula for uniform current over the two
/// cross-sections: (1/2) (Vxx d2M/dX2 + Vyy d2M/dY2), with Vxx, Vyy the variances of the relative
/// transverse displacement in the section frame where the second filament sits at (X, Y) (no
/// covariance term: parallel conductors share their section frame). Derived from g_d = -R/d and
/// g_dd = u^2/(d^2 R) (docs/inductance-geometry.md).
double parallelSectionCorrection(double l1, double l2, double s, double X, double Y, double vxx,
                                 double vyy) {
  const double u[4] = {s + l2, s + l2 - l1, s, s - l1};
  const double sg[4] = {1, -1, -1, 1};
  const double d = std::hypot(X, Y);
  const double cx = d > 0 ? X / d : 1.0, cy = d > 0 ? Y / d : 0.0;
  double sb = 0.0, sc = 0.0;
  for (int k = 0; k < 4; ++k) {
    const double au = std::abs(u[k]);
    const double R = std::hypot(u[k], d);
    sb += sg[k] / (R + au);
    sc += sg[k] / R;
  }
  const double overlap = std::max(0.0, std::min(l1, s + l2) - std::max(0.0, s));
  const double A = (overlap > 0 ? 2.0 * overlap / (d * d) : 0.0) + sb;
  const double mxx = A * (cx * cx - cy * cy) - sc * cx * cx;
  const double myy = A * (cy * cy - cx * cx) - sc * cy * cy;
  return kMu0Over4Pi * 0.5 * (vxx * mxx + vyy * myy);
}

/// G(l, m, th) = l atanh(m/(l + R)) + m atanh(l/(m + R)) of physics.md 1.5.
double angleG(double l, double m, double th) {
  if (l <= 0 || m <= 0) return 0.0;
  // R^2 = (l - m)^2 + 4 l m sin^2(th/2) has no cancellation; the triangle inequality keeps both
  // atanh arguments <= 1, which rounding must not break.
  const double sh = std::sin(0.5 * th);
  const double R = std::sqrt((l - m) * (l - m) + 4.0 * l * m * sh * sh);
  return l * std::atanh(std::min(1.0, m / (l + R))) + m * std::atanh(std::min(1.0, l / (m + R)));
}

double coplanarF(double a, double b, double eps) {
  if (a == 0 || b == 0) return 0.0;
  const bool same = (a > 0) == (b > 0);
  const double th = same ? eps : kPi - eps;
  const double sgn = same ? 1.0 : -1.0;
  return sgn * 2.0 * kMu0Over4Pi * std::cos(eps) * angleG(std::abs(a), std::abs(b), th);
}

double coplanarRaw(double a1, double a2, double b1, double b2, double eps) {
  return coplanarF(a2, b2, eps) - coplanarF(a1, b2, eps) - coplanarF(a2, b1, eps) +
         coplanarF(a1, b1, eps);
}

// ---- Neumann kernel quadrature -----------------------------------------------------------------

/// int int K dt ds over two straight pieces (midpoints mp, mq; half-vectors hp, hq = half length
/// times unit axis) with fixed orders; K = 1/r (1 + (3 r.C.r/r^2 - tr C)/(2 r^2)), the Neumann
/// kernel averaged over the cross-sections to second order (C = 0 for filaments). The result is
/// per unit parameter, i.e. it must be multiplied by |hp| |hq|.
double gaussPair(V3 mp, V3 hp, V3 mq, V3 hq, int np, int nq, const Sym3 &cov, bool useCov) {
  const GaussRule &rp = gaussRule(np);
  const GaussRule &rq = gaussRule(nq);
  const V3 dm = mq - mp;
  const double tr = cov.trace();
  double sum = 0.0;
  for (int i = 0; i < np; ++i) {
    const V3 base = dm - rp.x[i] * hp;
    double row = 0.0;
    for (int j = 0; j < nq; ++j) {
      const V3 rv = base + rq.x[j] * hq;
      const double r2 = dot(rv, rv);
      if (r2 <= 0) continue; // crossing exactly at a node: the integrable point is dropped
      const double inv = 1.0 / std::sqrt(r2);
      double k = inv;
      if (useCov) {
        const double inv2 = inv * inv;
        k *= 1.0 + 0.5 * (3.0 * cov.quad(rv) * inv2 - tr) * inv2;
      }
      row += rq.w[j] * k;
    }
    sum += rp.w[i] * row;
  }
  return sum;
}

/// Mean of the section-averaged kernel K over two distant pieces, E[K(r + t u2 - s u1)] for s
/// uniform in [-h1, h1] and t in [-h2, h2], by a Taylor expansion about the midpoints: fourth
/// order in the half-lengths, second order in the section, plus the section x length cross term.
/// Derivatives of 1/r along a direction u are n! P_n(u.n)/r^(n+1); the mixed and section terms
/// contract the fourth-derivative tensor of 1/r (docs/inductance-geometry.md). The pair integral
/// is 4 h1 h2 times the result.
double expansionMeanKernel(V3 r, double invRho, V3 u1, double h1, V3 u2, double h2, double g,
                           const Sym3 &cov) {
  const double inv2 = invRho * invRho;
  const double c1 = dot(u1, r) * invRho, c2 = dot(u2, r) * invRho;
  const double c1s = c1 * c1, c2s = c2 * c2;
  const double a1 = h1 * h1 * inv2, a2 = h2 * h2 * inv2; // (h/rho)^2
  // Length terms, orders 2 and 4.
  const double t2 = (a1 * (3 * c1s - 1) + a2 * (3 * c2s - 1)) * (1.0 / 6.0);
  const double t4 = (a1 * a1 * (35 * c1s * c1s - 30 * c1s + 3) +
                     a2 * a2 * (35 * c2s * c2s - 30 * c2s + 3)) * (1.0 / 40.0) +
                    a1 * a2 *
                        (105 * c1s * c2s - 15 * (c1s + c2s + 4 * g * c1 * c2) + 3 * (1 + 2 * g * g)) *
                        (1.0 / 36.0);
  // Section terms: order 2, and the cross term with the length second moments (C over rho^2).
  const V3 cr = cov.times(r);
  const double nCn = dot(r, cr) * inv2 * inv2, tr = cov.trace() * inv2;
  const double u1Cn = dot(u1, cr) * invRho * inv2, u2Cn = dot(u2, cr) * invRho * inv2;
  const double u1Cu1 = cov.quad(u1) * inv2, u2Cu2 = cov.quad(u2) * inv2;
  const double s2 = 0.5 * (3 * nCn - tr);
  auto crossQ = [&](double c, double uCn, double uCu) {
    return 105 * nCn * c * c - 15 * (tr * c * c + 4 * c * uCn + nCn) + 3 * (tr + 2 * uCu);
  };
  const double sx = (a1 * crossQ(c1, u1Cn, u1Cu1) + a2 * crossQ(c2, u2Cn, u2Cu2)) * (1.0 / 12.0);
  return (1.0 + t2 + t4 + s2 + sx) * invRho;
}

/// Adaptive version: splits the piece that is too close until both pieces see the other beyond
/// the ratio needed by the largest fixed order, then applies the fixed-order rule. Returns
/// int int K ds dt in m^2/m = m (lengths included).
double adaptivePair(V3 p0, V3 p1, V3 q0, V3 q1, const Sym3 &cov, bool useCov, int depth,
                    int &budget) {
  const V3 mp = 0.5 * (p0 + p1), mq = 0.5 * (q0 + q1);
  const V3 hp = 0.5 * (p1 - p0), hq = 0.5 * (q1 - q0);
  const double lp = norm(hp), lq = norm(hq);
  if (!(lp > 0 && lq > 0)) return 0.0;
  const double r = norm(mq - mp);
  const double ap = (r - lq) / lp, aq = (r - lp) / lq;
  constexpr int kMaxOrder = 12;
  const int np = orderFor(ap, kMaxOrder), nq = orderFor(aq, kMaxOrder);
  --budget;
  if ((np > 0 && nq > 0) || depth >= kMaxSubdivisionDepth || budget <= 0) {
    const int npp = np > 0 ? np : kMaxOrder, nqq = nq > 0 ? nq : kMaxOrder;
    return lp * lq * gaussPair(mp, hp, mq, hq, npp, nqq, cov, useCov);
  }
  const bool splitP = np == 0 && (nq > 0 || lp >= lq);
  if (splitP) {
    return adaptivePair(p0, mp, q0, q1, cov, useCov, depth + 1, budget) +
           adaptivePair(mp, p1, q0, q1, cov, useCov, depth + 1, budget);
  }
  return adaptivePair(p0, p1, q0, mq, cov, useCov, depth + 1, budget) +
         adaptivePair(p0, p1, mq, q1, cov, useCov, depth + 1, budget);
}

double adaptivePair(V3 p0, V3 p1, V3 q0, V3 q1, const Sym3 &cov, bool useCov) {
  int budget = kMaxSubPairs;
  return adaptivePair(p0, p1, q0, q1, cov, useCov, 0, budget);
}

bool finite(V3 v) { return std::isfinite(v.x) && std::isfinite(v.y) && std::isfinite(v.z); }

/// Closest distance between segments p0-p1 and q0-q1 (clamped parameters).
double segmentDistance(V3 p0, V3 p1, V3 q0, V3 q1) {
  const V3 d1 = p1 - p0, d2 = q1 - q0, r = p0 - q0;
  const double a = dot(d1, d1), e = dot(d2, d2), f = dot(d2, r);
  double s = 0.0, t = 0.0;
  if (a <= 0 && e <= 0) return norm(r);
  if (a <= 0) {
    t = std::clamp(f / e, 0.0, 1.0);
  } else {
    const double c = dot(d1, r);
    if (e <= 0) {
      s = std::clamp(-c / a, 0.0, 1.0);
    } else {
      const double b = dot(d1, d2);
      const double denom = a * e - b * b;
      s = denom > 0 ? std::clamp((b * f - c * e) / denom, 0.0, 1.0) : 0.0;
      t = (b * s + f) / e;
      if (t < 0) {
        t = 0;
        s = std::clamp(-c / a, 0.0, 1.0);
      } else if (t > 1) {
        t = 1;
        s = std::clamp((b - c) / a, 0.0, 1.0);
      }
    }
  }
  return norm((p0 + s * d1) - (q0 + t * d2));
}

} // namespace

// ---- Conductor --------------------------------------------------------------------------------

Conductor Conductor::bar(Point3 a, Point3 b, Meter width, Meter thickness) {
  return Conductor{a, b, width, thickness, CrossSection::Rectangle};
}

Conductor Conductor::wire(Point3 a, Point3 b, Meter radius) {
  return Conductor{a, b, radius * 2.0, radius * 2.0, CrossSection::Round};
}

Meter Conductor::length() const { return Meter(norm(toV(b) - toV(a))); }

// ---- self ---------------------------------------------------------------------------------------

Henry hoerLoveSelf(Meter width, Meter thickness, Meter length) {
  const double w = width.si(), t = thickness.si(), l = length.si();
  if (!(w > 0 && t > 0 && l > 0)) return Henry(kNaN);
  return Henry(static_cast<double>(hoerLoveMutualLd(0, 0, 0, w, t, l, 0, 0, 0, w, t, l)));
}

Henry groverBarSelf(Meter width, Meter thickness, Meter length) {
  const double w = width.si(), t = thickness.si(), l = length.si();
  if (!(w > 0 && t > 0 && l > 0)) return Henry(kNaN);
  return Henry(2.0 * kMu0Over4Pi * l *
               (std::log(2.0 * l / (w + t)) + 0.5 + 0.2235 * (w + t) / l));
}

Henry barSelfPartial(Meter width, Meter thickness, Meter length) {
  const double w = width.si(), t = thickness.si(), l = length.si();
  if (!(w > 0 && t > 0 && l > 0)) return Henry(kNaN);
  if (l <= kHoerLoveMaxRatio * std::sqrt(w * t)) return hoerLoveSelf(width, thickness, length);
  return groverBarSelf(width, thickness, length);
}

namespace {
/// Rosa 1908 / Grover 1946, with the DC internal term 1/4 (physics.md 1.2). Kept private:
/// checker/physics/line_inductance.h offers the public round-wire helpers.
double rosaWireSelf(double l, double r) {
  if (!(l > 0 && r > 0)) return l == 0 ? 0.0 : kNaN;
  return 2.0 * kMu0Over4Pi * l * (std::asinh(l / r) - std::sqrt(1.0 + (r / l) * (r / l)) + r / l + 0.25);
}
} // namespace

Henry selfPartial(const Conductor &c) { return selfPartial(PreparedConductor(c)); }

Henry selfPartial(const PreparedConductor &c) {
  if (!c.valid_) return Henry(kNaN);
  if (c.len_ <= 0) return Henry(0.0);
  if (c.c_.section == CrossSection::Round) return Henry(rosaWireSelf(c.len_, 0.5 * c.w_));
  return barSelfPartial(Meter(c.w_), Meter(c.t_), Meter(c.len_));
}

// ---- parallel ----------------------------------------------------------------------------------

Henry hoerLoveMutual(const BarBox &b1, const BarBox &b2) {
  if (!(b1.dx.si() > 0 && b1.dy.si() > 0 && b1.dz.si() > 0 && b2.dx.si() > 0 && b2.dy.si() > 0 &&
        b2.dz.si() > 0))
    return Henry(kNaN);
  return Henry(static_cast<double>(
      hoerLoveMutualLd(b1.x0.si(), b1.y0.si(), b1.z0.si(), b1.dx.si(), b1.dy.si(), b1.dz.si(),
                       b2.x0.si(), b2.y0.si(), b2.z0.si(), b2.dx.si(), b2.dy.si(), b2.dz.si())));
}

Henry filamentMutualParallel(Meter l1, Meter l2, Meter offset, Meter distance) {
  if (l1.si() <= 0 || l2.si() <= 0) return Henry(0.0);
  return Henry(parallelFilamentRaw(l1.si(), l2.si(), offset.si(), std::abs(distance.si())));
}

Henry filamentMutualCollinear(Meter l1, Meter l2, Meter gap) {
  if (gap.si() < 0) return Henry(kNaN);
  return filamentMutualParallel(l1, l2, l1 + gap, Meter(0.0));
}

// ---- angles ------------------------------------------------------------------------------------

Henry filamentMutualTouchingAngle(Meter l, Meter m, double epsRad) {
  if (l.si() <= 0 || m.si() <= 0) return Henry(0.0);
  return Henry(2.0 * kMu0Over4Pi * std::cos(epsRad) * angleG(l.si(), m.si(), epsRad));
}

Henry filamentMutualCoplanar(Meter a1, Meter a2, Meter b1, Meter b2, double epsRad) {
  if (!(epsRad > 0 && epsRad < kPi)) return Henry(kNaN);
  return Henry(coplanarRaw(a1.si(), a2.si(), b1.si(), b2.si(), epsRad));
}

Henry filamentMutualNeumann(Point3 a1, Point3 b1, Point3 a2, Point3 b2) {
  const V3 p0 = toV(a1), p1 = toV(b1), q0 = toV(a2), q1 = toV(b2);
  if (!finite(p0) || !finite(p1) || !finite(q0) || !finite(q1)) return Henry(kNaN);
  const double lp = norm(p1 - p0), lq = norm(q1 - q0);
  if (lp <= 0 || lq <= 0) return Henry(0.0);
  const double c = dot(p1 - p0, q1 - q0) / (lp * lq);
  const Sym3 none;
  return Henry(kMu0Over4Pi * c * adaptivePair(p0, p1, q0, q1, none, false));
}

// ---- prepared conductors and the dispatcher ---------------------------------------------------

const char *mutualMethodName(MutualMethod m) {
  switch (m) {
  case MutualMethod::Zero: return "zero";
  case MutualMethod::HoerLove: return "hoer-love";
  case MutualMethod::ParallelFilament: return "parallel-filament";
  case MutualMethod::CoplanarFilament: return "coplanar-filament";
  case MutualMethod::Neumann: return "neumann";
  case MutualMethod::FarField: return "far-field";
  }
  return "?";
}

PreparedConductor::PreparedConductor(const Conductor &c) : c_(c) {
  const V3 a = toV(c.a), b = toV(c.b);
  store(a_, a);
  store(b_, b);
  store(mid_, 0.5 * (a + b));
  len_ = norm(b - a);
  half_ = 0.5 * len_;
  invHalf_ = len_ > 0 ? 1.0 / half_ : 0.0;
  w_ = c.width.si();
  t_ = c.section == CrossSection::Round ? c.width.si() : c.thickness.si();
  maxDim_ = std::max(w_, t_);
  valid_ = finite(a) && finite(b) && std::isfinite(w_) && std::isfinite(t_) && w_ > 0 && t_ > 0;
  if (!valid_ || len_ <= 0) return;
  const V3 u = (1.0 / len_) * (b - a);
  store(u_, u);
  // Width lies in the x-y plane, perpendicular to the axis; a (nearly) vertical conductor takes
  // x as its width direction so that all vias share one frame.
  V3 wd = cross(V3{0, 0, 1}, u);
  if (norm(wd) < 1e-6) wd = V3{1, 0, 0} - u.x * u;
  wd = (1.0 / norm(wd)) * wd;
  const V3 td = cross(u, wd);
  store(wdir_, wd);
  store(tdir_, td);
  // Covariance of a point of the section about the axis (uniform current density).
  auto addOuter = [&](V3 v, double var) {
    cov_[0] += var * v.x * v.x;
    cov_[1] += var * v.y * v.y;
    cov_[2] += var * v.z * v.z;
    cov_[3] += var * v.x * v.y;
    cov_[4] += var * v.x * v.z;
    cov_[5] += var * v.y * v.z;
  };
  if (c.section == CrossSection::Round) {
    const double var = 0.25 * (0.5 * w_) * (0.5 * w_); // r^2/4 per transverse direction
    addOuter(wd, var);
    addOuter(td, var);
  } else {
    addOuter(wd, w_ * w_ / 12.0);
    addOuter(td, t_ * t_ / 12.0);
  }
}

/// Pair evaluation with access to the prepared data.
class PairEvaluator {
public:
  static MutualPartial evaluate(const PreparedConductor &p, const PreparedConductor &q,
                                bool farField);

private:
  static MutualPartial parallel(const PreparedConductor &p, const PreparedConductor &q, double c);
  static double parallelPieces(const PreparedConductor &p, const PreparedConductor &q, double pS0,
                               double pS1, double qS0, double qS1, double X, double Y, double S,
                               bool &usedHoerLove, int &budget);
};

MutualPartial PairEvaluator::evaluate(const PreparedConductor &p, const PreparedConductor &q,
                                      bool farField) {
  if (!p.valid_ || !q.valid_) return {Henry(kNaN), MutualMethod::Zero};
  if (p.len_ <= 0 || q.len_ <= 0) return {Henry(0.0), MutualMethod::Zero};
  const V3 up = toV(p.u_), uq = toV(q.u_);
  const double c = dot(up, uq);
  if (std::abs(c) < kPerpendicularCos) return {Henry(0.0), MutualMethod::Zero};
  const V3 mp = toV(p.mid_), mq = toV(q.mid_);
  const V3 dm = mq - mp;
  const double r = std::sqrt(dot(dm, dm));
  const double sizeD = std::max(p.maxDim_, q.maxDim_);
  const double ap = (r - q.half_) * p.invHalf_, aq = (r - p.half_) * q.invHalf_;
  const Sym3 cov = sumCov(p.cov_, q.cov_);

  // Distant pair: both pieces see the other beyond the fixed-order ratio, and the bodies are far
  // enough apart for the second-order section expansion.
  if (farField && r - p.half_ - q.half_ >= kSectionExpansionRatio * sizeD) {
    if (ap >= kExpansionRatio && aq >= kExpansionRatio) {
      const double k = expansionMeanKernel(dm, 1.0 / r, up, p.half_, uq, q.half_, c, cov);
      return {Henry(kMu0Over4Pi * c * 4.0 * p.half_ * q.half_ * k), MutualMethod::FarField};
    }
    const int np = orderFor(ap, kFarFieldMaxOrder), nq = orderFor(aq, kFarFieldMaxOrder);
    if (np > 0 && nq > 0) {
      const double v = gaussPair(mp, p.half_ * up, mq, q.half_ * uq, np, nq, cov, true);
      return {Henry(kMu0Over4Pi * c * p.half_ * q.half_ * v), MutualMethod::FarField};
    }
  }

  const V3 n = cross(up, uq);
  const double sinE = norm(n);
  if (sinE < kParallelSin) return parallel(p, q, c);

  const V3 pa = toV(p.a_), pb = toV(p.b_), qa = toV(q.a_), qb = toV(q.b_);
  const double dist = segmentDistance(pa, pb, qa, qb);
  if (dist >= kSectionExpansionRatio * sizeD) {
    return {Henry(kMu0Over4Pi * c * adaptivePair(pa, pb, qa, qb, cov, true)),
            MutualMethod::Neumann};
  }
  // Close and at an angle: centre-line filaments (the section matters only near a bend, where
  // the drawn corner is itself approximate; docs/inductance-geometry.md).
  const double planeOffset = std::abs(dot(qa - pa, (1.0 / sinE) * n));
  if (sinE >= kCoplanarMinSin && planeOffset <= 1e-9 * (p.len_ + q.len_)) {
    // Intersection O of the two lines: pa + s up = qa + t uq.
    const V3 w = qa - pa;
    const double wu = dot(w, up), wv = dot(w, uq), den = 1.0 - c * c;
    const double s = (wu - c * wv) / den, t = (c * wu - wv) / den;
    const double eps = std::acos(std::clamp(c, -1.0, 1.0));
    // Segments meeting at a corner have an end exactly at O; rounding leaves ~1e-19 m there.
    auto snap = [](double v, double len) { return std::abs(v) <= 1e-9 * len ? 0.0 : v; };
    const double v = coplanarRaw(snap(-s, p.len_), snap(-s + p.len_, p.len_), snap(-t, q.len_),
                                 snap(-t + q.len_, q.len_), eps);
    return {Henry(v), MutualMethod::CoplanarFilament};
  }
  const Sym3 none;
  return {Henry(kMu0Over4Pi * c * adaptivePair(pa, pb, qa, qb, none, false)),
          MutualMethod::Neumann};
}

MutualPartial PairEvaluator::parallel(const PreparedConductor &p, const PreparedConductor &q,
                                      double c) {
  // Work in p's frame with q turned to p's direction; an antiparallel q flips the sign.
  const double sign = c < 0 ? -1.0 : 1.0;
  const V3 qStart = c < 0 ? toV(q.b_) : toV(q.a_);
  const V3 delta = qStart - toV(p.a_);
  const double X = dot(delta, toV(p.wdir_)), Y = dot(delta, toV(p.tdir_));
  const double S = dot(delta, toV(p.u_));
  bool usedHoerLove = false;
  int budget = kMaxSubPairs;
  const double v = parallelPieces(p, q, 0.0, p.len_, 0.0, q.len_, X, Y, S, usedHoerLove, budget);
  return {Henry(sign * v), usedHoerLove ? MutualMethod::HoerLove : MutualMethod::ParallelFilament};
}

/// Mutual of the part [pS0, pS1] of p with the part [qS0, qS1] of q (axial coordinates from each
/// start; q's start sits at (X, Y, S) in p's frame). Splits axially when Hoer-Love would be badly
/// conditioned; the mutual is additive over pieces, so splitting is exact. \p budget bounds the
/// number of splits for absurdly long bars (kilometres of thin trace).
double PairEvaluator::parallelPieces(const PreparedConductor &p, const PreparedConductor &q,
                                     double pS0, double pS1, double qS0, double qS1, double X,
                                     double Y, double S, bool &usedHoerLove, int &budget) {
  const double l1 = pS1 - pS0, l2 = qS1 - qS0;
  const double s = S + qS0 - pS0; // start of the q piece relative to the start of the p piece
  const double d = std::hypot(X, Y);
  const double gap = std::max({0.0, s - l1, -(s + l2)});
  const double dist = std::hypot(d, gap);
  const double sizeD = std::max(p.maxDim_, q.maxDim_);
  if (dist >= kSectionExpansionRatio * sizeD) {
    // The relative transverse displacement has covariance Cp + Cq; p's frame diagonalises it.
    const Sym3 cov = sumCov(p.cov_, q.cov_);
    const double vxx = cov.quad(toV(p.wdir_)), vyy = cov.quad(toV(p.tdir_));
    return parallelFilamentRaw(l1, l2, s, d) + parallelSectionCorrection(l1, l2, s, X, Y, vxx, vyy);
  }
  // Close: rectangular bars by Hoer-Love (round wires as squares of equal GMD).
  auto section = [](const PreparedConductor &k, double &sw, double &st) {
    if (k.c_.section == CrossSection::Round) sw = st = kSquareSidePerRadius * 0.5 * k.w_;
    else sw = k.w_, st = k.t_;
  };
  double w1, t1, w2, t2;
  section(p, w1, t1);
  section(q, w2, t2);
  // q's width direction is parallel or antiparallel to p's (same axis, same frame rule), and a
  // centred box is symmetric, so q's box is centred at (X, Y) in p's frame.
  const double maxAxial = std::max({std::abs(s - l1), std::abs(s + l2 - l1), std::abs(s + l2),
                                    std::abs(s)});
  const double secRoot = std::sqrt(std::min(w1 * t1, w2 * t2));
  if (maxAxial > kHoerLoveMaxRatio * secRoot && --budget > 0) {
    if (l1 >= l2) {
      const double m = 0.5 * (pS0 + pS1);
      return parallelPieces(p, q, pS0, m, qS0, qS1, X, Y, S, usedHoerLove, budget) +
             parallelPieces(p, q, m, pS1, qS0, qS1, X, Y, S, usedHoerLove, budget);
    }
    const double m = 0.5 * (qS0 + qS1);
    return parallelPieces(p, q, pS0, pS1, qS0, m, X, Y, S, usedHoerLove, budget) +
           parallelPieces(p, q, pS0, pS1, m, qS1, X, Y, S, usedHoerLove, budget);
  }
  usedHoerLove = true;
  if (maxAxial <= kHoerLoveDoubleRatio * secRoot)
    return hoerLoveMutualT<double>(-0.5 * w1, -0.5 * t1, 0.0, w1, t1, l1, X - 0.5 * w2,
                                   Y - 0.5 * t2, s, w2, t2, l2);
  return static_cast<double>(hoerLoveMutualLd(-0.5 * w1, -0.5 * t1, 0.0, w1, t1, l1,
                                              X - 0.5 * w2, Y - 0.5 * t2, s, w2, t2, l2));
}

MutualPartial mutualPartialDetailed(const PreparedConductor &p, const PreparedConductor &q,
                                    const MutualOptions &options) {
  return PairEvaluator::evaluate(p, q, options.farField);
}

Henry mutualPartial(const Conductor &p, const Conductor &q) {
  return mutualPartialDetailed(PreparedConductor(p), PreparedConductor(q)).value;
}

} // namespace gateloop
