// Inputs kept from fuzzing (tests/fuzz_regressions/): each must give a model or errors, and a
// model must solve or say it did not, never crash. Run under the sanitizer build in CI.
#include <doctest/doctest.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "gradeline/solver.h"
#include "io/change_set.h"
#include "io/parser.h"
#include "test_support.h"

using namespace gradeline;

namespace {
std::string slurp(const std::filesystem::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::stringstream s;
  s << in.rdbuf();
  return s.str();
}
}  // namespace

TEST_CASE("kept fuzzing inputs for the network parser neither crash nor claim a false result") {
  int files = 0;
  for (const auto& e : std::filesystem::directory_iterator(testing::source_path("tests/fuzz_regressions/network"))) {
    ++files;
    ParseResult r = parse_network_text(slurp(e.path()), e.path().filename().string());
    if (!r.ok()) continue;
    for (int reduced = 0; reduced < 2; ++reduced) {  // as given, and through the reduction
      CAPTURE(e.path().filename().string());
      CAPTURE(reduced);
      SolveOptions options;
      options.max_iterations = 30;
      options.reduction_min_nodes = reduced ? 0 : 1 << 30;
      SolveResult s = solve(r.network, options);
      if (s.summary.converged()) {
        CHECK(s.summary.max_energy_residual_m <= options.energy_tolerance_m);
        CHECK(s.summary.max_continuity_residual_m3s <= options.continuity_tolerance_m3s);
        for (const NodeState& n : s.nodes) CHECK((!n.supplied || std::isfinite(n.head_m)));
      }
    }
  }
  CHECK(files >= 1);
}

TEST_CASE("kept fuzzing inputs for change sets neither crash nor corrupt the network") {
  const char* base = "reservoir R head=50\nnode A elevation=0 demand=2\n"
                     "pipe P1 R A length=100 diameter=150 roughness=0.1\n";
  int files = 0;
  for (const auto& e : std::filesystem::directory_iterator(testing::source_path("tests/fuzz_regressions/changes"))) {
    ++files;
    Network net = parse_network_text(base, "base.gln").network;
    ChangeResult r = apply_change_text(slurp(e.path()), e.path().filename().string(), &net);
    for (const Pipe& p : net.pipes) {
      CHECK(p.from < net.nodes.size());
      CHECK(p.to < net.nodes.size());
    }
    (void)r;
  }
  CHECK(files >= 1);
}
