// Baselines, waivers, --fail-on, --rule and project discovery, end to end through the binary on
// a copy of the clean example (spec sections 2 and 4.5).
#include "test_support.h"

#include <gtest/gtest.h>

#include <nlohmann/json.hpp>

#include <functional>
#include <filesystem>
#include <fstream>
#include <regex>
#include <sstream>
#include <sys/wait.h>
#include <unistd.h>

namespace fs = std::filesystem;
using namespace gateloop::testing;

namespace {

class BaselineWaiver : public ::testing::Test {
protected:
  void SetUp() override {
    root_ = fs::temp_directory_path() / ("gateloop-bw-" + std::to_string(::getpid()) + "-" +
                                         ::testing::UnitTest::GetInstance()->current_test_info()->name());
    fs::remove_all(root_);
    fs::create_directories(root_ / "examples");
    fs::copy(fs::path(GATELOOP_SOURCE_DIR) / "examples" / "clean-halfbridge", root_ / "examples" / "clean-halfbridge",
             fs::copy_options::recursive);
    fs::copy(fs::path(GATELOOP_SOURCE_DIR) / "examples" / "parts", root_ / "examples" / "parts",
             fs::copy_options::recursive);
    project_ = root_ / "examples" / "clean-halfbridge";
  }
  void TearDown() override { fs::remove_all(root_); }

  // Standard output and error together: messages go to either, and the tests read both.
  RunResult run(const std::string &args, const fs::path &cwd, const std::string &today = "2026-12-01") {
    RunResult r = runGateloop(cwd, args, "GATELOOP_TODAY=" + today);
    return {r.status, r.all(), ""};
  }

  // Seeds a fault: the low-side turn-off resistor drops below the recommended 1 ohm.
  void breakTurnOffResistor() {
    fs::path deck = project_ / "halfbridge.cir";
    std::string text = std::regex_replace(readFile(deck), std::regex("ROFF2 GL_L G_L 2.2"), "ROFF2 GL_L G_L 0.47");
    std::ofstream(deck, std::ios::binary) << text;
  }

  void editProject(const std::function<void(nlohmann::json &)> &edit) {
    nlohmann::json j = nlohmann::json::parse(readFile(project_ / "gateloop.json"));
    edit(j);
    std::ofstream(project_ / "gateloop.json") << j.dump(2);
  }

  fs::path root_, project_;
};

} // namespace

TEST_F(BaselineWaiver, ProjectFileIsFoundByWalkingUp) {
  fs::create_directories(project_ / "hw" / "deep");
  RunResult r = run("check", project_ / "hw" / "deep");
  EXPECT_EQ(r.status, 0) << r.out;
  EXPECT_NE(r.out.find("design hb-1"), std::string::npos) << r.out;
}

TEST_F(BaselineWaiver, BaselineRoundTrip) {
  // 1. Accept today's findings (with --fail-on note the clean example still has none, so seed
  //    an accepted warning first: a pull-down above the configured maximum).
  editProject([](nlohmann::json &j) { j["rules"]["gate-pulldown"] = {{"max", "5 kohm"}}; });
  RunResult first = run("check --write-baseline baseline.json", project_);
  EXPECT_EQ(first.status, 0) << first.out; // warnings only, fail level error
  std::string baseline = readFile(project_ / "baseline.json");
  auto j = nlohmann::json::parse(baseline);
  EXPECT_EQ(j["schema"], "gateloop-baseline/1");
  ASSERT_EQ(j["findings"].size(), 2u); // RPD1 and RPD2
  // Sorted and diff-friendly: writing it again gives the same bytes.
  run("check --write-baseline baseline2.json", project_);
  EXPECT_EQ(readFile(project_ / "baseline2.json"), baseline);

  // 2. With the baseline, even --fail-on warning passes: the findings are accepted.
  RunResult accepted = run("check --baseline baseline.json --fail-on warning", project_);
  EXPECT_EQ(accepted.status, 0) << accepted.out;
  EXPECT_NE(accepted.out.find("accepted in baseline"), std::string::npos) << accepted.out;

  // 3. A new fault fails the run and is the only finding reported as new.
  breakTurnOffResistor();
  RunResult broken = run("check --baseline baseline.json --fail-on warning --format json", project_);
  EXPECT_EQ(broken.status, 1) << broken.out;
  auto report = nlohmann::json::parse(broken.out);
  std::vector<std::string> fresh;
  for (const auto &f : report["designs"][0]["findings"])
    if (!f["baseline"].get<bool>() && f["severity"] != "note") fresh.push_back(f["rule"].get<std::string>() + " " + f["refs"][0].get<std::string>());
  ASSERT_EQ(fresh.size(), 1u) << broken.out;
  EXPECT_EQ(fresh[0], "rg-range ROFF2");
}

TEST_F(BaselineWaiver, FixedFindingsAreReportedAsFixed) {
  breakTurnOffResistor();
  RunResult first = run("check --write-baseline baseline.json", project_);
  EXPECT_EQ(first.status, 1) << first.out;
  // Repair the design: the accepted finding is now reported as fixed.
  fs::path deck = project_ / "halfbridge.cir";
  std::ofstream(deck, std::ios::binary)
      << std::regex_replace(readFile(deck), std::regex("ROFF2 GL_L G_L 0.47"), "ROFF2 GL_L G_L 2.2");
  RunResult fixed = run("check --baseline baseline.json", project_);
  EXPECT_EQ(fixed.status, 0) << fixed.out;
  EXPECT_NE(fixed.out.find("fixed since baseline: rg-range on XQ2"), std::string::npos) << fixed.out;
}

TEST_F(BaselineWaiver, WaiverWaivesUntilItExpires) {
  breakTurnOffResistor();
  editProject([](nlohmann::json &j) {
    j["waivers"] = nlohmann::json::array(
        {{{"rule", "rg-range"}, {"loop", "XQ?"}, {"reason", "board rework pending"}, {"until", "2027-06-30"}}});
  });
  RunResult waived = run("check", project_, "2027-06-30");
  EXPECT_EQ(waived.status, 0) << waived.out;
  EXPECT_NE(waived.out.find("waived: board rework pending"), std::string::npos) << waived.out;

  RunResult expired = run("check", project_, "2027-07-01");
  EXPECT_EQ(expired.status, 1) << expired.out;
  EXPECT_NE(expired.out.find("expired on 2027-06-30"), std::string::npos) << expired.out;
}

TEST_F(BaselineWaiver, WaiverMatchingNothingIsANote) {
  editProject([](nlohmann::json &j) {
    j["waivers"] = nlohmann::json::array({{{"rule", "gate-clamp"}, {"loop", "XQ9"}, {"reason", "old board"}}});
  });
  RunResult r = run("check --fail-on note", project_);
  EXPECT_EQ(r.status, 1) << r.out;
  EXPECT_NE(r.out.find("matches no finding"), std::string::npos) << r.out;
}

TEST_F(BaselineWaiver, FailOnAndRuleOverrides) {
  breakTurnOffResistor();
  EXPECT_EQ(run("check", project_).status, 1);
  EXPECT_EQ(run("check --fail-on never", project_).status, 0);
  EXPECT_EQ(run("check --rule rg-range=off", project_).status, 0);
  RunResult demoted = run("check --rule rg-range=warning", project_);
  EXPECT_EQ(demoted.status, 0) << demoted.out;
  EXPECT_EQ(run("check --rule rg-range=warning --fail-on warning", project_).status, 1);
  editProject([](nlohmann::json &j) { j["rules"]["rg-range"] = {{"severity", "off"}}; });
  EXPECT_EQ(run("check", project_).status, 0);
}
