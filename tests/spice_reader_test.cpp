// Tests of the SPICE deck reader (netlist-io/spice_reader.h): syntax, hierarchy, includes,
// limits and the exact text of input errors.
#include "netlist-io/spice_reader.h"

#include <gtest/gtest.h>

#include <chrono>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <string>
#include <vector>

using namespace gateloop;
namespace fs = std::filesystem;

namespace {

struct Parsed {
  bool ok = false;
  FileTable files;
  Circuit circuit;
  InputDiagnostics diags;

  std::vector<std::string> messages(Severity s) const {
    std::vector<std::string> out;
    for (const auto &d : diags.items())
      if (d.severity == s) out.push_back(formatDiagnostic(d, files));
    return out;
  }
  std::vector<std::string> errors() const { return messages(Severity::Error); }
  std::vector<std::string> notes() const { return messages(Severity::Note); }
  const Component &comp(std::string_view name) const {
    ComponentId id = circuit.findComponent(name);
    EXPECT_NE(id, kNone) << name;
    static const Component kEmpty;
    return id == kNone ? kEmpty : circuit.component(id);
  }
  std::string pinNet(std::string_view comp, std::string_view pin) const {
    ComponentId id = circuit.findComponent(comp);
    if (id == kNone) return "<no component>";
    NetId n = circuit.pinNet(circuit.component(id), pin);
    return n == kNone ? "<no pin>" : std::string(circuit.netAt(n).name);
  }
};

std::unique_ptr<Parsed> parseText(std::string_view text, SpiceReadOptions options = {}) {
  auto p = std::make_unique<Parsed>();
  if (options.projectRoot.empty()) options.projectRoot = fs::temp_directory_path().string();
  p->ok = readSpiceText(text, "deck.cir", options, p->files, p->circuit, p->diags);
  return p;
}

/// A fresh folder under the test temp dir, with helpers to write files into it.
class TempTree {
public:
  TempTree() {
    static int counter = 0;
    root_ = fs::path(::testing::TempDir()) /
            ("spice_reader_test_" + std::to_string(::getpid()) + "_" + std::to_string(counter++));
    fs::remove_all(root_);
    fs::create_directories(root_);
  }
  ~TempTree() {
    std::error_code ec;
    fs::remove_all(root_, ec);
  }
  fs::path write(const std::string &rel, std::string_view text) const {
    fs::path p = root_ / rel;
    fs::create_directories(p.parent_path());
    std::ofstream(p, std::ios::binary) << text;
    return p;
  }
  const fs::path &root() const { return root_; }

  std::unique_ptr<Parsed> read(const std::string &rel, SpiceReadOptions options = {}) const {
    auto p = std::make_unique<Parsed>();
    if (options.projectRoot.empty()) options.projectRoot = root_.string();
    p->ok = readSpiceDeck((root_ / rel).string(), options, p->files, p->circuit, p->diags);
    return p;
  }

private:
  fs::path root_;
};

std::string joined(const std::vector<std::string> &v) {
  std::string s;
  for (const auto &x : v) s += x + "\n";
  return s;
}

} // namespace

// --- Basic syntax -----------------------------------------------------------------------------------

TEST(SpiceReader, TitleCommentsContinuationCase) {
  auto p = parseText("My Gate Drive\n"
                     "* a comment line\n"
                     "R1 a b 4.7 ; inline comment\n"
                     "C1 a 0 1n $ another comment\n"
                     "L1 a\n"
                     "* comment between a card and its continuation\n"
                     "\n"
                     "+ GND\n"
                     "+ 10n\n"
                     "\tr2\tA\tB\t1k\n"
                     ".END\n"
                     "R9 never read 1\n");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  EXPECT_EQ(p->circuit.title, "My Gate Drive");
  ASSERT_EQ(p->circuit.components().size(), 4u);
  EXPECT_DOUBLE_EQ(p->comp("R1").value, 4.7);
  EXPECT_DOUBLE_EQ(p->comp("C1").value, 1e-9);
  EXPECT_DOUBLE_EQ(p->comp("L1").value, 10e-9); // value on the second continuation line
  EXPECT_EQ(p->pinNet("L1", "2"), "0");         // gnd is ground
  EXPECT_TRUE(p->circuit.netAt(p->circuit.findNet("gnd")).ground);
  // Location of a continued card: its first line, column of the name.
  EXPECT_EQ(p->comp("L1").where.line, 5u);
  EXPECT_EQ(p->comp("L1").where.column, 1u);
  // Names are case-insensitive: A and a are one net; r2 keeps its spelling.
  EXPECT_EQ(p->circuit.findNet("A"), p->circuit.findNet("a"));
  EXPECT_EQ(p->comp("R2").name, "r2");
  EXPECT_EQ(p->comp("r2").where.column, 2u); // after the tab
  EXPECT_EQ(p->circuit.findComponent("R9"), kNone); // after .end
  EXPECT_EQ(p->files.name(p->comp("R1").where.file), "deck.cir");
}

TEST(SpiceReader, DuplicateNamesFarApartAndAtTheEndOfABigDeck) {
  // Duplicates are found through hash buckets filled a few names behind the reader; pairs far
  // apart, adjacent, and among the last cards of the deck must all be reported, in deck order.
  std::string deck = "t\n";
  for (int i = 0; i < 5000; ++i) deck += "R" + std::to_string(i) + " n" + std::to_string(i) + " 0 1k\n";
  deck += "r3 a 0 1\n";      // line 5002, duplicates R3 (line 5)
  deck += "C7 a 0 1p\nc7 b 0 1p\n"; // lines 5003-5004
  auto p = parseText(deck);
  EXPECT_FALSE(p->ok);
  EXPECT_EQ(p->errors(), (std::vector<std::string>{
                             "deck.cir:5002:1: error: duplicate element name r3 (first at deck.cir:5:1)",
                             "deck.cir:5004:1: error: duplicate element name c7 (first at deck.cir:5003:1)"}));
  // Every net of the deck is found again, whatever its case.
  EXPECT_EQ(p->circuit.nets().size(), 5003u); // n0..n4999, ground, a, b
  for (int i = 0; i < 5000; i += 499) EXPECT_NE(p->circuit.findNet("N" + std::to_string(i)), kNone) << i;
  EXPECT_EQ(p->circuit.findNet("GND"), p->circuit.findNet("0"));
  EXPECT_EQ(p->circuit.findNet("n5000"), kNone);
}

