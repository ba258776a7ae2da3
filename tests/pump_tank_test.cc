// Pumps and tanks: the operating point against an independent pump-curve/system-curve
// intersection (scipy brentq), the affinity laws, the non-return function, and tanks.
#include <doctest/doctest.h>

#include <cmath>
#include <fstream>
#include <nlohmann/json.hpp>

#include "gradeline/solver.h"
#include "hydraulics/link_law.h"
#include "io/element_reader.h"
#include "io/parser.h"
#include "report/pump_point.h"
#include "test_support.h"

using namespace gradeline;

namespace {
constexpr double kFlowRelTol = 1e-8;

Pipe pump_with(double speed) {
  Pipe p;
  p.kind = LinkKind::kPump;
  p.edit_control().curve.points = {{0.0, 60.0}, {0.040, 50.0}, {0.070, 35.0}};
  REQUIRE(fit_pump_curve(&p.edit_control().curve).empty());
  p.edit_control().speed = speed;
  return p;
}

PipeLaw law_of(const Pipe& p) { return make_pipe_law(p, {}, {}, 1e-8); }
}  // namespace

TEST_CASE("the pump's operating point is where its curve meets the system curve (scipy brentq)") {
  // tests/reference/pump_lift.json from tools/reference_pump.py.
  std::ifstream in(testing::source_path("tests/reference/pump_lift.json"));
  nlohmann::json ref = nlohmann::json::parse(in);
  for (const char* key : {"speed_1", "speed_0.9"}) {
    CAPTURE(key);
    Network net = testing::load("tests/networks/pump_lift.gln");
    net.pipes[*net.find_pipe("PS1")].edit_control().speed = std::string(key) == "speed_1" ? 1.0 : 0.9;
    SolveResult r = solve(net);
    REQUIRE_MESSAGE(r.summary.converged(), r.summary.message);
    const std::size_t k = *net.find_pipe("PS1");
    CHECK(r.links[k].flow_m3s == doctest::Approx(ref[key]["flow_m3s"].get<double>()).epsilon(kFlowRelTol));
    CHECK(-r.links[k].headloss_m == doctest::Approx(ref[key]["head_m"].get<double>()).epsilon(kFlowRelTol));
  }
}

TEST_CASE("a three-point fit passes through its points") {
  Pipe p = pump_with(1.0);
  for (const auto& [q, h] : p.control().curve.points) {
    CHECK(-evaluate_pipe(law_of(p), q).headloss_m == doctest::Approx(h).epsilon(1e-9));
  }
}

TEST_CASE("affinity laws: at half speed the curve scales as Q ~ N and H ~ N^2") {
  // H_s(s Q) = s^2 H_1(Q): the pump affinity laws (similarity of velocity triangles).
  const PipeLaw full = law_of(pump_with(1.0)), half = law_of(pump_with(0.5));
  for (double q : {0.01, 0.03, 0.05}) {
    CHECK(evaluate_pipe(half, 0.5 * q).headloss_m ==
          doctest::Approx(0.25 * evaluate_pipe(full, q).headloss_m).epsilon(1e-8));
  }
}

TEST_CASE("the pump's dh/dQ matches finite differences, near zero flow too") {
  const PipeLaw law = law_of(pump_with(0.8));
  // The difference is taken against the 38 m shut-off head, so round-off limits it near Q = 0:
  // there (Q = 1e-7, inside the regularisation) the tolerance is 1e-3.
  for (double q : {1e-7, 1e-4, 0.02, 0.06}) {
    const double step = 1e-3 * q;
    const double fd = (evaluate_pipe(law, q + step).headloss_m - evaluate_pipe(law, q - step).headloss_m) /
                      (2 * step);
    CAPTURE(q);
    CHECK(evaluate_pipe(law, q).dh_dq == doctest::Approx(fd).epsilon(q < 1e-6 ? 1e-3 : 1e-6));
    CHECK(evaluate_pipe(law, q).dh_dq > 0.0);
  }
}

