/// \file
/// Reader for the parts library `gateloop-parts/1` (spec 4.3).

#include "netlist-io/json_common.h"
#include "netlist-io/json_inputs.h"

#include <algorithm>
#include <array>

namespace gateloop {

using jsonio::childPath;
using jsonio::indexPath;
using jsonio::Json;
using jsonio::Sign;

namespace {

struct KindName {
  const char *name;
  PartKind kind;
};
constexpr std::array<KindName, 9> kKinds{{{"igbt", PartKind::Igbt},
                                          {"mosfet", PartKind::Mosfet},
                                          {"driver", PartKind::Driver},
                                          {"resistor", PartKind::Resistor},
                                          {"capacitor", PartKind::Capacitor},
                                          {"diode", PartKind::Diode},
                                          {"zener", PartKind::Zener},
                                          {"tvs", PartKind::Tvs},
                                          {"ferrite", PartKind::Ferrite}}};

const std::vector<std::string> kCommonFields{"kind", "match", "description"};
const std::vector<std::string> kSwitchFields{
    "pins",  "v_ge_max", "v_ge_min", "v_gs_max", "v_gs_min", "v_th_min",        "v_plateau",
    "c_ies", "c_iss",    "c_res",    "c_rss",    "q_g",      "q_g_swing",       "r_g_int",
    "r_g_recommended",   "v_rated",  "i_rated",  "l_gate_internal",             "t_fall"};
const std::vector<std::string> kDriverFields{"pins",   "i_source_peak", "i_sink_peak", "r_source",
                                             "r_sink", "v_on",          "v_off"};
const std::vector<std::string> kResistorFields{"case", "p_rated", "tolerance", "t_knee",
                                               "t_max", "esl",    "pulse",     "v_max"};
const std::vector<std::string> kCapacitorFields{"capacitance", "case", "tolerance", "esl"};
const std::vector<std::string> kDiodeFields{"pins", "v_f"};
const std::vector<std::string> kClampFields{"pins", "v_f", "v_breakdown", "v_clamp", "bidirectional"};
const std::vector<std::string> kFerriteFields{"r_dc", "l"};

const std::vector<std::string> &kindFields(PartKind k) {
  switch (k) {
  case PartKind::Igbt:
  case PartKind::Mosfet: return kSwitchFields;
  case PartKind::Driver: return kDriverFields;
  case PartKind::Resistor: return kResistorFields;
  case PartKind::Capacitor: return kCapacitorFields;
  case PartKind::Diode: return kDiodeFields;
  case PartKind::Zener:
  case PartKind::Tvs: return kClampFields;
  case PartKind::Ferrite: return kFerriteFields;
  }
  return kResistorFields;
}

std::vector<std::string> allFields() {
  std::vector<std::string> all = kCommonFields;
  for (const auto *list : {&kSwitchFields, &kDriverFields, &kResistorFields, &kCapacitorFields,
                           &kClampFields, &kFerriteFields})
    for (const auto &f : *list)
      if (std::find(all.begin(), all.end(), f) == all.end()) all.push_back(f);
  return all;
}

/// Pin roles per kind. A switch accepts the other technology's words (an IGBT's "source" is its
/// emitter) and stores the kind's own word, so later stages look up one spelling per kind.
struct PinRole {
  const char *written;
  const char *stored;
};
constexpr std::array<PinRole, 6> kIgbtPins{{{"gate", "gate"},
                                            {"emitter", "emitter"},
                                            {"kelvin", "kelvin"},
                                            {"collector", "collector"},
                                            {"source", "emitter"},
                                            {"drain", "collector"}}};
constexpr std::array<PinRole, 6> kMosfetPins{{{"gate", "gate"},
                                              {"source", "source"},
                                              {"kelvin", "kelvin"},
                                              {"drain", "drain"},
                                              {"emitter", "source"},
                                              {"collector", "drain"}}};
constexpr std::array<PinRole, 6> kDriverPins{{{"out_source", "out_source"},
                                              {"out_sink", "out_sink"},
                                              {"out", "out"},
                                              {"ref", "ref"},
                                              {"supply", "supply"},
                                              {"clamp", "clamp"}}};

/// Diodes, Zeners and TVS: which pin is which when the netlist's pin names do not say
/// (SPICE and typed XML diodes list the anode first).
constexpr std::array<PinRole, 2> kDiodePins{{{"anode", "anode"}, {"cathode", "cathode"}}};

class PartReader {
public:
  PartReader(jsonio::FieldReader &r) : r_(r) {}

