// The real gradeline binary: exit codes, messages and outputs.
#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>
#include <map>
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
  auto r = run_gradeline("solve tests/networks/loop_minor_closed.gln --max-iterations 1");
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

TEST_CASE("--case all solves every case; a violated criterion exits 1 and is listed") {
  auto r = run_gradeline("solve networks/brindlemoor.gln --case all --summary");
  CHECK(r.exit_code == 1);
  CHECK(r.out.find("case        average") != std::string::npos);
  CHECK(r.out.find("case        fire_E13") != std::string::npos);
  CHECK(r.out.find("criteria    1 VIOLATIONS") != std::string::npos);
  CHECK(r.out.find("fire_E13     E13            pressure  min") != std::string::npos);
}

TEST_CASE("a case that meets its criteria exits 0; a command-line criterion can make it fail") {
  CHECK(run_gradeline("solve networks/brindlemoor.gln --case average --summary").exit_code == 0);
  auto r = run_gradeline("solve networks/brindlemoor.gln --case average --summary --min-pressure 50psi");
  CHECK(r.exit_code == 1);
  auto bad = run_gradeline("solve networks/brindlemoor.gln --min-pressure 50furlongs");
  CHECK(bad.exit_code == 2);
  CHECK(bad.err.find("gradeline: error: --min-pressure: bad unit 'furlongs'") == 0);
  auto unknown = run_gradeline("solve networks/brindlemoor.gln --case peek");
  CHECK(unknown.exit_code == 2);
  CHECK(unknown.err == "gradeline: error: no case 'peek' in the network (did you mean 'peak'?)\n");
}

TEST_CASE("JSON of several cases nests them and lists the violations in SI") {
  std::string path = temp_dir() + "/cases.json";
  auto r = run_gradeline("solve networks/brindlemoor.gln --case all --summary --json " + path);
  REQUIRE(r.exit_code == 1);
  std::ifstream in(path);
  nlohmann::json j = nlohmann::json::parse(in);
  CHECK(j["cases"].size() == 3);
  CHECK(j["cases"]["peak"]["summary"]["converged"] == true);
  REQUIRE(j["violations"].size() == 1);
  const auto& v = j["violations"][0];
  CHECK(v["case"] == "fire_E13");
  CHECK(v["id"] == "E13");
  CHECK(v["quantity"] == "pressure");
  CHECK(v["kind"] == "min");
  CHECK(v["unit"] == "m");
  CHECK(v["value"].get<double>() < v["limit"].get<double>());
}

TEST_CASE("--case all, each case started from the last one's flows, gives each case's own solution") {
  // The warm start changes only where the Newton iterations begin: every head must agree with
  // a run of that case alone to within the solver's tolerances.
  constexpr double kSameHead_m = 1e-7;
  const std::string all = temp_dir() + "/all.json", one = temp_dir() + "/one.json";
  REQUIRE(run_gradeline("solve networks/brindlemoor.gln --case all --summary --json " + all).exit_code == 1);
  REQUIRE(run_gradeline("solve networks/brindlemoor.gln --case fire_E13 --summary --json " + one).exit_code == 1);
  std::ifstream a(all), b(one);
  const nlohmann::json ja = nlohmann::json::parse(a), jb = nlohmann::json::parse(b);
  const auto& nodes_all = ja["cases"]["fire_E13"]["nodes"];
  const auto& nodes_one = jb["nodes"];
  REQUIRE(nodes_all.size() == nodes_one.size());
  for (std::size_t i = 0; i < nodes_one.size(); ++i) {
    CAPTURE(nodes_one[i]["id"]);
    if (nodes_one[i]["head_m"].is_null()) continue;
    CHECK(std::abs(nodes_all[i]["head_m"].get<double>() - nodes_one[i]["head_m"].get<double>()) <
          kSameHead_m);
  }
}

TEST_CASE("compare: before and after columns equal two separate solve runs") {
  const std::string dir = temp_dir();
  auto cmp = run_gradeline("compare networks/brindlemoor.gln --apply networks/brindlemoor_fire_mains.chg "
                           "--case fire_E13 --json " + dir + "/cmp.json");
  REQUIRE(cmp.exit_code == 0);
  CHECK(cmp.out.find("fixed          E13") != std::string::npos);
  auto before = run_gradeline("solve networks/brindlemoor.gln --case fire_E13 --summary --json " + dir + "/b.json");
  auto after = run_gradeline("solve networks/brindlemoor.gln --case fire_E13 --summary --apply "
                             "networks/brindlemoor_fire_mains.chg --json " + dir + "/a.json");
  CHECK(before.exit_code == 1);
  CHECK(after.exit_code == 0);
  std::ifstream c(dir + "/cmp.json"), b(dir + "/b.json"), a(dir + "/a.json");
  nlohmann::json jc = nlohmann::json::parse(c), jb = nlohmann::json::parse(b), ja = nlohmann::json::parse(a);
  std::map<std::string, double> pb, pa;
  for (const auto& n : jb["nodes"]) pb[n["id"]] = n["pressure_kPa"].get<double>();
  for (const auto& n : ja["nodes"]) pa[n["id"]] = n["pressure_kPa"].get<double>();
  const auto& nodes = jc["cases"]["fire_E13"]["nodes"];
  CHECK(nodes.size() == 28);
  // The after side starts from the before side's flows, so it may stop at another point within
  // the solver's tolerances (1e-8 m of energy residual): a millionth of a kPa is far beyond that.
  constexpr double kSamePressure_kPa = 1e-6;
  for (const auto& n : nodes) {
    CHECK(n["before_pressure_kPa"].get<double>() == pb[n["id"]]);
    CHECK(std::abs(n["after_pressure_kPa"].get<double>() - pa[n["id"]]) < kSamePressure_kPa);
  }
  CHECK(jc["cases"]["fire_E13"]["fixed"] == nlohmann::json::array({"E13"}));
  CHECK(jc["cases"]["fire_E13"]["newly_failing"].empty());
}

