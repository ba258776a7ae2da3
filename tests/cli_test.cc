// The real gradeline binary: exit codes, messages and outputs.
#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>

#include "test_support.h"

using gradeline::testing::run_gradeline;
using gradeline::testing::temp_dir;

namespace {
std::string write_temp(const std::string& name, const std::string& text) {
  std::string path = temp_dir() + "/" + name;
  std::ofstream(path) << text;
  return path;
}
}  // namespace

TEST_CASE("--version and --help exit 0") {
  auto v = run_gradeline("--version");
  CHECK(v.exit_code == 0);
  CHECK(v.out == "gradeline 0.1.0\n");
  auto h = run_gradeline("--help");
  CHECK(h.exit_code == 0);
  CHECK(h.out.find("solve") != std::string::npos);
}

TEST_CASE("an unknown option or missing subcommand is an input error, exit 2") {
  CHECK(run_gradeline("").exit_code == 2);
  CHECK(run_gradeline("solve networks/brindlemoor.gln --bogus").exit_code == 2);
}

TEST_CASE("check reports counts, sources and islands") {
  auto r = run_gradeline("check networks/brindlemoor.gln");
  CHECK(r.exit_code == 0);
  CHECK(r.out.find("28 junctions, 2 reservoirs, 41 pipes (1 closed, 1 check valves)") !=
        std::string::npos);
  CHECK(r.out.find("islands     1") != std::string::npos);
  CHECK(r.out.find("unsupplied  0 nodes") != std::string::npos);
}

TEST_CASE("solve prints the summary, every node and link, and the caution") {
  auto r = run_gradeline("solve networks/brindlemoor.gln");
  CHECK(r.exit_code == 0);
  CHECK(r.out.find("status      SOLVED in") != std::string::npos);
  CHECK(r.out.find("source      COPSE") != std::string::npos);
  CHECK(r.out.find("  MILL ") != std::string::npos);
  CHECK(r.out.find("  P41 ") != std::string::npos);
  CHECK(r.out.find("licensed engineer") != std::string::npos);
  CHECK(r.err.empty());
}

TEST_CASE("solve --json writes the documented keys in SI") {
  std::string path = temp_dir() + "/out.json";
  auto r = run_gradeline("solve tests/networks/loop_two_sources.gln --json " + path);
  REQUIRE(r.exit_code == 0);
  std::ifstream in(path);
  nlohmann::json j = nlohmann::json::parse(in);
  CHECK(j["summary"]["converged"] == true);
  CHECK(j["summary"]["iterations"].get<int>() > 0);
  CHECK(j["summary"]["max_continuity_residual_m3s"].get<double>() < 1e-9);
  CHECK(j["summary"]["max_energy_residual_m"].get<double>() < 1e-8);
  const auto& node = j["nodes"][2];
  for (const char* key : {"id", "kind", "head_m", "pressure_m", "pressure_kPa", "demand_m3s", "supplied"})
    CHECK_MESSAGE(node.contains(key), key);
  const auto& link = j["links"][0];
  for (const char* key : {"id", "kind", "flow_m3s", "velocity_ms", "headloss_m", "reynolds",
                          "friction_factor", "status"})
    CHECK_MESSAGE(link.contains(key), key);
  CHECK(link["kind"] == "pipe");
  CHECK(node["pressure_kPa"].get<double>() ==
        doctest::Approx(node["pressure_m"].get<double>() * 998 * 9.80665 / 1000));
}

TEST_CASE("input errors go to stderr as FILE:LINE: error: and exit 2") {
  std::string path = write_temp("bad.gln", "reservoir R head=10\nnode A elevation=0\n"
                                           "pipe P A B length=1 diameter=1 roughness=0\n");
  auto r = run_gradeline("solve " + path);
  CHECK(r.exit_code == 2);
  CHECK(r.out.empty());
  CHECK(r.err == path + ":3: error: pipe 'P' refers to unknown node 'B'\n");
  CHECK(run_gradeline("check " + path).exit_code == 2);
}

TEST_CASE("a missing input file exits 2") {
  auto r = run_gradeline("solve /nonexistent.gln");
  CHECK(r.exit_code == 2);
  CHECK(r.err == "/nonexistent.gln: error: cannot read file: No such file or directory\n");
}

TEST_CASE("no solution exits 3 and prints no result") {
  auto r = run_gradeline("solve tests/networks/loop_two_sources.gln --max-iterations 1");
  CHECK(r.exit_code == 3);
  CHECK(r.out.empty());
  CHECK(r.err.find("gradeline: error: no solution for case 'base': no convergence after 1 iterations") !=
        std::string::npos);
}

TEST_CASE("--json refuses to write over the input and leaves it untouched") {
  std::string copy = temp_dir() + "/keep.gln";
  std::filesystem::copy_file(gradeline::testing::source_path("tests/networks/loop_hazen.gln"), copy,
                             std::filesystem::copy_options::overwrite_existing);
  auto before = std::filesystem::file_size(copy);
  auto r = run_gradeline("solve " + copy + " --json " + copy);
  CHECK(r.exit_code == 2);
  CHECK(r.err == "gradeline: error: refusing to write over the input file '" + copy + "'\n");
  CHECK(std::filesystem::file_size(copy) == before);
}

TEST_CASE("an unwritable output folder exits 2 and leaves no file behind") {
  auto r = run_gradeline("solve tests/networks/loop_hazen.gln --json /nonexistent-dir/out.json");
  CHECK(r.exit_code == 2);
  CHECK(r.err.find("gradeline: error: cannot create a file in '/nonexistent-dir'") == 0);
}