  /// Reads one part; false when its kind is unusable (the part is then not added).
  bool read(const std::string &id, const Json &obj, const std::string &path, Part &part) {
    if (!r_.expectObject(obj, path)) return false;
    part.id = id;
    part.fieldPath = path;
    part.file = r_.file();

    const Json *kindJson = r_.field(obj, path, "kind", true);
    std::optional<PartKind> kind;
    if (kindJson) kind = readKind(*kindJson, childPath(path, "kind"));
    checkFields(obj, path, kind);
    if (!kind) return false;
    part.kind = *kind;

    if (const Json *m = r_.field(obj, path, "match")) readMatch(*m, childPath(path, "match"), part);
    if (const Json *p = r_.field(obj, path, "pins")) readPins(*p, childPath(path, "pins"), part);
    if (const Json *d = r_.field(obj, path, "description")) r_.string(*d, childPath(path, "description"), false);

    switch (part.kind) {
    case PartKind::Igbt:
    case PartKind::Mosfet: readSwitch(obj, path, part); break;
    case PartKind::Driver: readDriver(obj, path, part); break;
    case PartKind::Resistor: readResistor(obj, path, part); break;
    case PartKind::Capacitor: readCapacitor(obj, path, part); break;
    case PartKind::Diode:
    case PartKind::Zener:
    case PartKind::Tvs: readSemiconductorClamp(obj, path, part); break;
    case PartKind::Ferrite: readFerrite(obj, path, part); break;
    }
    return true;
  }

private:
  std::optional<PartKind> readKind(const Json &v, const std::string &path) {
    auto s = r_.string(v, path);
    if (!s) return std::nullopt;
    std::vector<std::string> names;
    for (const auto &k : kKinds) {
      if (*s == k.name) return k.kind;
      names.push_back(k.name);
    }
    std::string msg = "unknown kind \"" + *s + "\" (expected igbt, mosfet, driver, resistor, capacitor, "
                                               "diode, zener, tvs or ferrite)";
    if (auto near = jsonio::closestMatch(*s, names)) msg += "; did you mean \"" + *near + "\"?";
    r_.error(path, std::move(msg));
    return std::nullopt;
  }

  /// Unknown fields get a "did you mean"; known fields of another kind say so instead, which is
  /// the likelier mistake ("v_f" on a resistor).
  void checkFields(const Json &obj, const std::string &path, std::optional<PartKind> kind) {
    static const std::vector<std::string> all = allFields();
    std::vector<std::string> allowed = kCommonFields;
    if (kind) allowed.insert(allowed.end(), kindFields(*kind).begin(), kindFields(*kind).end());
    else allowed = all;
    for (auto it = obj.begin(); it != obj.end(); ++it) {
      const std::string &key = it.key();
      if (std::find(allowed.begin(), allowed.end(), key) != allowed.end()) continue;
      if (std::find(all.begin(), all.end(), key) != all.end()) {
        r_.error(childPath(path, key),
                 std::string("field does not apply to a part of kind \"") + partKindName(*kind) + "\"");
        continue;
      }
      std::string msg = "unknown field";
      if (auto near = jsonio::closestMatch(key, allowed)) msg += "; did you mean \"" + *near + "\"?";
      else if (auto nearAny = jsonio::closestMatch(key, all)) msg += "; did you mean \"" + *nearAny + "\"?";
      r_.error(childPath(path, key), std::move(msg));
    }
  }

  void readMatch(const Json &v, const std::string &path, Part &part) {
    if (!r_.expectObject(v, path)) return;
    r_.checkKeys(v, path, {"subckt", "model"});
    if (const Json *s = r_.field(v, path, "subckt")) part.matchSubckt = r_.stringList(*s, childPath(path, "subckt"));
    if (const Json *m = r_.field(v, path, "model")) part.matchModel = r_.stringList(*m, childPath(path, "model"));
  }

