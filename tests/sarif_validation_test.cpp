/// \file
/// Validates gateloop's SARIF with the SARIF SDK multitool (`sarif-multitool validate`, npm
/// package @microsoft/sarif-multitool): the 2.1.0 JSON schema plus the SDK's SARIF and GitHub
/// rule sets, at its default levels (error and warning). Skips when the tool is not installed; install it with
/// scripts/install-sarif-validator.sh. Also validates the SARIF of every example project under
/// examples/ when there is one. Circuit data is invented for the test.
#include "checker/report/formatters.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <sys/wait.h>

#include <algorithm>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

using namespace gateloop;
using nlohmann::json;
namespace fs = std::filesystem;

namespace {

bool executable(const fs::path &p) {
  std::error_code ec;
  auto st = fs::status(p, ec);
  return !ec && fs::is_regular_file(st) && (st.permissions() & fs::perms::owner_exec) != fs::perms::none;
}

// The native multitool binary where it can be found, else the npm wrapper script. The native
// binary is preferred: the npm wrapper passes its arguments through a shell, which splits the
// semicolon-separated lists some options take.
std::string findMultitool() {
  const fs::path local = fs::path(GATELOOP_SOURCE_DIR) / ".tools" / "sarif" / "node_modules";
  const fs::path native = local / "@microsoft" / "sarif-multitool-linux" / "Sarif.Multitool";
  if (executable(native)) return native.string();
  if (executable(local / ".bin" / "sarif-multitool")) return (local / ".bin" / "sarif-multitool").string();
  if (const char *path = std::getenv("PATH")) {
    std::stringstream dirs(path);
    std::string dir;
    while (std::getline(dirs, dir, ':')) {
      if (dir.empty()) continue;
      fs::path candidate = fs::path(dir) / "sarif-multitool";
      if (!executable(candidate)) continue;
      // A global npm install: use the native binary beside the wrapper when it resolves.
      std::error_code ec;
      fs::path real = fs::canonical(candidate, ec);
      if (!ec) {
        fs::path sibling = real.parent_path().parent_path() / "sarif-multitool-linux" / "Sarif.Multitool";
        if (executable(sibling)) return sibling.string();
      }
      return candidate.string();
    }
  }
  return {};
}

std::string quoted(const std::string &s) {
  std::string q = "'";
  for (char c : s) q += c == '\'' ? std::string("'\\''") : std::string(1, c);
  return q + "'";
}

struct TempDir {
  fs::path path;
  TempDir() {
    std::string tmpl = (fs::temp_directory_path() / "gateloop-sarif-XXXXXX").string();
    path = mkdtemp(tmpl.data());
  }
  ~TempDir() {
    std::error_code ec;
    fs::remove_all(path, ec);
  }
};

struct Validation {
  int exitCode = -1;
  std::string console;
  std::vector<std::string> problems; // "SARIF1234 error: message" for each error or warning
};

// Runs `validate` on \p sarifFile and reads the problems from the tool's own SARIF log (more
// robust than its console text). Only error and warning levels are requested: the note-level
// checks include one that fetches the $schema URI over the network.
Validation validate(const std::string &tool, const fs::path &sarifFile, const fs::path &work) {
  Validation v;
  fs::path log = work / (sarifFile.stem().string() + ".validation.sarif");
  fs::path console = work / (sarifFile.stem().string() + ".console.txt");
  // The SDK's own rules plus its GitHub code-scanning rules (required help text, regions, ...).
  // The npm wrapper runs the native tool through a second shell, which would split the list at
  // the semicolon, so the list carries its own quotes there.
  bool wrapper = fs::path(tool).filename() != "Sarif.Multitool";
  std::string kinds = wrapper ? "'\"Sarif;Gh\"'" : "'Sarif;Gh'";
  std::string cmd = quoted(tool) + " validate --rule-kind " + kinds + " --output " + quoted(log.string()) + " " +
                    quoted(sarifFile.string()) + " > " + quoted(console.string()) + " 2>&1";
  int status = std::system(cmd.c_str());
  v.exitCode = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  std::ifstream c(console);
  v.console.assign(std::istreambuf_iterator<char>(c), {});
  std::ifstream in(log);
  if (!in) {
    v.problems.push_back("no validation log written");
    return v;
  }
  json j = json::parse(in, nullptr, false);
  if (j.is_discarded()) {
    v.problems.push_back("validation log is not JSON");
    return v;
  }
  for (const auto &run : j.value("runs", json::array())) {
    for (const auto &r : run.value("results", json::array())) {
      std::string level = r.value("level", "warning");
      if (level != "error" && level != "warning") continue;
      std::string text;
      if (r.contains("message") && r["message"].contains("text")) text = r["message"]["text"];
      if (r.contains("message") && r["message"].contains("arguments")) text += " " + r["message"]["arguments"].dump();
      v.problems.push_back(r.value("ruleId", "?") + " " + level + ": " + text);
    }
    for (const auto &inv : run.value("invocations", json::array()))
      for (const auto &n : inv.value("toolExecutionNotifications", json::array()))
        if (n.value("level", "") == "error") v.problems.push_back("tool error: " + n["message"].value("text", ""));
  }
  return v;
}

// A report with every feature the SARIF writer has: catalogue and extra rules, known and unknown
// regions, a finding with no file, baseline and waived findings, an input note, an odd file name.
struct SampleReport {
  FileTable files;
  Circuit circuit;
  PartLibrary parts;
  RunReport report;

