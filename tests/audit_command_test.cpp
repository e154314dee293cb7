/// \file
/// `gateloop audit`, run as the built binary over a scratch copy of tests/cli/audit: two readable
/// projects and one broken one, plus hidden and build folders that must be skipped.

#include "test_support.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <map>
#include <sstream>
#include <string>
#include <sys/wait.h>
#include <vector>

namespace fs = std::filesystem;
using namespace gateloop::testing;

namespace {

const fs::path kAuditData = fs::path(GATELOOP_TEST_DATA) / "cli" / "audit";

/// A strict RFC 4180 reader: CRLF records, quoted fields with doubled quotes. Fails the test on
/// anything else, so the writer's quoting is checked, not just tolerated.
std::vector<std::vector<std::string>> parseCsv(const std::string &text) {
  std::vector<std::vector<std::string>> rows;
  std::vector<std::string> row;
  std::string field;
  std::size_t i = 0;
  while (i < text.size()) {
    if (text[i] == '"') {
      ++i;
      for (;;) {
        if (i >= text.size()) {
          ADD_FAILURE() << "unterminated quoted field";
          return rows;
        }
        if (text[i] == '"') {
          if (i + 1 < text.size() && text[i + 1] == '"') {
            field += '"';
            i += 2;
            continue;
          }
          ++i;
          break;
        }
        field += text[i++];
      }
    } else {
      while (i < text.size() && text[i] != ',' && text[i] != '\r' && text[i] != '\n') {
        if (text[i] == '"') ADD_FAILURE() << "quote inside an unquoted field";
        field += text[i++];
      }
    }
    row.push_back(field);
    field.clear();
    if (i < text.size() && text[i] == ',') {
      ++i;
      continue;
    }
    if (text.compare(i, 2, "\r\n") != 0) {
      ADD_FAILURE() << "record not ended by CRLF at byte " << i;
      return rows;
    }
    i += 2;
    rows.push_back(row);
    row.clear();
  }
  return rows;
}

class AuditCommand : public ::testing::Test {
protected:
  void SetUp() override {
    fs::copy(kAuditData, tree(), fs::copy_options::recursive);
    // Copies of a broken project in places an audit must not look.
    for (const char *hidden : {".snapshots/old", "build/tests", "out/build-debug/x"}) {
      fs::create_directories(tree() / hidden);
      fs::copy_file(kAuditData / "broken-c/gateloop.json", tree() / hidden / "gateloop.json");
    }
  }
  fs::path tree() const { return work_.path() / "tree"; }
  fs::path at(const std::string &name) const { return work_.path() / name; }

