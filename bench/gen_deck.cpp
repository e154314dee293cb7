/// \file
/// Writes synthetic SPICE decks of half-bridge legs for the parse benchmark (docs/performance.md).
/// Every leg has, for its high-side and low-side switch: a driver source, split turn-on/turn-off
/// gate resistors with a steering diode, a gate-source pull-down, a back-to-back Zener gate clamp
/// and the switch (an M element with a .model); plus one decoupling capacitor per leg. The decks
/// are valid ngspice input (they end with a short .tran).
///
///   gen_deck --legs N [--hier] [--out FILE]     N legs, flat or as N instances of .subckt leg
///   gen_deck --lines L [--hier] [--out FILE]    as many legs as fit in about L lines (flat)
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <string>

namespace {

void usage() {
  std::fprintf(stderr, "usage: gen_deck (--legs N | --lines L) [--hier] [--out FILE]\n");
}

constexpr long kFlatLinesPerLeg = 18; // 17 element lines + 1 comment line

void writeModels(std::FILE *f) {
  std::fprintf(f, ".model NSW NMOS(level=1 vto=3.5 kp=20 lambda=0.01)\n");
  std::fprintf(f, ".model DSTEER D(is=1e-12 n=1.8 rs=0.05)\n");
  std::fprintf(f, ".model DZ18 D(is=1e-14 bv=18 ibv=5m)\n");
}

/// One switch with its gate network. \p s is the suffix that makes names unique ("" in a
/// subcircuit), \p drvRef the driver's reference node (the switch source).
void writeSwitch(std::FILE *f, const char *side, const std::string &s, const char *drain,
                 const std::string &source, double von, double voff) {
  const char *sfx = s.c_str();
  const char *src = source.c_str();
  std::fprintf(f, "Vdrv%s%s drv%s%s %s PULSE(%g %g 0 20n 20n 4.9u 10u)\n", side, sfx, side, sfx, src,
               voff, von);
  std::fprintf(f, "Rgon%s%s drv%s%s g%s%s 4.7\n", side, sfx, side, sfx, side, sfx);
  std::fprintf(f, "Rgoff%s%s drv%s%s k%s%s 2.2\n", side, sfx, side, sfx, side, sfx);
  std::fprintf(f, "Dst%s%s g%s%s k%s%s DSTEER\n", side, sfx, side, sfx, side, sfx);
  std::fprintf(f, "Rpd%s%s g%s%s %s 10k\n", side, sfx, side, sfx, src);
  std::fprintf(f, "Dza%s%s z%s%s g%s%s DZ18\n", side, sfx, side, sfx, side, sfx);
  std::fprintf(f, "Dzb%s%s z%s%s %s DZ18\n", side, sfx, side, sfx, src);
  std::fprintf(f, "M%s%s %s g%s%s %s %s NSW\n", side, sfx, drain, side, sfx, src, src);
}

void writeFlatLeg(std::FILE *f, long i) {
  std::string s = "_" + std::to_string(i);
  std::string sw = "sw" + s;
  std::fprintf(f, "* leg %ld\n", i);
  writeSwitch(f, "h", s, "dcp", sw, 15, -5);
  writeSwitch(f, "l", s, sw.c_str(), "0", 15, -5);
  std::fprintf(f, "Cdec%s dcp 0 100n\n", s.c_str());
}

} // namespace

int main(int argc, char **argv) {
  long legs = -1, lines = -1;
  bool hier = false;
  const char *out = nullptr;
  for (int i = 1; i < argc; ++i) {
    std::string a = argv[i];
    if (a == "--legs" && i + 1 < argc) legs = std::atol(argv[++i]);
    else if (a == "--lines" && i + 1 < argc) lines = std::atol(argv[++i]);
    else if (a == "--hier") hier = true;
    else if (a == "--out" && i + 1 < argc) out = argv[++i];
    else {
      usage();
      return 2;
    }
  }
  if (legs < 0 && lines < 0) {
    usage();
    return 2;
  }
  if (legs < 0) legs = hier ? lines - 40 : (lines - 10) / kFlatLinesPerLeg;
  if (legs < 1) legs = 1;
  std::FILE *f = out ? std::fopen(out, "wb") : stdout;
  if (!f) {
    std::perror(out);
    return 1;
  }
  static char buffer[1 << 20];
  std::setvbuf(f, buffer, _IOFBF, sizeof buffer);
  std::fprintf(f, "synthetic inverter deck: %ld half-bridge legs (%s)\n", legs, hier ? "hierarchical" : "flat");
  writeModels(f);
  std::fprintf(f, "Vdc dcp 0 DC 800\n");
  if (hier) {
    std::fprintf(f, ".subckt leg dcp dcn sw\n");
    writeSwitch(f, "h", "", "dcp", "sw", 15, -5);
    writeSwitch(f, "l", "", "sw", "dcn", 15, -5);
    std::fprintf(f, "Cdec dcp dcn 100n\n");
    std::fprintf(f, ".ends leg\n");
    for (long i = 0; i < legs; ++i) std::fprintf(f, "X%ld dcp 0 out_%ld leg\n", i, i);
  } else {
    for (long i = 0; i < legs; ++i) writeFlatLeg(f, i);
  }
  std::fprintf(f, ".tran 10n 20u\n.end\n");
  if (out) std::fclose(f);
  return 0;
}
