// Topological reduction: which nodes and links leave the Newton system, the chain law's dh/dQ,
// and reduced solves against scipy (tools/reference_solve.py) and against unreduced solves.
#include <doctest/doctest.h>

#include <cmath>
#include <algorithm>
#include <fstream>
#include <nlohmann/json.hpp>
#if defined(_OPENMP)
#include <omp.h>
#endif

#include "analysis/self_check.h"
#include "gradeline/solver.h"
#include "hydraulics/chain_law.h"
#include "model/demand_cases.h"
#include "model/topology.h"
#include "solver/reduction.h"
#include "test_support.h"

using namespace gradeline;

namespace {

constexpr double kDerivativeRelTol = 1e-6;
constexpr double kHeadTol_m = 1e-6;         // against scipy, as for the other reference networks
constexpr double kFlowTol_m3s = 1e-8;
constexpr double kSameHead_m = 1e-7;        // reduced against unreduced: both meet 1e-8 m energy
constexpr double kSameFlow_m3s = 1e-8;      // and continuity tolerances, so they agree to about this
constexpr double kContinuityTol_m3s = 1e-9;
constexpr double kLoopTol_m = 1e-7;

const char* kFluid =
    "units SI\nfluid viscosity=1.0e-6m2/s density=998kg/m3\ndefaults roughness=0.1mm\n";

Reduction reduce(const Network& net) {
  return reduce_topology(net, build_topology(net), eliminable_links(net));
}

bool eliminated(const Network& net, const Reduction& r, const char* node) {
  return r.core_of_node[*net.find_node(node)] == kEliminated;
}

// Reduction on whatever the network's size (by default small networks are solved unreduced).
SolveOptions reducing() {
  SolveOptions o;
  o.reduction_min_nodes = 0;
  return o;
}

SolveResult solve_with(const Network& net, bool reduce, const std::vector<double>& demand) {
  SolveOptions o = reducing();
  o.topological_reduction = reduce;
  return solve(net, o, demand);
}

}  // namespace

TEST_CASE("dead-end branches are peeled to the core, leaves first") {
  // R - A, a loop A-B-C-A, and a branch C - D - E with a side leaf F at D.
  Network net = testing::parse_or_fail(std::string(kFluid) +
      "reservoir R head=50\nnode A elevation=0\nnode B elevation=0\nnode C elevation=0\n"
      "node D elevation=0\nnode E elevation=0\nnode F elevation=0\n"
      "pipe P0 R A length=10 diameter=100\npipe P1 A B length=10 diameter=100\n"
      "pipe P2 B C length=10 diameter=100\npipe P3 C A length=10 diameter=100\n"
      "pipe P4 C D length=10 diameter=100\npipe P5 E D length=10 diameter=100\n"
      "pipe P6 D F length=10 diameter=100\n");
  const Reduction r = reduce(net);
  CHECK(r.tree_link.size() == 3);  // P5, P6, then P4; a reservoir is never a leaf
  for (const char* n : {"D", "E", "F"}) CHECK(eliminated(net, r, n));
  for (const char* n : {"R", "A", "B", "C"}) CHECK_FALSE(eliminated(net, r, n));
  // D goes after both of its leaves.
  const auto pos = [&](const char* leaf) {
    const std::uint32_t n = static_cast<std::uint32_t>(*net.find_node(leaf));
    for (std::size_t i = 0; i < r.tree_leaf.size(); ++i) {
      if (r.tree_leaf[i] == n) return i;
    }
    return r.tree_leaf.size();
  };
  CHECK(pos("D") > pos("E"));
  CHECK(pos("D") > pos("F"));
}