  void readPins(const Json &v, const std::string &path, Part &part) {
    if (!r_.expectObject(v, path)) return;
    const PinRole *roles = nullptr;
    std::size_t count = 0;
    switch (part.kind) {
    case PartKind::Igbt: roles = kIgbtPins.data(), count = kIgbtPins.size(); break;
    case PartKind::Mosfet: roles = kMosfetPins.data(), count = kMosfetPins.size(); break;
    case PartKind::Driver: roles = kDriverPins.data(), count = kDriverPins.size(); break;
    case PartKind::Diode:
    case PartKind::Zener:
    case PartKind::Tvs: roles = kDiodePins.data(), count = kDiodePins.size(); break;
    default: return; // checkFields already reported "pins" on a passive
    }
    std::vector<std::string> names;
    for (std::size_t i = 0; i < count; ++i) names.push_back(roles[i].written);
    for (auto it = v.begin(); it != v.end(); ++it) {
      std::string rolePath = childPath(path, it.key());
      const PinRole *role = nullptr;
      for (std::size_t i = 0; i < count; ++i)
        if (it.key() == roles[i].written) role = &roles[i];
      if (!role) {
        std::string msg = std::string("unknown pin role for a part of kind \"") + partKindName(part.kind) + "\"";
        if (auto near = jsonio::closestMatch(it.key(), names)) msg += "; did you mean \"" + *near + "\"?";
        r_.error(rolePath, std::move(msg));
        continue;
      }
      auto pin = r_.string(it.value(), rolePath);
      if (!pin) continue;
      if (!part.pins.emplace(role->stored, *pin).second) {
        r_.error(rolePath, "pin role \"" + std::string(role->stored) + "\" is given twice (\"" + role->written +
                               "\" means the same as \"" + role->stored + "\" here)");
      }
    }
    if (part.kind == PartKind::Driver && part.pins.count("out") &&
        (part.pins.count("out_source") || part.pins.count("out_sink")))
      r_.error(childPath(path, "out"),
               "a driver has either one bidirectional \"out\" or \"out_source\"/\"out_sink\", not both");
  }

  /// Reads \p a or its synonym \p b (v_ge_max / v_gs_max); both at once is an error.
  template <class Q>
  std::optional<Q> eitherOf(const Json &obj, const std::string &path, const char *a, const char *b, Dimension dim,
                            Sign sign) {
    const Json *va = r_.field(obj, path, a);
    const Json *vb = r_.field(obj, path, b);
    if (va && vb) {
      r_.error(childPath(path, b), std::string("give either \"") + a + "\" or \"" + b + "\", not both");
      return std::nullopt;
    }
    return r_.typed<Q>(obj, path, va ? a : b, dim, sign);
  }

  template <class Q>
  std::optional<Range<Q>> range(const Json &v, const std::string &path, Dimension dim, Sign sign, bool strict) {
    if (!v.is_array() || v.size() != 2) {
      r_.error(path, "expected a pair [low, high], got " + jsonio::brief(v));
      return std::nullopt;
    }
    auto lo = r_.quantity(v[0], indexPath(path, 0), dim, sign);
    auto hi = r_.quantity(v[1], indexPath(path, 1), dim, sign);
    if (!lo || !hi) return std::nullopt;
    if (strict ? !(*lo < *hi) : !(*lo <= *hi)) {
      r_.error(path, std::string("the low end must be ") + (strict ? "below" : "at most") + " the high end, got " +
                         jsonio::brief(v));
      return std::nullopt;
    }
    return Range<Q>{Q(*lo), Q(*hi)};
  }

