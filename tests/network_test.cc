// The network model's records: what only some kinds of element carry, and source locations.
#include <doctest/doctest.h>

#include <string>
#include <thread>

#include "gradeline/network.h"
#include "test_support.h"

using namespace gradeline;
using gradeline::testing::parse_or_fail;

TEST_CASE("an empty box reads as the default, and a written one is copied, not shared") {
  Boxed<LinkControls> a;
  CHECK(a.empty());
  CHECK(a.get().speed == 1.0);
  CHECK(!a.get().efficiency);
  a.edit().speed = 0.8;
  CHECK(!a.empty());
  Boxed<LinkControls> b = a;
  b.edit().speed = 0.5;
  CHECK(a.get().speed == 0.8);
  CHECK(b.get().speed == 0.5);
  Boxed<LinkControls> c = std::move(b);
  CHECK(c.get().speed == 0.5);
  c = Boxed<LinkControls>{};
  CHECK(c.empty());
  CHECK(c.get().speed == 1.0);
}

TEST_CASE("plain pipes and junctions carry no box; pumps, valves and tanks do") {
  const Network n = parse_or_fail(
      "reservoir R head=80\n"
      "tank T bottom=60 level=4 min_level=1 max_level=8 diameter=12\n"
      "node A elevation=10 demand=1\n"
      "node B elevation=10\n"
      "pipe P1 R A length=100 diameter=200 roughness=0.1\n"
      "pump K A B curve=0:40,30:32,60:12 speed=0.9\n"
      "valve V B T type=prv diameter=150 head=70\n");
  CHECK(n.pipes[*n.find_pipe("P1")].controls.empty());
  CHECK(n.nodes[*n.find_node("A")].tank.empty());
  const Pipe& pump = n.pipes[*n.find_pipe("K")];
  CHECK(!pump.controls.empty());
  CHECK(pump.control().speed == 0.9);
  CHECK(pump.control().curve.points.size() == 3);
  CHECK(n.pipes[*n.find_pipe("V")].control().valve_head_m == 70.0);
  const Node& tank = n.nodes[*n.find_node("T")];
  CHECK(tank.levels().level_m == 4.0);
  CHECK(tank.levels().max_level_m == 8.0);
  CHECK(tank.head_m == 64.0);
}

TEST_CASE("a string is interned once, the same handle from every thread") {
  const InternedString here = intern("zone/a.gln");
  InternedString there;
  std::thread other([&] { there = intern(std::string("zone/") + "a.gln"); });
  other.join();
  CHECK(here == there);
  CHECK(here.str() == "zone/a.gln");
  CHECK(intern("zone/b.gln") != here);
  CHECK(intern("zone/a.gln") == here);  // after another string on this thread
  CHECK(intern("").empty());
  CHECK(InternedString().str().empty());
}

TEST_CASE("records stay compact: a node is 96 bytes and a link 104") {
  // Most passes over a large network stream these records (gradeline/compact.h).
  CHECK(sizeof(Node) == 96);
  CHECK(sizeof(Pipe) == 104);
  CHECK(sizeof(OptionalDouble) == 8);
  CHECK(sizeof(OptionalPoint) == 16);
  CHECK(sizeof(SourceLocation) == 8);
}

TEST_CASE("an OptionalDouble reads and writes like std::optional<double>") {
  OptionalDouble v;
  CHECK_FALSE(v);
  CHECK(v.value_or(2.5) == 2.5);
  v = 0.1;
  CHECK(v);
  CHECK(*v == 0.1);
  v = std::optional<double>();
  CHECK_FALSE(v.has_value());
  v = std::optional<double>(-3.0);
  CHECK(std::optional<double>(v) == std::optional<double>(-3.0));
  CHECK(v == OptionalDouble(-3.0));
  CHECK(v != OptionalDouble());
  v.reset();
  CHECK(v == OptionalDouble(std::nullopt));
}
