// Corpus and robustness tests of the SPICE reader: every deck under tests/decks/corpus must read
// without errors and give the counts written in its own `* expect:` comment; decks marked
// `* ngspice: compare` must give the element count ngspice lists for them; and mutated or random
// decks must never crash the reader.
//
// Deck annotations (SPICE comments, so every deck stays valid input):
//   * expect: elements=N instances=N nets=N notes=N   primitive elements (not X instances),
//                                                     X instances, nets, notes
//   * expect-value: NAME VALUE                        component value in SI units
//   * ngspice: compare                                valid ngspice input; compare element counts
#include "netlist-io/spice_reader.h"

#include <gtest/gtest.h>

#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <map>
#include <random>
#include <regex>
#include <sstream>
#include <string>
#include <vector>

using namespace gateloop;
namespace fs = std::filesystem;

namespace {

const fs::path kCorpus = fs::path(GATELOOP_TEST_DATA) / "decks" / "corpus";

std::string readAll(const fs::path &p) {
  std::ifstream in(p, std::ios::binary);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

std::vector<fs::path> corpusDecks() {
  std::vector<fs::path> out;
  for (const auto &e : fs::directory_iterator(kCorpus))
    if (e.is_regular_file() && e.path().extension() == ".cir") out.push_back(e.path());
  std::sort(out.begin(), out.end());
  return out;
}

struct Expectations {
  std::map<std::string, long> counts;
  std::vector<std::pair<std::string, double>> values;
  bool ngspice = false;
};

// Test-side parsing of the annotations (std::regex is fine here, off the reader's hot path).
Expectations expectationsOf(const std::string &text) {
  Expectations e;
  std::istringstream in(text);
  std::string line;
  static const std::regex countRe(R"((\w+)=(\d+))");
  while (std::getline(in, line)) {
    if (!line.empty() && line.back() == '\r') line.pop_back();
    if (line.rfind("* expect:", 0) == 0) {
      for (std::sregex_iterator it(line.begin(), line.end(), countRe), end; it != end; ++it)
        e.counts[(*it)[1]] = std::stol((*it)[2]);
    } else if (line.rfind("* expect-value:", 0) == 0) {
      std::istringstream fields(line.substr(15));
      std::string name, value;
      fields >> name >> value;
      e.values.emplace_back(name, std::strtod(value.c_str(), nullptr));
    } else if (line == "* ngspice: compare") {
      e.ngspice = true;
    }
  }
  return e;
}

struct Read {
  bool ok = false;
  FileTable files;
  Circuit circuit;
  InputDiagnostics diags;
  std::size_t elements = 0, instances = 0, notes = 0;
  std::string errors;
};

std::unique_ptr<Read> readDeck(const fs::path &deck) {
  auto r = std::make_unique<Read>();
  SpiceReadOptions o;
  o.projectRoot = kCorpus.string();
  r->ok = readSpiceDeck(deck.string(), o, r->files, r->circuit, r->diags);
  for (const auto &c : r->circuit.components())
    (c.kind == ElementKind::Subcircuit ? r->instances : r->elements)++;
  for (const auto &d : r->diags.items()) {
    if (d.severity == Severity::Note) ++r->notes;
    if (d.severity == Severity::Error) r->errors += formatDiagnostic(d, r->files) + "\n";
  }
  return r;
}

} // namespace

TEST(SpiceCorpus, HasAtLeastThirtyDecks) { EXPECT_GE(corpusDecks().size(), 30u); }

TEST(SpiceCorpus, EveryDeckReadsWithItsExpectedCounts) {
  for (const fs::path &deck : corpusDecks()) {
    SCOPED_TRACE(deck.filename().string());
    Expectations e = expectationsOf(readAll(deck));
    ASSERT_EQ(e.counts.size(), 4u) << "deck lacks a complete '* expect:' line";
    auto r = readDeck(deck);
    EXPECT_TRUE(r->ok) << r->errors;
    EXPECT_EQ(static_cast<long>(r->elements), e.counts["elements"]);
    EXPECT_EQ(static_cast<long>(r->instances), e.counts["instances"]);
    EXPECT_EQ(static_cast<long>(r->circuit.nets().size()), e.counts["nets"]);
    EXPECT_EQ(static_cast<long>(r->notes), e.counts["notes"]);
    for (const auto &[name, value] : e.values) {
      ComponentId id = r->circuit.findComponent(name);
      ASSERT_NE(id, kNone) << name;
      // Deck data (invented values), compared at rel 1e-12 as physics.md 6 asks for decimal scaling.
      EXPECT_NEAR(r->circuit.component(id).value, value, std::fabs(value) * 1e-12) << name;
    }
  }
}

namespace {

std::string findNgspice() {
  const char *path = std::getenv("PATH");
  std::string dirs = path ? path : "/usr/bin:/bin";
  std::stringstream ss(dirs);
  std::string dir;
  while (std::getline(ss, dir, ':')) {
    fs::path p = fs::path(dir) / "ngspice";
    std::error_code ec;
    if (fs::is_regular_file(p, ec)) return p.string();
  }
  return {};
}

std::string lowerCopy(std::string s) {
  for (char &c : s) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return s;
}

/// A copy of \p deck for ngspice: its own .control block and .end removed, include paths made
/// absolute, and a control block that lists the expanded deck.
std::string ngspiceCopy(const fs::path &deck) {
  std::istringstream in(readAll(deck));
  std::string line, out;
  bool first = true, inControl = false;
  static const std::regex includeRe(R"(^(\s*\.(include|inc|lib)\s+)(["']?)([^"'\s]+)(["']?)(.*)$)",
                                    std::regex::icase);
  while (std::getline(in, line)) {
    if (!line.empty() && line.back() == '\r') line.pop_back();
    std::string t = lowerCopy(line);
    t.erase(0, t.find_first_not_of(" \t"));
    if (!first && t.rfind(".control", 0) == 0) inControl = true;
    if (inControl) {
      if (t.rfind(".endc", 0) == 0) inControl = false;
      continue;
    }
    if (!first && (t == ".end" || t.rfind(".end ", 0) == 0)) continue;
    std::smatch m;
    if (!first && std::regex_match(line, m, includeRe)) {
      fs::path p = m[4].str();
      if (p.is_relative()) p = deck.parent_path() / p;
      line = m[1].str() + m[3].str() + p.string() + m[5].str() + m[6].str();
    }
    out += line + "\n";
    first = false;
  }
  out += ".control\nlisting e\nquit\n.endc\n.end\n";
  return out;
}

/// Number of element lines in ngspice's `listing e` output (the first listed line is the title).
long ngspiceElementCount(const std::string &output) {
  std::istringstream in(output);
  std::string line;
  static const std::regex listed(R"(^\s+\d+ : (\S+))");
  long count = 0;
  bool title = true;
  while (std::getline(in, line)) {
    std::smatch m;
    if (!std::regex_search(line, m, listed)) continue;
    if (title) {
      title = false;
      continue;
    }
    if (std::isalpha(static_cast<unsigned char>(m[1].str()[0]))) ++count;
  }
  return count;
}

} // namespace

TEST(SpiceCorpus, ElementCountsMatchNgspice) {
  std::string ngspice = findNgspice();
  if (ngspice.empty()) GTEST_SKIP() << "ngspice not found on PATH; element counts not compared";
  fs::path tmp = fs::temp_directory_path() / ("gateloop_ngspice_" + std::to_string(::getpid()));
  fs::create_directories(tmp);
  int compared = 0;
  for (const fs::path &deck : corpusDecks()) {
    Expectations e = expectationsOf(readAll(deck));
    if (!e.ngspice) continue;
    SCOPED_TRACE(deck.filename().string());
    fs::path copy = tmp / deck.filename();
    std::ofstream(copy) << ngspiceCopy(deck);
    fs::path log = tmp / (deck.stem().string() + ".log");
    std::string cmd = "cd '" + tmp.string() + "' && timeout 120 '" + ngspice + "' -b '" +
                      copy.string() + "' > '" + log.string() + "' 2>&1";
    int rc = std::system(cmd.c_str());
    std::string output = readAll(log);
    ASSERT_EQ(rc, 0) << output;
    long theirs = ngspiceElementCount(output);
    auto r = readDeck(deck);
    EXPECT_EQ(static_cast<long>(r->elements), theirs) << output; // ngspice simulation listing
    ++compared;
  }
  std::error_code ec;
  fs::remove_all(tmp, ec);
  EXPECT_GE(compared, 25);
}

// --- Robustness: mutated and random decks ---------------------------------------------------------

namespace {

const char *const kFragments[] = {
    ".subckt s a b\n", ".ends\n", ".ends s\n", "{", "}", "'", "\"", "+", "\n+ ", ".", "\n",
    "\r\n", ";", "$ ", "=", " = ", "params:", "X1 a b s\n", "X2 a s\n", ".include corpus.inc\n",
    ".include ../../../../etc/passwd\n", ".lib models/corners.lib nosuch\n", ".lib x\n", ".endl\n",
    ".param a={a}\n", ".param b={1/0}\n", ".func f(x) {f(x)}\n", "R1 a b {f(1)}\n", "R1 a b\n",
    "POLY(9)", "POLY(2)", ".control\n", ".endc\n", ".end\n", "K1 L1 L2\n", "\xC2", "\xFF",
    "\xEF\xBB\xBF", std::string_view("\0", 1).data(), "4k7", "1e999", "9999999999999999999",
    ".model\n", ".model m\n", "M1 d g s\n", "Q1 c b e s m x\n", "A1 [a b] [c] m\n", "%vd(",
    "E1 a b POLY(3)\n", "X9 a b c d e f g h i j k l m\n", "{{{{{{{{{{", "(((((((((", "\t",
};

std::string mutate(std::string s, std::mt19937 &rng) {
  std::uniform_int_distribution<int> op(0, 5);
  std::uniform_int_distribution<int> count(1, 8);
  std::uniform_int_distribution<int> byte(0, 255);
  int n = count(rng);
  for (int k = 0; k < n; ++k) {
    auto pos = [&] { return s.empty() ? 0 : std::uniform_int_distribution<std::size_t>(0, s.size() - 1)(rng); };
    switch (op(rng)) {
    case 0: // flip one byte
      if (!s.empty()) s[pos()] = static_cast<char>(byte(rng));
      break;
    case 1: { // insert a fragment
      std::size_t f = std::uniform_int_distribution<std::size_t>(0, std::size(kFragments) - 1)(rng);
      std::string frag = kFragments[f];
      if (frag.empty()) frag = std::string(1, '\0');
      s.insert(s.empty() ? 0 : pos(), frag);
      break;
    }
    case 2: { // delete a range
      if (s.empty()) break;
      std::size_t a = pos();
      s.erase(a, std::uniform_int_distribution<std::size_t>(1, 40)(rng));
      break;
    }
    case 3: { // duplicate a range (repeated cards, duplicate names, nested blocks)
      if (s.empty()) break;
      std::size_t a = pos();
      std::string piece = s.substr(a, std::uniform_int_distribution<std::size_t>(1, 200)(rng));
      s.insert(pos(), piece);
      break;
    }
    case 4: // truncate
      if (!s.empty()) s.resize(pos());
      break;
    case 5: { // swap two lines' worth of text
      if (s.size() < 2) break;
      std::size_t a = pos(), b = pos();
      std::swap(s[a], s[b]);
      break;
    }
    }
  }
  return s;
}

} // namespace

TEST(SpiceRobustness, MutatedAndRandomDecksNeverCrash) {
  std::vector<std::string> seeds;
  for (const fs::path &deck : corpusDecks()) seeds.push_back(readAll(deck));
  ASSERT_FALSE(seeds.empty());
  std::mt19937 rng(20240611u); // fixed seed: failures reproduce
  std::uniform_int_distribution<int> byte(0, 255);
  auto start = std::chrono::steady_clock::now();
  int withErrors = 0, clean = 0;
  constexpr int kIterations = 3000;
  for (int i = 0; i < kIterations; ++i) {
    std::string deck;
    if (i % 10 == 9) { // pure noise
      deck.resize(std::uniform_int_distribution<std::size_t>(0, 2000)(rng));
      for (char &c : deck) c = static_cast<char>(byte(rng));
    } else {
      deck = mutate(seeds[static_cast<std::size_t>(i) % seeds.size()], rng);
    }
    FileTable files;
    Circuit circuit;
    InputDiagnostics diags;
    SpiceReadOptions o;
    o.projectRoot = kCorpus.string();
    o.maxElements = 100000;
    bool ok = readSpiceText(deck, "fuzz.cir", o, files, circuit, diags);
    ASSERT_EQ(ok, !diags.hasErrors()) << "iteration " << i;
    for (const auto &d : diags.items()) {
      // Every message renders, and errors in text point at a line.
      std::string text = formatDiagnostic(d, files);
      ASSERT_FALSE(text.empty());
    }
    (ok ? clean : withErrors)++;
  }
  double seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  EXPECT_GT(withErrors, 100); // the mutations do produce bad input
  EXPECT_GT(clean, 10);       // and some stay valid
  EXPECT_LT(seconds, 60.0);   // no hang
}

TEST(SpiceRobustness, PathologicalShapes) {
  std::vector<std::string> decks = {
      std::string(200000, '{'),
      "t\nR1 a b {" + std::string(100000, '(') + "}\n",
      "t\n" + std::string(100000, '+') + "\n",
      "t\nR1 a b 1\n" + std::string(50000, '\n') + "+ 2\n",
      "t\n.param a=" + std::string(50000, '-') + "1\nR1 a b {a}\n",
      "t\nX1 " + std::string(70000, 'a') + " s\n",
  };
  std::string many = "t\nR1 ";
  for (int i = 0; i < 70000; ++i) many += "n" + std::to_string(i) + " ";
  decks.push_back(many + "\n");
  for (const std::string &deck : decks) {
    FileTable files;
    Circuit circuit;
    InputDiagnostics diags;
    SpiceReadOptions o;
    o.projectRoot = kCorpus.string();
    bool ok = readSpiceText(deck, "odd.cir", o, files, circuit, diags);
    EXPECT_EQ(ok, !diags.hasErrors());
  }
}
