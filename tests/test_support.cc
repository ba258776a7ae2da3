#include "test_support.h"

#include <doctest/doctest.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cmath>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "io/parser.h"

namespace gradeline::testing {

std::string source_path(const std::string& relative) {
  return std::string(GRADELINE_SOURCE_DIR) + "/" + relative;
}

std::vector<std::vector<double>> read_csv(const std::string& relative) {
  std::ifstream in(source_path(relative));
  REQUIRE(in.good());
  std::vector<std::vector<double>> rows;
  std::string line;
  bool header = true;
  while (std::getline(in, line)) {
    if (line.empty() || line[0] == '#') continue;
    if (header) {
      header = false;
      continue;
    }
    std::vector<double> row;
    std::stringstream fields(line);
    std::string field;
    while (std::getline(fields, field, ',')) row.push_back(std::strtod(field.c_str(), nullptr));
    rows.push_back(row);
  }
  return rows;
}

Network load(const std::string& relative) {
  ParseResult r = parse_network_file(source_path(relative));
  for (const Diagnostic& d : r.errors) FAIL_CHECK(d.format());
  REQUIRE(r.ok());
  return std::move(r.network);
}

Network parse_or_fail(const std::string& text) {
  ParseResult r = parse_network_text(text, "test.gln");
  for (const Diagnostic& d : r.errors) FAIL_CHECK(d.format());
  REQUIRE(r.ok());
  return std::move(r.network);
}

std::vector<double> base_demand(const Network& net) {
  std::vector<double> q;
  q.reserve(net.nodes.size());
  for (const Node& n : net.nodes) q.push_back(n.demand_m3s);
  return q;
}

double max_loop_headloss_m(const Network& net, const SolveResult& result) {
  // Spanning forest of the open links by breadth-first search; each open link outside it closes
  // one fundamental cycle, walked through the tree to the common ancestor.
  const std::size_t n = net.nodes.size();
  std::vector<std::vector<std::size_t>> adjacent(n);
  for (std::size_t k = 0; k < net.pipes.size(); ++k) {
    if (!result.links[k].open) continue;
    adjacent[net.pipes[k].from].push_back(k);
    adjacent[net.pipes[k].to].push_back(k);
  }
  const std::size_t none = static_cast<std::size_t>(-1);
  std::vector<std::size_t> parent_link(n, none), depth(n, none);
  std::vector<char> in_tree(net.pipes.size(), 0);
  for (std::size_t root = 0; root < n; ++root) {
    if (depth[root] != none) continue;
    depth[root] = 0;
    std::vector<std::size_t> queue{root};
    for (std::size_t q = 0; q < queue.size(); ++q) {
      std::size_t u = queue[q];
      for (std::size_t k : adjacent[u]) {
        std::size_t v = net.pipes[k].from == u ? net.pipes[k].to : net.pipes[k].from;
        if (depth[v] != none) continue;
        depth[v] = depth[u] + 1;
        parent_link[v] = k;
        in_tree[k] = 1;
        queue.push_back(v);
      }
    }
  }
  // Head loss from a node up to the root of its tree: sum of signed losses along the path.
  auto up = [&](std::size_t node, std::size_t* next) {
    std::size_t k = parent_link[node];
    const Pipe& p = net.pipes[k];
    *next = p.from == node ? p.to : p.from;
    return p.from == node ? result.links[k].headloss_m : -result.links[k].headloss_m;
  };
  double worst = 0.0;
  for (std::size_t k = 0; k < net.pipes.size(); ++k) {
    if (!result.links[k].open || in_tree[k]) continue;
    std::size_t a = net.pipes[k].to, b = net.pipes[k].from;
    double sum = result.links[k].headloss_m;  // from -> to
    while (a != b) {
      std::size_t next;
      if (depth[a] >= depth[b]) {
        sum += up(a, &next);
        a = next;
      } else {
        sum -= up(b, &next);
        b = next;
      }
    }
    worst = std::max(worst, std::abs(sum));
  }
  return worst;
}

double max_continuity_m3s(const Network& net, const SolveResult& result) {
  std::vector<double> balance(net.nodes.size(), 0.0);
  for (std::size_t k = 0; k < net.pipes.size(); ++k) {
    balance[net.pipes[k].from] -= result.links[k].flow_m3s;
    balance[net.pipes[k].to] += result.links[k].flow_m3s;
  }
  double worst = 0.0;
  for (std::size_t i = 0; i < net.nodes.size(); ++i) {
    if (net.nodes[i].is_fixed_head() || !result.nodes[i].supplied) continue;
    worst = std::max(worst, std::abs(balance[i] - result.nodes[i].demand_m3s));
  }
  return worst;
}

std::string temp_dir() {
  static std::string dir = [] {
    std::string pattern =
        (std::filesystem::temp_directory_path() / "gradeline-test-XXXXXX").string();
    REQUIRE(mkdtemp(pattern.data()) != nullptr);
    return pattern;
  }();
  return dir;
}

namespace {
std::string slurp(const std::string& path) {
  std::ifstream in(path);
  std::stringstream s;
  s << in.rdbuf();
  return s.str();
}
}  // namespace

CommandResult run_gradeline(const std::string& arguments) {
  const std::string out = temp_dir() + "/stdout.txt";
  const std::string err = temp_dir() + "/stderr.txt";
  const std::string command = std::string("cd '") + GRADELINE_SOURCE_DIR + "' && '" +
                              GRADELINE_BINARY + "' " + arguments + " >'" + out + "' 2>'" + err +
                              "' </dev/null";
  int status = std::system(command.c_str());
  CommandResult r;
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  r.out = slurp(out);
  r.err = slurp(err);
  return r;
}

PipeLaw pipe_law(HeadlossLaw kind, double d_m, double minor) {
  Pipe p;
  p.length_m = 350.0;
  p.diameter_m = d_m;
  p.roughness_m = 2e-4;
  p.cfactor = 120.0;
  p.minor_k = minor;
  HeadlossModel m;
  m.law = kind;
  Fluid f;
  f.kinematic_viscosity_m2s = 1.1e-6;
  return make_pipe_law(p, m, f, 1e-8);
}

}  // namespace gradeline::testing
