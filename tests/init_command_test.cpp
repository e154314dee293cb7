/// \file
/// `gateloop init`, run as the built binary in a scratch folder: the files it writes, that
/// `gateloop check` loads them, that it never overwrites without --force, and its errors.

#include "test_support.h"

#include <gtest/gtest.h>
#include <nlohmann/json.hpp>

#include <algorithm>
#include <cctype>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <regex>
#include <set>
#include <sstream>
#include <string>
#include <sys/wait.h>

namespace fs = std::filesystem;
using namespace gateloop::testing;

namespace {

const fs::path kCliData = fs::path(GATELOOP_TEST_DATA) / "cli";

/// Runs the gateloop binary with \p args in folder \p cwd; stdout and stderr are captured in a
/// separate folder so they never show up among the files under test.
std::string lower(std::string s) {
  for (char &c : s) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return s;
}

/// Net names of a layout template, lower-cased (netlist names are case-insensitive).
std::set<std::string> layoutNets(const nlohmann::json &layout) {
  std::set<std::string> names;
  for (auto it = layout.at("nets").begin(); it != layout.at("nets").end(); ++it) names.insert(lower(it.key()));
  return names;
}

class InitCommand : public ::testing::Test {
protected:
  void SetUp() override {
    fs::create_directories(work_.path() / "hw");
    fs::create_directories(work_.path() / "lib");
    fs::copy_file(kCliData / "audit/inverter-a/hw/half_bridge.cir", work_.path() / "hw/half_bridge.cir");
    fs::copy_file(kCliData / "audit/parts/gate-drive.json", work_.path() / "lib/gate-drive.json");
  }
  fs::path at(const std::string &name) const { return work_.path() / name; }

  TempDir work_{"gateloop-init-"};
};

// The nets of the two gate loops of hw/half_bridge.cir: driver source/sink outputs, gate, and the
// reference (the high side's switch node, the low side's ground), read off the deck by hand.
const std::set<std::string> kHalfBridgeNets{"gh_src", "gh_snk", "g_h", "sw_mid", "gl_src", "gl_snk", "g_l", "0"};

TEST_F(InitCommand, WritesProjectAndLayoutThatCheckLoads) {
  RunResult r = runGateloop(work_.path(), "init hw/half_bridge.cir --parts lib/gate-drive.json");
  ASSERT_EQ(r.status, 0) << r.err;
  EXPECT_NE(r.out.find("2 gate loops"), std::string::npos) << r.out;

  auto project = nlohmann::json::parse(readFile(at("gateloop.json")));
  EXPECT_EQ(project.at("schema"), "gateloop/1");
  EXPECT_EQ(project.at("parts"), nlohmann::json::array({"lib/gate-drive.json"}));
  ASSERT_EQ(project.at("designs").size(), 1u);
  const auto &design = project.at("designs")[0];
  EXPECT_EQ(design.at("name"), "half_bridge");
  EXPECT_EQ(design.at("netlist"), "hw/half_bridge.cir");
  EXPECT_EQ(design.at("layout"), "half_bridge.layout.json");

  auto layout = nlohmann::json::parse(readFile(at("half_bridge.layout.json")));
  EXPECT_EQ(layout.at("schema"), "gateloop-layout/1");
  EXPECT_TRUE(layout.at("stackup").contains("top"));
  EXPECT_TRUE(layout.at("stackup").contains("bottom"));
  EXPECT_EQ(layoutNets(layout), kHalfBridgeNets);
  for (const auto &net : layout.at("nets")) EXPECT_TRUE(net.empty()) << "lengths are the user's to fill in";

  // The written pair must be a valid input: check reads it and finds the same two loops.
  RunResult check = runGateloop(work_.path(), "check --format json --output report.json");
  ASSERT_TRUE(check.status == 0 || check.status == 1) << check.status << "\n" << check.err;
  auto report = nlohmann::json::parse(readFile(at("report.json")));
  ASSERT_EQ(report.at("designs").size(), 1u);
  std::set<std::string> loopIds;
  for (const auto &loop : report.at("designs")[0].at("loops")) loopIds.insert(lower(loop.at("id")));
  EXPECT_EQ(loopIds, (std::set<std::string>{"m1", "m2"}));
}

TEST_F(InitCommand, RefusesToOverwriteWithoutForceAndWritesNothing) {
  writeFile(at("gateloop.json"), "keep me\n");
  RunResult r = runGateloop(work_.path(), "init hw/half_bridge.cir --parts lib/gate-drive.json");
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.err.find("gateloop.json: error: exists; use --force to overwrite"), std::string::npos) << r.err;
  EXPECT_EQ(readFile(at("gateloop.json")), "keep me\n");
  EXPECT_FALSE(fs::exists(at("half_bridge.layout.json"))) << "nothing may be written when one target exists";

