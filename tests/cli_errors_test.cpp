// The command line on bad input: exit status 2, every error as FILE:LINE:COLUMN: error: MESSAGE
// (or FILE: FIELD.PATH: error: ...), never a crash, and never a half-written report over an
// existing output file (spec section 2).
#include "test_support.h"

#include <gtest/gtest.h>

#include <chrono>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <sys/wait.h>
#include <unistd.h>

namespace fs = std::filesystem;
using namespace gateloop::testing;

namespace {

class CliErrors : public ::testing::Test {
protected:
  void SetUp() override {
    dir_ = fs::temp_directory_path() / ("gateloop-cli-" + std::to_string(::getpid()) + "-" +
                                        ::testing::UnitTest::GetInstance()->current_test_info()->name());
    fs::create_directories(dir_);
  }
  void TearDown() override { fs::remove_all(dir_); }

  void write(const std::string &name, const std::string &text) {
    fs::create_directories((dir_ / name).parent_path());
    std::ofstream(dir_ / name, std::ios::binary) << text;
  }

  // Standard output and error together: messages go to either, and the tests read both.
  RunResult run(const std::string &args) {
    RunResult r = runGateloop(dir_, args);
    return {r.status, r.all(), ""};
  }

  fs::path dir_;
};

const char *const kGoodDeck = "* ok\nR1 a b 1k\n.end\n";

} // namespace

TEST_F(CliErrors, MissingNetlistFile) {
  RunResult r = run("check --netlist nothere.cir");
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("nothere.cir"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("error:"), std::string::npos) << r.out;
}

TEST_F(CliErrors, SpiceSyntaxErrorHasLineAndColumn) {
  write("bad.cir", "* title\nR1 a b 1k\nC1 x\n.end\n");
  RunResult r = run("check --netlist bad.cir");
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("bad.cir:3:1: error:"), std::string::npos) << r.out;
}

TEST_F(CliErrors, AllErrorsAreReportedNotOnlyTheFirst) {
  write("bad.cir", "* title\nR1 a b\nC1 x\nL1 a\n.end\n");
  RunResult r = run("check --netlist bad.cir");
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("bad.cir:2:1: error:"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("bad.cir:3:1: error:"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("bad.cir:4:1: error:"), std::string::npos) << r.out;
}

TEST_F(CliErrors, IncludeCycleIsAnError) {
  write("a.cir", "* a\n.include b.inc\n.end\n");
  write("b.inc", ".include a.cir\n");
  RunResult r = run("check --netlist a.cir");
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("error:"), std::string::npos) << r.out;
}

TEST_F(CliErrors, IncludeOutsideProjectRootIsRefused) {
  write("sub/top.cir", "* top\n.include ../outside.inc\n.end\n");
  write("outside.inc", "R9 a b 1k\n");
  RunResult r = run("check --netlist sub/top.cir");
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("top.cir:2:"), std::string::npos) << r.out;
  RunResult allowed = run("check --netlist sub/top.cir --allow-outside-root");
  EXPECT_EQ(allowed.status, 0) << allowed.out;
}

TEST_F(CliErrors, SubcircuitBombIsRefusedByTheCap) {
  std::string deck = "* bomb\n.subckt L0 a b\nR1 a b 1\n.ends\n";
  for (int i = 1; i <= 9; ++i) {
    deck += ".subckt L" + std::to_string(i) + " a b\n";
    for (int k = 0; k < 10; ++k) deck += "X" + std::to_string(k) + " a b L" + std::to_string(i - 1) + "\n";
    deck += ".ends\n";
  }
  deck += "XTOP in out L9\n.end\n";
  write("bomb.cir", deck);
  auto t0 = std::chrono::steady_clock::now();
  RunResult r = run("check --netlist bomb.cir");
  double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("bomb.cir:"), std::string::npos) << r.out;
  EXPECT_LT(seconds, 10.0); // refused by counting, not by expanding 1e9 elements
}

TEST_F(CliErrors, XmlErrorHasLine) {
  write("bad.xml", "<netlist name=\"x\" version=\"1\">\n  <component part=\"P\">\n    <pin name=\"1\" net=\"a\"/>\n"
                   "  </component>\n</netlist>\n");
  RunResult r = run("check --netlist bad.xml");
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("bad.xml:2:"), std::string::npos) << r.out;
}