TEST(SpiceReader, CrLfAndBom) {
  auto p = parseText("\xEF\xBB\xBFtitle\r\nR1 a b 10\r\n+ \r\nC1 a b 1u\r\n.end\r\n");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  EXPECT_EQ(p->circuit.title, "title");
  EXPECT_DOUBLE_EQ(p->comp("R1").value, 10.0);
  EXPECT_DOUBLE_EQ(p->comp("C1").value, 1e-6);
}

TEST(SpiceReader, ElementLettersAndPins) {
  auto p = parseText("kinds\n"
                     ".model NPN1 NPN\n"
                     ".model NCH NMOS(level=1)\n"
                     ".model VD VDMOS(vto=3)\n"
                     ".model SW1 SW(ron=1)\n"
                     ".model CSW1 CSW\n"
                     "D1 a k DMOD\n"
                     "Q1 c b e NPN1\n"
                     "Q2 c b e sub NPN1\n"
                     "Q3 c b e QUNKNOWN\n"
                     "Q4 c b e NPN1 2.0\n"
                     "M1 d g s b NCH L=1u W=10u\n"
                     "M2 d g s VD\n"
                     "J1 d g s JMOD\n"
                     "Z1 d g s ZMOD\n"
                     "S1 a b c d SW1\n"
                     "W1 a b Vsense CSW1\n"
                     "T1 a 0 b 0 Z0=50 TD=1n\n"
                     "V1 a 0 DC 15\n"
                     "V2 a 0 PULSE(0 5 0 1n 1n 1u 2u)\n"
                     "I1 a 0 1m\n"
                     "E1 o 0 a b 10\n"
                     "E2 o 0 POLY(2) a 0 b 0 0 1 1\n"
                     "E3 o 0 VALUE={V(a)*2}\n"
                     "G1 o 0 a b 1m\n"
                     "F1 o 0 V1 2\n"
                     "H1 o 0 V1 100\n"
                     "B1 o 0 V=V(a)*2\n"
                     "K1 L1 L2 0.95\n"
                     "L1 a 0 1u\n"
                     "L2 b 0 1u\n");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  const Circuit &c = p->circuit;
  auto pins = [&](std::string_view n) { return c.pinNames(p->comp(n)); };
  using V = std::vector<std::string>;
  EXPECT_EQ(p->comp("D1").kind, ElementKind::Diode);
  EXPECT_EQ(pins("D1"), (V{"a", "k"}));
  EXPECT_EQ(c.str(p->comp("D1").model), "DMOD");
  EXPECT_EQ(pins("Q1"), (V{"c", "b", "e"}));
  EXPECT_EQ(pins("Q2"), (V{"c", "b", "e", "s"})); // fourth word is no .model: substrate
  EXPECT_EQ(p->pinNet("Q2", "s"), "sub");
  EXPECT_EQ(pins("Q3"), (V{"c", "b", "e"})); // nothing after it: the model
  EXPECT_EQ(c.str(p->comp("Q3").model), "QUNKNOWN");
  EXPECT_EQ(pins("Q4"), (V{"c", "b", "e"})); // area factor after the model
  EXPECT_EQ(p->comp("M1").kind, ElementKind::Mosfet);
  EXPECT_EQ(pins("M1"), (V{"d", "g", "s", "b"}));
  EXPECT_EQ(c.str(p->comp("M1").model), "NCH");
  EXPECT_EQ(pins("M2"), (V{"d", "g", "s"})); // three-terminal when the 4th word is a .model
  EXPECT_EQ(p->comp("J1").kind, ElementKind::Jfet);
  EXPECT_EQ(p->comp("Z1").kind, ElementKind::Mesfet);
  EXPECT_EQ(pins("Z1"), (V{"d", "g", "s"}));
  EXPECT_EQ(p->comp("S1").kind, ElementKind::Switch);
  EXPECT_EQ(c.pins(p->comp("S1")).size(), 4u);
  EXPECT_EQ(c.pins(p->comp("W1")).size(), 2u);
  EXPECT_EQ(c.str(p->comp("W1").model), "CSW1");
  EXPECT_EQ(p->comp("T1").kind, ElementKind::TransmissionLine);
  EXPECT_EQ(c.pins(p->comp("T1")).size(), 4u);
  EXPECT_EQ(p->comp("V1").kind, ElementKind::VoltageSource);
  EXPECT_DOUBLE_EQ(p->comp("V1").value, 15.0); // DC value kept for reference
  EXPECT_FALSE(p->comp("V2").hasValue());
  EXPECT_EQ(p->comp("I1").kind, ElementKind::CurrentSource);
  EXPECT_EQ(c.pins(p->comp("E1")).size(), 4u);
  EXPECT_EQ(c.pins(p->comp("E2")).size(), 6u); // 2 + 2 x POLY(2)
  EXPECT_EQ(c.pins(p->comp("E3")).size(), 2u);
  EXPECT_EQ(p->comp("G1").kind, ElementKind::ControlledSource);
  EXPECT_EQ(c.pins(p->comp("F1")).size(), 2u);
  EXPECT_EQ(c.pins(p->comp("H1")).size(), 2u);
  EXPECT_EQ(p->comp("B1").kind, ElementKind::BehavioralSource);
  EXPECT_EQ(p->comp("K1").kind, ElementKind::Coupling);
  EXPECT_EQ(p->comp("K1").pinCount, 0);
  EXPECT_DOUBLE_EQ(p->comp("K1").value, 0.95);
  EXPECT_EQ(c.str(p->comp("K1").model), "L1 L2"); // the coupled inductors
}

