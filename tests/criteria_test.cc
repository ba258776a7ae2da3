// Design criteria: limits read from the file, violations found and ordered.
#include <doctest/doctest.h>

#include <cmath>

#include "analysis/case_run.h"
#include "io/parser.h"
#include "model/demand_cases.h"
#include "test_support.h"

using namespace gradeline;
using gradeline::testing::parse_or_fail;

namespace {
// Three junctions on a falling main: pressures rise from A to C.
const char* kNetwork =
    "fluid viscosity=1e-6m2/s density=1000kg/m3\ndefaults roughness=0.1\n"
    "reservoir R head=60\nnode A elevation=30 demand=5\nnode B elevation=20 demand=5\n"
    "node C elevation=10 demand=5\nnode X elevation=0 demand=1\n"
    "pipe P1 R A length=400 diameter=150\npipe P2 A B length=400 diameter=100\n"
    "pipe P3 B C length=400 diameter=100\npipe P4 C X length=10 diameter=100 status=closed\n"
    "case peak factor=2\n";
}

TEST_CASE("limits convert pressures to heads of the fluid, and case limits override") {
  Network net = parse_or_fail(std::string(kNetwork) +
                              "limit pressure min=196.133kPa max=60m\nlimit velocity max=2m/s\n"
                              "limit pressure min=10m case=peak\n");
  CHECK(*net.limits.min_pressure_m == doctest::Approx(20.0).epsilon(1e-12));
  CHECK(*net.limits.max_pressure_m == 60.0);
  CHECK(*net.limits.max_velocity_ms == 2.0);
  Criteria peak = criteria_for(net, "peak");
  CHECK(*peak.min_pressure_m == 10.0);
  CHECK(*peak.max_pressure_m == 60.0);
}

TEST_CASE("violations list failing nodes first, worst first, then pipes") {
  Network net = parse_or_fail(std::string(kNetwork) + "limit pressure min=40m\nlimit velocity max=0.5m/s\n");
  std::vector<DemandCase> cases;
  std::string why;
  REQUIRE(select_cases(net, "peak", &cases, &why));
  CaseOutcome o = run_case(net, cases[0], {}, {});
  REQUIRE(o.result.summary.converged());
  REQUIRE(o.violations.size() >= 3);
  // X is unsupplied (behind a closed pipe) and has a demand: it fails the minimum outright.
  CHECK(o.violations[0].unsupplied);
  CHECK(net.nodes[o.violations[0].element].id == "X");
  // Then the supplied junctions, lowest pressure first.
  std::size_t lowest = 1;
  for (std::size_t n = 1; n <= 3; ++n) {
    if (o.result.nodes[n].pressure_m < o.result.nodes[lowest].pressure_m) lowest = n;
  }
  CHECK(o.violations[1].element == lowest);
  CHECK(o.violations[1].margin <= o.violations[2].margin);
  CHECK(o.violations[1].margin == doctest::Approx(o.result.nodes[lowest].pressure_m - 40.0));
  CHECK(o.violations.back().quantity == LimitQuantity::kVelocity);
}

TEST_CASE("command-line criteria override the file for every case") {
  Network net = parse_or_fail(std::string(kNetwork) + "limit pressure min=40m\n");
  std::vector<DemandCase> cases;
  std::string why;
  REQUIRE(select_cases(net, "all", &cases, &why));
  CriteriaOverride o;
  o.min_pressure_m = 1.0;
  CaseOutcome out = run_case(net, cases[0], {}, o);
  CHECK(out.criteria.min_pressure_m == 1.0);
  CHECK(out.violations.size() == 1);  // only the unsupplied node X
}

TEST_CASE("an unknown case is refused with a suggestion") {
  Network net = parse_or_fail(kNetwork);
  std::vector<DemandCase> cases;
  std::string why;
  CHECK_FALSE(select_cases(net, "peek", &cases, &why));
  CHECK(why == "no case 'peek' in the network (did you mean 'peak'?)");
}

TEST_CASE("limit errors: unknown case, missing bound, wrong quantity") {
  ParseResult r = parse_network_text(
      std::string(kNetwork) + "limit pressure min=10m case=fire\nlimit pressure\nlimit flow max=3\n",
      "net.gln");
  std::string all;
  for (const Diagnostic& d : r.errors) all += d.format() + "\n";
  CHECK(all ==
        "net.gln:14: error: limit pressure needs min= or max=\n"
        "net.gln:15: error: limit needs one field: pressure or velocity\n"
        "net.gln:13: error: limit for unknown case 'fire'\n");
}

TEST_CASE("any_violation answers as the list does, for each limit alone and with none") {
  // The same solve judged under one limit at a time: a 1 m minimum is broken only by the
  // unsupplied X (it has a demand), a 1 m maximum by every supplied junction, 0.1 m/s by the
  // mains; loose limits, and none at all, by nothing.
  Network net = parse_or_fail(kNetwork);
  std::vector<DemandCase> cases;
  std::string why;
  REQUIRE(select_cases(net, "peak", &cases, &why));
  const CaseOutcome o = run_case(net, cases[0], {}, {});
  REQUIRE(o.result.summary.converged());
  auto judged = [&](Criteria c) {
    const bool listed = !find_violations(net, "peak", o.result, c).empty();
    CHECK(any_violation(net, o.result, c) == listed);
    return listed;
  };
  CHECK_FALSE(judged(Criteria{}));
  Criteria low, high, fast, loose;
  low.min_pressure_m = 1.0;  // only X, unsupplied with a demand
  high.max_pressure_m = 1.0;
  fast.max_velocity_ms = 0.1;
  loose.max_pressure_m = 1000.0;
  loose.max_velocity_ms = 100.0;
  CHECK(judged(low));
  CHECK(judged(high));
  CHECK(judged(fast));
  CHECK_FALSE(judged(loose));
}
