/// \file
/// Reader for the project file `gateloop/1` (spec 4.5) and the search for it.

#include "netlist-io/json_common.h"
#include "netlist-io/json_inputs.h"

#include <filesystem>
#include <set>

namespace gateloop {

using jsonio::childPath;
using jsonio::indexPath;
using jsonio::Json;
using jsonio::Sign;

namespace fs = std::filesystem;

namespace {

bool isLeapYear(int y) { return (y % 4 == 0 && y % 100 != 0) || y % 400 == 0; }

/// True for a real calendar date written exactly as YYYY-MM-DD (ISO 8601 calendar date, extended
/// format), Gregorian leap years included.
bool isIsoDate(const std::string &s) {
  if (s.size() != 10 || s[4] != '-' || s[7] != '-') return false;
  for (std::size_t i : {0, 1, 2, 3, 5, 6, 8, 9})
    if (s[i] < '0' || s[i] > '9') return false;
  int y = std::stoi(s.substr(0, 4)), m = std::stoi(s.substr(5, 2)), d = std::stoi(s.substr(8, 2));
  static constexpr int kDays[] = {31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31};
  if (m < 1 || m > 12 || d < 1) return false;
  int maxDay = kDays[m - 1] + (m == 2 && isLeapYear(y) ? 1 : 0);
  return d <= maxDay;
}

/// Sets \p dst when the file gave a value; fields the file leaves out keep what \p dst had, so an
/// operating-point file can be laid over a design's own values.
template <class T> void keep(std::optional<T> &dst, std::optional<T> v) {
  if (v) dst = v;
}

/// The keys of an operating point (a design's `operating`, or a stand-alone file), at \p path.
void readOperatingFields(jsonio::FieldReader &r, const Json &v, const std::string &path, OperatingPoint &op,
                         const std::vector<std::string> &extraKeys) {
  if (!r.expectObject(v, path)) return;
  std::vector<std::string> keys{"v_bus", "i_load", "f_sw", "t_ambient", "l_power_loop", "drive", "dv_dt", "di_dt",
                                "l_per_length", "assumed_length"};
  keys.insert(keys.end(), extraKeys.begin(), extraKeys.end());
  r.checkKeys(v, path, keys);
  keep(op.vBus, r.typed<Volt>(v, path, "v_bus", Dimension::Voltage, Sign::Positive));
  keep(op.iLoad, r.typed<Ampere>(v, path, "i_load", Dimension::Current, Sign::NonNegative));
  keep(op.fSw, r.typed<Hertz>(v, path, "f_sw", Dimension::Frequency, Sign::Positive));
  keep(op.tAmbient, r.typed<Celsius>(v, path, "t_ambient", Dimension::Temperature));
  keep(op.lPowerLoop, r.typed<Henry>(v, path, "l_power_loop", Dimension::Inductance, Sign::NonNegative));
  keep(op.dvDt, r.typed<VoltPerSecond>(v, path, "dv_dt", Dimension::VoltageSlope, Sign::Positive));
  keep(op.diDt, r.typed<AmperePerSecond>(v, path, "di_dt", Dimension::CurrentSlope, Sign::Positive));
  keep(op.assumedInductancePerLength,
       r.typed<HenryPerMeter>(v, path, "l_per_length", Dimension::InductancePerLength, Sign::Positive));
  keep(op.assumedLength, r.typed<Meter>(v, path, "assumed_length", Dimension::Length, Sign::Positive));
  if (const Json *drive = r.field(v, path, "drive")) {
    std::string dp = childPath(path, "drive");
    if (r.expectObject(*drive, dp)) {
      r.checkKeys(*drive, dp, {"v_on", "v_off"});
      keep(op.driveVOn, r.typed<Volt>(*drive, dp, "v_on", Dimension::Voltage));
      keep(op.driveVOff, r.typed<Volt>(*drive, dp, "v_off", Dimension::Voltage));
      if (op.driveVOn && op.driveVOff && !(*op.driveVOff < *op.driveVOn)) {
        if (r.field(*drive, dp, "v_off")) {
          r.error(childPath(dp, "v_off"), "must be below v_on");
          op.driveVOff.reset();
        } else {
          r.error(childPath(dp, "v_on"), "must be above v_off");
          op.driveVOn.reset();
        }
      }
    }
  }
}

class ProjectReader {
public:
  ProjectReader(jsonio::FieldReader &r, Project &out, fs::path baseDir) : r_(r), out_(out), base_(std::move(baseDir)) {}