TEST(SpiceReader, UnknownLettersAreGenericWithOneNotePerLetter) {
  auto p = parseText("sim specific\n"
                     "A1 [in1 in2] out dgate\n"
                     "A2 %vd(a b) out2 amodel\n"
                     "U1 x y z urc\n"
                     "U2 x y z urc\n"
                     "N1 p q nmodel\n");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  const Circuit &c = p->circuit;
  EXPECT_EQ(p->comp("A1").kind, ElementKind::Generic);
  EXPECT_EQ(c.pins(p->comp("A1")).size(), 3u);
  EXPECT_EQ(p->pinNet("A1", "1"), "in1");
  EXPECT_EQ(p->pinNet("A1", "3"), "out");
  EXPECT_EQ(c.str(p->comp("A1").model), "dgate");
  EXPECT_EQ(p->pinNet("A2", "1"), "a");
  EXPECT_EQ(c.pins(p->comp("A2")).size(), 3u);
  EXPECT_EQ(c.pins(p->comp("U2")).size(), 3u);
  auto notes = p->notes();
  ASSERT_EQ(notes.size(), 3u) << joined(notes); // A, U, N
  EXPECT_EQ(notes[0], "deck.cir:2:1: note: element A1: letter 'A' is not a SPICE 3 element; such "
                      "elements are kept as generic elements with their node words as pins (later "
                      "ones without a note)");
}

TEST(SpiceReader, IgnoredAndUnknownDotCards) {
  auto p = parseText("dots\n"
                     "R1 a 0 1\n"
                     ".tran 1n 1u\n.ac dec 10 1 1meg\n.op\n.options reltol=1e-4\n.option gmin=1e-12\n"
                     ".temp 25\n.ic v(a)=0\n.nodeset v(a)=0\n.save all\n.print tran v(a)\n"
                     ".plot v(a)\n.probe\n.meas tran x max v(a)\n.step param r 1 2 1\n"
                     ".width out=80\n.backanno\n.four 1k v(a)\n.noise v(a) V1 dec 10 1 1k\n"
                     ".control\nrun\n+ weird line\nR99 x y z\nplot v(a)\n.endc\n"
                     ".frobnicate 1 2\n.frobnicate 3\n"
                     "R2 a 0 2\n");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  EXPECT_EQ(p->circuit.components().size(), 2u); // nothing from the .control block
  auto notes = p->notes();
  ASSERT_EQ(notes.size(), 1u) << joined(notes);
  EXPECT_EQ(notes[0],
            "deck.cir:27:1: note: unknown dot card .frobnicate skipped (later ones without a note)");
}

// --- Values -------------------------------------------------------------------------------------------

TEST(SpiceReader, ValueForms) {
  auto p = parseText("values\n"
                     ".param rg=4.7 k=2\n"
                     "R1 a b {rg*k}\n"
                     "R2 a b 'rg/2'\n"
                     "R3 a b R=10k\n"
                     "R4 a b RMOD 22\n" // PSpice order: model, then value
                     "R5 a b rg\n"      // a parameter name without braces
                     "C1 a b C={1n*k}\n"
                     "L1 a b 1Mohm\n"
                     ".model RMOD RES(tc1=0.001)\n");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  EXPECT_DOUBLE_EQ(p->comp("R1").value, 9.4);
  EXPECT_DOUBLE_EQ(p->comp("R2").value, 2.35);
  EXPECT_DOUBLE_EQ(p->comp("R3").value, 10e3);
  EXPECT_DOUBLE_EQ(p->comp("R4").value, 22.0);
  EXPECT_EQ(p->circuit.str(p->comp("R4").model), "RMOD");
  EXPECT_DOUBLE_EQ(p->comp("R5").value, 4.7);
  EXPECT_DOUBLE_EQ(p->comp("C1").value, 2e-9);
  EXPECT_DOUBLE_EQ(p->comp("L1").value, 1e-3); // physics.md 6: Mohm is milli
}

TEST(SpiceReader, RkmValuesGetANote) {
  auto p = parseText("rkm\n"
                     "R1 a b 4k7\n"
                     "R2 a b 1M0\n"
                     "R3 a b R47\n"
                     "R4 a b 4R7\n"
                     "R5 a b 47R\n"
                     "R6 a b 10k0\n");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  EXPECT_DOUBLE_EQ(p->comp("R1").value, 4700.0); // IEC 60062 RKM code
  EXPECT_DOUBLE_EQ(p->comp("R2").value, 1e6);    // IEC 60062 RKM code
  EXPECT_DOUBLE_EQ(p->comp("R3").value, 0.47);   // IEC 60062 RKM code
  EXPECT_DOUBLE_EQ(p->comp("R4").value, 4.7);    // IEC 60062 RKM code
  EXPECT_DOUBLE_EQ(p->comp("R5").value, 47.0);   // physics.md 5.2: also 47 in SPICE
  auto notes = p->notes();
  ASSERT_EQ(notes.size(), 4u) << joined(notes); // not R5, not R6 (10k0 is 10000 either way)
  EXPECT_EQ(notes[0], "deck.cir:2:8: note: R1: value '4k7' read as 4700 (IEC 60062 RKM code); "
                      "SPICE simulators read it as 4000");
  EXPECT_EQ(notes[1], "deck.cir:3:8: note: R2: value '1M0' read as 1e6 (IEC 60062 RKM code); "
                      "SPICE simulators read it as 0.001");
  EXPECT_EQ(notes[2], "deck.cir:4:8: note: R3: value 'R47' read as 0.47 (IEC 60062 RKM code); "
                      "SPICE simulators reject it");
  EXPECT_EQ(notes[3], "deck.cir:5:8: note: R4: value '4R7' read as 4.7 (IEC 60062 RKM code); "
                      "SPICE simulators read it as 4");
}

