// Reading valid network files into the SI model.
#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>

#include "io/parser.h"
#include "model/water.h"
#include "test_support.h"

using namespace gradeline;
using gradeline::testing::parse_or_fail;

TEST_CASE("a minimal SI network reads into SI values") {
  Network n = parse_or_fail(
      "title Test zone\n"
      "units SI\n"
      "reservoir R1 head=96.5m at=0,0\n"
      "node N1 elevation=52 demand=2.4 at=120.5,-40\n"
      "pipe P1 R1 N1 length=410 diameter=300 roughness=0.26 minor=1.5\n");
  CHECK(n.title == "Test zone");
  REQUIRE(n.nodes.size() == 2);
  CHECK(n.nodes[0].is_fixed_head());
  CHECK(n.nodes[0].head_m == 96.5);
  CHECK(n.nodes[1].demand_m3s == doctest::Approx(2.4e-3));
  CHECK(n.nodes[1].at->x == 120.5);
  CHECK(n.nodes[1].at->y == -40.0);
  REQUIRE(n.pipes.size() == 1);
  const Pipe& p = n.pipes[0];
  CHECK(p.from == 0);
  CHECK(p.to == 1);
  CHECK(p.length_m == 410.0);
  CHECK(p.diameter_m == doctest::Approx(0.3));
  CHECK(*p.roughness_m == doctest::Approx(0.26e-3));
  CHECK(p.minor_k == 1.5);
  CHECK(p.status == LinkStatus::kOpen);
  CHECK_FALSE(p.check_valve);
}

TEST_CASE("US units change the bare-number defaults") {
  Network n = parse_or_fail(
      "units US\n"
      "reservoir R head=300\n"
      "node A elevation=100 demand=50\n"
      "pipe P R A length=1000 diameter=8 roughness=0.01\n");
  CHECK(n.nodes[0].head_m == doctest::Approx(91.44));
  CHECK(n.nodes[1].demand_m3s == doctest::Approx(50 * 3.785411784e-3 / 60));
  CHECK(n.pipes[0].length_m == doctest::Approx(304.8));
  CHECK(n.pipes[0].diameter_m == doctest::Approx(0.2032));
  CHECK(*n.pipes[0].roughness_m == doctest::Approx(0.000254));
}

TEST_CASE("the fluid follows the temperature through the water formulas") {
  Network n = parse_or_fail(
      "fluid water temperature=20C\nreservoir R head=10\nnode A elevation=0\n"
      "pipe P R A length=1 diameter=100 roughness=0\n");
  CHECK(n.fluid.density_kgm3 == water_density_kgm3(20.0));
  CHECK(n.fluid.kinematic_viscosity_m2s == water_kinematic_viscosity_m2s(20.0));
}

TEST_CASE("a fluid given by viscosity and density is taken as given") {
  Network n = parse_or_fail(
      "fluid viscosity=1.0e-6m2/s density=998kg/m3\nreservoir R head=10\nnode A elevation=0\n"
      "pipe P R A length=1 diameter=100 roughness=0\n");
  CHECK(n.fluid.kinematic_viscosity_m2s == 1.0e-6);
  CHECK(n.fluid.density_kgm3 == 998.0);
  CHECK_FALSE(n.fluid.temperature_c.has_value());
}

TEST_CASE("hazen-williams takes its coefficient and exponents") {
  Network n = parse_or_fail(
      "headloss hazen-williams coefficient=10.667 flow_exponent=1.852 diameter_exponent=4.871\n"
      "reservoir R head=10\nnode A elevation=0\npipe P R A length=1 diameter=100 cfactor=130\n");
  CHECK(n.headloss.law == HeadlossLaw::kHazenWilliams);
  CHECK(n.headloss.hw_coefficient == 10.667);
  CHECK(n.headloss.hw_flow_exponent == 1.852);
  CHECK(n.headloss.hw_diameter_exponent == 4.871);
  CHECK(*n.pipes[0].cfactor == 130.0);
}

TEST_CASE("defaults fill in what a pipe leaves out, wherever the statement stands") {
  Network n = parse_or_fail(
      "reservoir R head=10\nnode A elevation=0\n"
      "pipe P1 R A length=1 diameter=100\n"
      "pipe P2 R A length=1 diameter=100 roughness=0.5 minor=2\n"
      "defaults roughness=0.1mm minor=0.4\n");
  CHECK(*n.pipes[0].roughness_m == doctest::Approx(1e-4));
  CHECK(n.pipes[0].minor_k == 0.4);
  CHECK(*n.pipes[1].roughness_m == doctest::Approx(5e-4));
  CHECK(n.pipes[1].minor_k == 2.0);
}

TEST_CASE("pipes may refer to nodes defined later") {
  Network n = parse_or_fail(
      "pipe P R A length=1 diameter=100 roughness=0\nreservoir R head=10\nnode A elevation=0\n");
  CHECK(n.pipes[0].from == 0);
  CHECK(n.pipes[0].to == 1);
}

TEST_CASE("status and check valves") {
  Network n = parse_or_fail(
      "reservoir R head=10\nnode A elevation=0\n"
      "pipe P1 R A length=1 diameter=100 roughness=0 status=closed\n"
      "pipe P2 R A length=1 diameter=100 roughness=0 check=yes\n");
  CHECK(n.pipes[0].status == LinkStatus::kClosed);
  CHECK(n.pipes[1].check_valve);
}

TEST_CASE("a supply given as a pressure at an elevation becomes a head") {
  Network n = parse_or_fail(
      "fluid viscosity=1e-6m2/s density=1000kg/m3\n"
      "reservoir MAINS elevation=40m pressure=490.3325kPa\nnode A elevation=0\n"
      "pipe P MAINS A length=1 diameter=100 roughness=0\n");
  CHECK(n.nodes[0].head_m == doctest::Approx(90.0).epsilon(1e-12));
}

TEST_CASE("a UTF-8 BOM, CRLF endings, tabs and a last line with no newline all read") {
  Network n = parse_or_fail(
      "\xEF\xBB\xBFunits SI\r\nreservoir\tR\thead=10\r\nnode A elevation=0\r\n"
      "pipe P R A length=1 diameter=100 roughness=0");
  CHECK(n.pipes.size() == 1);
}

TEST_CASE("include reads a file relative to the including file") {
  namespace fs = std::filesystem;
  fs::path dir = fs::path(testing::temp_dir()) / "include_ok";
  fs::create_directories(dir / "parts");
  std::ofstream(dir / "main.gln") << "include parts/nodes.gln\npipe P R A length=1 diameter=100 roughness=0\n";
  std::ofstream(dir / "parts" / "nodes.gln") << "reservoir R head=10\ninclude more.gln\n";
  std::ofstream(dir / "parts" / "more.gln") << "node A elevation=0\n";
  ParseResult r = parse_network_file((dir / "main.gln").string());
  for (const auto& e : r.errors) FAIL_CHECK(e.format());
  CHECK(r.network.nodes.size() == 2);
  CHECK(r.network.nodes[1].where.file() == (dir / "parts" / "more.gln").string());
}
