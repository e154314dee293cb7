/// \file
/// Reader for the layout sidecar `gateloop-layout/1` (spec 4.4).

#include "netlist-io/json_common.h"
#include "netlist-io/json_inputs.h"

#include "checker/model/circuit.h"

#include <cmath>

namespace gateloop {

using jsonio::childPath;
using jsonio::indexPath;
using jsonio::Json;
using jsonio::Sign;

namespace {

constexpr double kDefaultCopper = 35e-6; // 1 oz/ft^2 copper, the usual outer-layer default
constexpr double kMil = 25.4e-6;
/// A bare number is metres; a board dimension of 5 cm or more written that way was almost
/// certainly meant in millimetres.
constexpr double kSuspiciousBareMetres = 0.05;

class LayoutReader {
public:
  LayoutReader(jsonio::FieldReader &r, Layout &out) : r_(r), out_(out) {}

  void read(const Json &doc) {
    r_.checkSchema(doc, "gateloop-layout/1");
    r_.checkKeys(doc, "", {"schema", "units", "stackup", "nets", "traces", "wires", "description"});
    if (auto u = r_.stringField(doc, "", "units")) {
      if (*u == "mil") pointScale_ = kMil;
      else if (*u != "mm") r_.error("units", "expected \"mm\" or \"mil\", got \"" + *u + "\"");
    }
    if (const Json *s = r_.field(doc, "", "stackup")) readStackup(*s);
    if (const Json *n = r_.field(doc, "", "nets")) readNets(*n);
    if (const Json *t = r_.field(doc, "", "traces")) readTraces(*t);
    if (const Json *w = r_.field(doc, "", "wires")) readWires(*w);
    checkPairs();
  }

private:
  /// A small dimension (trace width, wire diameter, copper) given as a bare number.
  std::optional<double> smallLength(const Json &obj, const std::string &path, const char *key, Sign sign,
                                    bool required) {
    auto v = r_.quantityField(obj, path, key, Dimension::Length, sign, required);
    const Json *raw = r_.field(obj, path, key);
    if (v && raw && raw->is_number() && *v >= kSuspiciousBareMetres)
      r_.warning(childPath(path, key), "bare number " + jsonio::brief(*raw) +
                                           " is read in metres; write \"" + jsonio::brief(*raw) +
                                           " mm\" if millimetres were meant");
    return v;
  }

  void checkLayer(const std::string &layer, const std::string &path) {
    if (out_.layer(layer)) return;
    std::string msg = "layer \"" + layer + "\" is not in the stackup";
    std::vector<std::string> names;
    for (const auto &l : out_.stackup) names.push_back(l.name);
    if (auto near = jsonio::closestMatch(layer, names)) msg += "; did you mean \"" + *near + "\"?";
    else if (names.empty()) msg += " (the file has no \"stackup\")";
    r_.error(path, std::move(msg));
  }

  void readStackup(const Json &v) {
    if (!r_.expectObject(v, "stackup")) return;
    for (auto it = v.begin(); it != v.end(); ++it) {
      std::string path = childPath("stackup", it.key());
      if (!r_.expectObject(it.value(), path)) continue;
      r_.checkKeys(it.value(), path, {"z", "copper"});
      if (out_.layer(it.key())) {
        r_.error(path, "layer names differ only in case from another layer");
        continue;
      }
      StackupLayer layer;
      layer.name = it.key();
      auto z = smallLength(it.value(), path, "z", Sign::NonNegative, true);
      auto cu = smallLength(it.value(), path, "copper", Sign::Positive, false);
      layer.z = Meter(z.value_or(0.0));
      layer.copper = Meter(cu.value_or(kDefaultCopper));
      out_.stackup.push_back(std::move(layer));
    }
  }

