// Demand cases: the demands they produce, homogeneity checks that follow from the equations
// themselves, and factored cases against the independent scipy solve.
#include <doctest/doctest.h>

#include <cmath>
#include <fstream>
#include <nlohmann/json.hpp>

#include "gradeline/solver.h"
#include "io/parser.h"
#include "model/demand_cases.h"
#include "test_support.h"

using namespace gradeline;
using gradeline::testing::parse_or_fail;

namespace {

constexpr double kScaleRelTol = 1e-9;  // exact in the equations; round-off and HW smoothing only
constexpr double kHeadTol_m = 1e-6;    // against scipy, as for the base case

DemandCase named(const Network& net, const std::string& name) {
  for (const DemandCase& c : net.cases) {
    if (c.name == name) return c;
  }
  FAIL("no case " << name);
  return {};
}

}  // namespace

TEST_CASE("a case scales base demands by its factor, per category where given, and adds draws") {
  Network net = parse_or_fail(
      "reservoir R head=50\nnode A elevation=0 demand=2:homes\nnode B elevation=0 demand=4:works\n"
      "node C elevation=0 demand=1\npipe P1 R A length=1 diameter=100 roughness=0\n"
      "pipe P2 A B length=1 diameter=100 roughness=0\npipe P3 B C length=1 diameter=100 roughness=0\n"
      "case peak factor=1.5 factor.works=1.1 draw=C:10L/s draw=A:1\n");
  std::vector<double> q = case_demands(net, named(net, "peak"));
  CHECK(q[0] == 0.0);
  CHECK(q[1] == doctest::Approx(1.5 * 2e-3 + 1e-3));
  CHECK(q[2] == doctest::Approx(1.1 * 4e-3));
  CHECK(q[3] == doctest::Approx(1.5 * 1e-3 + 10e-3));
}

TEST_CASE("with no case the base demands form one case named base") {
  Network net = parse_or_fail("reservoir R head=5\nnode A elevation=0 demand=2\n"
                              "pipe P R A length=1 diameter=100 roughness=0\n");
  std::vector<DemandCase> cases = cases_of(net);
  REQUIRE(cases.size() == 1);
  CHECK(cases[0].name == "base");
  CHECK(case_demands(net, cases[0])[1] == doctest::Approx(2e-3));
}

TEST_CASE("homogeneity: a tree with one source carries exactly f times the base flows") {
  // Continuity alone fixes the flows of a tree (Darcy-Weisbach does not enter).
  Network net = parse_or_fail(
      "fluid viscosity=1e-6m2/s density=998kg/m3\ndefaults roughness=0.1\n"
      "reservoir R head=90\nnode A elevation=10 demand=4\nnode B elevation=12 demand=3\n"
      "node C elevation=8 demand=6\nnode D elevation=9 demand=2\n"
      "pipe P1 R A length=300 diameter=200\npipe P2 A B length=200 diameter=100\n"
      "pipe P3 A C length=250 diameter=150\npipe P4 C D length=150 diameter=100\n"
      "case scaled factor=2.7\n");
  SolveResult base = solve(net);
  SolveResult scaled = solve(net, {}, case_demands(net, named(net, "scaled")));
  REQUIRE(base.summary.converged());
  REQUIRE(scaled.summary.converged());
  for (std::size_t k = 0; k < net.pipes.size(); ++k) {
    CHECK(scaled.links[k].flow_m3s == doctest::Approx(2.7 * base.links[k].flow_m3s).epsilon(kScaleRelTol));
  }
}

TEST_CASE("homogeneity: looped Hazen-Williams with one source scales flows by f, losses by f^n") {
  // h = r Q^n is homogeneous of degree n, so Q -> fQ and (H0 - H) -> f^n (H0 - H) solve the
  // scaled problem when there is one fixed head and no minor loss.
  Network net = parse_or_fail(
      "headloss hazen-williams\nreservoir R head=100\n"
      "node A elevation=0 demand=20\nnode B elevation=0 demand=15\nnode C elevation=0 demand=10\n"
      "node D elevation=0 demand=12\n"
      "pipe P1 R A length=500 diameter=300 cfactor=120\npipe P2 A B length=400 diameter=200 cfactor=110\n"
      "pipe P3 A C length=350 diameter=150 cfactor=130\npipe P4 B D length=300 diameter=150 cfactor=100\n"
      "pipe P5 C D length=450 diameter=150 cfactor=120\npipe P6 B C length=250 diameter=100 cfactor=90\n"
      "case half factor=0.5\n");
  SolveResult base = solve(net);
  SolveResult half = solve(net, {}, case_demands(net, named(net, "half")));
  REQUIRE(base.summary.converged());
  REQUIRE(half.summary.converged());
  const double loss_scale = std::pow(0.5, 1.852);
  for (std::size_t k = 0; k < net.pipes.size(); ++k) {
    CHECK(half.links[k].flow_m3s == doctest::Approx(0.5 * base.links[k].flow_m3s).epsilon(1e-7));
  }
  for (std::size_t n = 1; n < net.nodes.size(); ++n) {
    CHECK(100.0 - half.nodes[n].head_m ==
          doctest::Approx(loss_scale * (100.0 - base.nodes[n].head_m)).epsilon(1e-7));
  }
}

TEST_CASE("a factored case and a case with draws match the independent scipy solve") {
  // tests/reference/loop_two_sources.json, "cases": tools/reference_solve.py applies the case
  // rules itself (factor, category factors, draws) before its scipy solve.
  Network net = testing::load("tests/networks/loop_two_sources.gln");
  std::ifstream in(testing::source_path("tests/reference/loop_two_sources.json"));
  nlohmann::json ref = nlohmann::json::parse(in);
  for (const char* name : {"peak", "fire"}) {
    CAPTURE(name);
    SolveResult r = solve(net, {}, case_demands(net, named(net, name)));
    REQUIRE(r.summary.converged());
    double worst = 0.0;
    for (auto& [id, head] : ref["cases"][name]["heads_m"].items()) {
      worst = std::max(worst, std::abs(r.nodes[*net.find_node(id)].head_m - head.get<double>()));
    }
    double worst_flow = 0.0;
    for (auto& [id, flow] : ref["cases"][name]["flows_m3s"].items()) {
      worst_flow = std::max(worst_flow, std::abs(r.links[*net.find_pipe(id)].flow_m3s - flow.get<double>()));
    }
    MESSAGE(name << ": worst head error vs scipy " << worst << " m, flow " << worst_flow << " m3/s");
    CHECK(worst < kHeadTol_m);
    CHECK(worst_flow < 1e-8);
  }
}

TEST_CASE("case errors: unknown draw node, unknown category, bad draw, duplicate name") {
  ParseResult r = parse_network_text(
      "reservoir R head=5\nnode A elevation=0 demand=2:homes\n"
      "pipe P R A length=1 diameter=100 roughness=0\n"
      "case c1 draw=Z:5\ncase c2 factor.hoems=2\ncase c3 draw=A5\ncase c1 factor=2\n"
      "case c4 draw=R:1\n",
      "net.gln");
  std::string all;
  for (const Diagnostic& d : r.errors) all += d.format() + "\n";
  CHECK(all ==
        "net.gln:6: error: draw must be NODE:FLOW, got 'A5'\n"
        "net.gln:4: error: case 'c1': draw at unknown node 'Z'\n"
        "net.gln:5: error: case 'c2': no node has demand category 'hoems'\n"
        "net.gln:7: error: duplicate case 'c1' (first defined at net.gln:4)\n"
        "net.gln:8: error: case 'c4': draw at reservoir 'R'\n");
}