  SampleReport() {
    FileId deck = files.add("hw/inverter stage.cir");
    FileId project = files.add("gateloop.json");
    Part igbt;
    igbt.id = "IGBT-1200V";
    igbt.kind = PartKind::Igbt;
    parts.parts.push_back(igbt);
    std::uint32_t swPins = circuit.internPinNames({"c", "g", "e"});
    std::uint32_t drvPins = circuit.internPinNames({"out", "ref"});
    NetId dc = circuit.net("DC+", {deck, 2, 1}), g = circuit.net("G1", {deck, 3, 1}), e = circuit.net("PH", {deck, 3, 1});
    Component q;
    q.name = "X1.Q1";
    q.kind = ElementKind::Subcircuit;
    q.part = 0;
    std::vector<NetId> qNets = {dc, g, e};
    ComponentId qId = circuit.addComponent(q, qNets, swPins);
    Component u;
    u.name = "X1.U1";
    u.kind = ElementKind::Subcircuit;
    std::vector<NetId> uNets = {g, e};
    ComponentId uId = circuit.addComponent(u, uNets, drvPins);

    DesignReport d;
    d.name = "inverter";
    d.circuit = &circuit;
    d.parts = &parts;
    GateLoop loop;
    loop.id = "X1.Q1";
    loop.switchId = qId;
    loop.gateNet = g;
    loop.refNet = e;
    loop.driver = uId;
    d.loops = {loop};
    LoopAnalysis a;
    a.vOn = Volt(15);
    a.vOff = Volt(-8);
    a.cGate = Farad(100e-9);
    d.analyses = {a};

    auto finding = [&](const char *rule, Severity s, const char *loopId, SourceLocation where, const char *msg) {
      Finding f;
      f.rule = rule;
      f.severity = s;
      f.design = d.name;
      f.loop = loopId;
      f.where = where;
      f.message = msg;
      f.fix = "change something concrete";
      f.values = {{"zeta", 0.46, ""}, {"r_off", 0.2, "ohm"}};
      f.fingerprint = findingFingerprint(f);
      return f;
    };
    d.findings.push_back(finding("loop-damping", Severity::Error, "X1.Q1", {deck, 42, 3}, "off loop damping ratio 0.46 is below 0.5"));
    d.findings.push_back(finding("gate-pulldown", Severity::Warning, "X1.Q1", {deck, 0, 0}, "no pull-down resistor"));
    d.findings.back().waived = true;
    d.findings.back().waiverReason = "inside the module";
    d.findings.push_back(finding("connectivity", Severity::Note, "X1.Q1", {deck, 7, 0}, "driver X1.U1 has no part data"));
    d.findings.back().baseline = true;
    d.findings.push_back(finding("waiver", Severity::Note, "", {}, "waiver waivers[0] matches no finding"));
    sortFindings(d.findings);
    Finding fixed;
    fixed.rule = "rg-range";
    fixed.loop = "X1.Q1";
    fixed.fingerprint = "0123456789abcdef";
    d.fixed = {fixed};

    report.toolVersion = "0.1.0";
    report.rules = {{"connectivity", "gate loops are complete", Severity::Error},
                    {"gate-pulldown", "gate pull-down resistor present", Severity::Warning},
                    {"loop-damping", "gate loop damping ratio", Severity::Error},
                    {"rg-range", "gate resistance inside the recommended range", Severity::Error}};
    report.files = &files;
    report.designs.push_back(std::move(d));
    report.inputNotes.push_back({Severity::Warning, {project, 4, 9}, {}, "unknown key \"rules.foo\" ignored"});
    report.inputNotes.push_back({Severity::Note, {project, 0, 0}, "operating.f_sw", "assumed 10 kHz"});
    report.summary = summarize(report.designs);
  }
};

std::string describe(const Validation &v) {
  std::string s = "exit code " + std::to_string(v.exitCode) + "\n";
  for (const auto &p : v.problems) s += "  " + p + "\n";
  return s + "console:\n" + v.console;
}

TEST(SarifValidation, HandBuiltReportValidatesWithoutErrorsOrWarnings) {
  std::string tool = findMultitool();
  if (tool.empty()) GTEST_SKIP() << "sarif-multitool not installed; run scripts/install-sarif-validator.sh";
  TempDir tmp;
  SampleReport sample;
  fs::path file = tmp.path / "report.sarif";
  {
    std::ofstream out(file);
    writeSarifReport(sample.report, out);
  }
  Validation v = validate(tool, file, tmp.path);
  EXPECT_EQ(v.exitCode, 0) << describe(v);
  EXPECT_TRUE(v.problems.empty()) << describe(v);
}

TEST(SarifValidation, ValidatorCatchesABrokenLog) {
  // Guards the test above against a validator that accepts anything (its exit code is 0 even
  // when it reports errors, so the log is what counts): a region clamped to line 0 breaks the
  // schema, and a rule without help breaks the GitHub rules.
  std::string tool = findMultitool();
  if (tool.empty()) GTEST_SKIP() << "sarif-multitool not installed; run scripts/install-sarif-validator.sh";
  TempDir tmp;
  SampleReport sample;
  std::ostringstream text;
  writeSarifReport(sample.report, text);
  json j = json::parse(text.str());
  bool broken = false;
  for (auto &result : j["runs"][0]["results"]) {
    if (!result["locations"][0].contains("physicalLocation")) continue;
    result["locations"][0]["physicalLocation"]["region"] = {{"startLine", 0}};
    broken = true;
    break;
  }
  ASSERT_TRUE(broken);
  j["runs"][0]["tool"]["driver"]["rules"][0].erase("help");
  fs::path file = tmp.path / "broken.sarif";
  std::ofstream(file) << j.dump(2);
  Validation v = validate(tool, file, tmp.path);
  auto reported = [&](const std::string &id) {
    return std::any_of(v.problems.begin(), v.problems.end(), [&](const std::string &p) { return p.rfind(id, 0) == 0; });
  };
  EXPECT_TRUE(reported("JSON1008")) << describe(v); // startLine below the schema minimum of 1
  EXPECT_TRUE(reported("GH2012")) << describe(v);   // rule without a help object
}

TEST(SarifValidation, ExampleProjectsValidate) {
  std::string tool = findMultitool();
  if (tool.empty()) GTEST_SKIP() << "sarif-multitool not installed; run scripts/install-sarif-validator.sh";
  fs::path examples = fs::path(GATELOOP_SOURCE_DIR) / "examples";
  std::vector<fs::path> projects;
  std::error_code ec;
  if (fs::is_directory(examples, ec))
    for (auto it = fs::recursive_directory_iterator(examples, ec); it != fs::recursive_directory_iterator(); ++it)
      if (it->path().filename() == "gateloop.json") projects.push_back(it->path());
  if (projects.empty()) GTEST_SKIP() << "no examples/**/gateloop.json to validate";
  std::sort(projects.begin(), projects.end());
  TempDir tmp;
  int n = 0;
  for (const auto &project : projects) {
    fs::path out = tmp.path / ("example" + std::to_string(n++) + ".sarif");
    std::string cmd = quoted(GATELOOP_BINARY) + " check " + quoted(project.string()) +
                      " --format sarif --fail-on never --output " + quoted(out.string()) + " > /dev/null 2>&1";
    int status = std::system(cmd.c_str());
    int code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
    ASSERT_EQ(code, 0) << "gateloop check failed on " << project;
    Validation v = validate(tool, out, tmp.path);
    EXPECT_EQ(v.exitCode, 0) << project << "\n" << describe(v);
    EXPECT_TRUE(v.problems.empty()) << project << "\n" << describe(v);
  }
}

} // namespace