// --- Parameters, subcircuits, hierarchy -------------------------------------------------------------

TEST(SpiceReader, SubcircuitParametersAndExpressions) {
  auto p = parseText("params\n"
                     ".param vdrv=15 rbase=2\n"
                     ".func par(a, b) = {a*b/(a+b)}\n"
                     ".param twice(x) = 2*x\n"
                     ".subckt stage in out params: ron=10 roff={ron/2}\n"
                     ".param rsum={ron+roff}\n"
                     "R1 in mid {ron}\n"
                     "R2 mid out {roff}\n"
                     "R3 in out {rsum}\n"
                     "R4 in out {par(ron, roff)}\n"
                     "R5 in out {rbase*vdrv}\n" // refers to deck parameters
                     ".param rsum=99 rsum={ron+roff}\n" // the later one counts
                     "R6 in out {twice(rsum)}\n"
                     ".ends stage\n"
                     "X1 a b stage\n"
                     "X2 a b stage ron=4\n"
                     "X3 a b stage params: ron={rbase*3} roff=1\n");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  EXPECT_DOUBLE_EQ(p->comp("X1.R1").value, 10.0);
  EXPECT_DOUBLE_EQ(p->comp("X1.R2").value, 5.0);
  EXPECT_DOUBLE_EQ(p->comp("X1.R3").value, 15.0);
  EXPECT_DOUBLE_EQ(p->comp("X1.R4").value, 50.0 / 15.0);
  EXPECT_DOUBLE_EQ(p->comp("X1.R5").value, 30.0);
  EXPECT_DOUBLE_EQ(p->comp("X1.R6").value, 30.0);
  EXPECT_DOUBLE_EQ(p->comp("X2.R1").value, 4.0); // instance overrides the default
  EXPECT_DOUBLE_EQ(p->comp("X2.R2").value, 2.0); // default evaluated with the override
  EXPECT_DOUBLE_EQ(p->comp("X3.R1").value, 6.0); // instance value from a deck parameter
  EXPECT_DOUBLE_EQ(p->comp("X3.R2").value, 1.0);
  EXPECT_DOUBLE_EQ(p->comp("X3.R3").value, 7.0);
}

TEST(SpiceReader, ParameterPrecedence) {
  // Decision (docs/spice-reader.md): instance value > .param in the body > .subckt default.
  auto p = parseText("precedence\n"
                     ".subckt s a params: r=1 q=7\n"
                     ".param r=5\n"
                     "R1 a 0 {r}\n"
                     "R2 a 0 {q}\n"
                     ".ends\n"
                     "X1 n s r=2\n"
                     "X2 n s\n");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  EXPECT_DOUBLE_EQ(p->comp("X1.R1").value, 2.0);
  EXPECT_DOUBLE_EQ(p->comp("X2.R1").value, 5.0);
  EXPECT_DOUBLE_EQ(p->comp("X2.R2").value, 7.0);
}

TEST(SpiceReader, IncludeInsideASubcircuitBody) {
  TempTree t;
  t.write("top.cir", "top\n.subckt cell a b\n.include body.inc\n.ends\nX1 n1 n2 cell\n");
  t.write("body.inc", "R1 a m 1\nR2 m b 2\n");
  auto p = t.read("top.cir");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  EXPECT_EQ(p->pinNet("X1.R1", "2"), "X1.m");
  EXPECT_EQ(p->files.name(p->comp("X1.R2").where.file), "body.inc");
}

TEST(SpiceReader, NestedParametersSeeTheirParent) {
  auto p = parseText("nested params\n"
                     ".subckt inner a params: r=1\n"
                     "R1 a 0 {r*g}\n"
                     ".ends\n"
                     ".subckt outer a params: g=3\n"
                     "XI a inner r={g*2}\n"
                     ".ends\n"
                     "XO n outer g=5\n");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  EXPECT_DOUBLE_EQ(p->comp("XO.XI.R1").value, 50.0); // r = 2*g = 10, times g = 5 of the parent
}

TEST(SpiceReader, HierarchyNamesNetsAndParents) {
  auto p = parseText("hierarchy\n"
                     ".global vcc\n"
                     ".subckt half in out kel\n"
                     "XH in gate kel clamp\n"
                     "R5 gate out 1\n"
                     "C1 vcc 0 1u\n"
                     ".subckt clamp a b c\n" // nested definition, local to half
                     "R5 a b 10k\n"
                     "R6 b GATE 1\n"
                     ".ends clamp\n"
                     ".ends half\n"
                     "X1 drv sw 0 half\n");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  const Circuit &c = p->circuit;
  // Order: X1, X1.XH (before its contents), X1.XH.R5, X1.XH.R6, X1.R5, X1.C1.
  ASSERT_EQ(c.components().size(), 6u);
  EXPECT_EQ(c.component(0).name, "X1");
  EXPECT_EQ(c.component(0).kind, ElementKind::Subcircuit);
  EXPECT_EQ(c.str(c.component(0).model), "half");
  EXPECT_EQ(c.pinNames(c.component(0)), (std::vector<std::string>{"in", "out", "kel"}));
  EXPECT_EQ(c.component(0).parent, kNone);
  EXPECT_EQ(c.component(1).name, "X1.XH");
  EXPECT_EQ(c.component(1).parent, 0u);
  EXPECT_EQ(c.component(2).name, "X1.XH.R5");
  EXPECT_EQ(c.component(2).parent, 1u);
  EXPECT_EQ(c.component(4).name, "X1.R5");
  EXPECT_EQ(c.component(4).parent, 0u);
  // Ports take the outer net; internal nets are prefixed; ground and globals keep their names.
  EXPECT_EQ(p->pinNet("X1.XH.R5", "1"), "drv");
  EXPECT_EQ(p->pinNet("X1.XH.R5", "2"), "X1.gate");
  EXPECT_EQ(p->pinNet("X1.XH.R6", "2"), "X1.XH.GATE");
  EXPECT_EQ(p->pinNet("X1.R5", "2"), "sw");
  EXPECT_EQ(p->pinNet("X1.XH", "c"), "0");
  EXPECT_EQ(p->pinNet("X1.C1", "1"), "vcc");
  EXPECT_TRUE(c.netAt(c.findNet("vcc")).global);
  EXPECT_EQ(p->pinNet("X1.C1", "2"), "0");
  // Flattened elements point at their definition line.
  EXPECT_EQ(p->comp("X1.XH.R6").where.line, 9u);
}

