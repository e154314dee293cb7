// The circuit model's storage: names copied into its own store or viewed in text it keeps, the
// case-insensitive net and component indexes, and the parallel loop the check stages run on.
#include "checker/core/parallel.h"
#include "checker/model/circuit.h"

#include <gtest/gtest.h>

#include <atomic>
#include <cstdlib>
#include <stdexcept>
#include <string>
#include <vector>

using namespace gateloop;

namespace {

ComponentId addResistor(Circuit &c, std::string_view name, NetId a, NetId b,
                        Circuit::NameIn nameIn = Circuit::NameIn::anywhere) {
  Component r;
  r.name = name;
  r.kind = ElementKind::Resistor;
  NetId nets[] = {a, b};
  return c.addComponent(r, nets, c.internPinNames({"1", "2"}), nameIn);
}

TEST(CircuitModel, NetIndexGrowsFromEmptyAndIgnoresCase) {
  Circuit c; // no reserve(): the index grows many times
  std::vector<NetId> ids;
  for (int i = 0; i < 20000; ++i) ids.push_back(c.net("Gate_" + std::to_string(i), {}));
  ASSERT_EQ(c.nets().size(), 20000u);
  for (int i = 0; i < 20000; i += 97) {
    EXPECT_EQ(c.findNet("GATE_" + std::to_string(i)), ids[i]);
    EXPECT_EQ(c.net("gate_" + std::to_string(i), {}), ids[i]) << "an existing net is not created again";
    EXPECT_EQ(c.netAt(ids[i]).name, "Gate_" + std::to_string(i)) << "the first spelling is kept";
  }
  EXPECT_EQ(c.nets().size(), 20000u);
  EXPECT_EQ(c.findNet("gate_20000"), kNone);
}

TEST(CircuitModel, GroundHasTwoNames) {
  Circuit c;
  NetId g = c.net("GND", {});
  EXPECT_EQ(c.net("0", {}), g);
  EXPECT_EQ(c.findNet("gnd"), g);
  EXPECT_TRUE(c.netAt(g).ground);
  EXPECT_EQ(c.netAt(g).name, "0");
}

TEST(CircuitModel, NamesOutliveTheCallersStringsAndSurviveAMove) {
  Circuit c;
  {
    std::string name = "X1.XH.R5", net = "X1.GATE";
    addResistor(c, name, c.net(net, {}), c.net("0", {}));
    name.assign(name.size(), '#'); // the circuit must have copied it
    net.assign(net.size(), '#');
  }
  std::string_view kept = c.keepText("R7 a b 1k\n");
  addResistor(c, kept.substr(0, 2), c.net(kept.substr(3, 1), hashIgnoreCase("a"), {}, Circuit::NameIn::keptText),
              c.net("b", {}), Circuit::NameIn::keptText);
  Circuit moved = std::move(c);
  ASSERT_EQ(moved.components().size(), 2u);
  EXPECT_EQ(moved.components()[0].name, "X1.XH.R5");
  EXPECT_EQ(moved.netAt(moved.pins(moved.components()[0])[0]).name, "X1.GATE");
  EXPECT_EQ(moved.components()[1].name, "R7");
  EXPECT_EQ(moved.components()[1].name.data(), kept.data()) << "a name in kept text is viewed, not copied";
  EXPECT_EQ(moved.findComponent("x1.xh.r5"), 0u);
  EXPECT_EQ(moved.findComponent("r7"), 1u);
}

TEST(CircuitModel, FirstOfTwoEquallyNamedComponentsIsFound) {
  Circuit c;
  NetId a = c.net("a", {}), b = c.net("b", {});
  addResistor(c, "R1", a, b);
  addResistor(c, "r1", b, a);
  EXPECT_EQ(c.findComponent("R1"), 0u);
  addResistor(c, "R2", a, b); // adding clears the index; it is rebuilt on the next lookup
  EXPECT_EQ(c.findComponent("r2"), 2u);
}

TEST(ParallelFor, EveryIndexOnceWhateverTheThreadCount) {
  for (const char *threads : {"1", "2", "5"}) {
    ::setenv("GATELOOP_THREADS", threads, 1);
    std::vector<std::atomic<int>> hits(10007);
    parallelFor(hits.size(), [&](std::size_t i) { hits[i]++; }, 13);
    for (std::size_t i = 0; i < hits.size(); ++i) ASSERT_EQ(hits[i].load(), 1) << threads << " threads, index " << i;
  }
  ::unsetenv("GATELOOP_THREADS");
}

TEST(ParallelFor, ATasksExceptionReachesTheCaller) {
  ::setenv("GATELOOP_THREADS", "2", 1);
  EXPECT_THROW(parallelFor(1000, [](std::size_t i) {
                 if (i == 777) throw std::runtime_error("task failed");
               }, 10),
               std::runtime_error);
  ::unsetenv("GATELOOP_THREADS");
}

} // namespace