  void readNets(const Json &v) {
    if (!r_.expectObject(v, "nets")) return;
    for (auto it = v.begin(); it != v.end(); ++it) {
      std::string path = childPath("nets", it.key());
      const Json &n = it.value();
      if (!r_.expectObject(n, path)) continue;
      r_.checkKeys(n, path, {"length", "width", "layer", "return"});
      if (out_.routing(it.key())) {
        r_.error(path, "net names differ only in case from another net (net names are case-insensitive)");
        continue;
      }
      NetRouting nr;
      nr.net = it.key();
      nr.fieldPath = path;
      if (auto l = r_.quantityField(n, path, "length", Dimension::Length, Sign::Positive)) nr.length = Meter(*l);
      if (auto w = smallLength(n, path, "width", Sign::Positive, false)) nr.width = Meter(*w);
      if (auto layer = r_.stringField(n, path, "layer")) {
        checkLayer(*layer, childPath(path, "layer"));
        nr.layer = *layer;
      }
      if (const Json *ret = r_.field(n, path, "return")) readReturn(*ret, childPath(path, "return"), nr);
      out_.nets.push_back(std::move(nr));
    }
  }

  void readReturn(const Json &v, const std::string &path, NetRouting &nr) {
    if (!r_.expectObject(v, path)) return;
    r_.checkKeys(v, path, {"plane", "pair", "gap"});
    const Json *plane = r_.field(v, path, "plane");
    const Json *pair = r_.field(v, path, "pair");
    if (!plane && !pair) {
      r_.error(path, "expected \"plane\" or \"pair\"");
      return;
    }
    if (plane && pair) {
      r_.error(path, "give either \"plane\" or \"pair\", not both");
      return;
    }
    if (plane) {
      auto layer = r_.string(*plane, childPath(path, "plane"));
      if (!layer) return;
      checkLayer(*layer, childPath(path, "plane"));
      nr.ret.kind = NetReturn::Kind::Plane;
      nr.ret.target = *layer;
      if (r_.field(v, path, "gap"))
        r_.error(childPath(path, "gap"), "\"gap\" applies to a \"pair\" return only");
      return;
    }
    auto partner = r_.string(*pair, childPath(path, "pair"));
    if (!partner) return;
    if (equalsIgnoreCase(*partner, nr.net)) {
      r_.error(childPath(path, "pair"), "a net cannot be its own return");
      return;
    }
    nr.ret.kind = NetReturn::Kind::Pair;
    nr.ret.target = *partner;
    // Edge-to-edge gap of a side-by-side pair on one layer.
    if (auto gap = r_.quantityField(v, path, "gap", Dimension::Length, Sign::Positive)) nr.ret.gap = Meter(*gap);
  }

  void readTraces(const Json &v) {
    if (!r_.expectArray(v, "traces")) return;
    for (std::size_t i = 0; i < v.size(); ++i) {
      std::string path = indexPath("traces", i);
      const Json &t = v[i];
      if (!r_.expectObject(t, path)) continue;
      r_.checkKeys(t, path, {"net", "layer", "width", "points"});
      TracePath tp;
      tp.fieldPath = path;
      auto net = r_.stringField(t, path, "net", true);
      auto layer = r_.stringField(t, path, "layer", true);
      if (layer) checkLayer(*layer, childPath(path, "layer"));
      auto width = smallLength(t, path, "width", Sign::Positive, true);
      bool ok = net && layer && width;
      if (const Json *pts = r_.field(t, path, "points", true)) ok = readPoints(*pts, childPath(path, "points"), tp) && ok;
      else ok = false;
      if (!ok) continue;
      tp.net = *net;
      tp.layer = *layer;
      tp.width = Meter(*width);
      out_.traces.push_back(std::move(tp));
    }
  }

  bool readPoints(const Json &v, const std::string &path, TracePath &tp) {
    if (!r_.expectArray(v, path)) return false;
    bool ok = true;
    for (std::size_t i = 0; i < v.size(); ++i) {
      const Json &p = v[i];
      std::string pp = indexPath(path, i);
      if (!p.is_array() || p.size() != 2 || !p[0].is_number() || !p[1].is_number()) {
        r_.error(pp, std::string("expected a point [x, y] in ") + (pointScale_ == kMil ? "mil" : "mm") + ", got " +
                         jsonio::brief(p));
        ok = false;
        continue;
      }
      std::pair<double, double> xy{p[0].get<double>() * pointScale_, p[1].get<double>() * pointScale_};
      // A repeated point is a zero-length segment, which has no inductance to add; drop it so the
      // segment formulas never see a zero length.
      if (!tp.pointsM.empty() && tp.pointsM.back() == xy) continue;
      tp.pointsM.push_back(xy);
    }
    if (ok && tp.pointsM.size() < 2) {
      r_.error(path, "a trace needs at least two distinct points");
      ok = false;
    }
    return ok;
  }

