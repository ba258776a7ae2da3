// The corpus of pathological networks in tests/pathological/: each file states in comments what
// it must produce, and every file must give a correct result or a clear error, never a crash,
// NaN in the output, or "converged" with residuals above the tolerance. Two large shapes
// (10^5 pipes in series, a star of 10^4 pipes on one node) are generated here.
#include <doctest/doctest.h>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "analysis/self_check.h"
#include "gradeline/solver.h"
#include "io/parser.h"
#include "test_support.h"

using namespace gradeline;

namespace {

std::vector<std::string> expectations(const std::string& text, const std::string& key) {
  std::vector<std::string> out;
  std::istringstream in(text);
  std::string line;
  const std::string tag = "# " + key + ": ";
  while (std::getline(in, line)) {
    if (!line.empty() && line.back() == '\r') line.pop_back();
    std::size_t at = line.find(tag);
    if (at != std::string::npos) out.push_back(line.substr(at + tag.size()));
  }
  return out;
}

std::vector<std::string> words(const std::string& s) {
  std::istringstream in(s);
  std::vector<std::string> out;
  for (std::string w; in >> w;) out.push_back(w);
  return out;
}


// A solved network must be consistent: finite, within tolerance, self-check passed.
void check_solved(const Network& net, const SolveResult& r) {
  REQUIRE_MESSAGE(r.summary.converged(), r.summary.message);
  SolveOptions options;
  CHECK(r.summary.max_energy_residual_m <= options.energy_tolerance_m);
  CHECK(r.summary.max_continuity_residual_m3s <= options.continuity_tolerance_m3s);
  SelfCheck c = check_result(net, testing::base_demand(net), r, options);
  CHECK_MESSAGE(c.ok, c.failure);
}

}  // namespace

TEST_CASE("every file of the pathological corpus gives what it states") {
  namespace fs = std::filesystem;
  int files = 0;
  for (const auto& entry : fs::directory_iterator(testing::source_path("tests/pathological"))) {
    const std::string path = entry.path().string();
    CAPTURE(path);
    std::ifstream in(path, std::ios::binary);
    std::stringstream buffer;
    buffer << in.rdbuf();
    const std::string text = buffer.str();
    ++files;
    ParseResult parsed = parse_network_file(path);
    std::vector<std::string> expected_errors = expectations(text, "expect-error");
    if (!expected_errors.empty()) {
      REQUIRE(parsed.errors.size() == expected_errors.size());
      for (std::size_t i = 0; i < expected_errors.size(); ++i) {
        CHECK(parsed.errors[i].format() == path + ":" + expected_errors[i].substr(0, expected_errors[i].find(':')) +
                                               ": error:" + expected_errors[i].substr(expected_errors[i].find(':') + 1));
      }
      continue;
    }
    REQUIRE(expectations(text, "expect") == std::vector<std::string>{"solved"});
    for (const auto& e : parsed.errors) FAIL_CHECK(e.format());
    REQUIRE(parsed.ok());
    const Network& net = parsed.network;
    SolveResult r = solve(net);
    check_solved(net, r);
    for (const std::string& n : expectations(text, "expect-unsupplied")) {
      CHECK(r.summary.unsupplied_nodes == std::stoul(n));
    }
    for (const std::string& ids : expectations(text, "expect-zero-flow")) {
      for (const std::string& id : words(ids)) CHECK(std::abs(r.links[*net.find_pipe(id)].flow_m3s) < 1e-12);
    }
    for (const std::string& id : expectations(text, "expect-closed-by-check-valve")) {
      CHECK(r.links[*net.find_pipe(id)].closed_by_check_valve);
    }
    for (const std::string& id : expectations(text, "expect-negative-pressure")) {
      CHECK(r.nodes[*net.find_node(id)].pressure_m < 0.0);
    }
  }
  CHECK(files >= 12);
}

TEST_CASE("10^5 pipes in series solve, and the end head matches the sum of the losses") {
  std::string text = "fluid viscosity=1e-6m2/s density=998kg/m3\nreservoir R head=200\n";
  const int n = 100000;
  for (int i = 0; i < n; ++i) text += "node N" + std::to_string(i) + " elevation=0\n";
  text += "node N" + std::to_string(n - 1) + "x elevation=0 demand=5\n";
  text += "pipe P0 R N0 length=10 diameter=300 roughness=0.1\n";
  for (int i = 1; i < n; ++i) {
    text += "pipe P" + std::to_string(i) + " N" + std::to_string(i - 1) + " N" + std::to_string(i) +
            " length=10 diameter=300 roughness=0.1\n";
  }
  text += "pipe PEND N" + std::to_string(n - 1) + " N" + std::to_string(n - 1) + "x length=10 diameter=300 roughness=0.1\n";
  Network net = testing::parse_or_fail(text);
  SolveResult r = solve(net);
  check_solved(net, r);
  // Every pipe carries the 5 L/s demand: identical pipes, identical losses.
  const double per_pipe = r.links[0].headloss_m;
  CHECK(r.nodes.back().head_m == doctest::Approx(200.0 - per_pipe * (n + 1)).epsilon(1e-9));
}

TEST_CASE("a star of 10^4 pipes on one node solves") {
  std::string text = "reservoir R head=60\nnode HUB elevation=0\n"
                     "pipe MAIN R HUB length=100 diameter=900 roughness=0.1\n";
  for (int i = 0; i < 10000; ++i) {
    text += "node L" + std::to_string(i) + " elevation=0 demand=0.01\n";
    text += "pipe S" + std::to_string(i) + " HUB L" + std::to_string(i) + " length=50 diameter=50 roughness=0.1\n";
  }
  Network net = testing::parse_or_fail(text);
  SolveResult r = solve(net);
  check_solved(net, r);
  CHECK(r.links[0].flow_m3s == doctest::Approx(0.1).epsilon(1e-9));
}
