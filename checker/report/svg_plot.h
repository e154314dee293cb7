/// \file
/// Inline SVG plots of a gate loop's predicted gate voltage for the HTML report, and the XML
/// escaping the HTML report and the plots share. The curves sample the series-RLC step model the
/// loop analysis already chose (stepWaveform); nothing here judges a value.
#pragma once

#include "checker/report/report.h"

#include <string>
#include <string_view>
#include <vector>

namespace gateloop {

/// \p text made safe for XML/HTML text and attribute values: `& < > " '` become entities,
/// control characters that XML 1.0 forbids are dropped (tab, line feed and carriage return stay)
/// and invalid UTF-8 becomes U+FFFD, so the page always parses as XHTML.
std::string xmlEscape(std::string_view text);

/// One loop's gate-voltage plot.
struct GateVoltagePlot {
  /// A complete `<svg>` element (with its xmlns) holding a turn-on panel (V_off -> V_on) and a
  /// turn-off panel (V_on -> V_off) on a shared voltage axis, or empty when neither edge has the
  /// data for a curve.
  std::string svg;
  /// Why an edge has no curve ("turn-off: no L_loop, C_gate"), one entry per edge
  /// without a curve; empty when both edges are plotted.
  std::vector<std::string> missing;
};

/// Plots loop \p loopIndex of \p design: for each edge, stepWaveform with that edge's r_total and
/// l_loop, the loop's c_gate and the drive rails v_on/v_off, over about seven ringing periods
/// (under-damped) or seven R*C time constants (otherwise). Draws the switch part's gate-voltage
/// limits (v_ge_max / v_ge_min, v_gs_* for MOSFETs) where the part has them, the drive rails,
/// axes with engineering-unit tick labels, and a legend. An edge lacking r_total, l_loop, c_gate,
/// v_on or v_off, or whose values the step model rejects, gets a text in its panel instead of a
/// curve and an entry in `missing`.
GateVoltagePlot gateVoltagePlot(const DesignReport &design, std::size_t loopIndex);

} // namespace gateloop