  TempDir work_{"gateloop-audit-"};
};

TEST_F(AuditCommand, SummarisesEveryProjectAndExitsTwoOnInputErrors) {
  RunResult r = runGateloop(work_.path(), "audit tree --jobs 1 --summary-csv s.csv --summary-json s.json");
  EXPECT_EQ(r.status, 2) << r.out << r.err;

  for (const char *p : {"tree/inverter-a/gateloop.json", "tree/boards/boost-b/gateloop.json",
                        "tree/broken-c/gateloop.json"})
    EXPECT_NE(r.out.find(p), std::string::npos) << p << " missing from\n" << r.out;
  for (const char *skipped : {".snapshots", "build/", "build-debug"})
    EXPECT_EQ(r.out.find(skipped), std::string::npos) << skipped << " should be skipped\n" << r.out;
  EXPECT_NE(r.out.find("input-error"), std::string::npos) << r.out;
  // The broken project's errors go to stderr under its path; not being a terminal, no progress.
  EXPECT_NE(r.err.find("tree/broken-c/gateloop.json"), std::string::npos) << r.err;
  EXPECT_NE(r.err.find("designs[0].operating.v_bus"), std::string::npos) << r.err;
  EXPECT_EQ(r.err.find("checked "), std::string::npos) << r.err;

  auto csv = parseCsv(readFile(at("s.csv")));
  ASSERT_EQ(csv.size(), 4u);
  EXPECT_EQ(csv[0], (std::vector<std::string>{"project", "design", "loops", "errors", "warnings", "notes", "status",
                                              "message"}));
  std::map<std::string, std::vector<std::string>> byProject;
  for (std::size_t i = 1; i < csv.size(); ++i) {
    ASSERT_EQ(csv[i].size(), 8u);
    byProject[csv[i][0]] = csv[i];
  }
  // Rows come sorted by project path.
  EXPECT_EQ(csv[1][0], "tree/boards/boost-b/gateloop.json");
  EXPECT_EQ(csv[2][0], "tree/broken-c/gateloop.json");
  EXPECT_EQ(csv[3][0], "tree/inverter-a/gateloop.json");
  const auto &broken = byProject["tree/broken-c/gateloop.json"];
  EXPECT_EQ(broken[6], "input-error");
  EXPECT_EQ(broken[2], "");
  // The message has quotes and a comma: it only survives a round trip if quoting is right.
  EXPECT_NE(broken[7].find("got \"400 A\""), std::string::npos) << broken[7];
  EXPECT_EQ(byProject["tree/boards/boost-b/gateloop.json"][1], "boost-b");
  EXPECT_EQ(byProject["tree/boards/boost-b/gateloop.json"][2], "1");
  EXPECT_EQ(byProject["tree/inverter-a/gateloop.json"][2], "2");

  auto json = nlohmann::json::parse(readFile(at("s.json")));
  ASSERT_TRUE(json.is_array());
  ASSERT_EQ(json.size(), 3u);
  for (std::size_t i = 0; i < json.size(); ++i) {
    const auto &row = json[i];
    const auto &c = csv[i + 1];
    EXPECT_EQ(row.at("project"), c[0]);
    EXPECT_EQ(row.at("status"), c[6]);
    if (row.at("status") == "input-error") {
      EXPECT_TRUE(row.at("loops").is_null());
      EXPECT_FALSE(row.at("input_errors").empty());
      EXPECT_EQ(row.at("message"), c[7]);
      continue;
    }
    EXPECT_EQ(std::to_string(row.at("loops").get<int>()), c[2]);
    EXPECT_EQ(std::to_string(row.at("errors").get<int>()), c[3]);
    EXPECT_EQ(std::to_string(row.at("warnings").get<int>()), c[4]);
    EXPECT_EQ(std::to_string(row.at("notes").get<int>()), c[5]);
    // At the default --fail-on error a design fails exactly when it has an error finding, and
    // the per-rule counts add up to the totals.
    EXPECT_EQ(row.at("status"), row.at("errors").get<int>() > 0 ? "findings" : "ok");
    int e = 0, w = 0, n = 0;
    for (const auto &rule : row.at("rules")) {
      e += rule.at("errors").get<int>();
      w += rule.at("warnings").get<int>();
      n += rule.at("notes").get<int>();
    }
    EXPECT_EQ(e, row.at("errors").get<int>());
    EXPECT_EQ(w, row.at("warnings").get<int>());
    EXPECT_EQ(n, row.at("notes").get<int>());
  }
  // boost-b's 100 ohm turn-on resistor is five times the part's recommended 20 ohm maximum.
  const auto &boost = json[0];
  EXPECT_EQ(boost.at("status"), "findings");
  ASSERT_TRUE(boost.at("rules").contains("rg-range")) << boost.dump(2);
  EXPECT_GE(boost.at("rules").at("rg-range").at("errors").get<int>(), 1);
}

TEST_F(AuditCommand, SameSummaryForAnyNumberOfJobs) {
  RunResult one = runGateloop(work_.path(), "audit tree --jobs 1 --summary-csv 1.csv --summary-json 1.json");
  for (const char *jobs : {"2", "3", "0"}) {
    std::string n(jobs);
    RunResult many =
        runGateloop(work_.path(), "audit tree --jobs " + n + " --summary-csv " + n + ".csv --summary-json " + n + ".json");
    EXPECT_EQ(many.status, one.status) << "--jobs " << n;
    EXPECT_EQ(many.out, one.out) << "--jobs " << n;
    EXPECT_EQ(many.err, one.err) << "--jobs " << n;
    EXPECT_EQ(readFile(at(n + ".csv")), readFile(at("1.csv"))) << "--jobs " << n;
    EXPECT_EQ(readFile(at(n + ".json")), readFile(at("1.json"))) << "--jobs " << n;
  }
}

TEST_F(AuditCommand, ExitStatusFollowsFailOnWhenInputsAreGood) {
  // boost-b alone: an rg-range error fails the run at the default level, not at "never".
  RunResult r = runGateloop(work_.path(), "audit tree/boards");
  EXPECT_EQ(r.status, 1) << r.out << r.err;
  r = runGateloop(work_.path(), "audit tree/boards --fail-on never");
  EXPECT_EQ(r.status, 0) << r.out << r.err;
  EXPECT_EQ(r.out.find("  findings\n"), std::string::npos) << "no design fails at --fail-on never\n" << r.out;
  EXPECT_NE(r.out.find("  ok\n"), std::string::npos) << r.out;

  // Several folders, a project file named directly, and a repeat that must be counted once.
  r = runGateloop(work_.path(),
                  "audit tree/inverter-a tree/boards tree/boards/boost-b/gateloop.json --fail-on never --quiet");
  EXPECT_EQ(r.status, 0) << r.out << r.err;
  std::size_t rows = 0;
  for (std::size_t at = r.out.find("gateloop.json"); at != std::string::npos; at = r.out.find("gateloop.json", at + 1))
    ++rows;
  EXPECT_EQ(rows, 2u) << r.out;
}

TEST_F(AuditCommand, MissingFolderOrNoProjectsIsAnInputError) {
  RunResult r = runGateloop(work_.path(), "audit no-such-folder");
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.err.find("no-such-folder: error: no such folder"), std::string::npos) << r.err;

