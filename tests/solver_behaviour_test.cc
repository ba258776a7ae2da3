// Behaviour of the solver on tiny hand-solvable cases: unsupplied zones, check valves,
// zero demand, non-convergence, and the reported residuals.
#include <doctest/doctest.h>

#include <cmath>
#include <string>

#include "gradeline/solver.h"
#include "test_support.h"

using namespace gradeline;
using gradeline::testing::parse_or_fail;

namespace {
const char* kFluid = "fluid viscosity=1.0e-6m2/s density=998kg/m3\ndefaults roughness=0.1\n";
}

TEST_CASE("zero demand everywhere gives zero flow and hydrostatic heads") {
  Network net = parse_or_fail(std::string(kFluid) +
                              "reservoir R head=50\nnode A elevation=10\nnode B elevation=20\n"
                              "pipe P1 R A length=100 diameter=100\npipe P2 A B length=100 diameter=100\n"
                              "pipe P3 R B length=100 diameter=100\n");
  SolveResult r = solve(net);
  REQUIRE(r.summary.converged());
  for (const LinkState& l : r.links) CHECK(std::abs(l.flow_m3s) < 1e-12);
  CHECK(r.nodes[1].head_m == doctest::Approx(50.0).epsilon(1e-12));
  CHECK(r.nodes[2].pressure_m == doctest::Approx(30.0).epsilon(1e-12));
}

TEST_CASE("a zone cut off by closed pipes is unsupplied and the rest still solves") {
  Network net = parse_or_fail(std::string(kFluid) +
                              "reservoir R head=50\nnode A elevation=0 demand=5\n"
                              "node B elevation=0 demand=2\nnode C elevation=0 demand=1\n"
                              "pipe P1 R A length=100 diameter=150\n"
                              "pipe P2 A B length=100 diameter=100 status=closed\n"
                              "pipe P3 B C length=100 diameter=100\n");
  SolveResult r = solve(net);
  REQUIRE(r.summary.converged());
  CHECK(r.summary.unsupplied_nodes == 2);
  CHECK(r.nodes[1].supplied);
  CHECK_FALSE(r.nodes[2].supplied);
  CHECK(std::isnan(r.nodes[2].head_m));
  CHECK(r.links[0].flow_m3s == doctest::Approx(5e-3).epsilon(1e-12));
  CHECK(r.links[2].flow_m3s == 0.0);
  CHECK_FALSE(r.links[2].open);
}

TEST_CASE("a check valve closes against reverse flow and the result says so") {
  // HIGH feeds A; the valve on LOW -> A would see A's head above LOW's, so it must close.
  Network net = parse_or_fail(std::string(kFluid) +
                              "reservoir HIGH head=80\nreservoir LOW head=40\n"
                              "node A elevation=0 demand=3\n"
                              "pipe P1 HIGH A length=500 diameter=150\n"
                              "pipe CV LOW A length=100 diameter=150 check=yes\n");
  SolveResult r = solve(net);
  REQUIRE_MESSAGE(r.summary.converged(), r.summary.message);
  CHECK(r.links[1].closed_by_check_valve);
  CHECK(r.links[1].flow_m3s == 0.0);
  CHECK(r.links[0].flow_m3s == doctest::Approx(3e-3).epsilon(1e-12));
  CHECK(r.nodes[2].head_m > 40.0);  // consistent: the head across the closed valve opposes flow
}

TEST_CASE("a check valve in the direction of flow stays open") {
  Network net = parse_or_fail(std::string(kFluid) +
                              "reservoir HIGH head=80\nnode A elevation=0 demand=3\n"
                              "pipe CV HIGH A length=500 diameter=150 check=yes\n");
  SolveResult r = solve(net);
  REQUIRE(r.summary.converged());
  CHECK_FALSE(r.links[0].closed_by_check_valve);
  CHECK(r.links[0].flow_m3s == doctest::Approx(3e-3).epsilon(1e-12));
}

