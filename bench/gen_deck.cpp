/// \file
/// Writes synthetic SPICE decks of half-bridge legs for the parse benchmark (docs/performance.md).
/// Every leg has, for its high-side and low-side switch: a driver source, split turn-on/turn-off
/// gate resistors with a steering diode, a gate-source pull-down, a back-to-back Zener gate clamp
/// and the switch (an M element with a .model); plus one decoupling capacitor per leg. The decks
/// are valid ngspice input (they end with a short .tran).
///
/// With --board, every leg also carries the rest of its share of a power board, none of it part
/// of a gate loop: RC snubbers, a DC-link capacitor segment with ESR and ESL, desaturation
/// sensing, a bootstrap supply, driver supply filters and decoupling, the controller's PWM input
/// filters, a phase-current shunt with its filter and amplifier, a thermistor divider, bus voltage
/// sensing and the phase output filter. That is closer to a real board, where gate loops are a
/// small part of the netlist (a million lines then hold thousands of loops, not a hundred thousand).
///
///   gen_deck --legs N [--hier] [--board] [--out FILE]   N legs, flat or as N instances of .subckt leg
///   gen_deck --lines L [--hier] [--board] [--out FILE]  as many legs as fit in about L lines
#include <cstdio>
#include <cstdlib>
#include <cstring>
#include <string>

namespace {

void usage() {
  std::fprintf(stderr, "usage: gen_deck (--legs N | --lines L) [--hier] [--board] [--out FILE]\n");
}

constexpr long kFlatLinesPerLeg = 18; // 17 element lines + 1 comment line
constexpr long kBoardLinesPerLeg = 81; // written by writeBoardShare

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

/// The rest of one leg's share of a power board (--board): kBoardLinesPerLeg lines, every
/// element outside the gate loops. \p s suffixes names, \p dcp/\p dcn/\p sw are the leg's
/// bus and switch-node nets.
void writeBoardShare(std::FILE *f, const std::string &s, const char *dcp, const char *dcn, const char *sw) {
  const char *x = s.c_str();
  auto line = [&](const char *fmt, auto... args) { std::fprintf(f, fmt, args...); };
  line("* snubbers, DC-link segment\n");
  line("Rsnh%s %s snh%s 4.7\nCsnh%s snh%s %s 1n\n", x, dcp, x, x, x, sw);
  line("Rsnl%s %s snl%s 4.7\nCsnl%s snl%s %s 1n\n", x, sw, x, x, x, dcn);
  for (int k = 0; k < 6; ++k) {
    line("Lbus%d%s %s bl%d%s 5n\n", k, x, dcp, k, x);
    line("Rbus%d%s bl%d%s bc%d%s 2m\n", k, x, k, x, k, x);
    line("Cbus%d%s bc%d%s %s 10u\n", k, x, k, x, dcn);
  }
  line("* desaturation sensing (high and low side)\n");
  for (const char *side : {"h", "l"}) {
    const char *drain = side[0] == 'h' ? dcp : sw;
    const char *ref = side[0] == 'h' ? sw : dcn;
    line("Ddes%s%s %s dsa%s%s DSTEER\n", side, x, drain, side, x);
    line("Rdes%s%s dsa%s%s dsb%s%s 1k\n", side, x, side, x, side, x);
    line("Cbl%s%s dsb%s%s %s 47p\n", side, x, side, x, ref);
    line("Ides%s%s vcc%s%s dsb%s%s DC 500u\n", side, x, side, x, side, x);
  }
  line("* bootstrap and driver supplies\n");
  line("Dbs%s vccl%s bsa%s DSTEER\nRbs%s bsa%s vcch%s 2.2\nCbs%s vcch%s %s 1u\n", x, x, x, x, x, x, x, x, sw);
  for (const char *side : {"h", "l"}) {
    const char *ref = side[0] == 'h' ? sw : dcn;
    line("Viso%s%s isoa%s%s %s DC 18\n", side, x, side, x, ref);
    line("Liso%s%s isoa%s%s isob%s%s 10u\n", side, x, side, x, side, x);
    line("Ciso%s%s isob%s%s %s 10u\n", side, x, side, x, ref);
    line("Risob%s%s isob%s%s vcc%s%s 1\n", side, x, side, x, side, x);
    line("Cdd%s%s vcc%s%s %s 1u\n", side, x, side, x, ref);
    line("Cde%s%s vcc%s%s %s 100n\n", side, x, side, x, ref);
  }
  line("* PWM inputs from the controller\n");
  for (const char *side : {"h", "l"}) {
    line("Vpwm%s%s pwma%s%s 0 PULSE(0 3.3 0 5n 5n 4.9u 10u)\n", side, x, side, x);
    line("Rpwm%s%s pwma%s%s pwmb%s%s 100\n", side, x, side, x, side, x);
    line("Cpwm%s%s pwmb%s%s 0 100p\n", side, x, side, x);
    line("Epwm%s%s pwmc%s%s 0 pwmb%s%s 0 1\n", side, x, side, x, side, x);
    line("Rin%s%s pwmc%s%s 0 10k\n", side, x, side, x);
  }
  line("* phase current, temperature, bus voltage, output filter\n");
  line("Rsh%s %s ph%s 0.5m\n", x, sw, x);
  line("Rkp%s %s cs1%s 100\nRkn%s ph%s cs2%s 100\nCcs%s cs1%s cs2%s 1n\n", x, sw, x, x, x, x, x, x, x);
  line("Ecs%s cso%s 0 cs1%s cs2%s 20\nRcso%s cso%s adc%s 1k\nCadc%s adc%s 0 1n\n", x, x, x, x, x, x, x, x, x);
  line("Vref%s vr%s 0 DC 3.3\nRntc%s vr%s ntc%s 10k\nRth%s ntc%s 0 10k\nCntc%s ntc%s 0 100n\n", x, x, x, x, x,
       x, x, x, x);
  line("Rdv1%s %s dv1%s 1meg\nRdv2%s dv1%s dv2%s 1meg\nRdv3%s dv2%s dv3%s 1meg\nRdv4%s dv3%s 0 4.7k\n", x, dcp, x,
       x, x, x, x, x, x, x, x);
  line("Cdv%s dv3%s 0 1n\n", x, x);
  line("Lout%s ph%s out%s 100u\nCout%s out%s 0 2.2u\nRdmp%s out%s od%s 2.2\nCdmp%s od%s 0 4.7u\n", x, x, x, x, x,
       x, x, x, x, x, x);
  line("Rload%s out%s 0 10\n", x, x);
}

void writeFlatLeg(std::FILE *f, long i, bool board) {
  std::string s = "_";
  s += std::to_string(i); // (GCC 12 warns wrongly on "_" + std::to_string)
  std::string sw = "sw" + s;
  std::fprintf(f, "* leg %ld\n", i);
  writeSwitch(f, "h", s, "dcp", sw, 15, -5);
  writeSwitch(f, "l", s, sw.c_str(), "0", 15, -5);
  std::fprintf(f, "Cdec%s dcp 0 100n\n", s.c_str());
  if (board) writeBoardShare(f, s, "dcp", "0", sw.c_str());
}

} // namespace

