// The scatter-map assembly gives B^T C B computed the plain way, and both Cholesky backends
// solve it alike.
#include <doctest/doctest.h>

#include <Eigen/Dense>
#include <string>
#include <vector>

#include "solver/assembly.h"
#include "test_support.h"

using namespace gradeline;

TEST_CASE("assembled matrix equals B^T C B over the junctions, with unit rows for unsupplied") {
  Network net = testing::load("tests/networks/loop_two_sources.gln");
  AssemblyPlan plan = plan_assembly(build_link_ends(net));
  std::vector<double> c(net.pipes.size());
  for (std::size_t k = 0; k < c.size(); ++k) c[k] = 0.5 + 0.25 * k;
  c[3] = 0.0;  // an inactive link
  std::vector<char> unsupplied(net.nodes.size(), 0);
  assemble_matrix(c, unsupplied, &plan);

  Eigen::MatrixXd b = Eigen::MatrixXd::Zero(net.pipes.size(), plan.unknowns);
  for (std::size_t k = 0; k < net.pipes.size(); ++k) {
    int from = plan.unknown_of_node[net.pipes[k].from];
    int to = plan.unknown_of_node[net.pipes[k].to];
    if (from >= 0) b(k, from) = 1.0;
    if (to >= 0) b(k, to) = -1.0;
  }
  Eigen::VectorXd cv = Eigen::Map<Eigen::VectorXd>(c.data(), c.size());
  Eigen::MatrixXd expected = b.transpose() * cv.asDiagonal() * b;
  Eigen::MatrixXd upper = Eigen::MatrixXd(plan.matrix);
  CHECK(Eigen::MatrixXd(upper.triangularView<Eigen::StrictlyLower>()).cwiseAbs().maxCoeff() == 0.0);
  Eigen::MatrixXd full = upper + upper.transpose();
  full.diagonal() = upper.diagonal();
  CHECK((full - expected).cwiseAbs().maxCoeff() < 1e-14);
}

TEST_CASE("CHOLMOD and Eigen's LDL^T agree on the assembled system") {
  Network net = testing::load("networks/brindlemoor.gln");
  AssemblyPlan plan = plan_assembly(build_link_ends(net));
  std::vector<double> c(net.pipes.size(), 1.0);
  std::vector<char> unsupplied(net.nodes.size(), 0);
  assemble_matrix(c, unsupplied, &plan);
  Eigen::VectorXd rhs = Eigen::VectorXd::LinSpaced(plan.unknowns, -1.0, 2.0);
  Eigen::VectorXd x1, x2;
  auto a = make_sparse_cholesky(CholeskyBackend::kCholmodSimplicial);
  auto e = make_sparse_cholesky(CholeskyBackend::kEigenSimplicial);
  REQUIRE(a->analyze(plan.matrix));
  REQUIRE(a->factorize(plan.matrix));
  REQUIRE(a->solve(rhs, &x1));
  REQUIRE(e->analyze(plan.matrix));
  REQUIRE(e->factorize(plan.matrix));
  REQUIRE(e->solve(rhs, &x2));
  CHECK((x1 - x2).cwiseAbs().maxCoeff() < 1e-10);
}

TEST_CASE("a dense factor goes supernodal, through the BLAS and LAPACK, and solves like LDL^T") {
  // A dense 400 x 400 symmetric positive definite matrix (diagonally dominant): about 2n/3 =
  // 267 flops per nonzero of L, above kSupernodalFlopsPerEntry, so CHOLMOD factorises it in
  // dense supernodes with dpotrf, dsyrk, dgemm and dtrsm (for a statically linked CHOLMOD,
  // those are loaded on first use: src/solver/blas_loader.cc).
  constexpr int kSize = 400;
  constexpr double kSolveTolerance = 1e-10;
  std::vector<Eigen::Triplet<double>> upper;
  for (int j = 0; j < kSize; ++j) {
    for (int i = 0; i < j; ++i) upper.emplace_back(i, j, 1.0 / (1.0 + (i * 7 + j * 3) % 11));
    upper.emplace_back(j, j, 2.0 * kSize);
  }
  SymmetricMatrix m(kSize, kSize);
  m.setFromTriplets(upper.begin(), upper.end());
  const Eigen::VectorXd rhs = Eigen::VectorXd::LinSpaced(kSize, -1.0, 2.0);
  Eigen::VectorXd x1, x2;
  auto a = make_sparse_cholesky(CholeskyBackend::kCholmodAuto);
  REQUIRE(a->analyze(m));
  CHECK(a->flops_per_entry() > kSupernodalFlopsPerEntry);
  CHECK(std::string(a->backend()) == "cholmod-supernodal");
  REQUIRE(a->factorize(m));
  REQUIRE(a->solve(rhs, &x1));
  auto e = make_sparse_cholesky(CholeskyBackend::kEigenSimplicial);
  REQUIRE(e->analyze(m));
  REQUIRE(e->factorize(m));
  REQUIRE(e->solve(rhs, &x2));
  CHECK((x1 - x2).cwiseAbs().maxCoeff() < kSolveTolerance);
  const Eigen::MatrixXd full = Eigen::MatrixXd(m).selfadjointView<Eigen::Upper>();
  CHECK((full * x1 - rhs).cwiseAbs().maxCoeff() < kSolveTolerance);
}
