// CHOLMOD's factorisation shared between two cores by subtrees gives the factor of one serial
// cholmod_factorize to the bit (the same arithmetic in the same order for every row), and the
// shared solves CHOLMOD's solution to round-off, on a tree-like system like those of
// distribution networks, numbered by AMD.
#include "solver/cholmod_ldlt.h"

#include <doctest/doctest.h>

#include <random>
#include <vector>

#include "solver/assembly.h"

using namespace gradeline;

namespace {

// Node 0 a fixed head; nodes 1..n-1 junctions on a random spanning tree, plus 15% extra
// links between nearby nodes closing loops, as the "distribution" benchmark networks have.
Topology tree_with_loops(std::uint32_t n, unsigned seed) {
  std::mt19937 rng(seed);
  Topology t;
  t.fixed_head.assign(n, 0);
  t.fixed_head[0] = 1;
  for (std::uint32_t v = 1; v < n; ++v) {
    t.from.push_back(v - 1 - static_cast<std::uint32_t>(rng() % std::min<std::uint32_t>(v, 50)));
    t.to.push_back(v);
  }
  for (std::uint32_t k = 0; k < n * 15 / 100; ++k) {
    const std::uint32_t a = 1 + static_cast<std::uint32_t>(rng() % (n - 1));
    const std::uint32_t b = std::min(n - 1, a + 1 + static_cast<std::uint32_t>(rng() % 40));
    if (a != b) {
      t.from.push_back(a);
      t.to.push_back(b);
    }
  }
  return t;
}

std::vector<double> conductances(std::size_t links, unsigned seed) {
  std::mt19937 rng(seed);
  std::uniform_real_distribution<double> c(0.01, 100.0);
  std::vector<double> out(links);
  for (double& x : out) x = c(rng);
  return out;
}

}  // namespace

TEST_CASE("the shared factorisation is CHOLMOD's serial one to the bit, refactorisation included") {
  // The shared solves sum the top rows' updates per core, so they round differently from
  // CHOLMOD's: by at most a few units in the last place of the largest unknown.
  constexpr double kRelativeRoundOff = 1e-13;
  const Topology t = tree_with_loops(40000, 5);
  AssemblyPlan plan = plan_assembly(t, junction_order(t));
  const std::vector<char> unsupplied(t.fixed_head.size(), 0);
  CholmodNaturalLdlt shared(kSupernodalFlopsPerEntry);
  auto serial = make_sparse_cholesky(CholeskyBackend::kCholmodSimplicial, Ordering::kNatural);
  REQUIRE(shared.analyze(plan.matrix));
  REQUIRE(serial->analyze(plan.matrix));
  CHECK(std::string(shared.backend()) == "cholmod-simplicial-ldlt");
  const Eigen::VectorXd rhs = Eigen::VectorXd::LinSpaced(plan.unknowns, -1.0, 2.0);
  // The first factorisation (serial in both), then two refactorisations (shared in one).
  for (unsigned round = 0; round < 3; ++round) {
    CAPTURE(round);
    assemble_matrix(conductances(t.from.size(), 100 + round), unsupplied, &plan);
    REQUIRE(shared.factorize(plan.matrix));
    REQUIRE(serial->factorize(plan.matrix));
    CHECK(shared.shared() == (round > 0));  // planned from the first factor's pattern
    Eigen::VectorXd x_cholmod, x_shared, x_serial;
    REQUIRE(shared.solve_with_cholmod(rhs, &x_cholmod));
    REQUIRE(shared.solve(rhs, &x_shared));
    REQUIRE(serial->solve(rhs, &x_serial));
    CHECK((x_cholmod - x_serial).cwiseAbs().maxCoeff() == 0.0);  // the same factor
    const double scale = x_serial.cwiseAbs().maxCoeff();
    CAPTURE(scale);
    CHECK((x_shared - x_serial).cwiseAbs().maxCoeff() <= kRelativeRoundOff * scale);
  }
}

TEST_CASE("a zero pivot found by a shared refactorisation fails as the serial one does") {
  const Topology t = tree_with_loops(30000, 9);
  AssemblyPlan plan = plan_assembly(t, junction_order(t));
  const std::vector<char> unsupplied(t.fixed_head.size(), 0);
  CholmodNaturalLdlt shared(kSupernodalFlopsPerEntry);
  REQUIRE(shared.analyze(plan.matrix));
  std::vector<double> c = conductances(t.from.size(), 3);
  assemble_matrix(c, unsupplied, &plan);
  REQUIRE(shared.factorize(plan.matrix));
  REQUIRE(shared.factorize(plan.matrix));
  REQUIRE(shared.shared());
  // Every link of junction 1 inactive: its row and column of the matrix are zero.
  for (std::size_t k = 0; k < c.size(); ++k) {
    if (t.from[k] == 1 || t.to[k] == 1) c[k] = 0.0;
  }
  assemble_matrix(c, unsupplied, &plan);
  CHECK_FALSE(shared.factorize(plan.matrix));
  CHECK(shared.shared());  // the failure was met on the shared path, then confirmed serially
  Eigen::VectorXd x;
  CHECK_FALSE(shared.solve(Eigen::VectorXd::Ones(plan.unknowns), &x));
  // And it recovers with a good matrix again.
  assemble_matrix(conductances(t.from.size(), 4), unsupplied, &plan);
  CHECK(shared.factorize(plan.matrix));
  CHECK(shared.solve(Eigen::VectorXd::Ones(plan.unknowns), &x));
}
