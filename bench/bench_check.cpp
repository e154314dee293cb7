/// \file
/// Benchmark of a full `check` on a synthetic deck: parse alone, then the whole pipeline (parse,
/// part resolution, gate-loop extraction, physics, rules), with the per-loop cost and the ratio
/// to `wc -l` on the same file. Results go into docs/performance.md ("Full check").
///
///   bench_check [DECK] [--repeat N] [--faulty]
/// Without DECK, gen_deck (beside this program) writes a flat deck of about one million lines.
#include "checker/app/analyze.h"
#include "checker/app/run_inputs.h"
#include "checker/core/parallel.h"
#include "netlist-io/spice_reader.h"

#include <sys/resource.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

namespace fs = std::filesystem;
using namespace gateloop;

namespace {

double seconds(std::chrono::steady_clock::duration d) { return std::chrono::duration<double>(d).count(); }

long peakRssKb() {
  rusage u{};
  getrusage(RUSAGE_SELF, &u);
  return u.ru_maxrss;
}

double timeWc(const std::string &path) {
  auto t0 = std::chrono::steady_clock::now();
  std::string cmd = "wc -l '" + path + "' > /dev/null";
  if (std::system(cmd.c_str()) != 0) return -1;
  return seconds(std::chrono::steady_clock::now() - t0);
}

// Parts for gen_deck's legs: the M elements (model NSW) are switches, each driver source is
// assigned a driver part whose single output is pin "1" (the positive node of a V element).
// The data make the legs pass every rule, as in a design that is gated in CI; `--faulty`
// narrows the gate rating so every loop also produces findings.
const char *const kParts = R"({ "schema": "gateloop-parts/1", "parts": {
  "SW-BENCH": { "kind": "mosfet", "match": {"model": ["NSW"]}, "v_gs_max": "20 V", "v_gs_min": "@VGSMIN@",
    "v_th_min": "3 V", "v_plateau": "5 V", "c_ies": "2 nF", "c_res": "20 pF", "q_g": "60 nC",
    "q_g_swing": ["-5 V", "15 V"], "r_g_int": "1 ohm", "l_gate_internal": "3 nH",
    "r_g_recommended": {"on": ["1 ohm", "22 ohm"], "off": ["1 ohm", "22 ohm"]}, "v_rated": "650 V" },
  "DRV-BENCH": { "kind": "driver", "pins": {"out": "1", "ref": "2"}, "r_source": "1 ohm", "r_sink": "0.5 ohm",
    "i_source_peak": "8 A", "i_sink_peak": "8 A", "v_on": "15 V", "v_off": "-5 V" },
  "RES-BENCH": { "kind": "resistor", "p_rated": "0.5 W", "tolerance": 0.01,
    "pulse": [["0.01 us", "400 W"], ["1 us", "80 W"], ["10 us", "25 W"], ["1 ms", "2 W"]] },
  "DZ-BENCH": { "kind": "zener", "match": {"model": ["DZ18"]}, "v_breakdown": "18 V" } } })";

} // namespace

