// The writer round-trips: parse, write, parse gives the same model.
#include <doctest/doctest.h>

#include "io/network_writer.h"
#include "io/parser.h"
#include "test_support.h"

using namespace gradeline;

namespace {

void check_same(const Network& a, const Network& b) {
  CHECK(a.title == b.title);
  CHECK(a.units == b.units);
  CHECK(a.headloss.law == b.headloss.law);
  CHECK(a.headloss.hw_coefficient == b.headloss.hw_coefficient);
  CHECK(a.headloss.hw_flow_exponent == b.headloss.hw_flow_exponent);
  CHECK(a.headloss.hw_diameter_exponent == b.headloss.hw_diameter_exponent);
  CHECK(a.fluid.density_kgm3 == b.fluid.density_kgm3);
  CHECK(a.fluid.kinematic_viscosity_m2s == b.fluid.kinematic_viscosity_m2s);
  REQUIRE(a.nodes.size() == b.nodes.size());
  for (std::size_t i = 0; i < a.nodes.size(); ++i) {
    const Node &x = a.nodes[i], &y = b.nodes[i];
    CHECK(x.id == y.id);
    CHECK(x.kind == y.kind);
    CHECK(x.elevation_m == y.elevation_m);
    CHECK(x.demand_m3s == y.demand_m3s);
    CHECK(x.head_m == y.head_m);
    CHECK(x.at.has_value() == y.at.has_value());
    if (x.at && y.at) {
      CHECK(x.at->x == y.at->x);
      CHECK(x.at->y == y.at->y);
    }
  }
  REQUIRE(a.pipes.size() == b.pipes.size());
  for (std::size_t k = 0; k < a.pipes.size(); ++k) {
    const Pipe &x = a.pipes[k], &y = b.pipes[k];
    CHECK(x.id == y.id);
    CHECK(x.from == y.from);
    CHECK(x.to == y.to);
    CHECK(x.length_m == y.length_m);
    CHECK(x.diameter_m == y.diameter_m);
    CHECK(x.roughness_m == y.roughness_m);
    CHECK(x.cfactor == y.cfactor);
    CHECK(x.minor_k == y.minor_k);
    CHECK(x.status == y.status);
    CHECK(x.check_valve == y.check_valve);
  }
  REQUIRE(a.cases.size() == b.cases.size());
  for (std::size_t c = 0; c < a.cases.size(); ++c) {
    CHECK(a.cases[c].name == b.cases[c].name);
    CHECK(a.cases[c].factor == b.cases[c].factor);
    CHECK(a.cases[c].category_factors == b.cases[c].category_factors);
    CHECK(a.cases[c].draws_m3s == b.cases[c].draws_m3s);
  }
  CHECK(a.limits.min_pressure_m == b.limits.min_pressure_m);
  CHECK(a.limits.max_pressure_m == b.limits.max_pressure_m);
  CHECK(a.limits.max_velocity_ms == b.limits.max_velocity_ms);
  REQUIRE(a.case_limits.size() == b.case_limits.size());
  for (std::size_t c = 0; c < a.case_limits.size(); ++c) {
    CHECK(a.case_limits[c].case_name == b.case_limits[c].case_name);
    CHECK(a.case_limits[c].criteria.min_pressure_m == b.case_limits[c].criteria.min_pressure_m);
    CHECK(a.case_limits[c].criteria.max_velocity_ms == b.case_limits[c].criteria.max_velocity_ms);
  }
  for (std::size_t i = 0; i < a.nodes.size(); ++i) {
    CHECK(a.nodes[i].demand_category == b.nodes[i].demand_category);
  }
}

}  // namespace

TEST_CASE("write then parse reproduces every shipped network exactly") {
  for (const char* file : {"networks/brindlemoor.gln", "tests/networks/two_loop.gln",
                           "tests/networks/loop_two_sources.gln", "tests/networks/pump_lift.gln", "networks/quarry_hill.gln", "tests/networks/fcv_line.gln",
                           "tests/networks/loop_minor_closed.gln", "tests/networks/loop_hazen.gln"}) {
    CAPTURE(file);
    Network first = testing::load(file);
    std::string text = write_network(first);
    ParseResult second = parse_network_text(text, "written.gln");
    for (const auto& e : second.errors) FAIL_CHECK(e.format());
    REQUIRE(second.ok());
    check_same(first, second.network);
    CHECK(write_network(second.network) == text);
  }
}

TEST_CASE("US networks round-trip too") {
  Network first = testing::parse_or_fail(
      "units US\nreservoir R head=300 at=1.5,2\nnode A elevation=100 demand=50\n"
      "pipe P R A length=1000 diameter=8 roughness=0.01 check=yes\n");
  ParseResult second = parse_network_text(write_network(first), "written.gln");
  REQUIRE(second.ok());
  check_same(first, second.network);
}

TEST_CASE("exact_number gives the shortest text that reads back exactly") {
  CHECK(exact_number(0.3) == "0.3");
  CHECK(exact_number(0.1 + 0.2) == "0.30000000000000004");
  CHECK(exact_number(1e-6) == "1e-06");
}

TEST_CASE("a network large enough to be written in blocks on every core round-trips") {
  // 30,000 nodes and pipes in a chain with side branches, varied values and optional keys.
  std::string text = "units SI\ndefaults roughness=0.15\nreservoir R head=70 at=0,0\n";
  constexpr int kNodes = 30000;
  for (int i = 0; i < kNodes; ++i) {
    text += "node N" + std::to_string(i) + " elevation=" + std::to_string(10 + i % 29) + "." +
            std::to_string(i % 10) + (i % 3 ? " demand=0." + std::to_string(1 + i % 7) : "") +
            (i % 5 ? "" : " at=" + std::to_string(i) + "," + std::to_string(-i)) + "\n";
  }
  for (int i = 0; i < kNodes; ++i) {
    text += "pipe P" + std::to_string(i) + " " + (i ? "N" + std::to_string(i - 1) : "R") + " N" +
            std::to_string(i) + " length=" + std::to_string(20 + i % 41) + " diameter=" +
            std::to_string(100 + 50 * (i % 5)) + (i % 11 ? "" : " roughness=0.01") +
            (i % 13 ? "" : " minor=0.5") + (i % 97 ? "" : " check=yes") + "\n";
  }
  Network first = testing::parse_or_fail(text);
  REQUIRE(first.pipes.size() == static_cast<std::size_t>(kNodes));
  const std::string written = write_network(first);
  ParseResult second = parse_network_text(written, "written.gln");
  REQUIRE(second.ok());
  check_same(first, second.network);
  CHECK(write_network(second.network) == written);
}
