/// \file
/// `gateloop audit DIR...`: checks every project file below the folders in parallel and
/// summarises one row per design. Each job owns its inputs and report; jobs share only the
/// progress counter and their own result slot, and nothing is printed until all are done, so the
/// output is the same for any --jobs.

#include "checker/app/commands.h"

#include "checker/app/analyze.h"
#include "checker/app/output_file.h"

#include <fmt/format.h>
#include <nlohmann/json.hpp>

#include <algorithm>
#include <array>
#include <atomic>
#include <exception>
#include <filesystem>
#include <iostream>
#include <map>
#include <mutex>
#include <set>
#include <sstream>
#include <thread>
#include <unistd.h>

namespace fs = std::filesystem;

namespace gateloop {

namespace {

constexpr int kExitClean = 0;
constexpr int kExitFindings = 1;
constexpr int kExitInputError = 2;
constexpr const char *kProjectFileName = "gateloop.json";

/// Counted findings of one severity class, in the order error, warning, note.
using SeverityCounts = std::array<std::size_t, 3>;

std::size_t severitySlot(Severity s) {
  switch (s) {
  case Severity::Error: return 0;
  case Severity::Warning: return 1;
  case Severity::Note: return 2;
  }
  return 2;
}

struct DesignRow {
  std::string design;
  std::size_t loops = 0;
  SeverityCounts counts{};
  std::size_t waived = 0, baseline = 0;
  std::map<std::string, SeverityCounts> byRule;   ///< counted findings per rule id
  bool fails = false;                             ///< has findings at or above --fail-on
};

struct ProjectResult {
  std::string path;                      ///< as found below the audited folder
  bool inputError = false;
  std::vector<std::string> errors;       ///< formatted input errors
  std::vector<DesignRow> designs;
};

/// Folders never searched: hidden ones (version control, editor state) and build trees, which
/// hold copies of test fixtures rather than projects.
bool skippedFolder(const fs::path &dir) {
  std::string name = dir.filename().string();
  if (name.empty()) return false;
  if (name[0] == '.') return true;
  if (name == "build" || name == "node_modules") return true;
  for (const char *prefix : {"build-", "build_", "cmake-build-"})
    if (name.rfind(prefix, 0) == 0) return true;
  std::error_code ec;
  return fs::exists(dir / "CMakeCache.txt", ec);
}

/// Finds every project file below \p dirs, sorted and without repeats. Folders that cannot be
/// searched are reported in \p errors.
std::vector<std::string> findProjects(const std::vector<std::string> &dirs, std::vector<std::string> &errors) {
  std::vector<std::string> found;
  std::set<std::string> seen;
  auto add = [&](const fs::path &p) {
    std::error_code ec;
    std::string key = fs::weakly_canonical(p, ec).string();
    if (seen.insert(ec ? p.string() : key).second) found.push_back(p.lexically_normal().generic_string());
  };
  for (const auto &dir : dirs) {
    std::error_code ec;
    fs::path root(dir);
    if (fs::is_regular_file(root, ec)) {
      // A project file named directly is audited whatever it is called.
      add(root);
      continue;
    }
    if (!fs::is_directory(root, ec)) {
      errors.push_back(dir + ": error: no such folder");
      continue;
    }
    fs::recursive_directory_iterator it(root, fs::directory_options::skip_permission_denied, ec), end;
    for (; !ec && it != end; it.increment(ec)) {
      const fs::directory_entry &entry = *it;
      std::error_code typeEc;
      if (entry.is_directory(typeEc)) {
        if (skippedFolder(entry.path())) it.disable_recursion_pending();
        continue;
      }
      if (entry.path().filename() == kProjectFileName && entry.is_regular_file(typeEc)) add(entry.path());
    }
    if (ec) errors.push_back(dir + ": error: cannot search folder: " + ec.message());
  }
  std::sort(found.begin(), found.end());
  return found;
}

bool failsAt(const SeverityCounts &c, const std::string &failOn) {
  if (failOn == "never") return false;
  if (c[0]) return true;
  if (failOn == "error") return false;
  if (c[1]) return true;
  if (failOn == "warning") return false;
  return c[2] != 0;
}

/// One job: reads and checks one project like `gateloop check` would, capturing every message.
void auditProject(const std::string &failOn, ProjectResult &out) {
  try {
    RunInputs in;
    InputSelection sel;
    sel.projectPath = out.path;
    loadRunInputs(sel, in);
    validateRuleParams(in.project.ruleParams, in.project.file, in.diags);
    if (in.diags.hasErrors()) {
      out.inputError = true;
      for (const auto &d : in.diags.items())
        if (d.severity == Severity::Error) out.errors.push_back(formatDiagnostic(d, in.files));
      return;
    }
    const std::string today = todayIso();
    std::vector<DesignReport> reports;
    for (const auto &d : in.designs) reports.push_back(analyzeDesign(*d, in.project, {}, today));
    applyWaivers(reports, in.project, today);
    for (const auto &r : reports) {
      DesignRow row;
      row.design = r.name;
      row.loops = r.loops.size();
      for (const auto &f : r.findings) {
        if (f.baseline) {
          ++row.baseline;
          continue;
        }
        if (f.waived) {
          ++row.waived;
          continue;
        }
        ++row.counts[severitySlot(f.severity)];
        ++row.byRule[f.rule][severitySlot(f.severity)];
      }
      row.fails = failsAt(row.counts, failOn);
      out.designs.push_back(std::move(row));
    }
  } catch (const std::exception &e) {
    // A bug or exhausted memory in one project must not take the whole audit down with it.
    out.inputError = true;
    out.designs.clear();
    out.errors.push_back(out.path + ": error: internal error while checking this project: " + e.what());
  }
}

/// Shows "checked N/M projects" on one terminal line, rewritten as jobs finish.
class Progress {
public:
  Progress(std::size_t total, bool enabled) : total_(total), enabled_(enabled) { show(); }