  void readSwitch(const Json &obj, const std::string &path, Part &p) {
    p.vGateMax = eitherOf<Volt>(obj, path, "v_ge_max", "v_gs_max", Dimension::Voltage, Sign::Any);
    p.vGateMin = eitherOf<Volt>(obj, path, "v_ge_min", "v_gs_min", Dimension::Voltage, Sign::Any);
    if (p.vGateMax && p.vGateMin && !(*p.vGateMin < *p.vGateMax)) {
      r_.error(path, "the minimum gate voltage must be below the maximum");
      p.vGateMin.reset();
    }
    p.vThMin = r_.typed<Volt>(obj, path, "v_th_min", Dimension::Voltage);
    p.vPlateau = r_.typed<Volt>(obj, path, "v_plateau", Dimension::Voltage);
    p.cIes = eitherOf<Farad>(obj, path, "c_ies", "c_iss", Dimension::Capacitance, Sign::Positive);
    p.cRes = eitherOf<Farad>(obj, path, "c_res", "c_rss", Dimension::Capacitance, Sign::Positive);
    p.qG = r_.typed<Coulomb>(obj, path, "q_g", Dimension::Charge, Sign::Positive);
    if (const Json *v = r_.field(obj, path, "q_g_swing"))
      p.qGSwing = range<Volt>(*v, childPath(path, "q_g_swing"), Dimension::Voltage, Sign::Any, true);
    p.rGInt = r_.typed<Ohm>(obj, path, "r_g_int", Dimension::Resistance, Sign::NonNegative);
    if (const Json *v = r_.field(obj, path, "r_g_recommended")) {
      std::string rp = childPath(path, "r_g_recommended");
      if (r_.expectObject(*v, rp)) {
        r_.checkKeys(*v, rp, {"on", "off"});
        if (const Json *on = r_.field(*v, rp, "on"))
          p.rgRecommendedOn = range<Ohm>(*on, childPath(rp, "on"), Dimension::Resistance, Sign::NonNegative, false);
        if (const Json *off = r_.field(*v, rp, "off"))
          p.rgRecommendedOff =
              range<Ohm>(*off, childPath(rp, "off"), Dimension::Resistance, Sign::NonNegative, false);
      }
    }
    p.vRated = r_.typed<Volt>(obj, path, "v_rated", Dimension::Voltage, Sign::Positive);
    p.iRated = r_.typed<Ampere>(obj, path, "i_rated", Dimension::Current, Sign::Positive);
    p.lGateInternal = r_.typed<Henry>(obj, path, "l_gate_internal", Dimension::Inductance, Sign::NonNegative);
    p.tFall = r_.typed<Second>(obj, path, "t_fall", Dimension::Time, Sign::Positive);
  }

  void readDriver(const Json &obj, const std::string &path, Part &p) {
    p.iSourcePeak = r_.typed<Ampere>(obj, path, "i_source_peak", Dimension::Current, Sign::Positive);
    p.iSinkPeak = r_.typed<Ampere>(obj, path, "i_sink_peak", Dimension::Current, Sign::Positive);
    p.rSource = r_.typed<Ohm>(obj, path, "r_source", Dimension::Resistance, Sign::NonNegative);
    p.rSink = r_.typed<Ohm>(obj, path, "r_sink", Dimension::Resistance, Sign::NonNegative);
    p.vOn = r_.typed<Volt>(obj, path, "v_on", Dimension::Voltage);
    p.vOff = r_.typed<Volt>(obj, path, "v_off", Dimension::Voltage);
    if (p.vOn && p.vOff && !(*p.vOff < *p.vOn)) {
      r_.error(childPath(path, "v_off"), "must be below v_on");
      p.vOff.reset();
    }
  }

  void readTolerance(const Json &obj, const std::string &path, Part &p) {
    const Json *v = r_.field(obj, path, "tolerance");
    if (!v) return;
    std::string tp = childPath(path, "tolerance");
    auto t = r_.quantity(*v, tp, Dimension::Dimensionless, Sign::NonNegative);
    if (!t) return;
    // 1 for "1 %" is the likely slip; a fraction of 1 or more is never a real tolerance.
    if (*t >= 1) {
      r_.error(tp, "must be a fraction below 1 (write 0.01 or \"1 %\" for 1 %), got " + jsonio::brief(*v));
      return;
    }
    p.tolerance = *t;
  }

  void readResistor(const Json &obj, const std::string &path, Part &p) {
    if (auto c = r_.stringField(obj, path, "case")) p.caseCode = *c;
    p.pRated = r_.typed<Watt>(obj, path, "p_rated", Dimension::Power, Sign::Positive);
    readTolerance(obj, path, p);
    p.tKnee = r_.typed<Celsius>(obj, path, "t_knee", Dimension::Temperature);
    p.tMax = r_.typed<Celsius>(obj, path, "t_max", Dimension::Temperature);
    if (p.tKnee && p.tMax && !(*p.tKnee < *p.tMax)) {
      r_.error(childPath(path, "t_max"), "must be above t_knee");
      p.tMax.reset();
    }
    p.esl = r_.typed<Henry>(obj, path, "esl", Dimension::Inductance, Sign::NonNegative);
    p.vMaxElement = r_.typed<Volt>(obj, path, "v_max", Dimension::Voltage, Sign::Positive);
    if (const Json *v = r_.field(obj, path, "pulse")) readPulse(*v, childPath(path, "pulse"), p);
  }

