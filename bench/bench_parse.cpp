/// \file
/// Parse benchmark for the SPICE reader (docs/performance.md, "Parsing").
///
///   bench_parse [DECK] [--repeat N]
///
/// Without DECK it runs the gen_deck program next to itself to write a flat deck of about one
/// million lines to /tmp/gateloop_bench_flat.cir. It then reads the deck with readSpiceDeck N
/// times (default 3) and prints the best and median parse time, MB/s, elements/s, the peak
/// resident memory (getrusage ru_maxrss) and its ratio to the file size, and the time of `wc -l`
/// on the same file with the ratio of the two.
#include "netlist-io/spice_reader.h"

#include <sys/resource.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <string>
#include <vector>

using namespace gateloop;
namespace fs = std::filesystem;

namespace {

double seconds(std::chrono::steady_clock::duration d) {
  return std::chrono::duration<double>(d).count();
}

/// User plus system CPU time of this process: on a shared machine the wall clock also counts the
/// time other processes held the CPU, so both are printed.
double cpuSeconds() {
  rusage u{};
  getrusage(RUSAGE_SELF, &u);
  return static_cast<double>(u.ru_utime.tv_sec + u.ru_stime.tv_sec) +
         static_cast<double>(u.ru_utime.tv_usec + u.ru_stime.tv_usec) * 1e-6;
}

long peakRssKb() {
  rusage u{};
  getrusage(RUSAGE_SELF, &u);
  return u.ru_maxrss;
}

double timeWc(const std::string &path, std::string &output) {
  std::string cmd = "wc -l < '" + path + "'";
  auto t0 = std::chrono::steady_clock::now();
  std::FILE *p = popen(cmd.c_str(), "r");
  if (!p) return -1;
  char buf[128];
  output.clear();
  while (std::fgets(buf, sizeof buf, p)) output += buf;
  pclose(p);
  auto t1 = std::chrono::steady_clock::now();
  while (!output.empty() && (output.back() == '\n' || output.back() == ' ')) output.pop_back();
  return seconds(t1 - t0);
}

} // namespace

int main(int argc, char **argv) {
  std::string deck;
  int repeat = 3;
  for (int i = 1; i < argc; ++i) {
    std::string a = argv[i];
    if (a == "--repeat" && i + 1 < argc) repeat = std::max(1, std::atoi(argv[++i]));
    else deck = a;
  }
  if (deck.empty()) {
    deck = "/tmp/gateloop_bench_flat.cir";
    fs::path gen = fs::path(argv[0]).parent_path() / "gen_deck";
    std::string cmd = "'" + gen.string() + "' --lines 1000000 --out '" + deck + "'";
    std::printf("generating: %s\n", cmd.c_str());
    if (std::system(cmd.c_str()) != 0) {
      std::fprintf(stderr, "bench_parse: gen_deck failed\n");
      return 1;
    }
  }
  std::error_code ec;
  auto bytes = fs::file_size(deck, ec);
  if (ec) {
    std::fprintf(stderr, "bench_parse: cannot stat %s\n", deck.c_str());
    return 1;
  }
  std::string lines;
  timeWc(deck, lines); // warms the page cache for both readers
  long rssBefore = peakRssKb();

  std::vector<double> times, cpuTimes;
  std::size_t elements = 0, nets = 0, diagnostics = 0;
  bool ok = true;
  for (int r = 0; r < repeat; ++r) {
    FileTable files;
    InputDiagnostics diags;
    SpiceReadOptions options;
    options.projectRoot = fs::path(deck).parent_path().string();
    auto t0 = std::chrono::steady_clock::now();
    double c0 = cpuSeconds();
    {
      Circuit circuit;
      ok = readSpiceDeck(deck, options, files, circuit, diags) && ok;
      elements = circuit.components().size();
      nets = circuit.nets().size();
      times.push_back(seconds(std::chrono::steady_clock::now() - t0)); // destruction not timed
      cpuTimes.push_back(cpuSeconds() - c0);
    }
    diagnostics = diags.items().size();
  }
  long rssPeak = peakRssKb();
  std::vector<double> wcTimes;
  for (int r = 0; r < repeat; ++r) wcTimes.push_back(timeWc(deck, lines));

  std::sort(times.begin(), times.end());
  std::sort(cpuTimes.begin(), cpuTimes.end());
  std::sort(wcTimes.begin(), wcTimes.end());
  double best = times.front(), median = times[times.size() / 2];
  double mb = static_cast<double>(bytes) / 1e6;
  double wcBest = wcTimes.front();
  std::printf("deck              %s\n", deck.c_str());
  std::printf("size              %.1f MB, %s lines\n", mb, lines.c_str());
  std::printf("result            %s, %zu elements, %zu nets, %zu diagnostics\n", ok ? "ok" : "ERRORS",
              elements, nets, diagnostics);
  std::printf("parse time        best %.3f s, median %.3f s (%d runs)\n", best, median, repeat);
  std::printf("cpu time          best %.3f s, median %.3f s\n", cpuTimes.front(),
              cpuTimes[cpuTimes.size() / 2]);
  std::printf("throughput        %.1f MB/s, %.2f M elements/s (best run, wall clock)\n", mb / best,
              static_cast<double>(elements) / best / 1e6);
  std::printf("throughput (cpu)  %.1f MB/s, %.2f M elements/s (best run, CPU time)\n",
              mb / cpuTimes.front(), static_cast<double>(elements) / cpuTimes.front() / 1e6);
  std::printf("peak memory       %.1f MB (ru_maxrss), %.2f x file size; before parsing %.1f MB\n",
              rssPeak * 1024.0 / 1e6, rssPeak * 1024.0 / static_cast<double>(bytes), rssBefore * 1024.0 / 1e6);
  std::printf("wc -l             best %.3f s; parse / wc -l = %.1f\n", wcBest, best / wcBest);
  return ok ? 0 : 1;
}
