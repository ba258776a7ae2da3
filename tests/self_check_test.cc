// The self-check refuses results that do not satisfy their own equations.
#include <doctest/doctest.h>

#include <limits>

#include "analysis/self_check.h"
#include "gradeline/solver.h"
#include "test_support.h"

using namespace gradeline;

TEST_CASE("a converged result passes the self-check") {
  Network net = testing::load("networks/brindlemoor.gln");
  SolveResult r = solve(net);
  REQUIRE(r.summary.converged());
  CHECK(check_result(net, testing::base_demand(net), r, {}).ok);
}

TEST_CASE("a perturbed head fails the energy check and names the pipe") {
  Network net = testing::load("tests/networks/loop_hazen.gln");
  SolveResult r = solve(net);
  REQUIRE(r.summary.converged());
  r.nodes[*net.find_node("N3")].head_m += 1e-3;
  SelfCheck c = check_result(net, testing::base_demand(net), r, {});
  CHECK_FALSE(c.ok);
  CHECK(c.failure.find("energy residual") != std::string::npos);
}

TEST_CASE("a perturbed flow fails the check") {
  Network net = testing::load("tests/networks/loop_hazen.gln");
  SolveResult r = solve(net);
  REQUIRE(r.summary.converged());
  r.links[*net.find_pipe("T2")].flow_m3s += 1e-6;
  CHECK_FALSE(check_result(net, testing::base_demand(net), r, {}).ok);
}

TEST_CASE("a non-finite value fails the check") {
  Network net = testing::load("tests/networks/loop_hazen.gln");
  SolveResult r = solve(net);
  r.links[0].flow_m3s = std::numeric_limits<double>::quiet_NaN();
  SelfCheck c = check_result(net, testing::base_demand(net), r, {});
  CHECK_FALSE(c.ok);
  CHECK(c.failure == "pipe 'S1' has a non-finite flow or head loss");
}

TEST_CASE("on a network checked on every core, the first failing link in file order is named") {
  // 30,000 pipes in series from one reservoir (above the parallel threshold of 20,000 links),
  // each junction taking 0.01 L/s; two links are then given non-finite flows.
  Network net;
  Node r;
  r.id = "R";
  r.kind = NodeKind::kReservoir;
  r.head_m = 100.0;
  net.add_node(r);
  for (int i = 1; i <= 30000; ++i) {
    Node n;
    n.id = "J" + std::to_string(i);
    n.demand_m3s = 1e-5;
    net.add_node(n);
    Pipe p;
    p.id = "P" + std::to_string(i);
    p.from = static_cast<std::size_t>(i - 1);
    p.to = static_cast<std::size_t>(i);
    p.length_m = 10.0;
    p.diameter_m = 0.3;
    p.roughness_m = 1e-4;
    net.add_pipe(p);
  }
  SolveResult result = solve(net);
  REQUIRE(result.summary.converged());
  CHECK(check_result(net, testing::base_demand(net), result, {}).ok);
  result.links[27000].flow_m3s = std::numeric_limits<double>::quiet_NaN();
  result.links[21000].flow_m3s = std::numeric_limits<double>::infinity();
  const SelfCheck c = check_result(net, testing::base_demand(net), result, {});
  CHECK_FALSE(c.ok);
  CHECK(c.failure == "pipe 'P21001' has a non-finite flow or head loss");
}

TEST_CASE("the reported friction factor only starts the check's own Colebrook iteration") {
  // A correct result with nonsense friction factors still passes (the loss is recomputed from
  // the flow), and nonsense cannot hide a wrong flow.
  Network net = testing::load("tests/networks/loop_two_sources.gln");
  SolveResult r = solve(net);
  REQUIRE(r.summary.converged());
  for (LinkState& l : r.links) l.friction_factor = l.friction_factor > 0.0 ? 1e-6 : 0.0;
  CHECK(check_result(net, testing::base_demand(net), r, {}).ok);
  for (LinkState& l : r.links) l.friction_factor = 0.9;
  CHECK(check_result(net, testing::base_demand(net), r, {}).ok);
  r.links[*net.find_pipe("L3")].flow_m3s *= 1.001;
  CHECK_FALSE(check_result(net, testing::base_demand(net), r, {}).ok);
}