TEST(SpiceReader, UndefinedSubcircuitIsABlackBox) {
  auto p = parseText("vendor\nXU1 in out vcc 0 VENDOR_DRIVER gain=2\n");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  const Component &x = p->comp("XU1");
  EXPECT_EQ(x.kind, ElementKind::Subcircuit);
  EXPECT_EQ(p->circuit.pinNames(x), (std::vector<std::string>{"1", "2", "3", "4"}));
  EXPECT_EQ(p->circuit.str(x.model), "VENDOR_DRIVER");
  auto notes = p->notes();
  ASSERT_EQ(notes.size(), 1u);
  EXPECT_EQ(notes[0],
            "deck.cir:2:1: note: subcircuit VENDOR_DRIVER is not defined; XU1 kept as a black box");
}

// --- Includes and libraries ---------------------------------------------------------------------------

TEST(SpiceReader, IncludesRelativeToTheIncludingFile) {
  TempTree t;
  t.write("top.cir", "top\n.include sub/a.inc\n.inc \"sub/b c.inc\"\nR1 n1 0 1\n");
  t.write("sub/a.inc", "* included\n.include deeper/d.inc\nR2 n2 0 2\n");
  t.write("sub/deeper/d.inc", "R3 n3 0 3\n.end\nR4 never 0 4\n");
  t.write("sub/b c.inc", "R5 n5 0 5\n");
  auto p = t.read("top.cir");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  EXPECT_EQ(p->circuit.components().size(), 4u);
  EXPECT_EQ(p->files.name(p->comp("R3").where.file), "sub/deeper/d.inc");
  EXPECT_EQ(p->comp("R3").where.line, 1u);
  EXPECT_EQ(p->files.name(p->comp("R1").where.file), "top.cir");
  EXPECT_EQ(p->circuit.findComponent("R4"), kNone); // .end stops only that file
  EXPECT_DOUBLE_EQ(p->comp("R5").value, 5.0);
}

TEST(SpiceReader, LibSections) {
  TempTree t;
  t.write("top.cir", "top\n.lib models/corners.lib typ\nXM1 d g s sw\n"
                     ".lib fast\nRfast a 0 1\n.endl fast\n"
                     ".lib slowest\nRslowest a 0 1\n.endl slowest\n"
                     ".lib top.cir slowest\n");
  t.write("models/corners.lib", "* corner library\n"
                                ".lib slow\n.subckt sw d g s\nRg g x 9\n.ends\n.endl slow\n"
                                ".lib typ\n.lib 'corners.lib' common\n.subckt sw d g s\nRg g x 4\n.ends\n.endl typ\n"
                                ".lib common\n.model NSW NMOS\n.endl common\n");
  auto p = t.read("top.cir");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  EXPECT_DOUBLE_EQ(p->comp("XM1.Rg").value, 4.0); // from section typ, not slow
  // `.lib fast` in the deck itself opens a section: not read unless asked for...
  EXPECT_EQ(p->circuit.findComponent("Rfast"), kNone);
  // ...as the last card does for section slowest of the same file.
  EXPECT_NE(p->circuit.findComponent("Rslowest"), kNone);
}

TEST(SpiceReader, LibSectionNotFound) {
  TempTree t;
  t.write("top.cir", "top\n.lib lib.lib nosuch\n");
  t.write("lib.lib", ".lib typ\nR1 a b 1\n.endl\n");
  auto p = t.read("top.cir");
  EXPECT_FALSE(p->ok);
  EXPECT_EQ(p->errors(),
            std::vector<std::string>{"top.cir:2:14: error: section nosuch not found in lib.lib"});
}

TEST(SpiceReader, LtspiceStyleWholeFileLib) {
  TempTree t;
  t.write("top.cir", "top\n.lib parts.lib\nXQ1 c g e IGBT_X\n");
  t.write("parts.lib", ".subckt IGBT_X c g e\nRg g gi 2\n.ends\n");
  auto p = t.read("top.cir");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  EXPECT_DOUBLE_EQ(p->comp("XQ1.Rg").value, 2.0);
}

// --- Limits ------------------------------------------------------------------------------------------

TEST(SpiceReaderLimits, IncludeCycleReportsTheChain) {
  TempTree t;
  t.write("top.cir", "top\n.include a.inc\n");
  t.write("a.inc", ".include b.inc\n");
  t.write("b.inc", "R1 x 0 1\n.include a.inc\n");
  auto p = t.read("top.cir");
  EXPECT_FALSE(p->ok);
  EXPECT_EQ(p->errors(), std::vector<std::string>{
                             "b.inc:2:10: error: include cycle: a.inc -> b.inc -> a.inc"});
}