  fs::create_directories(at("empty"));
  r = runGateloop(work_.path(), "audit empty");
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.err.find("no gateloop.json found"), std::string::npos) << r.err;

  // A missing folder next to good ones still audits the good ones, and still fails the run.
  r = runGateloop(work_.path(), "audit no-such-folder tree/boards --fail-on never");
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.out.find("tree/boards/boost-b/gateloop.json"), std::string::npos) << r.out;
}

TEST_F(AuditCommand, ShowsProgressOnlyOnATerminal) {
  // util-linux `script` gives the program a pseudo-terminal; without it this cannot be tested.
  if (std::system("command -v script >/dev/null 2>&1") != 0) GTEST_SKIP() << "no `script` program";
  auto onTerminal = [&](const std::string &args) {
    fs::path transcript = at("typescript");
    std::string inner = "cd " + quote(work_.path().string()) + " && " + quote(GATELOOP_BINARY) + " audit tree " +
                        args + " >/dev/null";
    std::string cmd = "script -qec " + quote(inner) + " " + quote(transcript.string()) + " >/dev/null 2>&1";
    int raw = std::system(cmd.c_str());
    EXPECT_TRUE(WIFEXITED(raw));
    return readFile(transcript);
  };
  std::string shown = onTerminal("--jobs 2");
  EXPECT_NE(shown.find("checked 3/3 projects"), std::string::npos) << shown;
  EXPECT_NE(shown.find("checked 0/3 projects"), std::string::npos) << shown;
  std::string quiet = onTerminal("--jobs 2 --quiet");
  EXPECT_EQ(quiet.find("checked "), std::string::npos) << quiet;
}

TEST_F(AuditCommand, UnwritableSummaryIsAnError) {
  RunResult r = runGateloop(work_.path(), "audit tree/boards --fail-on never --summary-csv no-such-dir/s.csv");
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.err.find("no-such-dir/s.csv"), std::string::npos) << r.err;
}

} // namespace
