// Links evaluated together (solver/link_batch.h) give what evaluate_pipe and
// ChainLaws::evaluate give one by one, whatever else is in the batch.
#include "solver/link_batch.h"

#include <doctest/doctest.h>

#include <cmath>
#include <vector>

#include "hydraulics/chain_law.h"
#include "hydraulics/link_law.h"
#include "test_support.h"

using namespace gradeline;

namespace {

// The vector logarithm of the batch's Colebrook path (colebrook_batch.h): about 1e-15
// relative in f, so in h and dh/dQ.
constexpr double kTurbulentRelTol = 1e-13;

PipeLaw valve_law() {
  Pipe p;
  p.kind = LinkKind::kThrottle;
  p.diameter_m = 0.15;
  p.minor_k = 3.0;
  p.edit_control().valve_loss_m = 2.0;
  return make_pipe_law(p, HeadlossModel{}, Fluid{}, 1e-8);
}

// Flows from reverse through zero, laminar and transitional to turbulent in a 100 mm pipe.
const double kFlows[] = {-0.03, -2e-3, 0.0, 1e-5, 1.5e-4, 2.5e-4, 4e-4, 2e-3, 0.03};

bool close(double a, double b, double rel) { return std::abs(a - b) <= rel * std::abs(b); }

}  // namespace

TEST_CASE("every link of a mixed batch gets evaluate_pipe's result") {
  const std::vector<PipeLaw> laws = {testing::pipe_law(HeadlossLaw::kDarcyWeisbach, 0.1, 1.5),
                                     testing::pipe_law(HeadlossLaw::kHazenWilliams, 0.1),
                                     testing::pipe_law(HeadlossLaw::kDarcyWeisbach, 0.3),
                                     valve_law()};
  LinkBatch batch;
  std::vector<double> x_batch, x_alone;
  x_batch.reserve(64);  // stable addresses for the warm starts
  for (const PipeLaw& law : laws) {
    for (double q : kFlows) {
      x_batch.push_back(0.0);
      batch.add_link(law, q, &x_batch.back());
    }
  }
  batch.evaluate();
  std::size_t i = 0;
  for (const PipeLaw& law : laws) {
    for (double q : kFlows) {
      CAPTURE(q);
      double x = 0.0;
      const LinkEval one = evaluate_pipe(law, q, &x);
      const LinkEval& got = batch.result(i);
      CHECK(got.regime == one.regime);
      if (one.regime == FlowRegime::kTurbulent && law.kind == LawKind::kDarcyWeisbach) {
        CHECK(close(got.headloss_m, one.headloss_m, kTurbulentRelTol));
        CHECK(close(got.dh_dq, one.dh_dq, kTurbulentRelTol));
        CHECK(close(got.friction_factor, one.friction_factor, kTurbulentRelTol));
        CHECK(close(x_batch[i], x, kTurbulentRelTol));
      } else {  // the same call: the same bits
        CHECK(got.headloss_m == one.headloss_m);
        CHECK(got.dh_dq == one.dh_dq);
        CHECK(got.friction_factor == one.friction_factor);
      }
      ++i;
    }
  }
}

TEST_CASE("a chain in a batch gets the chain law's sums") {
  ChainLaws chain;
  for (double d : {0.1, 0.08, 0.15})
    chain.law.push_back(testing::pipe_law(HeadlossLaw::kDarcyWeisbach, d, 0.8));
  chain.start = {0, 3};
  chain.offset_m3s = {0.0, 4e-4, 1.5e-3};
  chain.sign = {1, -1, 1};
  for (double q : kFlows) {
    CAPTURE(q);
    chain.colebrook_x.assign(3, 0.0);
    const LinkEval one = chain.evaluate(0, q);
    chain.colebrook_x.assign(3, 0.0);
    LinkBatch batch;
    batch.add_chain(&chain, 0, q);
    batch.evaluate();
    CHECK(close(batch.result(0).headloss_m, one.headloss_m, kTurbulentRelTol));
    CHECK(close(batch.result(0).dh_dq, one.dh_dq, kTurbulentRelTol));
  }
}

TEST_CASE("a link's result in a batch does not depend on the other links there") {
  const PipeLaw law = testing::pipe_law(HeadlossLaw::kDarcyWeisbach, 0.2);
  for (std::size_t others = 0; others <= 6; ++others) {
    LinkBatch batch;
    std::vector<double> x(others + 1, 0.0);
    for (std::size_t j = 0; j < others; ++j) batch.add_link(law, 0.01 * (j + 1), &x[j]);
    batch.add_link(law, 0.037, &x[others]);
    batch.evaluate();
    LinkBatch alone;
    double y = 0.0;
    alone.add_link(law, 0.037, &y);
    alone.evaluate();
    CHECK(batch.result(others).headloss_m == alone.result(0).headloss_m);
    CHECK(batch.result(others).dh_dq == alone.result(0).dh_dq);
    CHECK(x[others] == y);
  }
}