TEST(SpiceReaderLimits, IncludeDepth) {
  TempTree t;
  t.write("top.cir", "top\n.include i0.inc\n");
  for (int i = 0; i < 40; ++i)
    t.write("i" + std::to_string(i) + ".inc", ".include i" + std::to_string(i + 1) + ".inc\n");
  t.write("i40.inc", "R1 a 0 1\n");
  auto p = t.read("top.cir");
  EXPECT_FALSE(p->ok);
  EXPECT_EQ(p->errors(), std::vector<std::string>{
                             "i31.inc:1:10: error: includes nested more than 32 levels deep"});
  SpiceReadOptions deep;
  deep.maxIncludeDepth = 64;
  auto q = t.read("top.cir", deep);
  EXPECT_TRUE(q->ok) << joined(q->errors());
}

TEST(SpiceReaderLimits, OutsideTheProjectRoot) {
  TempTree t;
  t.write("outside.inc", "R9 a 0 1\n");
  t.write("proj/top.cir", "top\n.include ../outside.inc\n");
  SpiceReadOptions o;
  o.projectRoot = (t.root() / "proj").string();
  auto p = t.read("proj/top.cir", o);
  EXPECT_FALSE(p->ok);
  ASSERT_EQ(p->errors().size(), 1u);
  EXPECT_EQ(p->errors()[0], "top.cir:2:10: error: '../outside.inc' is outside the project root " +
                                fs::weakly_canonical(t.root() / "proj").generic_string() +
                                " (allow with --allow-outside-root)");
  o.allowOutsideRoot = true;
  auto q = t.read("proj/top.cir", o);
  EXPECT_TRUE(q->ok) << joined(q->errors());
  EXPECT_EQ(q->circuit.components().size(), 1u);
}

TEST(SpiceReaderLimits, MissingAndUnreadableFiles) {
  TempTree t;
  t.write("top.cir", "top\n.include nothere.inc\n.include sub\n");
  fs::create_directories(t.root() / "sub");
  auto p = t.read("top.cir");
  EXPECT_FALSE(p->ok);
  EXPECT_EQ(p->errors(), (std::vector<std::string>{
                             "top.cir:2:10: error: cannot open 'nothere.inc': no such file",
                             "top.cir:3:10: error: cannot read 'sub': not a regular file"}));
  auto q = t.read("missing.cir");
  EXPECT_FALSE(q->ok);
  EXPECT_EQ(q->errors(), std::vector<std::string>{
                             "missing.cir: error: cannot open 'missing.cir': no such file"});
}

TEST(SpiceReaderLimits, DeviceFilesAreNotRead) {
  // A device such as /dev/zero would never end; only regular files are read.
  SpiceReadOptions o;
  o.allowOutsideRoot = true;
  auto p = parseText("dev\n.include /dev/zero\n", o);
  EXPECT_FALSE(p->ok);
  EXPECT_EQ(p->errors(), std::vector<std::string>{
                             "deck.cir:2:10: error: cannot read '/dev/zero': not a regular file"});
}

TEST(SpiceReaderLimits, BinaryAndNonUtf8Files) {
  TempTree t;
  t.write("top.cir", "top\n.include bin.inc\n.include latin1.inc\n");
  t.write("bin.inc", std::string("R1 a 0 1\nR2 \0\x01\x02 b", 18));
  t.write("latin1.inc", "R3 a 0 1\n* 10 \xB5" "F\n");
  auto p = t.read("top.cir");
  EXPECT_FALSE(p->ok);
  EXPECT_EQ(p->errors(),
            (std::vector<std::string>{
                "bin.inc:2:4: error: file contains a NUL byte (a binary file, not a SPICE deck)",
                "latin1.inc:2:6: error: file is not UTF-8 text (byte 0xB5)"}));
}

TEST(SpiceReaderLimits, SubcircuitRecursion) {
  auto direct = parseText("rec\n.subckt a p\nR1 p 0 1\nX1 p a\n.ends\nX1 n a\n");
  EXPECT_FALSE(direct->ok);
  EXPECT_EQ(direct->errors(),
            std::vector<std::string>{
                "deck.cir:4:1: error: subcircuit recursion: a -> a (X1 instantiates a)"});
  auto indirect = parseText("rec\n.subckt a p\nXB p b\n.ends\n.subckt b p\nXC p c\n.ends\n"
                            ".subckt c p\nXA p a\n.ends\nX1 n a\n");
  EXPECT_FALSE(indirect->ok);
  EXPECT_EQ(indirect->errors(),
            std::vector<std::string>{
                "deck.cir:9:1: error: subcircuit recursion: a -> b -> c -> a (XA instantiates a)"});
}

