// A solver session reuses the symbolic analysis across solves of one topology and gives the
// same answers as fresh solves.
#include <doctest/doctest.h>

#include <cmath>

#include "gradeline/solver.h"
#include "model/demand_cases.h"
#include "test_support.h"

using namespace gradeline;

TEST_CASE("cases solved in one session match fresh solves, with one symbolic analysis") {
  Network net = testing::load("networks/brindlemoor.gln");
  SolverSession session;
  for (const DemandCase& c : net.cases) {
    std::vector<double> q = case_demands(net, c);
    SolveResult a = session.solve(net, {}, q);
    SolveResult b = solve(net, {}, q);
    REQUIRE(a.summary.converged());
    REQUIRE(b.summary.converged());
    for (std::size_t n = 0; n < net.nodes.size(); ++n) {
      CHECK(a.nodes[n].head_m == doctest::Approx(b.nodes[n].head_m).epsilon(1e-12));
    }
  }
  CHECK(session.symbolic_analyses() == 1);
}

TEST_CASE("a resized pipe keeps the analysis; a new pipe forces a new one") {
  Network net = testing::load("tests/networks/loop_hazen.gln");
  std::vector<double> q;
  for (const Node& n : net.nodes) q.push_back(n.demand_m3s);
  SolverSession session;
  REQUIRE(session.solve(net, {}, q).summary.converged());
  net.pipes[2].diameter_m *= 1.5;
  REQUIRE(session.solve(net, {}, q).summary.converged());
  CHECK(session.symbolic_analyses() == 1);
  Pipe extra = net.pipes[3];
  extra.id = "EXTRA";
  net.add_pipe(extra);
  REQUIRE(session.solve(net, {}, q).summary.converged());
  CHECK(session.symbolic_analyses() == 2);
}

TEST_CASE("a warm start from the solution converges at once to the same answer") {
  Network net = testing::load("tests/networks/loop_two_sources.gln");
  std::vector<double> q;
  for (const Node& n : net.nodes) q.push_back(n.demand_m3s);
  SolverSession session;
  SolveResult cold = session.solve(net, {}, q);
  REQUIRE(cold.summary.converged());
  std::vector<double> flows;
  for (const LinkState& l : cold.links) flows.push_back(l.flow_m3s);
  SolveResult warm = session.solve(net, {}, q, &flows);
  REQUIRE(warm.summary.converged());
  CHECK(warm.summary.iterations < cold.summary.iterations);
  for (std::size_t n = 0; n < net.nodes.size(); ++n) {
    CHECK(warm.nodes[n].head_m == doctest::Approx(cold.nodes[n].head_m).epsilon(1e-12));
  }
}
