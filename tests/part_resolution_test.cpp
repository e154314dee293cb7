/// \file
/// Tests of glob matching and part resolution (spec 4.3): XML part attribute over `assign` over
/// `match`, leaf versus hierarchical patterns, and hiding the contents of part-modelled
/// subcircuit instances.

#include "checker/model/part_resolution.h"

#include <gtest/gtest.h>

#include <string>
#include <vector>

namespace gateloop {
namespace {

TEST(GlobMatch, StarAndQuestionMark) {
  EXPECT_TRUE(globMatch("R*", "RGON"));
  EXPECT_TRUE(globMatch("R*", "R"));
  EXPECT_TRUE(globMatch("*", ""));
  EXPECT_TRUE(globMatch("R?", "R1"));
  EXPECT_FALSE(globMatch("R?", "R12"));
  EXPECT_FALSE(globMatch("R?", "R"));
  EXPECT_TRUE(globMatch("*G*N", "RGON"));
  EXPECT_TRUE(globMatch("X*.Q?", "X12.Q1"));
  EXPECT_FALSE(globMatch("X*.Q?", "X12.R1"));
  EXPECT_TRUE(globMatch("a*b*c", "aXbYbZc"));
  EXPECT_FALSE(globMatch("a*b*c", "aXbYbZ"));
  EXPECT_FALSE(globMatch("", "R1"));
  EXPECT_TRUE(globMatch("", ""));
}

TEST(GlobMatch, CaseInsensitive) {
  EXPECT_TRUE(globMatch("r*", "RGON"));
  EXPECT_TRUE(globMatch("XA.*", "xa.rgon"));
  EXPECT_FALSE(globMatch("XA.*", "XB.RGON"));
}

TEST(GlobMatch, ManyStarsStayFast) {
  // A naive recursive matcher takes exponential time here.
  std::string text(2000, 'a');
  EXPECT_FALSE(globMatch("*a*a*a*a*a*a*a*a*a*a*a*a*b", text));
  EXPECT_TRUE(globMatch("*a*a*a*a*a*a*a*a*a*a*a*a*", text));
}

Part makePart(std::string id, PartKind kind) {
  Part p;
  p.id = std::move(id);
  p.kind = kind;
  p.fieldPath = "parts." + p.id;
  return p;
}

class PartResolution : public ::testing::Test {
protected:
  PartResolution() {
    lib_.parts.push_back(makePart("SW-1200-300", PartKind::Igbt));
    lib_.parts.back().matchSubckt = {"SWMOD1200"};
    lib_.parts.push_back(makePart("RES-0603-TF", PartKind::Resistor));
    lib_.parts.push_back(makePart("RES-1206-TF", PartKind::Resistor));
    lib_.parts.push_back(makePart("NMOS-650", PartKind::Mosfet));
    lib_.parts.back().matchModel = {"nch650"};
    lib_.parts.push_back(makePart("DRV-ISO-4A", PartKind::Driver));
    assignFile_ = files_.add("gateloop.json");
  }

  ComponentId add(const std::string &name, ElementKind kind, const std::string &model = "",
                  ComponentId parent = kNone, const std::string &partHint = "") {
    Component c;
    c.name = name;
    c.kind = kind;
    c.model = circuit_.intern(model);
    c.partHint = circuit_.intern(partHint);
    c.parent = parent;
    c.where = {xmlFile_, static_cast<std::uint32_t>(circuit_.components().size() + 1), 1};
    std::vector<NetId> nets{circuit_.net(name + "_a", {}), circuit_.net(name + "_b", {})};
    return circuit_.addComponent(std::move(c), nets, circuit_.internPinNames({"1", "2"}));
  }

  void resolve(const std::vector<std::pair<std::string, std::string>> &assign) {
    resolveParts(circuit_, lib_, assign, {assignFile_, 0, 0}, "designs[0].assign", diags_);
    for (const auto &d : diags_.items()) messages_.push_back(formatDiagnostic(d, files_));
  }

  std::string partOf(const std::string &name) const {
    const Component &c = circuit_.component(circuit_.findComponent(name));
    return c.part == kNone ? std::string("-") : lib_.parts[c.part].id;
  }
  bool hidden(const std::string &name) const { return circuit_.component(circuit_.findComponent(name)).hidden; }

