// The bundled examples, run through the built binary, against their reviewed expected output in
// tests/examples/. Regenerate with UPDATE_GOLDEN=1 and review the diff before committing.
#include "test_support.h"

#include <gtest/gtest.h>

#include <cstdlib>
#include <filesystem>
#include <fstream>

using namespace gateloop::testing;

namespace {

// Output of `gateloop ARGS` run from the source folder, with a fixed date and no colour.
RunResult runInSourceDir(const std::string &args) {
  RunResult r = runGateloop(GATELOOP_SOURCE_DIR, args, "GATELOOP_TODAY=2026-12-01 NO_COLOR=1");
  return {r.status, r.all(), ""};
}

// The version line changes with every release; it is not part of what the examples check.
std::string withoutVersion(std::string s) {
  auto pos = s.find("\"version\": \"");
  if (pos != std::string::npos) s.replace(pos, s.find('"', pos + 12) - pos + 1, "\"version\": \"X\"");
  return s;
}

void expectGolden(const std::string &name, const std::string &args, int expectedStatus) {
  RunResult r = runInSourceDir(args);
  EXPECT_EQ(r.status, expectedStatus) << r.out;
  std::filesystem::path golden = std::filesystem::path(GATELOOP_TEST_DATA) / "examples" / name;
  std::string got = withoutVersion(r.out);
  if (std::getenv("UPDATE_GOLDEN")) {
    std::filesystem::create_directories(golden.parent_path());
    std::ofstream(golden, std::ios::binary) << got;
    return;
  }
  ASSERT_TRUE(std::filesystem::exists(golden)) << "missing " << golden << "; run with UPDATE_GOLDEN=1";
  EXPECT_EQ(got, readFile(golden)) << "output of `gateloop " << args << "` changed; review and run with UPDATE_GOLDEN=1";
}

} // namespace

TEST(Examples, InverterText) { expectGolden("inverter-3ph.txt", "check examples/inverter-3ph/gateloop.json", 1); }
TEST(Examples, InverterJson) {
  expectGolden("inverter-3ph.json", "check examples/inverter-3ph/gateloop.json --format json", 1);
}
TEST(Examples, InverterLoops) { expectGolden("inverter-3ph.loops.txt", "loops examples/inverter-3ph/gateloop.json", 0); }
TEST(Examples, HalfBridgeLeadsText) {
  expectGolden("halfbridge-leads.txt", "check examples/halfbridge-leads/gateloop.json", 1);
}
TEST(Examples, CleanHalfBridgeText) {
  expectGolden("clean-halfbridge.txt", "check examples/clean-halfbridge/gateloop.json --fail-on note", 0);
}
TEST(Examples, CleanHalfBridgeLoops) {
  expectGolden("clean-halfbridge.loops.json", "loops examples/clean-halfbridge/gateloop.json --format json", 0);
}
TEST(Examples, InverterMarkdown) {
  expectGolden("inverter-3ph.md", "check examples/inverter-3ph/gateloop.json --format markdown", 1);
}
TEST(Examples, CleanHalfBridgeMarkdown) {
  expectGolden("clean-halfbridge.md", "check examples/clean-halfbridge/gateloop.json --format markdown", 0);
}
