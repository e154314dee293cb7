#include "checker/core/finding.h"

#include <algorithm>
#include <cstdint>
#include <cstdio>

namespace gateloop {

std::string findingFingerprint(const Finding &f) {
  std::vector<std::string> refs = f.refs;
  std::sort(refs.begin(), refs.end());
  std::string key = f.rule + '\x1f' + f.design + '\x1f' + f.loop;
  for (const auto &r : refs) key += '\x1f' + r;
  // FNV-1a, 64 bit: short, stable across platforms and runs.
  std::uint64_t h = 1469598103934665603ull;
  for (unsigned char ch : key) {
    h ^= ch;
    h *= 1099511628211ull;
  }
  char buf[17];
  std::snprintf(buf, sizeof buf, "%016llx", static_cast<unsigned long long>(h));
  return buf;
}

} // namespace gateloop