  Circuit circuit_;
  PartLibrary lib_;
  FileTable files_;
  FileId assignFile_ = 0;
  FileId xmlFile_ = files_.add("board.xml");
  InputDiagnostics diags_;
  std::vector<std::string> messages_;
};

TEST_F(PartResolution, LeafPatternsMatchInsideHierarchy) {
  ComponentId xa = add("XA", ElementKind::Subcircuit, "GATEDRV");
  add("XA.RGON", ElementKind::Resistor, "", xa);
  add("R5", ElementKind::Resistor);
  add("C5", ElementKind::Capacitor);
  resolve({{"R*", "RES-0603-TF"}});
  EXPECT_TRUE(messages_.empty()) << ::testing::PrintToString(messages_);
  EXPECT_EQ(partOf("XA.RGON"), "RES-0603-TF"); // spec: `R*` matches `XA.RGON`
  EXPECT_EQ(partOf("R5"), "RES-0603-TF");
  EXPECT_EQ(partOf("C5"), "-");
  EXPECT_EQ(partOf("XA"), "-");
  EXPECT_FALSE(hidden("XA.RGON")); // XA has no part: it is structure only
}

TEST_F(PartResolution, HierarchicalPatternsAndFirstMatchWins) {
  ComponentId xa = add("XA", ElementKind::Subcircuit, "GATEDRV");
  ComponentId xb = add("XB", ElementKind::Subcircuit, "GATEDRV");
  add("XA.R1", ElementKind::Resistor, "", xa);
  add("XB.R1", ElementKind::Resistor, "", xb);
  add("R1", ElementKind::Resistor);
  resolve({{"xa.*", "RES-1206-TF"}, {"R?", "RES-0603-TF"}, {"R1", "RES-1206-TF"}});
  EXPECT_TRUE(messages_.empty()) << ::testing::PrintToString(messages_);
  EXPECT_EQ(partOf("XA.R1"), "RES-1206-TF"); // first pattern, full name
  EXPECT_EQ(partOf("XB.R1"), "RES-0603-TF"); // "xa.*" does not match; "R?" matches the leaf
  EXPECT_EQ(partOf("R1"), "RES-0603-TF");    // "R?" comes before "R1" in file order
}

TEST_F(PartResolution, XmlPartWinsOverAssignWhichWinsOverMatch) {
  add("Q1", ElementKind::Generic, "", kNone, "SW-1200-300");
  add("M1", ElementKind::Mosfet, "NCH650");
  add("M2", ElementKind::Mosfet, "NCH650");
  add("M3", ElementKind::Mosfet, "PCH650");
  add("X9", ElementKind::Subcircuit, "swmod1200");
  resolve({{"Q*", "RES-0603-TF"}, {"M2", "SW-1200-300"}});
  EXPECT_TRUE(messages_.empty()) << ::testing::PrintToString(messages_);
  EXPECT_EQ(partOf("Q1"), "SW-1200-300"); // the XML part attribute wins over assign
  EXPECT_EQ(partOf("M1"), "NMOS-650");    // .model name, case-insensitive
  EXPECT_EQ(partOf("M2"), "SW-1200-300"); // assign wins over match
  EXPECT_EQ(partOf("M3"), "-");
  EXPECT_EQ(partOf("X9"), "SW-1200-300"); // subckt name, case-insensitive
}

TEST_F(PartResolution, SubcircuitMatchOnlyForInstancesAndModelOnlyForElements) {
  // A primitive element naming a model that happens to equal a subcircuit name is not an instance.
  add("Q5", ElementKind::Bjt, "SWMOD1200");
  add("X5", ElementKind::Subcircuit, "NCH650");
  resolve({});
  EXPECT_EQ(partOf("Q5"), "-");
  EXPECT_EQ(partOf("X5"), "-");
}

TEST_F(PartResolution, ContentsOfPartModelledSubcircuitsAreHidden) {
  ComponentId x1 = add("X1", ElementKind::Subcircuit, "SWMOD1200");
  ComponentId inner = add("X1.XCORE", ElementKind::Subcircuit, "CORE", x1);
  add("X1.XCORE.R1", ElementKind::Resistor, "", inner);
  add("X1.Q1", ElementKind::Bjt, "QCORE", x1);
  ComponentId x2 = add("X2", ElementKind::Subcircuit, "OTHER");
  add("X2.R1", ElementKind::Resistor, "", x2);
  // Parent listed after its child: the reader may flatten children first.
  Component late;
  late.name = "X3.R1";
  late.kind = ElementKind::Resistor;
  late.parent = static_cast<ComponentId>(circuit_.components().size() + 1);
  std::vector<NetId> nets{circuit_.net("n1", {}), circuit_.net("n2", {})};
  circuit_.addComponent(late, nets, circuit_.internPinNames({"1", "2"}));
  add("X3", ElementKind::Subcircuit, "SWMOD1200");
  resolve({});
  EXPECT_FALSE(hidden("X1"));
  EXPECT_TRUE(hidden("X1.XCORE"));
  EXPECT_TRUE(hidden("X1.XCORE.R1"));
  EXPECT_TRUE(hidden("X1.Q1"));
  EXPECT_FALSE(hidden("X2"));
  EXPECT_FALSE(hidden("X2.R1"));
  EXPECT_TRUE(hidden("X3.R1"));
  EXPECT_FALSE(hidden("X3"));
}

TEST_F(PartResolution, UnknownPartIdsAreErrorsWithSuggestions) {
  add("Q1", ElementKind::Generic, "", kNone, "SW-1200-30");
  add("R1", ElementKind::Resistor);
  add("R2", ElementKind::Resistor);
  resolve({{"R*", "RES-0630-TF"}, {"Q?", "NOPE"}});
  ASSERT_EQ(messages_.size(), 3u) << ::testing::PrintToString(messages_);
  EXPECT_EQ(messages_[0],
            "gateloop.json: designs[0].assign[\"R*\"]: error: unknown part \"RES-0630-TF\"; did you mean \"RES-0603-TF\"?");
  EXPECT_EQ(messages_[1], "gateloop.json: designs[0].assign[\"Q?\"]: error: unknown part \"NOPE\"");
  EXPECT_EQ(messages_[2], "board.xml:1:1: error: unknown part \"SW-1200-30\" on Q1; did you mean \"SW-1200-300\"?");
  // The first matching pattern decides even when its id is unknown: no fall-through to match.
  EXPECT_EQ(partOf("R1"), "-");
  EXPECT_EQ(diags_.errorCount(), 3u);
}

TEST_F(PartResolution, KindMismatchWarns) {
  add("C1", ElementKind::Capacitor);
  add("R1", ElementKind::Resistor);
  resolve({{"C1", "RES-0603-TF"}, {"R1", "RES-0603-TF"}});
  ASSERT_EQ(messages_.size(), 1u) << ::testing::PrintToString(messages_);
  EXPECT_EQ(messages_[0], "board.xml:1:1: warning: part \"RES-0603-TF\" is a resistor but C1 is a capacitor element");
  EXPECT_EQ(partOf("C1"), "RES-0603-TF"); // still assigned: the user said so
}

TEST_F(PartResolution, DriverPartsMayStandOnSourcesButNotOnPassives) {
  // A simulation deck's driver is often a pulse, controlled or behavioural source.
  add("VDRV1", ElementKind::VoltageSource);
  add("EDRV2", ElementKind::ControlledSource);
  add("BDRV3", ElementKind::BehavioralSource);
  add("RDRV4", ElementKind::Resistor);
  resolve({{"?DRV*", "DRV-ISO-4A"}});
  ASSERT_EQ(messages_.size(), 1u) << ::testing::PrintToString(messages_);
  EXPECT_EQ(messages_[0], "board.xml:4:1: warning: part \"DRV-ISO-4A\" is a driver but RDRV4 is a resistor element");
  EXPECT_EQ(partOf("VDRV1"), "DRV-ISO-4A");
  EXPECT_EQ(partOf("BDRV3"), "DRV-ISO-4A");
}

TEST_F(PartResolution, SameMatchNameInTwoPartsWarns) {
  lib_.parts.push_back(makePart("NMOS-650-B", PartKind::Mosfet));
  lib_.parts.back().matchModel = {"NCH650"};
  lib_.parts.back().file = assignFile_;
  add("M1", ElementKind::Mosfet, "nch650");
  resolve({});
  ASSERT_EQ(messages_.size(), 1u);
  EXPECT_EQ(messages_[0], "gateloop.json: parts.NMOS-650-B.match: warning: model \"NCH650\" is also matched by part "
                          "\"NMOS-650\", which is used");
  EXPECT_EQ(partOf("M1"), "NMOS-650");
}

} // namespace
} // namespace gateloop
