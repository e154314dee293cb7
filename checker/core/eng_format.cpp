#include "checker/core/eng_format.h"

#include <algorithm>
#include <cmath>
#include <cstdio>

namespace gateloop {

std::string eng(double si, std::string_view unit, int significant) {
  if (std::isnan(si)) return "n/a";
  if (std::isinf(si)) return si > 0 ? "inf" : "-inf";
  static const struct {
    double scale;
    const char *prefix;
  } kPrefixes[] = {{1e12, "T"}, {1e9, "G"}, {1e6, "M"}, {1e3, "k"}, {1, ""},
                   {1e-3, "m"}, {1e-6, "u"}, {1e-9, "n"}, {1e-12, "p"}, {1e-15, "f"}};
  double mag = std::fabs(si);
  const auto *chosen = &kPrefixes[4];
  // Percent-like and dimensionless values are shown plainly.
  if (!unit.empty() && mag != 0.0) {
    for (const auto &p : kPrefixes)
      if (mag >= p.scale * 0.9995) {
        chosen = &p;
        break;
      }
    if (mag < 1e-15) chosen = &kPrefixes[9];
  }
  double scaled = si / chosen->scale;
  char buf[64];
  int digitsBefore = scaled == 0.0 ? 1 : static_cast<int>(std::floor(std::log10(std::fabs(scaled)))) + 1;
  int decimals = std::max(0, significant - std::max(digitsBefore, 1));
  std::snprintf(buf, sizeof buf, "%.*f", decimals, scaled);
  std::string text = buf;
  // Drop trailing zeros so "4.70 ohm" reads "4.7 ohm".
  if (text.find('.') != std::string::npos) {
    while (text.back() == '0') text.pop_back();
    if (text.back() == '.') text.pop_back();
  }
  if (unit.empty()) return text;
  return text + " " + chosen->prefix + std::string(unit);
}

} // namespace gateloop
