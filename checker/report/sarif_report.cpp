#include "checker/report/formatters.h"
#include "checker/report/rule_docs.h"

#include <nlohmann/json.hpp>

#include <algorithm>
#include <cctype>
#include <map>
#include <set>

namespace gateloop {

namespace {

using nlohmann::ordered_json;

// The project publishes no web page, and SARIF wants an absolute URI here. A URN names the tool
// without pretending to be a locator (see docs/reports.md, "SARIF").
constexpr const char *kInformationUri = "urn:gateloop:docs";
constexpr const char *kSchemaUri = "https://json.schemastore.org/sarif-2.1.0.json";
// Relative artifact URIs resolve against this base: the folder the input paths are relative to.
constexpr const char *kSourceRoot = "SRCROOT";
constexpr const char *kFingerprintKey = "gateloop/v1";

// Ids that findings can carry without being a rule of the catalogue (the waiver checks of the
// project file). Any other unknown id gets the generic description.
const std::map<std::string, std::string> kExtraRuleTitles = {
    {"waiver", "A waiver in the project file has expired or matches no finding."},
};

const char *sarifLevel(Severity s) {
  switch (s) {
  case Severity::Error: return "error";
  case Severity::Warning: return "warning";
  case Severity::Note: return "note";
  }
  return "none";
}

// "driver-peak-current" -> "DriverPeakCurrent": SARIF's reportingDescriptor.name is meant to be
// an identifier-like name, distinct from the kebab-case id.
std::string upperCamel(const std::string &id) {
  std::string out;
  bool upper = true;
  for (char c : id) {
    if (!std::isalnum(static_cast<unsigned char>(c))) {
      upper = true;
      continue;
    }
    out += upper ? static_cast<char>(std::toupper(static_cast<unsigned char>(c))) : c;
    upper = false;
  }
  return out;
}

// SARIF messages are sentences: they end with a period (the validator's message rules ask for it,
// and viewers concatenate them).
std::string sentence(std::string text) {
  while (!text.empty() && (text.back() == ' ' || text.back() == '\n')) text.pop_back();
  if (text.empty()) return text;
  if (text.back() != '.' && text.back() != '!' && text.back() != '?') text += '.';
  return text;
}

std::string capitalized(std::string text) {
  if (!text.empty()) text[0] = static_cast<char>(std::toupper(static_cast<unsigned char>(text[0])));
  return text;
}

// Percent-encodes a file name into a URI reference (RFC 3986): unreserved characters and '/' stay,
// everything else (spaces, '%', '#', non-ASCII bytes) is escaped. Backslashes become '/'.
std::string uriPath(const std::string &path) {
  static const char *kHex = "0123456789ABCDEF";
  std::string out;
  for (char ch : path) {
    auto c = static_cast<unsigned char>(ch);
    if (c == '\\') c = '/';
    if (std::isalnum(c) || c == '-' || c == '.' || c == '_' || c == '~' || c == '/') {
      out += static_cast<char>(c);
    } else {
      out += '%';
      out += kHex[c >> 4];
      out += kHex[c & 15];
    }
  }
  return out;
}

bool isAbsolutePath(const std::string &p) {
  if (!p.empty() && (p[0] == '/' || p[0] == '\\')) return true;
  return p.size() >= 3 && std::isalpha(static_cast<unsigned char>(p[0])) && p[1] == ':' && (p[2] == '/' || p[2] == '\\');
}

// An artifactLocation for an input file: relative names stay relative to SRCROOT (stable across
// checkouts, which GitHub needs to match alerts); absolute ones become file URIs.
ordered_json artifactLocation(const std::string &name) {
  ordered_json loc;
  if (isAbsolutePath(name)) {
    std::string path = uriPath(name);
    loc["uri"] = "file://" + std::string(path[0] == '/' ? "" : "/") + path;
  } else {
    std::string path = uriPath(name);
    while (path.rfind("./", 0) == 0) path.erase(0, 2);
    loc["uri"] = path;
    loc["uriBaseId"] = kSourceRoot;
  }
  return loc;
}

struct RuleTable {
  ordered_json rules = ordered_json::array();
  std::map<std::string, std::size_t> index;
};

ordered_json ruleJson(const std::string &id, const std::string &title, Severity level) {
  ordered_json r;
  r["id"] = id;
  // SARIF wants name and id to differ; a one-word id ("connectivity") has no distinct name, so
  // the optional name is left out there.
  std::string name = upperCamel(id);
  if (!equalsIgnoreCase(name, id)) r["name"] = name;
  r["shortDescription"] = {{"text", sentence(capitalized(title))}};
  const RuleDoc *doc = findRuleDoc(id);
  std::string summary = doc ? ruleDocSummary(doc->markdown) : std::string();
  r["fullDescription"] = {{"text", sentence(capitalized(summary.empty() ? title : summary))}};
  r["defaultConfiguration"] = {{"level", sarifLevel(level)}};
  // Code-scanning services require help on every rule; without a doc page the description is
  // the best there is.
  std::string help = doc ? std::string(doc->markdown) : sentence(capitalized(summary.empty() ? title : summary));
  r["help"] = {{"text", help}, {"markdown", help}};
  return r;
}

RuleTable buildRules(const RunReport &report) {
  RuleTable t;
  for (const auto &rule : report.rules) {
    t.index.emplace(rule.id, t.rules.size());
    t.rules.push_back(ruleJson(rule.id, rule.title, rule.defaultSeverity));
  }
  // Findings under ids outside the catalogue still need a descriptor, or their ruleIndex would
  // dangle; they are appended after the catalogue, sorted by id, with the level of their first
  // finding as the default.
  std::map<std::string, Severity> extra;
  for (const auto &d : report.designs)
    for (const auto &f : d.findings)
      if (!t.index.count(f.rule)) extra.emplace(f.rule, f.severity);
  for (const auto &[id, level] : extra) {
    auto known = kExtraRuleTitles.find(id);
    std::string title = known != kExtraRuleTitles.end() ? known->second
                                                        : "Finding reported by gateloop outside its rule catalogue";
    t.index.emplace(id, t.rules.size());
    t.rules.push_back(ruleJson(id, title, level));
  }
  return t;
}

std::string resultText(const Finding &f) {
  std::string text = sentence(capitalized(f.message));
  if (!f.fix.empty()) text += " Fix: " + sentence(f.fix);
  return text;
}

ordered_json logicalLocation(const std::string &designName, const std::string &loop) {
  const std::string design = designName.empty() ? "design" : designName;
  ordered_json l;
  if (loop.empty()) {
    l["name"] = design;
    l["fullyQualifiedName"] = design;
    l["kind"] = "module";
  } else {
    l["name"] = loop;
    l["fullyQualifiedName"] = design + "/" + loop;
    l["kind"] = "object";
  }
  return l;
}

ordered_json physicalLocation(const SourceLocation &where, const FileTable &files,
                              const std::map<FileId, std::size_t> &artifactIndex) {
  ordered_json loc = artifactLocation(files.name(where.file));
  loc["index"] = artifactIndex.at(where.file);
  ordered_json p;
  p["artifactLocation"] = loc;
  // Line 0 means unknown: leave the region out instead of inventing line 1.
  if (where.line != 0) {
    ordered_json region;
    region["startLine"] = where.line;
    if (where.column != 0) region["startColumn"] = where.column;
    p["region"] = region;
  }
  return p;
}

ordered_json resultJson(const Finding &f, const std::string &design, const RuleTable &rules, const FileTable &files,
                        const std::map<FileId, std::size_t> &artifactIndex) {
  ordered_json r;
  r["ruleId"] = f.rule;
  r["ruleIndex"] = rules.index.at(f.rule);
  r["level"] = sarifLevel(f.severity);
  r["message"] = {{"text", resultText(f)}};
  ordered_json location;
  if (f.where.file != 0 && f.where.line != 0) {
    location["physicalLocation"] = physicalLocation(f.where, files, artifactIndex);
  } else if (f.where.file != 0) {
    // File known, line not: a physical location without a region would claim the whole file
    // and one with line 1 would invent a position, so the file is named as the analysis target
    // and the result is placed by its logical location (design/loop) alone.
    ordered_json target = artifactLocation(files.name(f.where.file));
    target["index"] = artifactIndex.at(f.where.file);
    r["analysisTarget"] = target;
  }
  location["logicalLocations"] = ordered_json::array({logicalLocation(design, f.loop)});
  r["locations"] = ordered_json::array({location});
  r["partialFingerprints"] = {{kFingerprintKey, f.fingerprint.empty() ? findingFingerprint(f) : f.fingerprint}};
  r["baselineState"] = f.baseline ? "unchanged" : "new";
  if (f.waived) {
    ordered_json s = {{"kind", "external"}, {"status", "accepted"}};
    if (!f.waiverReason.empty()) s["justification"] = f.waiverReason;
    r["suppressions"] = ordered_json::array({s});
  }
  ordered_json props;
  props["design"] = design;
  if (!f.loop.empty()) props["loop"] = f.loop;
  props["refs"] = f.refs;
  ordered_json values = ordered_json::object(), units = ordered_json::object();
  for (const auto &v : f.values) {
    values[v.name] = v.value;
    units[v.name] = v.unit;
  }
  props["values"] = values;
  props["units"] = units;
  if (!f.fix.empty()) props["fix"] = f.fix;
  props["baseline"] = f.baseline;
  props["waived"] = f.waived;
  r["properties"] = props;
  return r;
}

ordered_json notificationJson(const InputDiagnostic &d, const FileTable &files,
                              const std::map<FileId, std::size_t> &artifactIndex) {
  ordered_json n;
  std::string text = d.fieldPath.empty() ? d.message : d.fieldPath + ": " + d.message;
  // Without a line there is no physical location (see resultJson), so the file goes in the text.
  if (d.where.file != 0 && d.where.line == 0) text = files.name(d.where.file) + ": " + text;
  n["message"] = {{"text", sentence(capitalized(text))}};
  n["level"] = sarifLevel(d.severity);
  if (d.where.file != 0 && d.where.line != 0)
    n["locations"] = ordered_json::array({{{"physicalLocation", physicalLocation(d.where, files, artifactIndex)}}});
  return n;
}

} // namespace

void writeSarifReport(const RunReport &report, std::ostream &out) {
  const FileTable &files = *report.files;
  RuleTable rules = buildRules(report);

  // Artifacts: every input file a result or notification points at, in file-table order.
  std::set<FileId> used;
  for (const auto &d : report.designs)
    for (const auto &f : d.findings)
      if (f.where.file != 0) used.insert(f.where.file);
  for (const auto &n : report.inputNotes)
    if (n.where.file != 0) used.insert(n.where.file);
  std::map<FileId, std::size_t> artifactIndex;
  ordered_json artifacts = ordered_json::array();
  bool anyRelative = false;
  for (FileId id : used) {
    artifactIndex[id] = artifacts.size();
    ordered_json loc = artifactLocation(files.name(id));
    anyRelative = anyRelative || loc.contains("uriBaseId");
    // Every file gateloop names is one of its inputs; the role says so (and gives the array
    // content beyond the locations, which validators otherwise flag as redundant).
    artifacts.push_back({{"location", loc}, {"roles", ordered_json::array({"analysisTarget"})}});
  }

  ordered_json results = ordered_json::array();
  ordered_json fixed = ordered_json::array();
  for (const auto &d : report.designs) {
    for (const auto &f : d.findings) results.push_back(resultJson(f, d.name, rules, files, artifactIndex));
    // Findings fixed since the baseline are listed in the run's properties rather than as
    // "absent" results: code-scanning services would otherwise show them as open alerts.
    for (const auto &f : d.fixed)
      fixed.push_back({{"ruleId", f.rule}, {"design", d.name}, {"loop", f.loop}, {"fingerprint", f.fingerprint}});
  }

  ordered_json notifications = ordered_json::array();
  for (const auto &n : report.inputNotes) notifications.push_back(notificationJson(n, files, artifactIndex));

  ordered_json driver;
  driver["name"] = "gateloop";
  driver["version"] = report.toolVersion;
  driver["informationUri"] = kInformationUri;
  driver["rules"] = rules.rules;

  ordered_json run;
  run["tool"] = {{"driver", driver}};
  ordered_json invocation;
  invocation["executionSuccessful"] = true;
  if (!notifications.empty()) invocation["toolExecutionNotifications"] = notifications;
  run["invocations"] = ordered_json::array({invocation});
  if (anyRelative)
    run["originalUriBaseIds"] = {
        {kSourceRoot,
         {{"description", {{"text", "The folder the input paths are relative to (the project root)."}}}}}};
  if (!artifacts.empty()) run["artifacts"] = artifacts;
  run["results"] = results;
  ordered_json runProps;
  runProps["summary"] = {{"errors", report.summary.errors},     {"warnings", report.summary.warnings},
                         {"notes", report.summary.notes},       {"baseline", report.summary.baseline},
                         {"waived", report.summary.waived},     {"fixed", report.summary.fixed}};
  runProps["fixedSinceBaseline"] = fixed;
  runProps["caution"] = kSafetyCaution;
  run["properties"] = runProps;

  ordered_json root;
  root["$schema"] = kSchemaUri;
  root["version"] = "2.1.0";
  root["runs"] = ordered_json::array({run});
  // Invalid UTF-8 in a user string (a netlist in another encoding) must not abort the report.
  out << root.dump(2, ' ', false, ordered_json::error_handler_t::replace) << '\n';
}

} // namespace gateloop
