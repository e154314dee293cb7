#include "checker/app/geometry_svg.h"

#include "checker/app/output_file.h"
#include "checker/core/eng_format.h"
#include "checker/loops/loop_geometry.h"

#include <fmt/format.h>

#include <algorithm>
#include <filesystem>
#include <limits>

namespace gateloop {

namespace {

std::string safeFileName(std::string s) {
  for (char &c : s)
    if (!std::isalnum(static_cast<unsigned char>(c)) && c != '-' && c != '_' && c != '.') c = '_';
  return s;
}

std::string escape(const std::string &s) {
  std::string out;
  for (char c : s) {
    if (c == '&') out += "&amp;";
    else if (c == '<') out += "&lt;";
    else if (c == '>') out += "&gt;";
    else if (c == '"') out += "&quot;";
    else out += c;
  }
  return out;
}

std::string drawing(const LoopGeometry &g, const std::string &title, const std::string &caption) {
  double minX = std::numeric_limits<double>::infinity(), minY = minX, maxX = -minX, maxY = -minX;
  for (const auto &[x, y] : g.outline) {
    minX = std::min(minX, x);
    maxX = std::max(maxX, x);
    minY = std::min(minY, y);
    maxY = std::max(maxY, y);
  }
  double span = std::max({maxX - minX, maxY - minY, 1e-3});
  const double size = 480.0, pad = 40.0;
  double scale = (size - 2 * pad) / span;
  // Layout y grows downward in most exports, as in SVG, so no flip is applied.
  auto px = [&](double x) { return pad + (x - minX) * scale; };
  auto py = [&](double y) { return pad + (y - minY) * scale; };
  std::string svg = fmt::format("<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{0}\" height=\"{1}\" "
                                "viewBox=\"0 0 {0} {1}\">\n<title>{2}</title>\n"
                                "<rect width=\"100%\" height=\"100%\" fill=\"#ffffff\"/>\n",
                                size, size + 40, escape(title));
  std::string poly;
  for (const auto &[x, y] : g.outline) poly += fmt::format("{:.1f},{:.1f} ", px(x), py(y));
  svg += fmt::format("<polygon points=\"{}\" fill=\"#f4a261\" fill-opacity=\"0.35\" stroke=\"none\"/>\n", poly);
  for (const auto &t : g.traces) {
    std::string pts;
    for (const auto &[x, y] : t.trace->pointsM) pts += fmt::format("{:.1f},{:.1f} ", px(x), py(y));
    double w = std::max(1.5, t.trace->width.si() * scale);
    const char *color = t.part == LoopPart::Outgoing ? "#c0392b" : "#2471a3";
    svg += fmt::format("<polyline points=\"{}\" fill=\"none\" stroke=\"{}\" stroke-width=\"{:.1f}\" "
                       "stroke-linejoin=\"round\"><title>{} ({})</title></polyline>\n",
                       pts, color, w, escape(t.trace->net), escape(t.trace->layer));
  }
  svg += fmt::format("<text x=\"{}\" y=\"{}\" font-family=\"sans-serif\" font-size=\"13\">{}</text>\n", pad,
                     size + 10, escape(caption));
  svg += fmt::format("<text x=\"{}\" y=\"{}\" font-family=\"sans-serif\" font-size=\"11\" fill=\"#555\">red: "
                     "driver to gate; blue: drawn return{}; shaded: enclosed area</text>\n",
                     pad, size + 28, g.planeDepth ? " (return by image in the plane)" : "");
  svg += "</svg>\n";
  return svg;
}

} // namespace

std::string writeLoopGeometrySvgs(const RunReport &report, const RunInputs &inputs, const std::string &dir) {
  std::error_code ec;
  std::filesystem::create_directories(dir, ec);
  if (ec) return dir + ": error: cannot create folder: " + ec.message();
  for (std::size_t d = 0; d < report.designs.size(); ++d) {
    const DesignReport &design = report.designs[d];
    const LoadedDesign &loaded = *inputs.designs[d];
    if (!loaded.layout) continue;
    for (std::size_t i = 0; i < design.loops.size(); ++i) {
      const GateLoop &loop = design.loops[i];
      std::vector<std::string> outgoing;
      for (const auto &p : loop.paths)
        for (NetId n : p.nets) outgoing.emplace_back(design.circuit->netAt(n).name);
      std::string ref = loop.refNet == kNone ? std::string() : std::string(design.circuit->netAt(loop.refNet).name);
      auto g = buildLoopGeometry(outgoing, ref, *loaded.layout);
      if (!g) continue;
      const LoopAnalysis &a = design.analyses[i];
      std::string caption = fmt::format("{}: L_layout {} over {} of traces", loop.id, eng(a.lLayout.si(), "H"),
                                        eng(g->drawnLength.si(), "m"));
      std::string path = (std::filesystem::path(dir) / (safeFileName(design.name + "--" + loop.id) + ".svg")).string();
      if (auto err = writeOutputAtomically(path, drawing(*g, design.name + " " + loop.id, caption)); !err.empty())
        return err;
    }
  }
  return {};
}

} // namespace gateloop