TEST_CASE("a pump facing more head than its shut-off head closes and never runs backwards") {
  Network net = testing::load("tests/networks/pump_lift.gln");
  net.nodes[*net.find_node("SUMP")].head_m = -10.0;  // lift 69 m > 60 m shut-off
  SolveResult r = solve(net);
  REQUIRE_MESSAGE(r.summary.converged(), r.summary.message);
  const std::size_t k = *net.find_pipe("PS1");
  CHECK_FALSE(r.links[k].open);
  CHECK(r.links[k].flow_m3s == 0.0);
  CHECK(std::string(pump_point(net, net.pipes[k], r.links[k]).mode) == "closed (non-return)");
}

TEST_CASE("a pump switched off carries nothing and says so") {
  Network net = testing::load("tests/networks/pump_lift.gln");
  net.pipes[*net.find_pipe("PS1")].status = LinkStatus::kClosed;
  SolveResult r = solve(net);
  REQUIRE(r.summary.converged());
  const std::size_t k = *net.find_pipe("PS1");
  CHECK(r.links[k].flow_m3s == 0.0);
  CHECK(std::string(pump_point(net, net.pipes[k], r.links[k]).mode) == "off");
}

TEST_CASE("hydraulic power is rho g Q H") {
  Network net = testing::load("tests/networks/pump_lift.gln");
  SolveResult r = solve(net);
  const std::size_t k = *net.find_pipe("PS1");
  PumpPoint pp = pump_point(net, net.pipes[k], r.links[k]);
  CHECK(pp.hydraulic_power_w ==
        doctest::Approx(998 * kGravity_ms2 * r.links[k].flow_m3s * pp.head_gain_m));
  CHECK(pp.on_curve);
}

TEST_CASE("a tank holds the head of its bottom plus its level") {
  Network net = testing::load("tests/networks/pump_lift.gln");
  const Node& tank = net.nodes[*net.find_node("UPPER")];
  CHECK(tank.head_m == 59.0);
  CHECK(tank.is_fixed_head());
  CHECK_FALSE(tank.receives_only());
}

TEST_CASE("a tank at its minimum level cannot supply, but may still fill") {
  const char* base =
      "fluid viscosity=1e-6m2/s density=998kg/m3\ndefaults roughness=0.1\n"
      "reservoir R head=40\ntank T bottom=45 level=%s min_level=1\n"
      "node A elevation=0 demand=5\npipe P1 R A length=500 diameter=150\n"
      "pipe P2 T A length=200 diameter=150\n";
  char text[512];
  std::snprintf(text, sizeof text, base, "1");  // at its minimum: head 46 m but cannot supply
  Network empty = testing::parse_or_fail(text);
  SolveResult r = solve(empty);
  REQUIRE_MESSAGE(r.summary.converged(), r.summary.message);
  CHECK(r.links[1].flow_m3s == 0.0);
  CHECK(r.links[0].flow_m3s == doctest::Approx(5e-3).epsilon(1e-12));
  std::snprintf(text, sizeof text, base, "3");  // above its minimum: it supplies
  Network full = testing::parse_or_fail(text);
  SolveResult s = solve(full);
  REQUIRE(s.summary.converged());
  CHECK(s.links[1].flow_m3s > 0.0);
}

TEST_CASE("pump and tank errors") {
  ParseResult r = parse_network_text(
      "reservoir R head=10\nnode A elevation=0\n"
      "pump P1 R A\npump P2 R A curve=0:50m,10L/s:55m,20L/s:30m\npump P3 R A curve=10L/s\n"
      "tank T level=2\ntank U bottom=1 level=5 max_level=4\n",
      "net.gln");
  std::string all;
  for (const auto& e : r.errors) all += e.format() + "\n";
  CHECK(all ==
        "net.gln:3: error: pump 'P1': missing required key 'curve'\n"
        "net.gln:4: error: pump 'P2': curve heads must fall as the flow rises\n"
        "net.gln:5: error: curve points are FLOW:HEAD, got '10L/s'\n"
        "net.gln:6: error: tank 'T': missing required key 'bottom'\n"
        "net.gln:7: error: tank 'U': level is above max_level\n");
}