TEST_CASE("a series chain between branch nodes becomes one link; a ring on one node is kept") {
  // Branch nodes A and C joined by A-B-C (a chain through B) and directly; a ring C-D-E-C.
  Network net = testing::parse_or_fail(std::string(kFluid) +
      "reservoir R head=50\nnode A elevation=0\nnode B elevation=0\nnode C elevation=0\n"
      "node D elevation=0\nnode E elevation=0\n"
      "pipe P0 R A length=10 diameter=100\npipe P1 A B length=10 diameter=100\n"
      "pipe P2 C B length=10 diameter=100\npipe P3 A C length=10 diameter=100\n"
      "pipe P4 C D length=10 diameter=100\npipe P5 D E length=10 diameter=100\n"
      "pipe P6 E C length=10 diameter=100\n");
  const Reduction r = reduce(net);
  REQUIRE(r.chains() == 1);
  CHECK(r.chain_start[1] - r.chain_start[0] == 2);
  CHECK(eliminated(net, r, "B"));
  CHECK_FALSE(eliminated(net, r, "D"));
  CHECK_FALSE(eliminated(net, r, "E"));
  // The chain runs A -> C or C -> A; P2 points against it in the first case.
  const bool from_a = r.chain_from[0] == *net.find_node("A");
  CHECK(r.member_sign[1] == (from_a ? -1 : 1));
  CHECK(r.kept_links.size() == 5);  // P0, P3 and the ring's three pipes
}

TEST_CASE("pumps, valves, check valves, closed pipes and pipes at tanks are never eliminated") {
  Network net = testing::parse_or_fail(std::string(kFluid) +
      "reservoir R head=50\ntank T bottom=60 level=3 min_level=0.5 max_level=6 diameter=10\n"
      "node A elevation=0\nnode B elevation=0\nnode C elevation=0\nnode D elevation=0\n"
      "node E elevation=0\n"
      "pipe P0 R A length=10 diameter=100\npipe P1 A B length=10 diameter=100 check=yes\n"
      "pipe P2 A C length=10 diameter=100 status=closed\n"
      "valve V1 A D diameter=100 type=prv pressure=200kPa\n"
      "pipe P3 T E length=10 diameter=100\npipe P4 E A length=10 diameter=100\n");
  const std::vector<char> e = eliminable_links(net);
  for (const char* id : {"P1", "P2", "V1", "P3"}) {
    CAPTURE(id);
    CHECK_FALSE(e[*net.find_pipe(id)]);
  }
  CHECK(e[*net.find_pipe("P0")]);
  CHECK(e[*net.find_pipe("P4")]);
  const Reduction r = reduce(net);
  for (const char* n : {"B", "C", "D", "E"}) CHECK_FALSE(eliminated(net, r, n));
}

TEST_CASE("the chain law's dh/dQ matches a central finite difference in every regime") {
  // Three pipes, the second against the chain, with 0.4 and 1.1 L/s taken off between them;
  // chain flows from reverse through laminar and transitional to turbulent in every pipe.
  for (HeadlossLaw kind : {HeadlossLaw::kDarcyWeisbach, HeadlossLaw::kHazenWilliams}) {
    HeadlossModel model;
    model.law = kind;
    Fluid fluid;
    fluid.kinematic_viscosity_m2s = 1.1e-6;
    ChainLaws chain;
    for (double d : {0.1, 0.08, 0.15}) {
      Pipe p;
      p.length_m = 200.0;
      p.diameter_m = d;
      p.roughness_m = 1e-4;
      p.cfactor = 110.0;
      p.minor_k = 0.8;
      chain.law.push_back(make_pipe_law(p, model, fluid, 1e-8));
    }
    chain.start = {0, 3};
    chain.offset_m3s = {0.0, 4e-4, 1.5e-3};
    chain.sign = {1, -1, 1};
    chain.colebrook_x.assign(3, 0.0);
    for (double q : {-0.02, -1e-3, 1e-5, 4e-4, 6e-4, 1.5e-3, 1.7e-3, 3e-3, 0.01, 0.05}) {
      CAPTURE(q);
      const double step = std::max(1e-7 * std::abs(q), 1e-10);
      const double fd = (chain.evaluate(0, q + step).headloss_m -
                         chain.evaluate(0, q - step).headloss_m) / (2 * step);
      const LinkEval e = chain.evaluate(0, q);
      CHECK(e.dh_dq == doctest::Approx(fd).epsilon(kDerivativeRelTol));
      CHECK(e.dh_dq > 0.0);
      // h is the sum of the pipe laws at the pipe flows (link_law.h), pipe by pipe.
      double sum = 0.0;
      for (int i = 0; i < 3; ++i) sum += evaluate_pipe(chain.law[i], q - chain.offset_m3s[i]).headloss_m;
      CHECK(e.headloss_m == doctest::Approx(sum).epsilon(1e-12));
    }
  }
}

