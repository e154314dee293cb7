/// \file
/// Shared helpers for tests that run the built `gateloop` binary: temporary folders, files and
/// a runner that captures the exit status, standard output and standard error.
#pragma once

#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <stdexcept>
#include <string>
#include <sys/wait.h>
#include <unistd.h>

namespace gateloop::testing {

namespace fs = std::filesystem;

/// A fresh folder below the system temp folder, removed with everything in it.
class TempDir {
public:
  explicit TempDir(const std::string &prefix) {
    std::string pattern = (fs::temp_directory_path() / (prefix + "XXXXXX")).string();
    if (!::mkdtemp(pattern.data())) throw std::runtime_error("mkdtemp failed");
    path_ = pattern;
  }
  ~TempDir() {
    std::error_code ec;
    fs::remove_all(path_, ec);
  }
  TempDir(const TempDir &) = delete;
  TempDir &operator=(const TempDir &) = delete;
  const fs::path &path() const { return path_; }

private:
  fs::path path_;
};

/// Single-quotes \p s for the shell.
inline std::string quote(const std::string &s) {
  std::string q = "'";
  for (char c : s) q += c == '\'' ? std::string("'\\''") : std::string(1, c);
  return q + "'";
}

inline std::string readFile(const fs::path &p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream s;
  s << in.rdbuf();
  return s.str();
}

inline void writeFile(const fs::path &p, const std::string &text) {
  if (p.has_parent_path()) fs::create_directories(p.parent_path());
  std::ofstream(p, std::ios::binary) << text;
}

struct RunResult {
  int status = -1;
  std::string out, err;
  std::string all() const { return out + err; }
};

/// Runs `gateloop ARGS` in \p cwd with the extra environment assignments \p env
/// ("NAME=value ...", may be empty).
inline RunResult runGateloop(const fs::path &cwd, const std::string &args, const std::string &env = "") {
  TempDir capture("gateloop-capture-");
  std::string cmd = "cd " + quote(cwd.string()) + " && " + env + (env.empty() ? "" : " ") + quote(GATELOOP_BINARY) +
                    " " + args + " >" + quote((capture.path() / "out").string()) + " 2>" +
                    quote((capture.path() / "err").string());
  int raw = std::system(cmd.c_str());
  RunResult r;
  r.status = WIFEXITED(raw) ? WEXITSTATUS(raw) : -1;
  r.out = readFile(capture.path() / "out");
  r.err = readFile(capture.path() / "err");
  return r;
}

} // namespace gateloop::testing
