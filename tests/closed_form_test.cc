// Networks with closed-form solutions: one pipe, pipes in series, two and three in parallel.
//
// Darcy-Weisbach, given the head loss h on a pipe: Re sqrt(f) = (D/nu) sqrt(2 g D h / L) is
// known, so the Colebrook-White equation gives f explicitly,
//     1/sqrt(f) = -2 log10( e/(3.7 D) + 2.51 nu / (D sqrt(2 g D h / L)) ),
//     V = (1/sqrt(f)) sqrt(2 g D h / L)
// (the rearrangement behind the explicit discharge formula of Swamee & Jain, 1976).
// Hazen-Williams: h = r Q^n with r = k L / (C^n D^m), so series pipes add r and parallel pipes
// split the flow as Q_i = (h / r_i)^(1/n).
#include <doctest/doctest.h>

#include <cmath>
#include <string>

#include "gradeline/solver.h"
#include "test_support.h"

using namespace gradeline;
using gradeline::testing::parse_or_fail;

namespace {

constexpr double kFlowRelTol = 1e-9;
constexpr double kHeadTol_m = 1e-8;
constexpr double kNu = 1.0e-6;

const char* kFluid = "fluid viscosity=1.0e-6m2/s density=998kg/m3\n";

double colebrook_flow(double h, double length, double d, double e) {
  const double s = std::sqrt(2 * kGravity_ms2 * d * h / length);
  const double inv_sqrt_f = -2.0 * std::log10(e / (3.7 * d) + 2.51 * kNu / (d * s));
  return inv_sqrt_f * s * M_PI * d * d / 4;
}

double hw_r(double length, double d, double c) {
  return 10.67 * length / (std::pow(c, 1.852) * std::pow(d, 4.87));
}

SolveResult solved(const Network& net) {
  SolveResult r = solve(net);
  REQUIRE_MESSAGE(r.summary.converged(), r.summary.message);
  return r;
}

}  // namespace

TEST_CASE("one Darcy-Weisbach pipe between two reservoirs carries the Colebrook flow") {
  Network net = parse_or_fail(std::string(kFluid) +
                              "reservoir UP head=100\nreservoir DOWN head=88\n"
                              "pipe P UP DOWN length=1200 diameter=250 roughness=0.15\n");
  SolveResult r = solved(net);
  CHECK(r.links[0].flow_m3s ==
        doctest::Approx(colebrook_flow(12.0, 1200, 0.25, 0.15e-3)).epsilon(kFlowRelTol));
}

TEST_CASE("two parallel Darcy-Weisbach pipes each carry their own Colebrook flow") {
  Network net = parse_or_fail(std::string(kFluid) +
                              "reservoir UP head=60\nreservoir DOWN head=57.5\n"
                              "pipe A UP DOWN length=800 diameter=300 roughness=0.05\n"
                              "pipe B UP DOWN length=650 diameter=150 roughness=0.5\n");
  SolveResult r = solved(net);
  CHECK(r.links[0].flow_m3s ==
        doctest::Approx(colebrook_flow(2.5, 800, 0.3, 0.05e-3)).epsilon(kFlowRelTol));
  CHECK(r.links[1].flow_m3s ==
        doctest::Approx(colebrook_flow(2.5, 650, 0.15, 0.5e-3)).epsilon(kFlowRelTol));
}

TEST_CASE("three parallel Darcy-Weisbach pipes split a node demand by the Colebrook law") {
  Network net = parse_or_fail(std::string(kFluid) +
                              "reservoir R head=50\nnode N elevation=0 demand=90L/s\n"
                              "pipe A R N length=500 diameter=200 roughness=0.1\n"
                              "pipe B R N length=700 diameter=250 roughness=0.1\n"
                              "pipe C R N length=400 diameter=150 roughness=0.3\n");
  // The head loss h with sum Q_i(h) = 0.09 m3/s, by bisection on the closed forms.
  auto total = [](double h) {
    return colebrook_flow(h, 500, 0.2, 1e-4) + colebrook_flow(h, 700, 0.25, 1e-4) +
           colebrook_flow(h, 400, 0.15, 3e-4);
  };
  double lo = 1e-6, hi = 50.0;
  for (int i = 0; i < 200; ++i) {
    double mid = 0.5 * (lo + hi);
    (total(mid) < 0.09 ? lo : hi) = mid;
  }
  const double h = 0.5 * (lo + hi);
  SolveResult r = solved(net);
  CHECK(r.nodes[1].head_m == doctest::Approx(50.0 - h).epsilon(1e-12));
  CHECK(r.links[0].flow_m3s == doctest::Approx(colebrook_flow(h, 500, 0.2, 1e-4)).epsilon(1e-8));
  CHECK(r.links[2].flow_m3s == doctest::Approx(colebrook_flow(h, 400, 0.15, 3e-4)).epsilon(1e-8));
}