  void advance() {
    std::lock_guard<std::mutex> lock(mutex_);
    ++done_;
    show();
  }

  void finish() {
    std::lock_guard<std::mutex> lock(mutex_);
    if (enabled_ && width_) std::cerr << '\r' << std::string(width_, ' ') << '\r' << std::flush;
  }

private:
  void show() {
    if (!enabled_) return;
    std::string line = fmt::format("checked {}/{} project{}", done_, total_, total_ == 1 ? "" : "s");
    width_ = std::max(width_, line.size());
    std::cerr << '\r' << line << std::flush;
  }

  std::mutex mutex_;
  std::size_t done_ = 0, total_;
  std::size_t width_ = 0;
  bool enabled_;
};

void runJobs(std::vector<ProjectResult> &results, unsigned jobs, const std::string &failOn, Progress &progress) {
  std::atomic<std::size_t> next{0};
  auto worker = [&] {
    for (std::size_t i = next++; i < results.size(); i = next++) {
      auditProject(failOn, results[i]);
      progress.advance();
    }
  };
  unsigned n = jobs ? jobs : std::max(1u, std::thread::hardware_concurrency());
  n = static_cast<unsigned>(std::min<std::size_t>(n, results.size()));
  if (n <= 1) {
    worker();
    return;
  }
  std::vector<std::thread> pool;
  pool.reserve(n);
  for (unsigned t = 0; t < n; ++t) pool.emplace_back(worker);
  for (auto &t : pool) t.join();
}

/// One row of the summary, as text cells; counts are empty for a project that was not checked.
struct SummaryRow {
  std::string project, design, loops, errors, warnings, notes, status, message;
  const DesignRow *data = nullptr;
  const ProjectResult *result = nullptr;
};

std::vector<SummaryRow> summaryRows(const std::vector<ProjectResult> &results) {
  std::vector<SummaryRow> rows;
  for (const auto &r : results) {
    if (r.inputError) {
      SummaryRow row;
      row.project = r.path;
      row.status = "input-error";
      row.message = r.errors.empty() ? std::string() : r.errors.front();
      row.result = &r;
      rows.push_back(std::move(row));
      continue;
    }
    for (const auto &d : r.designs) {
      SummaryRow row;
      row.project = r.path;
      row.design = d.design;
      row.loops = std::to_string(d.loops);
      row.errors = std::to_string(d.counts[0]);
      row.warnings = std::to_string(d.counts[1]);
      row.notes = std::to_string(d.counts[2]);
      row.status = d.fails ? "findings" : "ok";
      row.data = &d;
      row.result = &r;
      rows.push_back(std::move(row));
    }
  }
  return rows;
}

std::string tableText(const std::vector<SummaryRow> &rows) {
  static const char *const kHeads[] = {"project", "design", "loops", "errors", "warnings", "notes", "status"};
  auto cells = [](const SummaryRow &r) {
    auto dash = [](const std::string &s) { return s.empty() ? std::string("-") : s; };
    std::string status = r.message.empty() ? r.status : r.status + ": " + r.message;
    return std::array<std::string, 7>{r.project, dash(r.design), dash(r.loops), dash(r.errors),
                                      dash(r.warnings), dash(r.notes), status};
  };
  std::array<std::size_t, 7> width{};
  for (std::size_t i = 0; i < 7; ++i) width[i] = std::string(kHeads[i]).size();
  for (const auto &r : rows) {
    auto c = cells(r);
    for (std::size_t i = 0; i < 6; ++i) width[i] = std::max(width[i], c[i].size());
  }
  std::ostringstream out;
  auto line = [&](const std::array<std::string, 7> &c) {
    // Names left-aligned, counts right-aligned; the last column is not padded.
    out << fmt::format("{:<{}}  {:<{}}  {:>{}}  {:>{}}  {:>{}}  {:>{}}  {}\n", c[0], width[0], c[1], width[1], c[2],
                       width[2], c[3], width[3], c[4], width[4], c[5], width[5], c[6]);
  };
  line({kHeads[0], kHeads[1], kHeads[2], kHeads[3], kHeads[4], kHeads[5], kHeads[6]});
  for (const auto &r : rows) line(cells(r));
  return out.str();
}

/// RFC 4180: fields with a comma, quote or line break are quoted, quotes doubled.
std::string csvField(const std::string &s) {
  if (s.find_first_of(",\"\r\n") == std::string::npos) return s;
  std::string q = "\"";
  for (char c : s) {
    if (c == '"') q += '"';
    q += c;
  }
  return q + '"';
}

std::string csvText(const std::vector<SummaryRow> &rows) {
  std::string out = "project,design,loops,errors,warnings,notes,status,message\r\n";
  for (const auto &r : rows) {
    for (const std::string *f : {&r.project, &r.design, &r.loops, &r.errors, &r.warnings, &r.notes, &r.status})
      out += csvField(*f) + ',';
    out += csvField(r.message) + "\r\n";
  }
  return out;
}

std::string jsonText(const std::vector<SummaryRow> &rows) {
  nlohmann::ordered_json arr = nlohmann::ordered_json::array();
  for (const auto &r : rows) {
    nlohmann::ordered_json o;
    o["project"] = r.project;
    if (r.data) {
      const DesignRow &d = *r.data;
      o["design"] = d.design;
      o["loops"] = d.loops;
      o["errors"] = d.counts[0];
      o["warnings"] = d.counts[1];
      o["notes"] = d.counts[2];
      o["waived"] = d.waived;
      o["status"] = r.status;
      o["message"] = nullptr;
      nlohmann::ordered_json rules = nlohmann::ordered_json::object();
      for (const auto &[id, c] : d.byRule) rules[id] = {{"errors", c[0]}, {"warnings", c[1]}, {"notes", c[2]}};
      o["rules"] = std::move(rules);
    } else {
      for (const char *k : {"design", "loops", "errors", "warnings", "notes", "waived"}) o[k] = nullptr;
      o["status"] = r.status;
      o["message"] = r.message;
      o["input_errors"] = r.result ? r.result->errors : std::vector<std::string>{};
      o["rules"] = nlohmann::ordered_json::object();
    }
    arr.push_back(std::move(o));
  }
  return arr.dump(2) + "\n";
}

} // namespace

int runAuditCommand(const AuditOptions &o) {
  std::vector<std::string> searchErrors;
  std::vector<std::string> projects = findProjects(o.dirs, searchErrors);
  for (const auto &e : searchErrors) std::cerr << e << '\n';
  if (projects.empty()) {
    std::string where;
    for (const auto &d : o.dirs) where += (where.empty() ? "" : ", ") + d;
    std::cerr << "gateloop: error: no " << kProjectFileName << " found below " << where << '\n';
    return kExitInputError;
  }

  std::vector<ProjectResult> results(projects.size());
  for (std::size_t i = 0; i < projects.size(); ++i) results[i].path = projects[i];
  Progress progress(results.size(), !o.quiet && ::isatty(STDERR_FILENO));
  runJobs(results, o.jobs, o.failOn, progress);
  progress.finish();

  // Input errors grouped by project, in project order: readable however the jobs interleaved.
  for (const auto &r : results) {
    if (!r.inputError) continue;
    std::cerr << fmt::format("{}: {} input error{}; not checked\n", r.path, r.errors.size(),
                             r.errors.size() == 1 ? "" : "s");
    for (const auto &e : r.errors) std::cerr << "  " << e << '\n';
  }

  std::vector<SummaryRow> rows = summaryRows(results);
  std::size_t inputErrors = 0, failing = 0, designs = 0;
  for (const auto &r : results) {
    if (r.inputError) ++inputErrors;
    for (const auto &d : r.designs) {
      ++designs;
      if (d.fails) ++failing;
    }
  }
  std::cout << tableText(rows);
  std::cout << fmt::format("{} project{}, {} design{} checked: {} with findings at or above {}, {} project{} "
                           "with input errors\n",
                           results.size(), results.size() == 1 ? "" : "s", designs, designs == 1 ? "" : "s",
                           failing, o.failOn, inputErrors, inputErrors == 1 ? "" : "s");
  std::cout.flush();

  bool writeFailed = false;
  if (!o.summaryCsv.empty()) {
    if (auto err = writeOutputAtomically(o.summaryCsv, csvText(rows)); !err.empty()) {
      std::cerr << err << '\n';
      writeFailed = true;
    }
  }
  if (!o.summaryJson.empty()) {
    if (auto err = writeOutputAtomically(o.summaryJson, jsonText(rows)); !err.empty()) {
      std::cerr << err << '\n';
      writeFailed = true;
    }
  }

  if (inputErrors || writeFailed || !searchErrors.empty()) return kExitInputError;
  return failing ? kExitFindings : kExitClean;
}

} // namespace gateloop