  void read(const Json &doc) {
    r_.checkSchema(doc, "gateloop/1");
    r_.checkKeys(doc, "", {"schema", "parts", "designs", "rules", "waivers", "description"});
    if (const Json *p = r_.field(doc, "", "parts")) out_.partsPaths = paths(*p, "parts");
    if (const Json *d = r_.field(doc, "", "designs", true)) readDesigns(*d);
    if (const Json *rules = r_.field(doc, "", "rules")) readRules(*rules);
    if (const Json *w = r_.field(doc, "", "waivers")) readWaivers(*w);
  }

private:
  /// Joins a path written in the project file with the file's folder, so it opens from the
  /// current directory; absolute paths stay as written.
  std::string resolve(const std::string &p) const {
    fs::path written(p);
    if (written.is_absolute() || base_.empty()) return written.lexically_normal().string();
    return (base_ / written).lexically_normal().string();
  }

  std::vector<std::string> paths(const Json &v, const std::string &path) {
    std::vector<std::string> out;
    for (auto &p : r_.stringList(v, path)) out.push_back(resolve(p));
    return out;
  }

  void readDesigns(const Json &v) {
    if (!r_.expectArray(v, "designs")) return;
    if (v.empty()) r_.error("designs", "the project has no designs");
    std::set<std::string> names;
    for (std::size_t i = 0; i < v.size(); ++i) {
      std::string path = indexPath("designs", i);
      const Json &d = v[i];
      if (!r_.expectObject(d, path)) continue;
      r_.checkKeys(d, path, {"name", "netlist", "layout", "parts", "assign", "operating", "description"});
      DesignSpec spec;
      spec.fieldPath = path;
      if (auto name = r_.stringField(d, path, "name", true)) {
        if (!names.insert(*name).second)
          r_.error(childPath(path, "name"), "another design is already called \"" + *name + "\"");
        spec.name = *name;
      }
      if (auto n = r_.stringField(d, path, "netlist", true)) spec.netlistPath = resolve(*n);
      if (auto l = r_.stringField(d, path, "layout")) spec.layoutPath = resolve(*l);
      if (const Json *p = r_.field(d, path, "parts")) spec.partsPaths = paths(*p, childPath(path, "parts"));
      if (const Json *a = r_.field(d, path, "assign")) readAssign(*a, childPath(path, "assign"), spec);
      if (const Json *o = r_.field(d, path, "operating")) readOperating(*o, childPath(path, "operating"), spec.operating);
      out_.designs.push_back(std::move(spec));
    }
  }

  void readAssign(const Json &v, const std::string &path, DesignSpec &spec) {
    if (!r_.expectObject(v, path)) return;
    for (auto it = v.begin(); it != v.end(); ++it) {
      std::string ap = childPath(path, it.key());
      if (it.key().empty()) {
        r_.error(ap, "an empty pattern matches nothing");
        continue;
      }
      if (auto part = r_.string(it.value(), ap)) spec.assign.emplace_back(it.key(), *part);
    }
  }

  void readOperating(const Json &v, const std::string &path, OperatingPoint &op) {
    readOperatingFields(r_, v, path, op, {});
  }

  void readRules(const Json &v) {
    // Each rule validates its own parameters (and the rule ids are checked against the registry)
    // later; here they are only kept.
    if (!r_.expectObject(v, "rules")) return;
    for (auto it = v.begin(); it != v.end(); ++it) out_.ruleParams[it.key()] = nlohmann::json(it.value());
  }