int main(int argc, char **argv) {
  std::string deck;
  int repeat = 3;
  bool faulty = false;
  for (int i = 1; i < argc; ++i) {
    std::string a = argv[i];
    if (a == "--repeat" && i + 1 < argc) repeat = std::max(1, std::atoi(argv[++i]));
    else if (a == "--faulty") faulty = true;
    else deck = a;
  }
  if (deck.empty()) {
    deck = "/tmp/gateloop_bench_flat.cir";
    if (!fs::exists(deck)) {
      std::string cmd = "'" + (fs::path(argv[0]).parent_path() / "gen_deck").string() + "' --lines 1000000 --out '" + deck + "'";
      std::printf("generating: %s\n", cmd.c_str());
      if (std::system(cmd.c_str()) != 0) return 1;
    }
  }
  fs::path dir = fs::temp_directory_path() / "gateloop-bench-check";
  fs::create_directories(dir);
  std::string parts = kParts;
  parts.replace(parts.find("@VGSMIN@"), 8, faulty ? "-10 V" : "-20 V");
  std::ofstream(dir / "parts.json") << parts;
  std::ofstream(dir / "gateloop.json") << R"({ "schema": "gateloop/1", "parts": ["parts.json"], "designs": [
    { "name": "bench", "netlist": ")" << fs::absolute(deck).string() << R"(",
      "assign": {"Vdrv*": "DRV-BENCH", "Rg*": "RES-BENCH"},
      "operating": {"v_bus": "400 V", "i_load": "20 A", "f_sw": "50 kHz", "t_ambient": "50 degC",
                    "l_power_loop": "20 nH", "di_dt": "2 kA/us"} } ] })";
  double bytes = static_cast<double>(fs::file_size(deck));
  timeWc(deck); // warm the page cache

  std::vector<double> parseTimes, checkTimes, wcTimes;
  StageSeconds bestStages;
  double bestInputs = 0;
  std::size_t loops = 0, findings = 0, elements = 0;
  for (int r = 0; r < repeat; ++r) {
    {
      FileTable files;
      InputDiagnostics diags;
      Circuit circuit;
      SpiceReadOptions options;
      options.projectRoot = "/";
      auto t0 = std::chrono::steady_clock::now();
      readSpiceDeck(deck, options, files, circuit, diags);
      parseTimes.push_back(seconds(std::chrono::steady_clock::now() - t0));
      elements = circuit.components().size();
    }
    {
      auto t0 = std::chrono::steady_clock::now();
      RunInputs run;
      InputSelection sel;
      sel.projectPath = (dir / "gateloop.json").string();
      sel.allowOutsideRoot = true;
      if (!loadRunInputs(sel, run)) {
        for (const auto &d : run.diags.items()) std::fprintf(stderr, "%s\n", formatDiagnostic(d, run.files).c_str());
        return 1;
      }
      auto t1 = std::chrono::steady_clock::now();
      StageSeconds stages;
      DesignReport report = analyzeDesign(*run.designs.front(), run.project, {}, "2026-01-01", &stages);
      checkTimes.push_back(seconds(std::chrono::steady_clock::now() - t0));
      if (checkTimes.back() <= *std::min_element(checkTimes.begin(), checkTimes.end())) {
        bestStages = stages;
        bestInputs = seconds(t1 - t0);
      }
      loops = report.loops.size();
      findings = report.findings.size();
    }
    wcTimes.push_back(timeWc(deck));
  }
  std::sort(parseTimes.begin(), parseTimes.end());
  std::sort(checkTimes.begin(), checkTimes.end());
  std::sort(wcTimes.begin(), wcTimes.end());
  double parse = parseTimes.front(), check = checkTimes.front(), wc = wcTimes.front();
  std::printf("deck              %s (%.1f MB, %zu elements)\n", deck.c_str(), bytes / 1e6, elements);
  std::printf("gate loops        %zu, findings %zu\n", loops, findings);
  std::printf("parse only        best %.3f s of %d runs\n", parse, repeat);
  std::printf("full check        best %.3f s (parse + parts + loops + physics + rules)\n", check);
  std::printf("  stages          inputs (parse, parts) %.3f s, extraction %.3f s, physics %.3f s,\n"
              "                  census %.3f s, rules %.3f s; %zu worker threads\n",
              bestInputs, bestStages.extraction, bestStages.physics, bestStages.census, bestStages.rules,
              workerThreads());
  std::printf("check / parse     %.2f (target <= 2)\n", check / parse);
  std::printf("per loop          %.2f us beyond parsing\n", loops ? (check - parse) / loops * 1e6 : 0.0);
  std::printf("wc -l             best %.3f s; check / wc -l = %.1f\n", wc, check / wc);
  std::printf("peak memory       %.1f MB (ru_maxrss), %.2f x file size\n", peakRssKb() * 1024.0 / 1e6,
              peakRssKb() * 1024.0 / bytes);
  fs::remove_all(dir);
  return 0;
}