TEST_CASE("demand above what the source can deliver gives negative pressure, reported as such") {
  Network net = parse_or_fail(std::string(kFluid) +
                              "reservoir R head=20\nnode A elevation=15 demand=60\n"
                              "pipe P R A length=2000 diameter=100\n");
  SolveResult r = solve(net);
  REQUIRE(r.summary.converged());
  CHECK(r.nodes[1].pressure_m < 0.0);
  CHECK(r.nodes[1].pressure_pa < 0.0);
}

TEST_CASE("an iteration limit too small is reported as not converged, with the worst element") {
  Network net = testing::load("tests/networks/loop_two_sources.gln");
  SolveOptions options;
  options.max_iterations = 1;
  SolveResult r = solve(net, options);
  CHECK_FALSE(r.summary.converged());
  CHECK(r.summary.termination == Termination::kMaxIterations);
  CHECK(r.summary.message.find("no convergence after 1 iterations: largest energy residual") == 0);
}

TEST_CASE("invalid options are refused before any work") {
  SolveOptions options;
  options.energy_tolerance_m = -1.0;
  CHECK(options.validate() == "energy_tolerance_m must be positive");
  SolveResult r = solve(testing::load("tests/networks/loop_hazen.gln"), options);
  CHECK(r.summary.termination == Termination::kInvalidOptions);
}

TEST_CASE("converged residuals are below the tolerances and match an independent recount") {
  Network net = testing::load("networks/brindlemoor.gln");
  SolveOptions options;
  SolveResult r = solve(net, options);
  REQUIRE(r.summary.converged());
  CHECK(r.summary.max_energy_residual_m <= options.energy_tolerance_m);
  CHECK(r.summary.max_continuity_residual_m3s <= options.continuity_tolerance_m3s);
  CHECK(testing::max_continuity_m3s(net, r) <= options.continuity_tolerance_m3s);
}

TEST_CASE("pipes 1 mm and 5 m in diameter, 0.1 m and 50 km long, solve together") {
  Network net = parse_or_fail(std::string(kFluid) +
                              "reservoir R head=100\nnode A elevation=0 demand=500\n"
                              "node B elevation=0 demand=0.001\nnode C elevation=0 demand=1\n"
                              "pipe BIG R A length=50km diameter=5m\n"
                              "pipe TINY A B length=0.1m diameter=1mm roughness=0\n"
                              "pipe MID A C length=300 diameter=100\n");
  SolveResult r = solve(net);
  REQUIRE_MESSAGE(r.summary.converged(), r.summary.message);
  CHECK(testing::max_continuity_m3s(net, r) < 1e-9);
}

TEST_CASE("links outside loops keep their evaluation once continuity has fixed their flows") {
  // A tree R-A-{B, C}: after the first step every flow equals the demand downstream of it
  // (continuity alone decides it), so later iterations reuse the link laws, and the solve still
  // meets its tolerances. The trunk carries 4 + 3 + 2 L/s (continuity, exact). The topological
  // reduction would take the whole tree out of the iterations, so it is off here.
  Network net = parse_or_fail(std::string(kFluid) +
                              "reservoir R head=60\nnode A elevation=10 demand=4\n"
                              "node B elevation=12 demand=3\nnode C elevation=11 demand=2\n"
                              "pipe P1 R A length=500 diameter=150\npipe P2 A B length=400 diameter=100\n"
                              "pipe P3 A C length=300 diameter=100\n");
  SolveOptions options;
  options.topological_reduction = false;
  SolveResult r = solve(net, options);
  REQUIRE(r.summary.converged());
  CHECK(r.summary.timing.reused_link_evaluations > 0);
  CHECK(r.links[0].flow_m3s == doctest::Approx(0.009).epsilon(1e-12));
  CHECK(r.summary.max_energy_residual_m <= SolveOptions{}.energy_tolerance_m);
}