TEST_CASE("Hazen-Williams pipes in series add their resistances") {
  Network net = parse_or_fail(std::string(kFluid) +
                              "headloss hazen-williams\n"
                              "reservoir UP head=70\nreservoir DOWN head=52\nnode MID elevation=0\n"
                              "pipe A UP MID length=900 diameter=300 cfactor=120\n"
                              "pipe B MID DOWN length=600 diameter=200 cfactor=100\n");
  const double ra = hw_r(900, 0.3, 120), rb = hw_r(600, 0.2, 100);
  const double q = std::pow(18.0 / (ra + rb), 1 / 1.852);
  SolveResult r = solved(net);
  CHECK(r.links[0].flow_m3s == doctest::Approx(q).epsilon(kFlowRelTol));
  CHECK(r.links[1].flow_m3s == doctest::Approx(q).epsilon(kFlowRelTol));
  CHECK(std::abs(r.nodes[2].head_m - (70.0 - ra * std::pow(q, 1.852))) < kHeadTol_m);
}

TEST_CASE("Darcy-Weisbach pipes in series carry the demand and lose head pipe by pipe") {
  // Demand-driven series: Q is known, so each head loss is f L/D V^2/2g with f from the
  // closed-form inversion: bisection on h with colebrook_flow(h) = Q.
  Network net = parse_or_fail(std::string(kFluid) +
                              "reservoir R head=40\nnode A elevation=0\nnode B elevation=0 demand=25L/s\n"
                              "pipe P1 R A length=300 diameter=200 roughness=0.1\n"
                              "pipe P2 A B length=450 diameter=150 roughness=0.2\n");
  auto loss = [](double q, double length, double d, double e) {
    double lo = 1e-9, hi = 100.0;
    for (int i = 0; i < 200; ++i) {
      double mid = 0.5 * (lo + hi);
      (colebrook_flow(mid, length, d, e) < q ? lo : hi) = mid;
    }
    return 0.5 * (lo + hi);
  };
  const double h1 = loss(0.025, 300, 0.2, 1e-4), h2 = loss(0.025, 450, 0.15, 2e-4);
  SolveResult r = solved(net);
  CHECK(std::abs(r.nodes[1].head_m - (40 - h1)) < kHeadTol_m);
  CHECK(std::abs(r.nodes[2].head_m - (40 - h1 - h2)) < kHeadTol_m);
}

TEST_CASE("two and three parallel Hazen-Williams pipes split the flow as r^(-1/n)") {
  Network two = parse_or_fail(std::string(kFluid) +
                              "headloss hazen-williams\nreservoir UP head=30\nreservoir DOWN head=25\n"
                              "pipe A UP DOWN length=500 diameter=200 cfactor=130\n"
                              "pipe B UP DOWN length=500 diameter=150 cfactor=130\n");
  SolveResult r2 = solved(two);
  const double ratio = std::pow(hw_r(500, 0.15, 130) / hw_r(500, 0.2, 130), 1 / 1.852);
  CHECK(r2.links[0].flow_m3s / r2.links[1].flow_m3s == doctest::Approx(ratio).epsilon(kFlowRelTol));

  Network three = parse_or_fail(std::string(kFluid) +
                                "headloss hazen-williams\nreservoir R head=30\n"
                                "node N elevation=0 demand=60L/s\n"
                                "pipe A R N length=500 diameter=200 cfactor=130\n"
                                "pipe B R N length=800 diameter=150 cfactor=110\n"
                                "pipe C R N length=300 diameter=100 cfactor=90\n");
  const double ra = hw_r(500, 0.2, 130), rb = hw_r(800, 0.15, 110), rc = hw_r(300, 0.1, 90);
  const double sum = std::pow(ra, -1 / 1.852) + std::pow(rb, -1 / 1.852) + std::pow(rc, -1 / 1.852);
  SolveResult r3 = solved(three);
  CHECK(r3.links[0].flow_m3s == doctest::Approx(0.06 * std::pow(ra, -1 / 1.852) / sum).epsilon(kFlowRelTol));
  CHECK(r3.links[1].flow_m3s == doctest::Approx(0.06 * std::pow(rb, -1 / 1.852) / sum).epsilon(kFlowRelTol));
  CHECK(r3.links[2].flow_m3s == doctest::Approx(0.06 * std::pow(rc, -1 / 1.852) / sum).epsilon(kFlowRelTol));
}