TEST_F(CliErrors, PartsFieldWithWrongUnitNamesTheFieldPath) {
  write("d.cir", kGoodDeck);
  write("parts.json", R"({"schema": "gateloop-parts/1", "parts": {"Q-SW1": {"kind": "igbt", "c_ies": "4.7 nH"}}})");
  RunResult r = run("check --netlist d.cir --parts parts.json");
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("parts.json: parts.Q-SW1.c_ies: error: expected a capacitance, got \"4.7 nH\""),
            std::string::npos)
      << r.out;
}

TEST_F(CliErrors, JsonSyntaxErrorHasLineAndColumn) {
  write("d.cir", kGoodDeck);
  write("layout.json", "{\n  \"schema\": \"gateloop-layout/1\",\n  \"nets\": {,}\n}\n");
  RunResult r = run("check --netlist d.cir --layout layout.json");
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("layout.json:3:"), std::string::npos) << r.out;
}

TEST_F(CliErrors, ProjectFileFieldErrors) {
  write("d.cir", kGoodDeck);
  write("gateloop.json", R"({"schema": "gateloop/1", "designs": [{"name": "a", "netlist": "d.cir",
    "operating": {"f_sw": "16 kV"}}], "waivers": [{"rule": "gate-pulldown", "loop": "*", "reason": ""}]})");
  RunResult r = run("check");
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("designs[0].operating.f_sw"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("waivers[0].reason"), std::string::npos) << r.out;
}

TEST_F(CliErrors, NoProjectFileFound) {
  RunResult r = run("check");
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("no project file gateloop.json"), std::string::npos) << r.out;
}

TEST_F(CliErrors, UnknownRuleIdGetsDidYouMean) {
  write("d.cir", kGoodDeck);
  RunResult r = run("check --netlist d.cir --rule loop-dampng=off");
  EXPECT_EQ(r.status, 2) << r.out;
  EXPECT_NE(r.out.find("did you mean \"loop-damping\""), std::string::npos) << r.out;
  RunResult e = run("explain gate-clam");
  EXPECT_EQ(e.status, 2) << e.out;
  EXPECT_NE(e.out.find("did you mean \"gate-clamp\""), std::string::npos) << e.out;
}

TEST_F(CliErrors, BadOptionValueIsAUsageError) {
  write("d.cir", kGoodDeck);
  RunResult r = run("check --netlist d.cir --format pdf");
  EXPECT_EQ(r.status, 2) << r.out;
  RunResult f = run("check --netlist d.cir --fail-on sometimes");
  EXPECT_EQ(f.status, 2) << f.out;
}

TEST_F(CliErrors, BadInputNeverOverwritesAnExistingReport) {
  write("bad.cir", "* title\nR1 a b\n.end\n");
  write("report.json", "previous report\n");
  RunResult r = run("check --netlist bad.cir --format json --output report.json");
  EXPECT_EQ(r.status, 2) << r.out;
  std::ifstream in(dir_ / "report.json");
  std::stringstream ss;
  ss << in.rdbuf();
  EXPECT_EQ(ss.str(), "previous report\n");
  for (const auto &e : fs::directory_iterator(dir_))
    EXPECT_EQ(e.path().filename().string().find(".tmp-"), std::string::npos) << e.path();
}

TEST_F(CliErrors, BinaryGarbageIsAnErrorNotACrash) {
  std::string junk = "\x7f" "ELF";
  for (int i = 0; i < 4096; ++i) junk += static_cast<char>((i * 131 + 7) % 256);
  write("junk.cir", junk);
  RunResult r = run("check --netlist junk.cir");
  EXPECT_EQ(r.status, 2) << r.out.substr(0, 400);
}

TEST_F(CliErrors, CleanBareDeckExitsZeroWithASummary) {
  write("d.cir", "* bare deck without parts\nM1 d g 0 0 NM\nRG g drv 4.7\nV1 drv 0 PULSE(0 15 0 1n 1n 1u 2u)\n.model NM NMOS\n.end\n");
  RunResult r = run("check --netlist d.cir");
  EXPECT_EQ(r.status, 0) << r.out;
  EXPECT_NE(r.out.find("read 3 components"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("without part data"), std::string::npos) << r.out; // the connectivity note
}