  void readWaivers(const Json &v) {
    if (!r_.expectArray(v, "waivers")) return;
    for (std::size_t i = 0; i < v.size(); ++i) {
      std::string path = indexPath("waivers", i);
      const Json &w = v[i];
      if (!r_.expectObject(w, path)) continue;
      r_.checkKeys(w, path, {"rule", "loop", "reason", "until"});
      Waiver waiver;
      waiver.fieldPath = path;
      auto rule = r_.stringField(w, path, "rule", true);
      auto loop = r_.stringField(w, path, "loop", true);
      auto reason = r_.stringField(w, path, "reason", true);
      auto until = r_.stringField(w, path, "until");
      bool badDate = until && !isIsoDate(*until);
      if (badDate)
        r_.error(childPath(path, "until"), "expected a date written YYYY-MM-DD, got \"" + *until + "\"");
      // A waiver whose end date cannot be read must not turn into one that never ends.
      if (!rule || !loop || !reason || badDate) continue;
      waiver.rule = *rule;
      waiver.loopGlob = *loop;
      waiver.reason = *reason;
      waiver.until = until.value_or("");
      out_.waivers.push_back(std::move(waiver));
    }
  }

  jsonio::FieldReader &r_;
  Project &out_;
  fs::path base_;
};

} // namespace

bool readProject(const std::string &path, FileTable &files, Project &out, InputDiagnostics &diags) {
  const std::size_t errorsBefore = diags.errorCount();
  fs::path base = fs::path(path).parent_path();
  std::error_code ec;
  fs::path root = fs::absolute(base.empty() ? fs::path(".") : base, ec).lexically_normal();
  std::string rootText = root.string();
  // lexically_normal keeps a trailing separator ("/work/proj/"); the root is a folder name.
  while (rootText.size() > 1 && rootText.back() == fs::path::preferred_separator) rootText.pop_back();
  out.rootDir = rootText;

  FileId fileId = 0;
  auto doc = jsonio::loadJsonFile(path, files, fileId, diags);
  out.file = fileId;
  if (!doc) return false;
  if (!doc->is_object()) {
    diags.error({fileId, 1, 1}, "expected a JSON object at the top level, got " + jsonio::brief(*doc));
    return false;
  }
  jsonio::FieldReader r(fileId, diags);
  ProjectReader(r, out, base).read(*doc);
  return diags.errorCount() == errorsBefore;
}

bool readOperatingPoint(const std::string &path, FileTable &files, OperatingPoint &out, InputDiagnostics &diags) {
  const std::size_t errorsBefore = diags.errorCount();
  FileId fileId = 0;
  auto doc = jsonio::loadJsonFile(path, files, fileId, diags);
  if (!doc) return false;
  if (!doc->is_object()) {
    diags.error({fileId, 1, 1}, "expected a JSON object at the top level, got " + jsonio::brief(*doc));
    return false;
  }
  jsonio::FieldReader r(fileId, diags);
  // The schema line is optional here: the file is named on the command line, not discovered.
  if (doc->contains("schema")) r.checkSchema(*doc, "gateloop-operating/1");
  readOperatingFields(r, *doc, "", out, {"schema", "description"});
  return diags.errorCount() == errorsBefore;
}

std::optional<std::string> findProjectFile(const std::string &startDir) {
  std::error_code ec;
  fs::path dir = fs::absolute(startDir.empty() ? fs::path(".") : fs::path(startDir), ec);
  if (ec) return std::nullopt;
  dir = dir.lexically_normal();
  for (;;) {
    fs::path candidate = dir / "gateloop.json";
    if (fs::is_regular_file(candidate, ec)) return candidate.string();
    fs::path parent = dir.parent_path();
    // "/x/" normalises to a path whose parent is "/x"; stop once walking up no longer moves.
    if (parent == dir || parent.empty()) return std::nullopt;
    dir = parent;
  }
}

} // namespace gateloop