TEST_CASE("branches and chains with demands match scipy in every case") {
  // tools/reference_solve.py: scipy.optimize.root on the full, unreduced system.
  Network net = testing::load("tests/networks/branches_chains.gln");
  std::ifstream in(testing::source_path("tests/reference/branches_chains.json"));
  REQUIRE(in.good());
  const nlohmann::json ref = nlohmann::json::parse(in);
  auto compare = [&](const nlohmann::json& expected, const std::vector<double>& demand) {
    SolveResult r = solve(net, reducing(), demand);
    REQUIRE_MESSAGE(r.summary.converged(), r.summary.message);
    CHECK(r.summary.reduction.applied);
    CHECK(r.summary.reduction.core_junctions == 4);
    CHECK(r.summary.reduction.tree_links == 5);
    CHECK(r.summary.reduction.chains == 2);
    double worst_head = 0.0, worst_flow = 0.0;
    for (auto& [id, head] : expected["heads_m"].items()) {
      worst_head = std::max(worst_head, std::abs(r.nodes[*net.find_node(id)].head_m - head.get<double>()));
    }
    for (auto& [id, flow] : expected["flows_m3s"].items()) {
      worst_flow = std::max(worst_flow, std::abs(r.links[*net.find_pipe(id)].flow_m3s - flow.get<double>()));
    }
    MESSAGE("worst head error vs scipy " << worst_head << " m, flow " << worst_flow << " m3/s, "
            << r.summary.iterations << " iterations");
    CHECK(worst_head < kHeadTol_m);
    CHECK(worst_flow < kFlowTol_m3s);
    CHECK(testing::max_loop_headloss_m(net, r) < kLoopTol_m);
    CHECK(testing::max_continuity_m3s(net, r) < kContinuityTol_m3s);
  };
  compare(ref, testing::base_demand(net));
  for (const DemandCase& c : net.cases) {
    CAPTURE(c.name);
    compare(ref["cases"][c.name], case_demands(net, c));
  }
}

TEST_CASE("reduced and unreduced solves agree on every shipped and test network") {
  for (const char* file :
       {"networks/brindlemoor.gln", "networks/quarry_hill.gln", "tests/networks/two_loop.gln",
        "tests/networks/hanoi.gln", "tests/networks/loop_hazen.gln",
        "tests/networks/loop_laminar.gln", "tests/networks/loop_minor_closed.gln",
        "tests/networks/branches_chains.gln", "tests/networks/prv_zone.gln"}) {
    Network net = testing::load(file);
    for (const DemandCase& c : cases_of(net)) {
      CAPTURE(file);
      CAPTURE(c.name);
      const std::vector<double> demand = case_demands(net, c);
      const SolveResult a = solve_with(net, true, demand), b = solve_with(net, false, demand);
      REQUIRE(a.summary.converged());
      REQUIRE(b.summary.converged());
      CHECK(a.summary.iterations <= b.summary.iterations + 1);
      for (std::size_t n = 0; n < net.nodes.size(); ++n) {
        CHECK(a.nodes[n].supplied == b.nodes[n].supplied);
        if (b.nodes[n].supplied) CHECK(std::abs(a.nodes[n].head_m - b.nodes[n].head_m) < kSameHead_m);
      }
      for (std::size_t k = 0; k < net.pipes.size(); ++k) {
        CHECK(a.links[k].open == b.links[k].open);
        CHECK(std::abs(a.links[k].flow_m3s - b.links[k].flow_m3s) < kSameFlow_m3s);
        CHECK(a.links[k].regime == b.links[k].regime);
      }
    }
  }
}