TEST(SpiceReaderLimits, NestingDepth) {
  // 1100 levels, each instantiating the one below once: the depth-first expansion would need a
  // deep stack, so nesting beyond 1000 levels is refused, in either definition order.
  std::string up = "deep\n.subckt l0 a\nR1 a 0 1\n.ends\n";
  for (int i = 1; i < 1100; ++i)
    up += ".subckt l" + std::to_string(i) + " a\nX1 a l" + std::to_string(i - 1) + "\n.ends\n";
  up += "Xtop n l1099\n";
  auto p = parseText(up);
  EXPECT_FALSE(p->ok);
  EXPECT_EQ(p->errors(), std::vector<std::string>{"deck.cir:3002:9: error: subcircuit l1000 nests "
                                                  "subcircuits more than 1000 levels deep"});
  EXPECT_EQ(p->circuit.components().size(), 1u); // Xtop only, not expanded

  std::string down = "deep\n";
  for (int i = 1099; i >= 1; --i)
    down += ".subckt l" + std::to_string(i) + " a\nX1 a l" + std::to_string(i - 1) + "\n.ends\n";
  down += ".subckt l0 a\nR1 a 0 1\n.ends\nXtop n l1099\n";
  auto q = parseText(down);
  EXPECT_FALSE(q->ok);
  ASSERT_EQ(q->errors().size(), 1u) << joined(q->errors());
  EXPECT_NE(q->errors()[0].find("nests subcircuits more than 1000 levels deep"), std::string::npos);

  // 990 levels are fine.
  std::string fine = "deep\n.subckt l0 a\nR1 a 0 1\n.ends\n";
  for (int i = 1; i < 990; ++i)
    fine += ".subckt l" + std::to_string(i) + " a\nX1 a l" + std::to_string(i - 1) + "\n.ends\n";
  fine += "Xtop n l989\n";
  auto r = parseText(fine);
  EXPECT_TRUE(r->ok) << joined(r->errors());
  EXPECT_EQ(r->circuit.components().size(), 991u);
}

TEST(SpiceReaderLimits, LongParameterChains) {
  auto chain = [](int n) {
    std::string d = "chain\n";
    for (int i = 0; i < n; ++i)
      d += ".param a" + std::to_string(i) + "={a" + std::to_string(i + 1) + "+1}\n";
    d += ".param a" + std::to_string(n) + "=0\nR1 x 0 {a0}\n";
    return d;
  };
  auto ok = parseText(chain(150));
  ASSERT_TRUE(ok->ok) << joined(ok->errors());
  EXPECT_DOUBLE_EQ(ok->comp("R1").value, 150.0);
  auto deep = parseText(chain(20000)); // would exhaust the stack if followed to the end
  EXPECT_FALSE(deep->ok);
  ASSERT_EQ(deep->errors().size(), 1u) << joined(deep->errors());
  EXPECT_EQ(deep->errors()[0], "deck.cir:202:8: error: parameter a200 is defined through more "
                               "than 200 other parameters");
}

TEST(SpiceReaderLimits, SubcircuitBombIsRefusedWithoutExpanding) {
  // 9 levels above a one-resistor cell, each instantiating the level below 10 times: about 2e9
  // elements if expanded (10^9 resistors plus the instances).
  std::string deck = "bomb\n.subckt l0 a\nR1 a 0 1\n.ends\n";
  for (int i = 1; i <= 9; ++i) {
    deck += ".subckt l" + std::to_string(i) + " a\n";
    for (int k = 0; k < 10; ++k)
      deck += "X" + std::to_string(k) + " a l" + std::to_string(i - 1) + "\n";
    deck += ".ends\n";
  }
  deck += "Xtop n l9\n";
  auto start = std::chrono::steady_clock::now();
  auto p = parseText(deck);
  double seconds =
      std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  EXPECT_LT(seconds, 0.5);
  EXPECT_FALSE(p->ok);
  EXPECT_EQ(p->errors(), std::vector<std::string>{
                             "deck.cir:113:1: error: Xtop would add 2111111111 elements (subcircuit "
                             "l9 flattened), over the limit of 5000000 elements"});
  EXPECT_EQ(p->circuit.components().size(), 0u);
  // A smaller limit applies to plain elements as well.
  SpiceReadOptions small;
  small.maxElements = 3;
  auto q = parseText("flat\nR1 a 0 1\nR2 a 0 1\nR3 a 0 1\nR4 a 0 1\nR5 a 0 1\n", small);
  EXPECT_FALSE(q->ok);
  EXPECT_EQ(q->errors(), std::vector<std::string>{"deck.cir:5:1: error: the deck has more than 3 "
                                                  "elements (the limit); the rest is not read"});
}

// --- Malformed input: exact messages with file:line:column ----------------------------------------

struct BadDeck {
  const char *name;
  const char *text;
  const char *message;
};

class SpiceReaderMalformed : public ::testing::TestWithParam<BadDeck> {};

TEST_P(SpiceReaderMalformed, ReportsFileLineColumn) {
  const BadDeck &b = GetParam();
  auto p = parseText(b.text);
  EXPECT_FALSE(p->ok);
  ASSERT_FALSE(p->errors().empty());
  EXPECT_EQ(p->errors()[0], b.message);
}

