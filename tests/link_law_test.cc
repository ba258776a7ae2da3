// Pipe head-loss laws: every dh/dQ against a central finite difference, sign symmetry,
// monotone losses, and the Hazen-Williams regularisation near Q = 0.
#include "hydraulics/link_law.h"

#include <doctest/doctest.h>

#include <cmath>

#include "test_support.h"

using namespace gradeline;

namespace {

constexpr double kDerivativeRelTol = 1e-6;

PipeLaw law(HeadlossLaw kind, double d_m, double minor = 0.0) {
  return testing::pipe_law(kind, d_m, minor);
}

void check_derivative(const PipeLaw& p, double q) {
  const double step = std::max(1e-7 * std::abs(q), 1e-12);
  const double fd =
      (evaluate_pipe(p, q + step).headloss_m - evaluate_pipe(p, q - step).headloss_m) / (2 * step);
  CAPTURE(q);
  CHECK(evaluate_pipe(p, q).dh_dq == doctest::Approx(fd).epsilon(kDerivativeRelTol));
}

}  // namespace

TEST_CASE("Darcy-Weisbach dh/dQ matches finite differences in every regime, with minor losses") {
  const PipeLaw p = law(HeadlossLaw::kDarcyWeisbach, 0.15, 2.5);
  // Re = |Q| D / (nu A): 1e-5 m3/s gives Re ~ 77 (laminar), 2.6e-4 ~ 2000, 5e-4 ~ 3900.
  for (double q : {1e-5, 1e-4, 3e-4, 4.5e-4, 6e-4, 1e-2, 0.1, -1e-5, -3e-4, -0.1}) {
    check_derivative(p, q);
  }
}

TEST_CASE("Hazen-Williams dh/dQ matches finite differences, including near zero flow") {
  const PipeLaw p = law(HeadlossLaw::kHazenWilliams, 0.2, 1.0);
  for (double q : {1e-9, 1e-8, 1e-6, 1e-3, 0.05, -1e-8, -0.05}) check_derivative(p, q);
}

TEST_CASE("head loss is odd in Q and dh/dQ positive everywhere, zero flow included") {
  for (HeadlossLaw kind : {HeadlossLaw::kDarcyWeisbach, HeadlossLaw::kHazenWilliams}) {
    const PipeLaw p = law(kind, 0.1, 0.5);
    CHECK(evaluate_pipe(p, 0.0).headloss_m == 0.0);
    CHECK(evaluate_pipe(p, 0.0).dh_dq > 0.0);
    for (double q : {1e-6, 1e-3, 0.05}) {
      CHECK(evaluate_pipe(p, -q).headloss_m == -evaluate_pipe(p, q).headloss_m);
      CHECK(evaluate_pipe(p, q).dh_dq > 0.0);
    }
  }
}

TEST_CASE("Darcy-Weisbach head loss rises monotonically through the transition") {
  const PipeLaw p = law(HeadlossLaw::kDarcyWeisbach, 0.15);
  double previous = 0.0;
  for (int i = 1; i <= 400; ++i) {
    const double q = i * 2e-6;  // Re from about 15 to 6200
    const double h = evaluate_pipe(p, q).headloss_m;
    CHECK(h > previous);
    previous = h;
  }
}

TEST_CASE("laminar loss is Hagen-Poiseuille: h = 32 nu L V / (g D^2)") {
  const PipeLaw p = law(HeadlossLaw::kDarcyWeisbach, 0.15);
  const double q = 1e-5;
  const double v = q / (M_PI * 0.15 * 0.15 / 4);
  CHECK(evaluate_pipe(p, q).headloss_m ==
        doctest::Approx(32 * 1.1e-6 * 350.0 * v / (kGravity_ms2 * 0.15 * 0.15)).epsilon(1e-12));
}

TEST_CASE("the Hazen-Williams regularisation is invisible at working flows") {
  // h = 10.67 L Q^1.852 / (C^1.852 D^4.87) (SI form of Hazen-Williams).
  const PipeLaw p = law(HeadlossLaw::kHazenWilliams, 0.2);
  for (double q : {1e-6, 1e-3, 0.05}) {
    const double exact =
        10.67 * 350.0 * std::pow(q, 1.852) / (std::pow(120.0, 1.852) * std::pow(0.2, 4.87));
    CHECK(evaluate_pipe(p, q).headloss_m == doctest::Approx(exact).epsilon(1e-10));
  }
}

TEST_CASE(
    "a first-order update over a relative flow change of kUpdateRelativeFlow is exact to "
    "round-off") {
  // The partial update of the Newton loop (link_law.h): h(Q0) + h'(Q0) (Q - Q0) against a new
  // evaluation at Q = Q0 (1 + d), in the laminar, transitional and turbulent ranges and under
  // Hazen-Williams. Taylor's theorem bounds the difference by about d^2 |h| = 1e-16 |h|; a
  // few units in the last place of the evaluation itself are allowed on top.
  constexpr double kRoundOffRelTol = 1e-14;
  auto check_update = [](const PipeLaw& p, double q0) {
    const LinkEval at = evaluate_pipe(p, q0);
    const double q = q0 * (1.0 + kUpdateRelativeFlow);
    const double updated = at.headloss_m + at.dh_dq * (q - q0);
    const double fresh = evaluate_pipe(p, q).headloss_m;
    CAPTURE(q0);
    CHECK(std::abs(updated - fresh) <= kRoundOffRelTol * std::abs(fresh));
  };
  const PipeLaw dw = law(HeadlossLaw::kDarcyWeisbach, 0.15, 2.5);
  for (double q : {1e-5, 3e-4, 4.5e-4, 1e-2, 0.1, -3e-4, -0.1}) check_update(dw, q);
  const PipeLaw hw = law(HeadlossLaw::kHazenWilliams, 0.2, 1.0);
  for (double q : {1e-3, 0.05, -0.05}) check_update(hw, q);
}
