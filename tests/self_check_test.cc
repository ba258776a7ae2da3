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