INSTANTIATE_TEST_SUITE_P(
    Cases, SpiceReaderMalformed,
    ::testing::Values(
        BadDeck{"TooFewNodes", "t\nR1 a\n",
                "deck.cir:2:1: error: too few nodes for resistor R1: expected 2, got 1"},
        BadDeck{"TooFewMosfetNodes", "t\nM1 d g s\n",
                "deck.cir:2:1: error: too few nodes for MOSFET M1: expected 4 plus a model name, got 3"},
        BadDeck{"MissingValue", "t\nC7 a b\n", "deck.cir:2:1: error: missing value for capacitor C7"},
        BadDeck{"UnparsableValue", "t\nR1 a b 4.7k7\n",
                "deck.cir:2:8: error: cannot read value '4.7k7' of resistor R1"},
        BadDeck{"DecimalComma", "t\nR1 a b 4,7\n",
                "deck.cir:2:10: error: unexpected second value '7' for R1 (a decimal comma? SPICE "
                "separates fields with commas)"},
        BadDeck{"UnterminatedBrace", "t\nR1 a b {rg*2\n",
                "deck.cir:2:8: error: unterminated '{' (no closing '}')"},
        BadDeck{"UnterminatedQuote", "t\nR1 a b 'rg*2\n",
                "deck.cir:2:8: error: unterminated quoted expression (no closing ')"},
        BadDeck{"UnknownParameter", "t\n.param rg=1\nR1 a b {rgate*2}\n",
                "deck.cir:3:9: error: unknown parameter rgate in value of R1 = {rgate*2}"},
        BadDeck{"DivisionByZero", "t\n.param a=1 b=1\nR1 x y {1/(a-b)}\n",
                "deck.cir:3:10: error: division by zero in value of R1 = {1/(a-b)}"},
        BadDeck{"ParamDivisionByZero", "t\n.param z = {1/0}\nR1 x y {z}\n",
                "deck.cir:2:14: error: division by zero in .param z = {1/0}"},
        BadDeck{"ParamCycle", "t\n.param a={b+1} b={a*2}\nR1 x y {a}\n",
                "deck.cir:2:8: error: parameter a depends on itself"},
        BadDeck{"EndsWithoutSubckt", "t\nR1 a b 1\n.ends\n",
                "deck.cir:3:1: error: .ends without .subckt"},
        BadDeck{"SubcktWithoutEnds", "t\n.subckt drv in out\nR1 in out 1\n",
                "deck.cir:2:9: error: subcircuit drv has no .ends"},
        BadDeck{"DuplicateSubckt", "t\n.subckt s a\n.ends\n.SUBCKT S a\n.ends\n",
                "deck.cir:4:9: error: subcircuit S is defined twice (first at deck.cir:2:9)"},
        BadDeck{"WrongPortCount", "t\n.subckt s a b\nR1 a b 1\n.ends\nX1 n1 n2 n3 s\n",
                "deck.cir:5:1: error: X1 connects 3 nodes but subcircuit s has 2 ports (defined at "
                "deck.cir:2:9)"},
        BadDeck{"OrphanContinuation", "t\n+ R1 a b 1\n",
                "deck.cir:2:1: error: continuation line '+' with no card before it"},
        BadDeck{"DuplicateName", "t\nR1 a b 1\nC1 a b 1p\nr1 c d 2\n",
                "deck.cir:4:1: error: duplicate element name r1 (first at deck.cir:2:1)"},
        BadDeck{"DuplicateNameInSubckt", "t\n.subckt s a\nR1 a 0 1\n  R1 a 0 2\n.ends\n",
                "deck.cir:4:3: error: duplicate element name R1 in subcircuit s (first at "
                "deck.cir:3:1)"},
        BadDeck{"NotACard", "t\n12 a b\n",
                "deck.cir:2:1: error: '12' is not a SPICE card (element names start with a letter)"},
        BadDeck{"EqualsWithoutName", "t\nX1 a b sub = 2 = 3\n.subckt sub a b\n.ends\n",
                "deck.cir:2:16: error: '=' without a name before it"},
        BadDeck{"CouplingNotInductor", "t\nK1 L1 C1 0.9\n",
                "deck.cir:2:7: error: coupling K1 names C1, which is not an inductor"},
        BadDeck{"ParamWithoutValue", "t\n.param rg=\n",
                "deck.cir:2:10: error: missing value after 'rg='"},
        BadDeck{"ModelWithoutType", "t\n.model NSW\n",
                "deck.cir:2:8: error: missing model type after .model NSW"},
        BadDeck{"MalformedFunc", "t\n.func f = {1}\n",
                "deck.cir:2:7: error: malformed function definition (no argument list); expected "
                "name(arg, ...) = {expression}"},
        BadDeck{"MissingInclude", "t\n.include \"no such.inc\"\n",
                "deck.cir:2:10: error: cannot open 'no such.inc': no such file"},
        BadDeck{"BadPoly", "t\nE1 o 0 POLY(x) a b 1\n",
                "deck.cir:2:8: error: cannot read POLY dimension of E1"}),
    [](const ::testing::TestParamInfo<BadDeck> &i) { return std::string(i.param.name); });

TEST(SpiceReader, ReportsAllErrorsNotOnlyTheFirst) {
  auto p = parseText("many\nR1 a\nR2 a b 1\nC1 a b\nR3 a b {nope}\n.ends\nL1 a b 1..2\n");
  EXPECT_FALSE(p->ok);
  EXPECT_EQ(p->errors().size(), 5u) << joined(p->errors());
  EXPECT_EQ(p->circuit.findComponent("R2") != kNone, true); // good cards still read
}

TEST(SpiceReader, ErrorCountIsCapped) {
  std::string deck = "capped\n";
  for (int i = 0; i < 500; ++i) deck += "R" + std::to_string(i) + " a\n";
  auto p = parseText(deck);
  EXPECT_FALSE(p->ok);
  auto errors = p->errors();
  ASSERT_EQ(errors.size(), 101u);
  EXPECT_EQ(errors.back(), "deck.cir:102:1: error: too many errors (100); reading stopped");
}

TEST(SpiceReader, InstanceParameterNotDeclaredGetsANote) {
  auto p = parseText("t\n.subckt s a params: r=1\nR1 a 0 {r}\n.ends\nX1 n s rr=2\n");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  EXPECT_EQ(p->notes(), std::vector<std::string>{
                            "deck.cir:5:8: note: X1 sets parameter rr, which subcircuit s does not "
                            "declare"});
  EXPECT_DOUBLE_EQ(p->comp("X1.R1").value, 1.0);
}

TEST(SpiceReader, ExpressionSpanningAContinuation) {
  auto p = parseText("t\n.param a=2\nR1 x y {a *\n+ 3}\n");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  EXPECT_DOUBLE_EQ(p->comp("R1").value, 6.0);
}

TEST(SpiceReader, TitleThatLooksLikeACard) {
  auto p = parseText(".subckt x a\nR1 a 0 1\n");
  ASSERT_TRUE(p->ok) << joined(p->errors());
  EXPECT_EQ(p->notes(), std::vector<std::string>{
                            "deck.cir:1:1: note: the first line of a deck is its title, so '.subckt "
                            "x a' is not read as a card"});
}