  fs::remove(at("gateloop.json"));
  writeFile(at("half_bridge.layout.json"), "keep me too\n");
  r = runGateloop(work_.path(), "init hw/half_bridge.cir");
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.err.find("half_bridge.layout.json: error: exists; use --force to overwrite"), std::string::npos)
      << r.err;
  EXPECT_EQ(readFile(at("half_bridge.layout.json")), "keep me too\n");
  EXPECT_FALSE(fs::exists(at("gateloop.json")));
}

TEST_F(InitCommand, ForceOverwritesBothFiles) {
  writeFile(at("gateloop.json"), "old\n");
  writeFile(at("half_bridge.layout.json"), "old\n");
  RunResult r = runGateloop(work_.path(), "init hw/half_bridge.cir --parts lib/gate-drive.json --force");
  ASSERT_EQ(r.status, 0) << r.err;
  EXPECT_EQ(nlohmann::json::parse(readFile(at("gateloop.json"))).at("schema"), "gateloop/1");
  EXPECT_EQ(layoutNets(nlohmann::json::parse(readFile(at("half_bridge.layout.json")))), kHalfBridgeNets);
  for (const auto &entry : fs::directory_iterator(work_.path()))
    EXPECT_EQ(entry.path().filename().string().find(".tmp-"), std::string::npos) << "temporary file left behind";
}

TEST_F(InitCommand, BadNetlistExitsTwoWithFileAndLine) {
  fs::copy_file(kCliData / "bad_syntax.cir", at("bad_syntax.cir"));
  RunResult r = runGateloop(work_.path(), "init bad_syntax.cir");
  EXPECT_EQ(r.status, 2);
  // The resistor without a value is on line 3 of the deck.
  EXPECT_TRUE(std::regex_search(r.err, std::regex(R"(bad_syntax\.cir:3:[0-9]+: error: )"))) << r.err;
  EXPECT_FALSE(fs::exists(at("gateloop.json")));
  EXPECT_FALSE(fs::exists(at("bad_syntax.layout.json")));
}

TEST_F(InitCommand, MissingNetlistOrPartsIsAnInputError) {
  RunResult r = runGateloop(work_.path(), "init hw/no_such_deck.cir");
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.err.find("no_such_deck.cir"), std::string::npos) << r.err;

  r = runGateloop(work_.path(), "init hw/half_bridge.cir --parts lib/no_such_parts.json");
  EXPECT_EQ(r.status, 2);
  EXPECT_NE(r.err.find("no_such_parts.json"), std::string::npos) << r.err;
  EXPECT_FALSE(fs::exists(at("gateloop.json")));
}

TEST_F(InitCommand, WithoutPartsGuessesNetsFromPinOrder) {
  RunResult r = runGateloop(work_.path(), "init hw/half_bridge.cir");
  ASSERT_EQ(r.status, 0) << r.err;
  EXPECT_NE(r.out.find("no gate loops found"), std::string::npos) << r.out;
  // M pin order is drain gate source bulk: gates G_H/G_L, sources SW_MID/0, and the nets one
  // series resistor from each gate; the pull-downs to the source or ground add nothing new.
  EXPECT_EQ(layoutNets(nlohmann::json::parse(readFile(at("half_bridge.layout.json")))), kHalfBridgeNets);
  auto project = nlohmann::json::parse(readFile(at("gateloop.json")));
  EXPECT_TRUE(project.at("parts").empty());

  RunResult check = runGateloop(work_.path(), "check");
  EXPECT_TRUE(check.status == 0 || check.status == 1) << check.status << "\n" << check.err;
}

TEST_F(InitCommand, ReadsXmlNetlists) {
  fs::copy_file(kCliData / "audit/boards/boost-b/boost.xml", at("boost.xml"));
  RunResult r = runGateloop(work_.path(), "init boost.xml --parts lib/gate-drive.json");
  ASSERT_EQ(r.status, 0) << r.err;
  auto layout = nlohmann::json::parse(readFile(at("boost.layout.json")));
  EXPECT_EQ(layoutNets(layout), (std::set<std::string>{"gh", "gl", "g", "pgnd"}));
  RunResult check = runGateloop(work_.path(), "check");
  EXPECT_TRUE(check.status == 0 || check.status == 1) << check.status << "\n" << check.err;
}

} // namespace