int main(int argc, char **argv) {
  long legs = -1, lines = -1;
  bool hier = false, board = false;
  const char *out = nullptr;
  for (int i = 1; i < argc; ++i) {
    std::string a = argv[i];
    if (a == "--legs" && i + 1 < argc) legs = std::atol(argv[++i]);
    else if (a == "--lines" && i + 1 < argc) lines = std::atol(argv[++i]);
    else if (a == "--hier") hier = true;
    else if (a == "--board") board = true;
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
  if (legs < 0)
    legs = hier ? lines - 40 - (board ? kBoardLinesPerLeg : 0)
                : (lines - 10) / (kFlatLinesPerLeg + (board ? kBoardLinesPerLeg : 0));
  if (legs < 1) legs = 1;
  std::FILE *f = out ? std::fopen(out, "wb") : stdout;
  if (!f) {
    std::perror(out);
    return 1;
  }
  static char buffer[1 << 20];
  std::setvbuf(f, buffer, _IOFBF, sizeof buffer);
  std::fprintf(f, "synthetic inverter deck: %ld half-bridge legs (%s%s)\n", legs, hier ? "hierarchical" : "flat",
               board ? ", with the rest of the board" : "");
  writeModels(f);
  std::fprintf(f, "Vdc dcp 0 DC 800\n");
  if (hier) {
    std::fprintf(f, ".subckt leg dcp dcn sw\n");
    writeSwitch(f, "h", "", "dcp", "sw", 15, -5);
    writeSwitch(f, "l", "", "sw", "dcn", 15, -5);
    std::fprintf(f, "Cdec dcp dcn 100n\n");
    if (board) writeBoardShare(f, "", "dcp", "dcn", "sw");
    std::fprintf(f, ".ends leg\n");
    for (long i = 0; i < legs; ++i) std::fprintf(f, "X%ld dcp 0 out_%ld leg\n", i, i);
  } else {
    for (long i = 0; i < legs; ++i) writeFlatLeg(f, i, board);
  }
  std::fprintf(f, ".tran 10n 20u\n.end\n");
  if (out) std::fclose(f);
  return 0;
}
