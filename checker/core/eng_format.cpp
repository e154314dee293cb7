#include "checker/core/eng_format.h"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

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
  // Dimensionless values (ratios, damping) are shown plainly, without a prefix.
  if (!unit.empty() && mag != 0.0) {
    chosen = &kPrefixes[9];
    for (const auto &p : kPrefixes)
      if (mag >= p.scale * 0.9995) {
        chosen = &p;
        break;
      }
  }
  double scaled = si / chosen->scale;
  int digitsBefore = scaled == 0.0 ? 1 : static_cast<int>(std::floor(std::log10(std::fabs(scaled)))) + 1;
  int decimals = std::max(0, significant - digitsBefore);
  fmt::memory_buffer buf;
  fmt::format_to(std::back_inserter(buf), "{:.{}f}", scaled, decimals);
  std::string text(buf.data(), buf.size());
  // "4.70" reads "4.7", "2.00" reads "2".
  if (text.find('.') != std::string::npos) {
    while (text.back() == '0') text.pop_back();
    if (text.back() == '.') text.pop_back();
  }
  if (text == "-0") text = "0";
  if (unit.empty()) return text;
  text += ' ';
  text += chosen->prefix;
  text += unit;
  return text;
}

} // namespace gateloop