  void readPulse(const Json &v, const std::string &path, Part &p) {
    if (!r_.expectArray(v, path)) return;
    std::vector<PulsePoint> points;
    bool ok = true;
    for (std::size_t i = 0; i < v.size(); ++i) {
      std::string ip = indexPath(path, i);
      if (!v[i].is_array() || v[i].size() != 2) {
        r_.error(ip, "expected a pair [width, power], got " + jsonio::brief(v[i]));
        ok = false;
        continue;
      }
      auto w = r_.quantity(v[i][0], indexPath(ip, 0), Dimension::Time, Sign::Positive);
      auto pw = r_.quantity(v[i][1], indexPath(ip, 1), Dimension::Power, Sign::Positive);
      if (!w || !pw) {
        ok = false;
        continue;
      }
      points.push_back({Second(*w), Watt(*pw)});
    }
    if (!ok) return;
    std::stable_sort(points.begin(), points.end(), [](const auto &a, const auto &b) { return a.width < b.width; });
    for (std::size_t i = 1; i < points.size(); ++i)
      if (points[i].width == points[i - 1].width) {
        r_.error(path, "two points have the same pulse width");
        return;
      }
    p.pulse = std::move(points);
  }

  void readCapacitor(const Json &obj, const std::string &path, Part &p) {
    p.capacitance = r_.typed<Farad>(obj, path, "capacitance", Dimension::Capacitance, Sign::Positive);
    if (auto c = r_.stringField(obj, path, "case")) p.caseCode = *c;
    readTolerance(obj, path, p);
    p.esl = r_.typed<Henry>(obj, path, "esl", Dimension::Inductance, Sign::NonNegative);
  }

  void readSemiconductorClamp(const Json &obj, const std::string &path, Part &p) {
    p.vForward = r_.typed<Volt>(obj, path, "v_f", Dimension::Voltage, Sign::Positive);
    if (p.kind == PartKind::Diode) return;
    p.vBreakdown = r_.typed<Volt>(obj, path, "v_breakdown", Dimension::Voltage, Sign::Positive);
    p.vClamp = r_.typed<Volt>(obj, path, "v_clamp", Dimension::Voltage, Sign::Positive);
    if (p.vBreakdown && p.vClamp && *p.vClamp < *p.vBreakdown) {
      r_.error(childPath(path, "v_clamp"), "must not be below v_breakdown");
      p.vClamp.reset();
    }
    if (auto b = r_.boolField(obj, path, "bidirectional")) p.bidirectional = *b;
  }

  void readFerrite(const Json &obj, const std::string &path, Part &p) {
    p.rDc = r_.typed<Ohm>(obj, path, "r_dc", Dimension::Resistance, Sign::NonNegative);
    p.inductance = r_.typed<Henry>(obj, path, "l", Dimension::Inductance, Sign::NonNegative);
  }

  jsonio::FieldReader &r_;
};

} // namespace

bool readPartsLibrary(const std::string &path, FileTable &files, PartLibrary &lib, InputDiagnostics &diags) {
  const std::size_t errorsBefore = diags.errorCount();
  FileId fileId = 0;
  auto doc = jsonio::loadJsonFile(path, files, fileId, diags);
  if (!doc) return false;
  jsonio::FieldReader r(fileId, diags);
  if (!doc->is_object()) {
    diags.error({fileId, 1, 1}, "expected a JSON object at the top level, got " + jsonio::brief(*doc));
    return false;
  }
  r.checkSchema(*doc, "gateloop-parts/1");
  r.checkKeys(*doc, "", {"schema", "parts", "description"});
  const Json *parts = r.field(*doc, "", "parts", true);
  if (parts && r.expectObject(*parts, "parts")) {
    PartReader reader(r);
    for (auto it = parts->begin(); it != parts->end(); ++it) {
      std::string partPath = childPath("parts", it.key());
      if (it.key().empty()) {
        r.error(partPath, "a part id must not be empty");
        continue;
      }
      Part part;
      if (!reader.read(it.key(), it.value(), partPath, part)) continue;
      int existing = lib.find(part.id);
      if (existing >= 0) {
        const Part &other = lib.parts[static_cast<std::size_t>(existing)];
        r.error(partPath, "part \"" + part.id + "\" is already defined in " +
                              (other.file == fileId ? std::string("this file") : files.name(other.file)));
        continue;
      }
      lib.parts.push_back(std::move(part));
    }
  }
  return diags.errorCount() == errorsBefore;
}

} // namespace gateloop