TEST_CASE("a branch and a chain cut off by a closed pipe are unsupplied, as without reduction") {
  // Behind the closed pipe PX: a chain B-C-D-E, two more pipes E-B, and a leaf F at B.
  Network net = testing::parse_or_fail(std::string(kFluid) +
      "reservoir R head=50\nnode A elevation=0 demand=1\nnode B elevation=0 demand=1\n"
      "node C elevation=0 demand=1\nnode D elevation=0 demand=1\nnode E elevation=0 demand=1\n"
      "node F elevation=0 demand=1\n"
      "pipe P0 R A length=100 diameter=100\npipe PX A B length=100 diameter=100 status=closed\n"
      "pipe P1 B C length=100 diameter=100\npipe P2 C D length=100 diameter=100\n"
      "pipe P3 D E length=100 diameter=100\npipe P4 E B length=100 diameter=100\n"
      "pipe P5 B F length=100 diameter=100\npipe P6 E B length=150 diameter=80\n");
  const SolveResult a = solve_with(net, true, testing::base_demand(net));
  const SolveResult b = solve_with(net, false, testing::base_demand(net));
  REQUIRE(a.summary.reduction.applied);
  CHECK(a.summary.unsupplied_nodes == 5);
  CHECK(a.summary.unsupplied_nodes == b.summary.unsupplied_nodes);
  for (const char* n : {"B", "C", "D", "E", "F"}) {
    CAPTURE(n);
    CHECK_FALSE(a.nodes[*net.find_node(n)].supplied);
    CHECK(std::isnan(a.nodes[*net.find_node(n)].head_m));
  }
  for (const char* k : {"P1", "P2", "P3", "P4", "P5", "P6"}) {
    CAPTURE(k);
    CHECK_FALSE(a.links[*net.find_pipe(k)].open);
    CHECK(a.links[*net.find_pipe(k)].flow_m3s == 0.0);
  }
}

TEST_CASE("a session keeps one reduction and one analysis across cases, and warm starts map onto chains") {
  Network net = testing::load("tests/networks/branches_chains.gln");
  SolverSession session;
  const SolveResult first = session.solve(net, reducing(), case_demands(net, net.cases[0]));
  REQUIRE(first.summary.converged());
  REQUIRE(first.summary.reduction.applied);
  std::vector<double> flows;
  for (const LinkState& l : first.links) flows.push_back(l.flow_m3s);
  const SolveResult again = session.solve(net, reducing(), case_demands(net, net.cases[0]), &flows);
  REQUIRE(again.summary.converged());
  CHECK(again.summary.iterations <= 1);
  const SolveResult other = session.solve(net, reducing(), case_demands(net, net.cases[1]), &flows);
  REQUIRE(other.summary.converged());
  // The session refreshed its kept core problem in place: the same answer as a fresh solve.
  const SolveResult fresh = solve(net, reducing(), case_demands(net, net.cases[1]));
  REQUIRE(fresh.summary.converged());
  for (std::size_t n = 0; n < net.nodes.size(); ++n) {
    CHECK(std::abs(other.nodes[n].head_m - fresh.nodes[n].head_m) < kSameHead_m);
  }
  CHECK(session.symbolic_analyses() == 1);
}

TEST_CASE("small networks are solved unreduced unless asked") {
  Network net = testing::load("tests/networks/branches_chains.gln");
  CHECK_FALSE(solve(net).summary.reduction.applied);
  CHECK(solve(net, reducing()).summary.reduction.applied);
}

