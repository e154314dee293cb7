/// \file
/// Tests of the neutral XML netlist reader (spec 4.2): the spec's example, and bad input checked
/// by the exact message with line and column.

#include "netlist-io/xml_netlist_reader.h"

#include <gtest/gtest.h>

#include <string>
#include <vector>

namespace gateloop {
namespace {

struct XmlResult {
  bool ok = false;
  Circuit circuit;
  FileTable files;
  InputDiagnostics diags;
  std::vector<std::string> messages;
};

XmlResult readText(const std::string &text) {
  XmlResult r;
  r.ok = readXmlNetlistText(text, "board.xml", r.files, r.circuit, r.diags);
  for (const auto &d : r.diags.items()) r.messages.push_back(formatDiagnostic(d, r.files));
  return r;
}

std::vector<std::string> pinNetNames(const Circuit &c, const Component &comp) {
  std::vector<std::string> out;
  for (NetId n : c.pins(comp)) out.emplace_back(c.netAt(n).name);
  return out;
}

TEST(XmlNetlist, SpecExampleLoads) {
  Circuit circuit;
  FileTable files;
  InputDiagnostics diags;
  ASSERT_TRUE(readXmlNetlist(std::string(GATELOOP_TEST_DATA) + "/inputs/xml/spec_example.xml", files, circuit, diags));
  EXPECT_TRUE(diags.items().empty());
  EXPECT_EQ(circuit.title, "drive-board-b");
  ASSERT_EQ(circuit.components().size(), 3u);

  const Component &u3 = circuit.component(circuit.findComponent("U3"));
  EXPECT_EQ(u3.kind, ElementKind::Generic); // no type: the part decides
  EXPECT_EQ(circuit.str(u3.partHint), "DRV-ISO-4A");
  EXPECT_EQ(circuit.pinNames(u3), (std::vector<std::string>{"OUTH", "OUTL", "VEE"}));
  EXPECT_EQ(pinNetNames(circuit, u3), (std::vector<std::string>{"GH_A", "GL_A", "KE_A"}));
  EXPECT_EQ(u3.where.line, 2u);
  EXPECT_EQ(u3.where.column, 3u);
  EXPECT_FALSE(u3.hasValue());

  const Component &r12 = circuit.component(circuit.findComponent("R12"));
  EXPECT_EQ(r12.kind, ElementKind::Resistor);
  EXPECT_DOUBLE_EQ(r12.value, 4.7);
  EXPECT_EQ(circuit.str(r12.partHint), "RES-0603-TF");
  EXPECT_EQ(r12.where.line, 5u);

  const Component &q1 = circuit.component(circuit.findComponent("Q1"));
  EXPECT_EQ(circuit.pinNet(q1, "KE"), circuit.findNet("KE_A"));
  EXPECT_EQ(circuit.pinNet(q1, "C"), circuit.findNet("DC_P"));
  EXPECT_EQ(q1.where.line, 8u);
  // The net R12 and U3 share is one net, first seen at U3's OUTH pin (line 3).
  EXPECT_EQ(circuit.pinNet(r12, "1"), circuit.pinNet(u3, "OUTH"));
  EXPECT_EQ(circuit.netAt(circuit.findNet("GH_A")).where.line, 3u);
  EXPECT_EQ(circuit.nets().size(), 6u);
}

TEST(XmlNetlist, TypesAndSpiceValues) {
  auto r = readText(R"(<?xml version="1.0" encoding="UTF-8"?>
<netlist name="t">
  <component ref="C1" type="C" value="2.2n"><pin name="1" net="A"/><pin name="2" net="B"/></component>
  <component ref="L1" type="L" value="10u"><pin name="1" net="A"/><pin name="2" net="B"/></component>
  <component ref="D1" type="D"><pin name="A" net="A"/><pin name="K" net="B"/></component>
  <component ref="Z1" type="z"><pin name="A" net="A"/><pin name="K" net="B"/></component>
  <component ref="T1" type="TVS"><pin name="1" net="A"/><pin name="2" net="B"/></component>
  <component ref="FB1" type="FB" value="0.05"><pin name="1" net="A"/><pin name="2" net="B"/></component>
  <component ref="R1" type="R" value="4k7"><pin name="1" net="A"/><pin name="2" net="gnd"/></component>
  <component ref="R2" type="R" value="10MEG"><pin name="1" net="A"/><pin name="2" net="0"/></component>
</netlist>)");
  ASSERT_TRUE(r.ok) << ::testing::PrintToString(r.messages);
  EXPECT_TRUE(r.messages.empty());
  const Circuit &c = r.circuit;
  EXPECT_EQ(c.component(c.findComponent("C1")).kind, ElementKind::Capacitor);
  EXPECT_DOUBLE_EQ(c.component(c.findComponent("C1")).value, 2.2e-9);
  EXPECT_EQ(c.component(c.findComponent("L1")).kind, ElementKind::Inductor);
  EXPECT_DOUBLE_EQ(c.component(c.findComponent("L1")).value, 10e-6);
  EXPECT_EQ(c.component(c.findComponent("D1")).kind, ElementKind::Diode);
  EXPECT_EQ(c.component(c.findComponent("Z1")).kind, ElementKind::Zener);
  EXPECT_EQ(c.component(c.findComponent("T1")).kind, ElementKind::Tvs);
  EXPECT_EQ(c.component(c.findComponent("FB1")).kind, ElementKind::Ferrite);
  // SPICE value syntax: RKM code 4k7 = 4700 (IEC 60062), MEG = 1e6.
  EXPECT_DOUBLE_EQ(c.component(c.findComponent("R1")).value, 4700.0);
  EXPECT_DOUBLE_EQ(c.component(c.findComponent("R2")).value, 10e6);
  // "gnd" and "0" are the ground net.
  EXPECT_TRUE(c.netAt(c.pinNet(c.component(c.findComponent("R1")), "2")).ground);
  EXPECT_EQ(c.pinNet(c.component(c.findComponent("R1")), "2"), c.pinNet(c.component(c.findComponent("R2")), "2"));
}

TEST(XmlNetlist, SyntaxErrorHasLineAndColumn) {
  auto r = readText("<netlist name=\"x\">\n  <component ref=\"R1\">\n    <pin name=\"1\" net=\"A\">\n  </component>\n</netlist>\n");
  EXPECT_FALSE(r.ok);
  ASSERT_EQ(r.messages.size(), 1u);
  EXPECT_EQ(r.messages[0], "board.xml:4:5: error: XML syntax error: end tag does not match the open element, or "
                           "an element is not closed");
}

TEST(XmlNetlist, MalformedAttribute) {
  auto r = readText("<netlist>\n  <component ref=R1/>\n</netlist>\n");
  ASSERT_EQ(r.messages.size(), 1u);
  EXPECT_EQ(r.messages[0], "board.xml:2:18: error: XML syntax error: malformed attribute");
}

TEST(XmlNetlist, EmptyDocument) {
  auto r = readText("<?xml version=\"1.0\"?>\n");
  ASSERT_EQ(r.messages.size(), 1u);
  EXPECT_EQ(r.messages[0], "board.xml:1:22: error: XML syntax error: no element in the document");
}

TEST(XmlNetlist, WrongRootAndVersion) {
  auto r = readText("<?xml version=\"1.0\"?>\n<design>\n</design>\n");
  EXPECT_FALSE(r.ok);
  ASSERT_EQ(r.messages.size(), 1u);
  EXPECT_EQ(r.messages[0], "board.xml:2:1: error: expected root element <netlist>, got <design>");

  r = readText("<netlist name=\"x\" version=\"2\">\n  <component ref=\"R1\"/>\n</netlist>\n");
  EXPECT_FALSE(r.ok);
  ASSERT_EQ(r.messages.size(), 1u);
  EXPECT_EQ(r.messages[0], "board.xml:1:1: error: unsupported netlist version \"2\" (this reader knows version 1)");
  EXPECT_TRUE(r.circuit.components().empty());
}

TEST(XmlNetlist, AllComponentErrorsAreReported) {
  auto r = readText(R"(<netlist name="x" version="1">
  <component part="P1"><pin name="1" net="A"/></component>
  <component ref="R1" type="R" value="4.7"><pin name="1" net="A"/><pin name="2" net="B"/></component>
  <component ref="r1" type="R" value="1k"><pin name="1" net="A"/></component>
  <component ref="R2" type="RES" value="abc">
    <pin name="1" net="A"/>
    <pin net="B"/>
    <pin name="2"/>
    <pin name="1" net="C"/>
  </component>
</netlist>
)");
  EXPECT_FALSE(r.ok);
  ASSERT_EQ(r.messages.size(), 7u) << ::testing::PrintToString(r.messages);
  EXPECT_EQ(r.messages[0], "board.xml:2:3: error: component without a \"ref\" attribute");
  EXPECT_EQ(r.messages[1], "board.xml:4:3: error: duplicate ref \"r1\" (first defined at line 3)");
  EXPECT_EQ(r.messages[2], "board.xml:5:3: error: unknown type \"RES\" on R2 (expected R, C, L, D, Z, TVS or FB, or no type)");
  EXPECT_EQ(r.messages[3], "board.xml:5:3: error: bad value \"abc\" on R2 (expected a SPICE value such as 4.7, 10k or 2.2n)");
  EXPECT_EQ(r.messages[4], "board.xml:7:5: error: pin of R2 without a \"name\" attribute");
  EXPECT_EQ(r.messages[5], "board.xml:8:5: error: pin 2 of R2 without a \"net\" attribute");
  EXPECT_EQ(r.messages[6], "board.xml:9:5: error: pin 1 appears twice on R2");
  // R1 and R2 are kept (with their good pins) so later stages see what can be seen.
  ASSERT_EQ(r.circuit.components().size(), 2u);
  EXPECT_EQ(r.circuit.components()[1].pinCount, 1u);
}

TEST(XmlNetlist, UnknownElementsAndAttributesWarn) {
  auto r = readText(R"(<netlist name="x" version="1">
  <meta tool="export-script"/>
  <component ref="R1" type="R" vaule="4.7" footprint="0603">
    <pin name="1" net="A" side="top"/>
    <pad name="2"/>
  </component>
</netlist>
)");
  EXPECT_TRUE(r.ok); // warnings only
  ASSERT_EQ(r.messages.size(), 5u) << ::testing::PrintToString(r.messages);
  EXPECT_EQ(r.messages[0], "board.xml:2:3: warning: element <meta> is not part of the netlist format and is ignored");
  EXPECT_EQ(r.messages[1], "board.xml:3:3: warning: attribute \"vaule\" on <component> is not part of the format and is ignored");
  EXPECT_EQ(r.messages[2], "board.xml:3:3: warning: attribute \"footprint\" on <component> is not part of the format and is ignored");
  EXPECT_EQ(r.messages[3], "board.xml:4:5: warning: attribute \"side\" on <pin> is not part of the format and is ignored");
  EXPECT_EQ(r.messages[4], "board.xml:5:5: warning: element <pad> inside <component> is not part of the format and is ignored");
}

TEST(XmlNetlist, SecondRootElement) {
  auto r = readText("<netlist version=\"1\"/>\n<netlist version=\"1\"/>\n");
  EXPECT_FALSE(r.ok);
  ASSERT_EQ(r.messages.size(), 1u);
  EXPECT_EQ(r.messages[0], "board.xml:2:1: error: more than one root element");
}

TEST(XmlNetlist, CrLfLineEndingsKeepLineNumbers) {
  auto r = readText("<netlist version=\"1\">\r\n  <component ref=\"R1\" type=\"Q\"/>\r\n</netlist>\r\n");
  ASSERT_EQ(r.messages.size(), 1u);
  EXPECT_EQ(r.messages[0], "board.xml:2:3: error: unknown type \"Q\" on R1 (expected R, C, L, D, Z, TVS or FB, or no type)");
}

TEST(XmlNetlist, MissingFile) {
  Circuit circuit;
  FileTable files;
  InputDiagnostics diags;
  EXPECT_FALSE(readXmlNetlist("/nonexistent/board.xml", files, circuit, diags));
  ASSERT_EQ(diags.items().size(), 1u);
  EXPECT_EQ(formatDiagnostic(diags.items()[0], files),
            "/nonexistent/board.xml: error: cannot open file (No such file or directory)");
}

} // namespace
} // namespace gateloop