TEST_CASE("solve --write-network writes the merged network, never over an input") {
  const std::string out = temp_dir() + "/merged.gln";
  auto r = run_gradeline("solve networks/brindlemoor.gln --summary --apply networks/brindlemoor_fire_mains.chg "
                         "--write-network " + out);
  CHECK(r.exit_code == 0);
  auto again = run_gradeline("solve " + out + " --case fire_E13 --summary");
  CHECK(again.exit_code == 0);  // the upsized network meets the fire criteria
  auto refuse = run_gradeline("solve networks/brindlemoor.gln --apply networks/brindlemoor_fire_mains.chg "
                              "--write-network networks/brindlemoor_fire_mains.chg");
  CHECK(refuse.exit_code == 2);
  CHECK(refuse.err == "gradeline: error: refusing to write over the input file "
                      "'networks/brindlemoor_fire_mains.chg'\n");
}

TEST_CASE("change-set errors from the command line exit 2 with FILE:LINE") {
  std::string path = write_temp("bad.chg", "modify P999 diameter=300mm\n");
  auto r = run_gradeline("solve networks/brindlemoor.gln --apply " + path);
  CHECK(r.exit_code == 2);
  CHECK(r.err == path + ":1: error: modify: no pipe or node 'P999' in the network\n");
}

TEST_CASE("size writes a change set that solve --apply accepts, and JSON with the cost") {
  const std::string dir = temp_dir();
  auto r = run_gradeline("size networks/brindlemoor.gln --catalogue networks/brindlemoor_catalogue.cat "
                         "--changes " + dir + "/sized.chg --json " + dir + "/sized.json");
  REQUIRE(r.exit_code == 0);
  CHECK(r.out.find("FEASIBLE design found") != std::string::npos);
  auto check = run_gradeline("solve networks/brindlemoor.gln --case all --summary --apply " + dir + "/sized.chg");
  CHECK(check.exit_code == 0);  // every case meets its criteria with the sized mains
  std::ifstream in(dir + "/sized.json");
  nlohmann::json j = nlohmann::json::parse(in);
  CHECK(j["feasible"] == true);
  CHECK(j["cost"].get<double>() > 0.0);
  CHECK(j["changes"][0].contains("from_diameter_m"));
  CHECK(j["min_pressure_m"].contains("fire_E13"));
}

TEST_CASE("size exits 1 on an infeasible problem and still writes the labelled best effort") {
  const std::string dir = temp_dir();
  auto r = run_gradeline("size networks/brindlemoor.gln --catalogue networks/brindlemoor_catalogue.cat "
                         "--min-pressure 600kPa --changes " + dir + "/effort.chg");
  CHECK(r.exit_code == 1);
  CHECK(r.out.find("NO FEASIBLE DESIGN") != std::string::npos);
  std::ifstream in(dir + "/effort.chg");
  std::string first;
  std::getline(in, first);
  std::getline(in, first);
  CHECK(first == "# BEST EFFORT ONLY: this design does NOT meet the criteria");
}

TEST_CASE("compare --catalogue prices the sized mains at the cost size reported") {
  const std::string dir = temp_dir();
  REQUIRE(run_gradeline("size networks/brindlemoor.gln --catalogue networks/brindlemoor_catalogue.cat "
                        "--changes " + dir + "/s.chg --json " + dir + "/s.json").exit_code == 0);
  auto r = run_gradeline("compare networks/brindlemoor.gln --apply " + dir + "/s.chg --catalogue "
                         "networks/brindlemoor_catalogue.cat --json " + dir + "/c.json");
  CHECK(r.exit_code == 0);
  std::ifstream s(dir + "/s.json"), c(dir + "/c.json");
  nlohmann::json js = nlohmann::json::parse(s), jc = nlohmann::json::parse(c);
  double total = 0.0;
  for (const auto& d : jc["new_or_resized_pipes"]) total += d["cost"].get<double>();
  CHECK(total == doctest::Approx(js["cost"].get<double>()));
}
