// Control valves: a PRV holds its downstream setting, runs fully open when the upstream head
// is too low, and does not cycle at zero demand; an FCV holds its flow with the head loss of an
// independent calculation; a cold-start network with 3 pumps, 4 PRVs and 2 tanks converges
// with every mode consistent with the final heads and flows.
#include <doctest/doctest.h>

#include <cmath>
#include <fstream>
#include <nlohmann/json.hpp>

#include "analysis/self_check.h"
#include "hydraulics/link_law.h"
#include "gradeline/solver.h"
#include "io/parser.h"
#include "model/demand_cases.h"
#include "test_support.h"

using namespace gradeline;

namespace {
constexpr double kSettingTol_m = 1e-6;


void check_consistent(const Network& net, const SolveResult& r) {
  SelfCheck c = check_result(net, testing::base_demand(net), r, {});
  CHECK_MESSAGE(c.ok, c.failure);
}
}  // namespace

TEST_CASE("a PRV holds the downstream pressure at its setting when the upstream head allows") {
  Network net = testing::load("tests/networks/prv_zone.gln");
  SolveResult r = solve(net);
  REQUIRE_MESSAGE(r.summary.converged(), r.summary.message);
  const std::size_t v = *net.find_pipe("V1");
  CHECK(r.links[v].valve_mode == ValveMode::kActive);
  const NodeState& b = r.nodes[*net.find_node("B")];
  CHECK(b.pressure_pa == doctest::Approx(300e3).epsilon(1e-9));  // 300 kPa as set
  CHECK(r.links[v].flow_m3s == doctest::Approx(9e-3).epsilon(1e-9));  // all of the low zone
  check_consistent(net, r);
}

TEST_CASE("a PRV whose upstream head is below its setting runs fully open, and says so") {
  Network net = testing::load("tests/networks/prv_zone.gln");
  net.nodes[*net.find_node("HIGH")].head_m = 48.0;  // setting is 50.65 m of head at B
  SolveResult r = solve(net);
  REQUIRE_MESSAGE(r.summary.converged(), r.summary.message);
  const std::size_t v = *net.find_pipe("V1");
  CHECK(r.links[v].valve_mode == ValveMode::kOpen);
  CHECK(r.nodes[*net.find_node("B")].head_m < net.pipes[v].control().valve_head_m);
  check_consistent(net, r);
}

TEST_CASE("at zero demand downstream the PRV does not cycle") {
  Network net = testing::load("tests/networks/prv_zone.gln");
  for (const char* id : {"B", "C", "D"}) net.nodes[*net.find_node(id)].demand_m3s = 0.0;
  SolveResult r = solve(net);
  REQUIRE_MESSAGE(r.summary.converged(), r.summary.message);
  CHECK(r.summary.iterations < 15);
  const std::size_t v = *net.find_pipe("V1");
  CHECK(std::abs(r.links[v].flow_m3s) < 1e-9);
  CHECK(r.nodes[*net.find_node("B")].supplied);
  check_consistent(net, r);
}

TEST_CASE("a PRV closes when the downstream head is above its setting from another source") {
  Network net = testing::parse_or_fail(
      "fluid viscosity=1e-6m2/s density=998kg/m3\ndefaults roughness=0.1\n"
      "reservoir HIGH head=100\nreservoir LOWTANK head=60\nnode A elevation=40 demand=1\n"
      "node B elevation=20 demand=2\npipe P1 HIGH A length=500 diameter=150\n"
      "valve V A B type=prv diameter=100 head=55m\npipe P2 LOWTANK B length=200 diameter=150\n");
  SolveResult r = solve(net);
  REQUIRE_MESSAGE(r.summary.converged(), r.summary.message);
  CHECK(r.links[*net.find_pipe("V")].valve_mode == ValveMode::kClosed);
  CHECK(r.links[*net.find_pipe("V")].flow_m3s == 0.0);
  check_consistent(net, r);
}

TEST_CASE("an FCV holds its flow, with the head loss of an independent calculation") {
  // tests/reference/fcv_line.json (tools/reference_valves.py, fluids' Colebrook).
  std::ifstream in(testing::source_path("tests/reference/fcv_line.json"));
  nlohmann::json ref = nlohmann::json::parse(in);
  Network net = testing::load("tests/networks/fcv_line.gln");
  SolveResult r = solve(net);
  REQUIRE_MESSAGE(r.summary.converged(), r.summary.message);
  const std::size_t f = *net.find_pipe("F1");
  CHECK(r.links[f].valve_mode == ValveMode::kActive);
  CHECK(r.links[f].flow_m3s == doctest::Approx(0.015).epsilon(1e-12));
  CHECK(r.links[f].headloss_m == doctest::Approx(ref["valve_headloss_m"].get<double>()).epsilon(1e-8));
  CHECK(r.nodes[*net.find_node("J1")].head_m == doctest::Approx(ref["head_J1_m"].get<double>()).epsilon(1e-9));
  check_consistent(net, r);
}