// A random 70,000-node spanning tree with one loop-closing pipe per ten nodes, a few closed
// pipes and two reservoirs: large enough for every per-link loop of the reduction, the
// solver and the recovery to run on all cores (20,000 elements and up).
Network random_tree_network() {
  Network net;
  std::uint64_t state = 12345;
  auto next = [&state](std::uint64_t n) {  // a fixed linear congruential sequence
    state = state * 6364136223846793005ull + 1442695040888963407ull;
    return (state >> 33) % n;
  };
  for (int s = 0; s < 2; ++s) {
    Node r;
    r.id = "R" + std::to_string(s);
    r.kind = NodeKind::kReservoir;
    r.head_m = 90.0 + 5.0 * s;
    net.add_node(r);
  }
  const int junctions = 70000;
  std::vector<std::size_t> parent(junctions);
  auto add_pipe = [&](const std::string& id, std::size_t a, std::size_t b, double d_m, bool open) {
    Pipe p;
    p.id = id;
    p.from = a;
    p.to = b;
    p.length_m = 50.0 + static_cast<double>(next(100));
    p.diameter_m = d_m;
    p.roughness_m = 1e-4;
    p.status = open ? LinkStatus::kOpen : LinkStatus::kClosed;
    net.add_pipe(p);
  };
  for (int i = 0; i < junctions; ++i) {
    Node n;
    n.id = "J" + std::to_string(i);
    n.elevation_m = 10.0 + static_cast<double>(next(20));
    n.demand_m3s = 1e-5 * static_cast<double>(1 + next(20));
    const std::size_t index = net.add_node(n);
    // Mostly extend one of the last few nodes (long branches), sometimes branch anywhere.
    parent[i] = i == 0 ? 0 : next(10) < 8 ? 2 + (i - 1 - next(std::min(i, 8))) : 2 + next(i);
    add_pipe("T" + std::to_string(i), i == 0 ? 0 : parent[i], index, i < 50 ? 0.5 : 0.15,
             next(500) != 0);
  }
  add_pipe("S1", 1, 2 + junctions / 2, 0.4, true);
  for (int l = 0; l < junctions / 10; ++l) {
    const std::size_t a = 2 + next(junctions);
    std::size_t b = a;
    for (int up = 0; up < 3; ++up) b = b >= 2 && b - 2 < parent.size() ? parent[b - 2] : b;
    if (b != a && b >= 2) add_pipe("L" + std::to_string(l), a, b, 0.1, true);
  }
  return net;
}

TEST_CASE("on a random 70,000-node tree with local loops, reduced and unreduced solves agree") {
  // Both solves must meet the tolerances and agree.
  const Network net = random_tree_network();
  const std::vector<double> demand = testing::base_demand(net);
  const SolveResult a = solve_with(net, true, demand), b = solve_with(net, false, demand);
  REQUIRE_MESSAGE(a.summary.converged(), a.summary.message);
  REQUIRE_MESSAGE(b.summary.converged(), b.summary.message);
  CHECK(a.summary.reduction.applied);
  CHECK(a.summary.reduction.tree_links > 1000);
  CHECK(a.summary.reduction.chains > 100);
  CHECK(a.summary.unsupplied_nodes == b.summary.unsupplied_nodes);
  // Both solves must satisfy the equations to their tolerances (checked below); they need not
  // stop at the same point within them. Flows may differ by up to the continuity tolerance,
  // and a branch thousands of links deep sums dh/dQ x that difference (up to about 1e-7 m per
  // link on its busiest mains) and the energy residuals of every link on the way, so heads far
  // out may differ by a few tenths of a millimetre; 1 mm is the bound checked.
  constexpr double kDeepSameHead_m = 1e-3;
  double worst_head = 0.0, worst_flow = 0.0;
  for (std::size_t n = 0; n < net.nodes.size(); ++n) {
    REQUIRE(a.nodes[n].supplied == b.nodes[n].supplied);
    if (b.nodes[n].supplied) worst_head = std::max(worst_head, std::abs(a.nodes[n].head_m - b.nodes[n].head_m));
  }
  for (std::size_t k = 0; k < net.pipes.size(); ++k) {
    worst_flow = std::max(worst_flow, std::abs(a.links[k].flow_m3s - b.links[k].flow_m3s));
  }
  MESSAGE("70,000 junctions: worst head difference " << worst_head << " m, flow " << worst_flow
          << " m3/s; " << a.summary.reduction.core_junctions << " junctions and "
          << a.summary.reduction.core_links << " links left, " << a.summary.iterations
          << " against " << b.summary.iterations << " iterations");
  CHECK(worst_head < kDeepSameHead_m);
  CHECK(worst_flow < kSameFlow_m3s);
  for (const SolveResult* r : {&a, &b}) {
    CHECK(r->summary.max_energy_residual_m <= SolveOptions{}.energy_tolerance_m);
    CHECK(r->summary.max_continuity_residual_m3s <= SolveOptions{}.continuity_tolerance_m3s);
    CHECK(check_result(net, demand, *r, reducing()).ok);
  }
}