  void readWires(const Json &v) {
    if (!r_.expectArray(v, "wires")) return;
    for (std::size_t i = 0; i < v.size(); ++i) {
      std::string path = indexPath("wires", i);
      const Json &w = v[i];
      if (!r_.expectObject(w, path)) continue;
      r_.checkKeys(w, path, {"nets", "length", "diameter", "spacing", "twisted"});
      WireLead lead;
      lead.fieldPath = path;
      bool ok = true;
      if (const Json *nets = r_.field(w, path, "nets", true)) {
        std::string np = childPath(path, "nets");
        if (!nets->is_array() || nets->size() != 2) {
          r_.error(np, "expected the two nets of the lead pair, got " + jsonio::brief(*nets));
          ok = false;
        } else {
          lead.nets = r_.stringList(*nets, np);
          if (lead.nets.size() != 2) ok = false;
          else if (equalsIgnoreCase(lead.nets[0], lead.nets[1])) {
            r_.error(np, "the two nets of a lead pair must differ");
            ok = false;
          }
        }
      } else {
        ok = false;
      }
      auto length = r_.quantityField(w, path, "length", Dimension::Length, Sign::Positive, true);
      auto diameter = smallLength(w, path, "diameter", Sign::Positive, true);
      auto spacing = r_.quantityField(w, path, "spacing", Dimension::Length, Sign::Positive, true);
      auto twisted = r_.boolField(w, path, "twisted");
      if (!length || !diameter || !spacing) continue;
      // Centre-to-centre spacing at or below one diameter means the conductors overlap; the
      // two-wire formula needs D > 2r.
      if (*spacing <= *diameter) {
        r_.error(childPath(path, "spacing"), "must be larger than the diameter (centre-to-centre spacing of "
                                             "two round wires)");
        continue;
      }
      if (!ok) continue;
      lead.length = Meter(*length);
      lead.diameter = Meter(*diameter);
      lead.spacing = Meter(*spacing);
      lead.twisted = twisted.value_or(false);
      out_.wires.push_back(std::move(lead));
    }
  }

  /// A pair return names a net that carries the return current, so it must be described here,
  /// in `nets` or by traces.
  void checkPairs() {
    for (const auto &nr : out_.nets) {
      if (nr.ret.kind != NetReturn::Kind::Pair) continue;
      if (out_.routing(nr.ret.target)) continue;
      bool traced = false;
      for (const auto &t : out_.traces) traced = traced || equalsIgnoreCase(t.net, nr.ret.target);
      if (traced) continue;
      std::string msg = "return net \"" + nr.ret.target + "\" is not described in \"nets\" or \"traces\"";
      std::vector<std::string> names;
      for (const auto &n : out_.nets) names.push_back(n.net);
      if (auto near = jsonio::closestMatch(nr.ret.target, names)) msg += "; did you mean \"" + *near + "\"?";
      r_.error(childPath(childPath(nr.fieldPath, "return"), "pair"), std::move(msg));
    }
  }

  jsonio::FieldReader &r_;
  Layout &out_;
  double pointScale_ = 1e-3;
};

} // namespace

bool readLayout(const std::string &path, FileTable &files, Layout &out, InputDiagnostics &diags) {
  const std::size_t errorsBefore = diags.errorCount();
  FileId fileId = 0;
  auto doc = jsonio::loadJsonFile(path, files, fileId, diags);
  out.file = fileId;
  if (!doc) return false;
  if (!doc->is_object()) {
    diags.error({fileId, 1, 1}, "expected a JSON object at the top level, got " + jsonio::brief(*doc));
    return false;
  }
  jsonio::FieldReader r(fileId, diags);
  LayoutReader(r, out).read(*doc);
  return diags.errorCount() == errorsBefore;
}

} // namespace gateloop
