// Change sets: every statement, and the exact text of every error.
#include <doctest/doctest.h>

#include "io/change_set.h"
#include "io/network_writer.h"
#include "io/parser.h"
#include "test_support.h"

using namespace gradeline;

namespace {

const char* kBase =
    "reservoir R head=50\nnode A elevation=0 demand=2\nnode B elevation=0 demand=1\n"
    "node Q elevation=0\n"
    "pipe P1 R A length=100 diameter=150 roughness=0.1\npipe P2 A B length=100 diameter=100 roughness=0.1\n"
    "pipe P3 R B length=300 diameter=100 roughness=0.1 status=closed\n"
    "pipe Q A Q length=10 diameter=50 roughness=0.1\n"
    "case fire draw=B:5\n";

Network base() { return testing::parse_or_fail(kBase); }

std::string errors(const std::string& changes) {
  Network net = base();
  ChangeResult r = apply_change_text(changes, "up.chg", &net);
  std::string out;
  for (const Diagnostic& d : r.errors) out += d.format() + "\n";
  return out;
}

}  // namespace

TEST_CASE("modify changes only the keys given, in the change set's units") {
  Network net = base();
  ChangeResult r = apply_change_text("title Upsize\nmodify P2 diameter=200mm\nmodify node A demand=3L/s:homes\n"
                                     "modify R head=55\n", "up.chg", &net);
  REQUIRE(r.ok());
  CHECK(r.title == "Upsize");
  CHECK(r.changes == 3);
  const Pipe& p = net.pipes[*net.find_pipe("P2")];
  CHECK(p.diameter_m == doctest::Approx(0.2));
  CHECK(p.length_m == 100.0);
  CHECK(*p.roughness_m == doctest::Approx(1e-4));
  CHECK(net.nodes[1].demand_m3s == doctest::Approx(3e-3));
  CHECK(net.nodes[1].demand_category == "homes");
  CHECK(net.nodes[0].head_m == 55.0);
}

TEST_CASE("units in a change set set its bare-number defaults") {
  Network net = base();
  REQUIRE(apply_change_text("units US\nmodify P2 diameter=8\n", "up.chg", &net).ok());
  CHECK(net.pipes[1].diameter_m == doctest::Approx(0.2032));
}

TEST_CASE("close and open set a pipe's status") {
  Network net = base();
  REQUIRE(apply_change_text("close P1\nopen P3\n", "up.chg", &net).ok());
  CHECK(net.pipes[0].status == LinkStatus::kClosed);
  CHECK(net.pipes[2].status == LinkStatus::kOpen);
}

TEST_CASE("add creates pipes, nodes and reservoirs; later changes can use them") {
  Network net = base();
  ChangeResult r = apply_change_text(
      "add node N9 elevation=3 demand=0.5\nadd reservoir R2 head=48\n"
      "add pipe P40 B N9 length=220m diameter=200mm roughness=0.1mm\n"
      "add pipe P41 R2 N9 length=100 diameter=150 roughness=0.1\nmodify P40 diameter=250\n",
      "up.chg", &net);
  for (const auto& e : r.errors) FAIL_CHECK(e.format());
  REQUIRE(net.find_pipe("P40"));
  CHECK(net.pipes[*net.find_pipe("P40")].diameter_m == doctest::Approx(0.25));
  CHECK(net.pipes[*net.find_pipe("P40")].to == *net.find_node("N9"));
  CHECK(net.nodes[*net.find_node("R2")].is_fixed_head());
}

TEST_CASE("remove drops a pipe, then an unconnected node, keeping indices consistent") {
  Network net = base();
  ChangeResult r = apply_change_text("remove pipe Q\nremove node Q\n", "up.chg", &net);
  for (const auto& e : r.errors) FAIL_CHECK(e.format());
  CHECK_FALSE(net.find_pipe("Q"));
  CHECK_FALSE(net.find_node("Q"));
  CHECK(net.nodes[net.pipes[1].to].id == "B");
  CHECK(net.nodes[net.cases[0].draws_m3s[0].first].id == "B");
}

TEST_CASE("a changed network round-trips through the writer") {
  Network net = base();
  REQUIRE(apply_change_text("modify P2 diameter=200mm\nadd node N9 elevation=3\n"
                            "add pipe P40 B N9 length=20 diameter=100 roughness=0.1\n",
                            "up.chg", &net).ok());
  ParseResult again = parse_network_text(write_network(net), "merged.gln");
  for (const auto& e : again.errors) FAIL_CHECK(e.format());
  CHECK(write_network(again.network) == write_network(net));
}

TEST_CASE("change-set errors, exactly") {
  CHECK(errors("modify P99 diameter=300mm\n") ==
        "up.chg:1: error: modify: no pipe or node 'P99' in the network\n");
  CHECK(errors("modify pipe A diameter=300mm\n") ==
        "up.chg:1: error: modify: no pipe 'A' in the network\n");
  CHECK(errors("modify Q diameter=300mm\n") ==
        "up.chg:1: error: modify: 'Q' is both a node and a pipe; write 'modify pipe Q' or "
        "'modify node Q'\n");
  CHECK(errors("modify P2\n") == "up.chg:1: error: modify needs at least one key=value\n");
  CHECK(errors("modify P2 diamter=300\n") ==
        "up.chg:1: error: unknown key 'diamter' for modify (did you mean 'diameter'?)\n");
  CHECK(errors("modify P2 roughness=60mm\n") ==
        "up.chg:1: error: pipe 'P2': roughness 60 mm is not smaller than the pipe radius 50 mm\n");
  CHECK(errors("close A\n") == "up.chg:1: error: close takes one pipe ID\n");
  CHECK(errors("open\n") == "up.chg:1: error: open needs one element ID\n");
  CHECK(errors("add pipe P1 A B length=1 diameter=100 roughness=0\n") ==
        "up.chg:1: error: duplicate pipe ID 'P1' (first defined at test.gln:5)\n");
  CHECK(errors("add pipe P9 A Z length=1 diameter=100 roughness=0\n") ==
        "up.chg:1: error: pipe 'P9' refers to unknown node 'Z'\n");
  CHECK(errors("add node A elevation=1\n") == "up.chg:1: error: add: node 'A' already exists\n");
  CHECK(errors("add valve V1\n") == "up.chg:1: error: add needs an element: pipe, pump, node, reservoir or tank\n");
  CHECK(errors("remove node B\n") ==
        "up.chg:1: error: remove: node 'B' still has pipe 'P2'; remove it first\n");
  CHECK(errors("modfy P2 diameter=1\n") ==
        "up.chg:1: error: unknown change 'modfy' (did you mean 'modify'?)\n");
  CHECK(errors("close P1\nunits US\n") == "up.chg:2: error: 'units' must come before the first change\n");
  CHECK(errors("remove pipe P1\nremove pipe P3\nremove node R\n") ==
        "up.chg:3: error: after the changes the network has no fixed-head node\n");
}

TEST_CASE("a change file that cannot be read is reported") {
  Network net = base();
  ChangeResult r = apply_change_file("/nonexistent.chg", &net);
  REQUIRE(r.errors.size() == 1);
  CHECK(r.errors[0].format() == "/nonexistent.chg: error: cannot read file: No such file or directory");
}