TEST_CASE("after a reduced solve shared among the cores, the norms are those of the elements") {
  // The recovery forms the residual norms on all cores, each keeping the first worst of its
  // share; they must be what one pass in file order gives: the largest |residual|, at the
  // first element that has it, and the count of unsupplied nodes.
  const Network net = random_tree_network();
  const SolveResult r = solve_with(net, true, testing::base_demand(net));
  REQUIRE(r.summary.converged());
  double continuity = 0.0, energy = 0.0;
  std::size_t worst_node = 0, worst_link = 0, unsupplied = 0;
  for (std::size_t n = 0; n < r.nodes.size(); ++n) {
    unsupplied += !r.nodes[n].supplied;
    if (std::abs(r.nodes[n].continuity_residual_m3s) > continuity) {
      continuity = std::abs(r.nodes[n].continuity_residual_m3s);
      worst_node = n;
    }
  }
  for (std::size_t k = 0; k < r.links.size(); ++k) {
    if (std::abs(r.links[k].energy_residual_m) > energy) {
      energy = std::abs(r.links[k].energy_residual_m);
      worst_link = k;
    }
  }
  CHECK(r.summary.max_continuity_residual_m3s == continuity);
  CHECK(r.summary.worst_continuity_node == worst_node);
  CHECK(r.summary.max_energy_residual_m == energy);
  CHECK(r.summary.worst_energy_link == worst_link);
  CHECK(r.summary.unsupplied_nodes == unsupplied);
  CHECK(unsupplied > 0);  // the closed pipes cut some branches off
}

TEST_CASE("a large solve gives the same bits on one core as on several") {
  // Every loop shared among the cores, and every stage run beside another, must leave the
  // result independent of the thread count (DEVELOPERS.md): heads, flows and the summary's
  // residuals are compared exactly, reduced and unreduced.
#if defined(_OPENMP)
  const Network net = random_tree_network();
  const std::vector<double> demand = testing::base_demand(net);
  const int threads = omp_get_max_threads();
  for (bool reduced : {true, false}) {
    CAPTURE(reduced);
    omp_set_num_threads(1);
    const SolveResult one = solve_with(net, reduced, demand);
    omp_set_num_threads(std::max(2, threads));
    const SolveResult many = solve_with(net, reduced, demand);
    omp_set_num_threads(threads);
    REQUIRE(one.summary.converged());
    REQUIRE(many.summary.converged());
    CHECK(one.summary.iterations == many.summary.iterations);
    CHECK(one.summary.max_energy_residual_m == many.summary.max_energy_residual_m);
    CHECK(one.summary.max_continuity_residual_m3s == many.summary.max_continuity_residual_m3s);
    CHECK(one.summary.worst_energy_link == many.summary.worst_energy_link);
    std::size_t differing = 0;
    for (std::size_t n = 0; n < net.nodes.size(); ++n) {
      const double a = one.nodes[n].head_m, b = many.nodes[n].head_m;
      differing += !(a == b || (std::isnan(a) && std::isnan(b)));
    }
    for (std::size_t k = 0; k < net.pipes.size(); ++k) {
      differing += one.links[k].flow_m3s != many.links[k].flow_m3s;
    }
    CHECK(differing == 0);
  }
#else
  MESSAGE("built without OpenMP: one thread only");
#endif
}