TEST_CASE("an FCV that cannot pass its flow runs open") {
  Network net = testing::load("tests/networks/fcv_line.gln");
  net.pipes[*net.find_pipe("F1")].edit_control().valve_flow_m3s = 0.5;  // far more than 40 m of head can drive
  SolveResult r = solve(net);
  REQUIRE_MESSAGE(r.summary.converged(), r.summary.message);
  CHECK(r.links[*net.find_pipe("F1")].valve_mode == ValveMode::kOpen);
  CHECK(r.links[*net.find_pipe("F1")].flow_m3s < 0.5);
}

TEST_CASE("a PSV keeps the upstream head at its setting") {
  Network net = testing::parse_or_fail(
      "fluid viscosity=1e-6m2/s density=998kg/m3\ndefaults roughness=0.1\n"
      "reservoir R head=70\nreservoir LOW head=20\nnode A elevation=30 demand=1\n"
      "node B elevation=0 demand=2\npipe P1 R A length=2000 diameter=150\n"
      "valve S A B type=psv diameter=150 pressure=300kPa\npipe P2 LOW B length=300 diameter=150\n");
  SolveResult r = solve(net);
  REQUIRE_MESSAGE(r.summary.converged(), r.summary.message);
  CHECK(r.links[*net.find_pipe("S")].valve_mode == ValveMode::kActive);
  CHECK(r.nodes[*net.find_node("A")].pressure_pa == doctest::Approx(300e3).epsilon(1e-9));
  check_consistent(net, r);
}

TEST_CASE("a throttle valve loses K V^2/2g") {
  Network net = testing::parse_or_fail(
      "fluid viscosity=1e-6m2/s density=998kg/m3\nreservoir R head=50\nnode A elevation=0 demand=10\n"
      "valve T R A type=throttle diameter=100 minor=8\n");
  SolveResult r = solve(net);
  REQUIRE(r.summary.converged());
  const double v = 0.01 / (M_PI * 0.01 / 4);
  CHECK(50.0 - r.nodes[1].head_m ==
        doctest::Approx(8 * v * v / (2 * kGravity_ms2) + kValveLinearResistance * 0.01).epsilon(1e-9));
}

TEST_CASE("a throttle given as a fixed head loss loses that head at working flows") {
  Network net = testing::parse_or_fail(
      "fluid viscosity=1e-6m2/s density=998kg/m3\nreservoir R head=50\nnode A elevation=0 demand=10\n"
      "valve T R A type=throttle diameter=100 loss=6.5m\n");
  SolveResult r = solve(net);
  REQUIRE(r.summary.converged());
  // 6.5 m times Q/sqrt(Q^2 + qs^2), plus the 1e-3 s/m^2 linear term: 6.49997 + 1e-5 m.
  CHECK(50.0 - r.nodes[1].head_m == doctest::Approx(6.5).epsilon(1e-4));
}

TEST_CASE("the fixed-loss throttle's dh/dQ matches finite differences") {
  Pipe p;
  p.kind = LinkKind::kThrottle;
  p.diameter_m = 0.1;
  p.edit_control().valve_loss_m = 6.5;
  PipeLaw law = make_pipe_law(p, {}, {}, 1e-8);
  for (double q : {-1e-3, 1e-5, 1e-4, 0.01}) {
    const double step = 1e-4 * std::abs(q);
    const double fd = (evaluate_pipe(law, q + step).headloss_m - evaluate_pipe(law, q - step).headloss_m) / (2 * step);
    CHECK(evaluate_pipe(law, q).dh_dq == doctest::Approx(fd).epsilon(1e-5));
  }
}

TEST_CASE("3 pumps, 4 PRVs and 2 tanks converge from a cold start with consistent modes") {
  Network net = testing::load("networks/quarry_hill.gln");
  for (const DemandCase& c : net.cases) {
    CAPTURE(c.name);
    std::vector<double> q = case_demands(net, c);
    SolveResult r = solve(net, {}, q);
    REQUIRE_MESSAGE(r.summary.converged(), r.summary.message);
    CHECK(r.summary.iterations <= 12);
    CHECK(check_result(net, q, r, {}).ok);
    for (std::size_t k = 0; k < net.pipes.size(); ++k) {
      const Pipe& p = net.pipes[k];
      if (p.kind != LinkKind::kPrv || r.links[k].valve_mode != ValveMode::kActive) continue;
      CHECK(std::abs(r.nodes[p.to].head_m - p.control().valve_head_m) < kSettingTol_m);
      CHECK(r.links[k].flow_m3s >= 0.0);
    }
  }
}

TEST_CASE("valve errors") {
  ParseResult r = parse_network_text(
      "reservoir R head=10\nnode A elevation=0\n"
      "valve V1 R A diameter=100\nvalve V2 R A type=gate diameter=100\n"
      "valve V3 R A type=prv diameter=100\nvalve V4 R A type=fcv diameter=100\n",
      "net.gln");
  std::string all;
  for (const auto& e : r.errors) all += e.format() + "\n";
  CHECK(all ==
        "net.gln:3: error: valve 'V1': missing required key 'type'\n"
        "net.gln:4: error: valve type must be prv, psv, fcv or throttle, got 'gate'\n"
        "net.gln:5: error: valve 'V3': give the setting as pressure= or head=\n"
        "net.gln:6: error: valve 'V4': missing required key 'flow'\n");
}
