// The bundled examples, run through the built binary, against their reviewed expected output in
// tests/examples/. Regenerate with UPDATE_GOLDEN=1 and review the diff before committing.
#include <gtest/gtest.h>

#include <array>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <sys/wait.h>

namespace {

struct RunResult {
  int status = -1;
  std::string out;
};

RunResult runInSourceDir(const std::string &args) {
  std::string cmd = std::string("cd ") + GATELOOP_SOURCE_DIR + " && GATELOOP_TODAY=2026-12-01 NO_COLOR=1 " +
                    GATELOOP_BINARY + " " + args + " 2>&1";
  RunResult r;
  FILE *pipe = popen(cmd.c_str(), "r");
  if (!pipe) return r;
  std::array<char, 4096> buf{};
  std::size_t n;
  while ((n = fread(buf.data(), 1, buf.size(), pipe)) > 0) r.out.append(buf.data(), n);
  int status = pclose(pipe);
  r.status = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  return r;
}

std::string readFile(const std::filesystem::path &p) {
  std::ifstream in(p, std::ios::binary);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
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
