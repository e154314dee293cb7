#include "checker/report/svg_plot.h"

#include "checker/core/eng_format.h"
#include "checker/physics/rlc_step.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <optional>

namespace gateloop {

std::string xmlEscape(std::string_view text) {
  std::string out;
  out.reserve(text.size());
  const char *kReplacement = "\xEF\xBF\xBD";
  std::size_t i = 0;
  while (i < text.size()) {
    auto c = static_cast<unsigned char>(text[i]);
    if (c < 0x80) {
      switch (c) {
      case '&': out += "&amp;"; break;
      case '<': out += "&lt;"; break;
      case '>': out += "&gt;"; break;
      case '"': out += "&quot;"; break;
      case '\'': out += "&#39;"; break;
      default:
        if (c >= 0x20 || c == '\t' || c == '\n' || c == '\r') out += static_cast<char>(c);
      }
      ++i;
      continue;
    }
    // Multi-byte UTF-8: copy a well-formed sequence, replace anything else byte by byte.
    std::size_t len = c >= 0xF0 && c <= 0xF4 ? 4 : c >= 0xE0 ? 3 : c >= 0xC2 && c <= 0xDF ? 2 : 0;
    if (c > 0xF4) len = 0;
    bool ok = len != 0 && i + len <= text.size();
    std::uint32_t cp = len == 2 ? c & 0x1F : len == 3 ? c & 0x0F : c & 0x07;
    for (std::size_t k = 1; ok && k < len; ++k) {
      auto cc = static_cast<unsigned char>(text[i + k]);
      if ((cc & 0xC0) != 0x80) ok = false;
      cp = (cp << 6) | (cc & 0x3F);
    }
    // Overlong forms, surrogates, values past U+10FFFF and the XML non-characters U+FFFE/U+FFFF.
    if (ok && ((len == 3 && cp < 0x800) || (len == 4 && (cp < 0x10000 || cp > 0x10FFFF)) ||
               (cp >= 0xD800 && cp <= 0xDFFF) || cp == 0xFFFE || cp == 0xFFFF))
      ok = false;
    if (ok) {
      out.append(text.substr(i, len));
      i += len;
    } else {
      out += kReplacement;
      ++i;
    }
  }
  return out;
}

namespace {

// Canvas geometry in SVG user units (the viewBox); two panels side by side.
constexpr double kWidth = 720, kHeight = 282;
constexpr double kPlotTop = 44, kPlotBottom = 222;
constexpr double kPanelLeft[2] = {64, 424};
constexpr double kPanelWidth = 280;
constexpr int kSamples = 480;
// Periods or time constants shown: enough for the ringing to die out or the R-C charge to
// finish (e^-7 < 0.1 %), few enough that the first edge stays readable.
constexpr double kSpanCount = 7;

constexpr const char *kOnColor = "#1f5fbf";
constexpr const char *kOffColor = "#c0392b";
constexpr const char *kLimitColor = "#e67e00";
constexpr const char *kRailColor = "#7f7f7f";

struct EdgeCurve {
  bool turnOn = true;
  std::vector<StepSample> samples;
  double tEnd = 0;
  double vFrom = 0, vTo = 0;
  std::string label;   // "R_total 8.7 Ω, L 31 nH, ζ 0.52"
  std::string missing; // why there is no curve
};

// A 1-2-5 step giving about \p target intervals over \p span.
double niceStep(double span, int target) {
  double raw = span / target;
  double mag = std::pow(10.0, std::floor(std::log10(raw)));
  double f = raw / mag;
  double nice = f < 1.5 ? 1 : f < 3 ? 2 : f < 7 ? 5 : 10;
  return nice * mag;
}

std::string fmtNum(double v) { return fmt::format("{:.1f}", v); }

std::string display(double si, const char *unit) { return eng(si, unit, 3); }

EdgeCurve edgeCurve(const LoopAnalysis &a, const EdgeAnalysis &e, bool turnOn) {
  EdgeCurve curve;
  curve.turnOn = turnOn;
  const char *edgeName = turnOn ? "turn-on" : "turn-off";
  std::vector<std::string> absent;
  if (!e.hasPath) {
    curve.missing = std::string(edgeName) + ": no conducting path";
    return curve;
  }
  if (!e.rTotal) absent.push_back("R_total");
  if (!e.lLoop) absent.push_back("L_loop");
  if (!a.cGate) absent.push_back("C_gate");
  if (!a.vOn) absent.push_back("V_on");
  if (!a.vOff) absent.push_back("V_off");
  if (!absent.empty()) {
    std::string list;
    for (const auto &s : absent) list += (list.empty() ? "" : ", ") + s;
    curve.missing = std::string(edgeName) + ": no " + list;
    return curve;
  }
  double r = e.rTotal->si(), l = e.lLoop->si(), c = a.cGate->si();
  curve.vFrom = turnOn ? a.vOff->si() : a.vOn->si();
  curve.vTo = turnOn ? a.vOn->si() : a.vOff->si();
  if (curve.vFrom == curve.vTo) {
    curve.missing = std::string(edgeName) + ": V_on equals V_off, no step to plot";
    return curve;
  }
  // Time axis: ringing periods when the analysis found ringing, else R*C. The periods are
  // bounded by the decay time constant 2L/R: just below critical damping the period is long
  // against the decay and the plot would be mostly flat line.
  double span = kSpanCount * r * c;
  if (e.fRing && e.fRing->si() > 0) {
    span = kSpanCount / e.fRing->si();
    if (r > 0) span = std::min(span, kSpanCount * 2 * l / r);
  }
  if (!(span > 0) || !std::isfinite(span)) {
    curve.missing = std::string(edgeName) + ": the loop values give no finite time scale";
    return curve;
  }
  curve.samples = stepWaveform(Ohm(r), Henry(l), Farad(c), Volt(curve.vFrom), Volt(curve.vTo), Second(span), kSamples);
  if (curve.samples.empty()) {
    curve.missing = std::string(edgeName) + ": the step model rejects these loop values";
    return curve;
  }
  curve.tEnd = span;
  curve.label = "R_total " + display(r, "Ω") + ", L " + display(l, "H") + ", C " + display(c, "F");
  if (e.zeta) curve.label += ", ζ " + eng(*e.zeta, "", 3);
  return curve;
}

struct VoltAxis {
  double lo = 0, hi = 1, step = 1;
  double y(double v) const { return kPlotBottom - (v - lo) / (hi - lo) * (kPlotBottom - kPlotTop); }
};

VoltAxis voltAxis(const std::vector<double> &values) {
  double lo = *std::min_element(values.begin(), values.end());
  double hi = *std::max_element(values.begin(), values.end());
  if (hi - lo < 1e-9) {
    lo -= 1;
    hi += 1;
  }
  VoltAxis ax;
  ax.step = niceStep(hi - lo, 6);
  // Half a step of headroom so an overshoot peak or a limit line never sits on the frame.
  ax.lo = std::floor((lo - 0.25 * ax.step) / ax.step) * ax.step;
  ax.hi = std::ceil((hi + 0.25 * ax.step) / ax.step) * ax.step;
  return ax;
}

void horizontalLine(std::string &svg, double x0, double x1, double y, const char *color, const char *dash) {
  svg += fmt::format(R"(<line x1="{}" y1="{}" x2="{}" y2="{}" stroke="{}" stroke-width="1.2" stroke-dasharray="{}"/>)",
                     fmtNum(x0), fmtNum(y), fmtNum(x1), fmtNum(y), color, dash);
  svg += '\n';
}

void panel(std::string &svg, const EdgeCurve &curve, int index, const VoltAxis &ax,
           const std::vector<std::pair<std::string, double>> &limits) {
  const double x0 = kPanelLeft[index], x1 = x0 + kPanelWidth;
  const char *color = curve.turnOn ? kOnColor : kOffColor;
  std::string title = curve.turnOn ? "turn-on" : "turn-off";
  if (curve.missing.empty())
    title += ": " + display(curve.vFrom, "V") + " → " + display(curve.vTo, "V");
  svg += fmt::format(R"(<text x="{}" y="14" font-weight="bold">{}</text>)", fmtNum(x0), xmlEscape(title)) + "\n";
  if (!curve.label.empty())
    svg += fmt::format(R"(<text x="{}" y="30" font-size="10">{}</text>)", fmtNum(x0), xmlEscape(curve.label)) + "\n";
  svg += fmt::format(R"(<rect x="{}" y="{}" width="{}" height="{}" fill="#ffffff" stroke="#999999"/>)", fmtNum(x0),
                     fmtNum(kPlotTop), fmtNum(kPanelWidth), fmtNum(kPlotBottom - kPlotTop)) +
         "\n";
  // Voltage grid and labels (shared axis, labelled on each panel).
  const long first = std::lround(std::ceil(ax.lo / ax.step - 1e-9)), last = std::lround(std::floor(ax.hi / ax.step + 1e-9));
  for (long k = first; k <= last; ++k) {
    // From an integer multiple, so accumulated rounding never prints "-1.78e-15 V" for 0.
    double shown = k == 0 ? 0.0 : k * ax.step;
    double y = ax.y(shown);
    svg += fmt::format(R"(<line x1="{}" y1="{}" x2="{}" y2="{}" stroke="#e6e6e6"/>)", fmtNum(x0), fmtNum(y),
                       fmtNum(x1), fmtNum(y));
    svg += fmt::format(R"(<text x="{}" y="{}" text-anchor="end">{}</text>)", fmtNum(x0 - 5), fmtNum(y + 4),
                       xmlEscape(display(shown, "V"))) +
           "\n";
  }
  if (!curve.missing.empty()) {
    svg += fmt::format(R"(<text x="{}" y="{}" text-anchor="middle" fill="#555555">{}</text>)",
                       fmtNum(x0 + kPanelWidth / 2), fmtNum((kPlotTop + kPlotBottom) / 2), xmlEscape(curve.missing)) +
           "\n";
    return;
  }
  // Time ticks.
  double tStep = niceStep(curve.tEnd, 5);
  auto xOf = [&](double t) { return x0 + t / curve.tEnd * kPanelWidth; };
  for (int k = 0; k * tStep <= curve.tEnd * (1 + 1e-9); ++k) {
    double t = k * tStep, x = xOf(t);
    svg += fmt::format(R"(<line x1="{}" y1="{}" x2="{}" y2="{}" stroke="#999999"/>)", fmtNum(x), fmtNum(kPlotBottom),
                       fmtNum(x), fmtNum(kPlotBottom + 4));
    svg += fmt::format(R"(<text x="{}" y="{}" text-anchor="middle">{}</text>)", fmtNum(x), fmtNum(kPlotBottom + 16),
                       xmlEscape(display(t, "s"))) +
           "\n";
  }
  svg += fmt::format(R"(<text x="{}" y="{}" text-anchor="middle" font-size="10">time after the driver step</text>)",
                     fmtNum(x0 + kPanelWidth / 2), fmtNum(kPlotBottom + 31)) +
         "\n";
  horizontalLine(svg, x0, x1, ax.y(curve.vFrom), kRailColor, "2 3");
  horizontalLine(svg, x0, x1, ax.y(curve.vTo), kRailColor, "2 3");
  for (const auto &[name, v] : limits) {
    horizontalLine(svg, x0, x1, ax.y(v), kLimitColor, "6 4");
    svg += fmt::format(R"(<text x="{}" y="{}" text-anchor="end" font-size="10" fill="{}">{}</text>)", fmtNum(x1 - 4),
                       fmtNum(ax.y(v) - 4), kLimitColor, xmlEscape(name + " " + display(v, "V"))) +
           "\n";
  }
  std::string points;
  for (const auto &s : curve.samples) {
    if (!std::isfinite(s.gate.si()) || !std::isfinite(s.time.si())) continue;
    if (!points.empty()) points += ' ';
    points += fmtNum(xOf(s.time.si())) + "," + fmtNum(ax.y(s.gate.si()));
  }
  svg += fmt::format(R"(<polyline fill="none" stroke="{}" stroke-width="1.8" points="{}"/>)", color, points) + "\n";
}

void legend(std::string &svg, const std::string &limitName) {
  struct Item {
    const char *color, *dash;
    std::string text;
  };
  std::vector<Item> items = {{kOnColor, "none", "turn-on"}, {kOffColor, "none", "turn-off"},
                             {kRailColor, "2 3", "drive rails V_on, V_off"}};
  if (!limitName.empty()) items.push_back({kLimitColor, "6 4", "part limits " + limitName});
  double x = kPanelLeft[0];
  const double y = kHeight - 8;
  for (const auto &it : items) {
    svg += fmt::format(R"(<line x1="{}" y1="{}" x2="{}" y2="{}" stroke="{}" stroke-width="1.8" stroke-dasharray="{}"/>)",
                       fmtNum(x), fmtNum(y - 4), fmtNum(x + 22), fmtNum(y - 4), it.color, it.dash);
    svg += fmt::format(R"(<text x="{}" y="{}">{}</text>)", fmtNum(x + 27), fmtNum(y), xmlEscape(it.text)) + "\n";
    // About 6.5 units per character at font size 11 is a generous estimate for sans-serif.
    x += 27 + 6.5 * it.text.size() + 18;
  }
}

} // namespace

GateVoltagePlot gateVoltagePlot(const DesignReport &design, std::size_t loopIndex) {
  GateVoltagePlot plot;
  const GateLoop &loop = design.loops.at(loopIndex);
  const LoopAnalysis &a = design.analyses.at(loopIndex);
  EdgeCurve curves[2] = {edgeCurve(a, a.on, true), edgeCurve(a, a.off, false)};
  for (const auto &c : curves)
    if (!c.missing.empty()) plot.missing.push_back(c.missing);
  if (curves[0].samples.empty() && curves[1].samples.empty()) return plot;

  // Gate-voltage limits of the switch part, named as its datasheet would (v_ge for IGBTs).
  std::vector<std::pair<std::string, double>> limits;
  std::string limitName;
  if (design.circuit && design.parts && loop.switchId != kNone) {
    const Component &sw = design.circuit->component(loop.switchId);
    if (sw.part != kNone && sw.part < design.parts->parts.size()) {
      const Part &p = design.parts->parts[sw.part];
      std::string prefix = p.kind == PartKind::Mosfet ? "v_gs" : "v_ge";
      if (p.vGateMax) limits.emplace_back(prefix + "_max", p.vGateMax->si());
      if (p.vGateMin) limits.emplace_back(prefix + "_min", p.vGateMin->si());
      if (!limits.empty()) limitName = limits.size() == 2 ? prefix + "_max, " + prefix + "_min" : limits[0].first;
    }
  }

  std::vector<double> values;
  for (const auto &c : curves) {
    if (c.samples.empty()) continue;
    values.push_back(c.vFrom);
    values.push_back(c.vTo);
    for (const auto &s : c.samples)
      if (std::isfinite(s.gate.si())) values.push_back(s.gate.si());
  }
  for (const auto &l : limits) values.push_back(l.second);
  VoltAxis ax = voltAxis(values);

  std::string svg = fmt::format(R"(<svg xmlns="http://www.w3.org/2000/svg" width="{0}" height="{1}" viewBox="0 0 {0} {1}" )"
                                R"(font-family="sans-serif" font-size="11" role="img" aria-label="{2}">)",
                                kWidth, kHeight, xmlEscape("predicted gate voltage of " + loop.id));
  svg += "\n";
  svg += "<title>" + xmlEscape("Predicted gate voltage of " + loop.id + " (series RLC step model)") + "</title>\n";
  for (int i = 0; i < 2; ++i) panel(svg, curves[i], i, ax, limits);
  legend(svg, limitName);
  svg += "</svg>";
  plot.svg = std::move(svg);
  return plot;
}

} // namespace gateloop
