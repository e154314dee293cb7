#include "checker/app/output_file.h"

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <unistd.h>

namespace gateloop {

std::string writeOutputAtomically(const std::string &path, const std::string &content) {
  if (path.empty() || path == "-") {
    std::cout << content;
    std::cout.flush();
    return std::cout ? std::string() : std::string("cannot write to standard output");
  }
  namespace fs = std::filesystem;
  fs::path target(path);
  fs::path tmp = target;
  tmp += ".tmp-" + std::to_string(::getpid());
  {
    std::ofstream out(tmp, std::ios::binary | std::ios::trunc);
    if (!out) return path + ": error: cannot create output file: " + std::strerror(errno);
    out << content;
    out.flush();
    if (!out) {
      std::error_code ec;
      fs::remove(tmp, ec);
      return path + ": error: cannot write output file";
    }
  }
  std::error_code ec;
  fs::rename(tmp, target, ec);
  if (ec) {
    fs::remove(tmp, ec);
    return path + ": error: cannot replace output file: " + ec.message();
  }
  return {};
}

} // namespace gateloop
