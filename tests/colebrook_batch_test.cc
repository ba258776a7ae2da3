// Colebrook-White for many pipes at once (hydraulics/colebrook_batch.h) against python3-fluids
// and against the one-pipe solution it stands for.
#include "hydraulics/colebrook_batch.h"

#include <doctest/doctest.h>

#include <cmath>
#include <string>
#include <vector>

#include "hydraulics/friction.h"
#include "test_support.h"

using namespace gradeline;

namespace {
constexpr double kColebrookRelTol = 1e-9;  // as for colebrook_friction against fluids
// Against colebrook_friction: the vector logarithm is within 4 ulp of std::log, which moves
// the root x = 1/sqrt(f) by about 1e-15 relative; the derivative comes from the same x.
constexpr double kSameRootRelTol = 1e-13;

struct Batch {
  std::vector<double> re, rr, x, f, df;
  void add(double reynolds, double relative_roughness, double start) {
    re.push_back(reynolds);
    rr.push_back(relative_roughness);
    x.push_back(start);
  }
  void solve() {
    f.assign(re.size(), 0.0);
    df.assign(re.size(), 0.0);
    colebrook_batch(re.size(), re.data(), rr.data(), x.data(), f.data(), df.data());
  }
};

double relative(double a, double b) { return std::abs(a / b - 1.0); }

}  // namespace

TEST_CASE("a batch matches python3-fluids' exact Colebrook solution, Re 4e3-1e8, e/D 0-0.05") {
  // tests/reference/colebrook_fluids.csv: fluids.friction.Colebrook(Re, eD, tol=0).
  const auto rows = testing::read_csv("tests/reference/colebrook_fluids.csv");
  Batch b;
  for (const auto& row : rows) b.add(row[0], row[1], 0.0);
  b.solve();
  double worst = 0.0;
  for (std::size_t i = 0; i < rows.size(); ++i) {
    worst = std::max(worst, relative(b.f[i], rows[i][2]));
    CHECK_MESSAGE(relative(b.f[i], rows[i][2]) <= kColebrookRelTol, "Re " << rows[i][0]);
  }
  CHECK(rows.size() == 410);
  const std::string path = colebrook_batch_is_vectorised() ? "four-wide path" : "one by one";
  MESSAGE("worst relative error of the batch vs fluids: " << worst << " (" << path << ")");
}

TEST_CASE("a batch gives each pipe colebrook_friction's root and derivative, cold and warm") {
  Batch b;
  std::vector<double> warm_from;
  for (double re = 4e3; re <= 1e8; re *= 1.7) {
    for (double rr : {0.0, 1e-6, 1e-4, 1e-3, 1e-2, 0.05}) {
      b.add(re, rr, 0.0);  // cold: Swamee-Jain start
      // Warm: the root at a Reynolds number 3% lower, as a Newton iteration would leave it.
      double x = 0.0;
      colebrook_friction(re * 0.97, rr, &x);
      b.add(re, rr, x);
    }
  }
  std::vector<double> x_in = b.x;
  b.solve();
  double worst_f = 0.0, worst_df = 0.0, worst_x = 0.0;
  for (std::size_t i = 0; i < b.re.size(); ++i) {
    double x = x_in[i];
    const ColebrookSolution one = colebrook_friction(b.re[i], b.rr[i], x > 0.0 ? &x : nullptr);
    worst_f = std::max(worst_f, relative(b.f[i], one.f));
    worst_df = std::max(worst_df, relative(b.df[i], one.df_dre));
    if (x_in[i] > 0.0) worst_x = std::max(worst_x, relative(b.x[i], x));
  }
  CHECK(worst_f <= kSameRootRelTol);
  CHECK(worst_df <= kSameRootRelTol);
  CHECK(worst_x <= kSameRootRelTol);
}

TEST_CASE("a pipe's result does not depend on the others in its batch or on its place there") {
  // Batches of 1 to 9 pipes: a multiple of four and every remainder.
  const double re[9] = {4e3, 1.2e4, 5e4, 2e5, 8e5, 3e6, 1e7, 4e7, 1e8};
  const double rr[9] = {0.0, 1e-5, 2e-4, 1e-3, 5e-3, 0.02, 0.05, 3e-4, 1e-6};
  for (std::size_t n = 1; n <= 9; ++n) {
    Batch all;
    for (std::size_t i = 0; i < n; ++i) all.add(re[i], rr[i], 0.0);
    all.solve();
    for (std::size_t i = 0; i < n; ++i) {
      Batch alone;
      alone.add(re[i], rr[i], 0.0);
      alone.solve();
      CHECK(all.f[i] == alone.f[0]);
      CHECK(all.df[i] == alone.df[0]);
      CHECK(all.x[i] == alone.x[0]);
    }
  }
}
