// The text report of a network large enough that its tables are formed in blocks on every
// core: each row must be what the printf formats of the report's columns give, in file order.
#include <doctest/doctest.h>

#include <cstdio>
#include <sstream>
#include <string>
#include <vector>

#include "gradeline/solver.h"
#include "model/parallel.h"
#include "model/units.h"
#include "report/text_report.h"
#include "test_support.h"

using namespace gradeline;

namespace {

// A ladder of two rails of `rungs` junctions each, fed from a reservoir at every 500th rung:
// every rung and every rail pipe closes a loop. The rails are closed before the last ten
// rungs, which are then unsupplied. More nodes and pipes than kParallelElements.
Network ladder(int rungs) {
  std::ostringstream text;
  text << "units SI\ndefaults roughness=0.1\n";
  for (int i = 0; i < rungs; ++i) {
    if (i % 500 == 0) text << "reservoir R" << i << " head=" << 60 + i % 7 << "\n";
    text << "node A" << i << " elevation=" << (i % 17) << " demand=0.02\n";
    text << "node B" << i << " elevation=" << (i % 13) << " demand=0.03\n";
  }
  for (int i = 0; i < rungs; ++i) {
    if (i % 500 == 0) text << "pipe F" << i << " R" << i << " A" << i << " length=50 diameter=300\n";
    text << "pipe C" << i << " A" << i << " B" << i << " length=15 diameter=" << (100 + i % 3 * 50)
         << "\n";
    if (i + 1 < rungs) {
      const char* status = i + 11 == rungs ? " status=closed" : "";
      text << "pipe RA" << i << " A" << i << " A" << i + 1 << " length=20 diameter=200" << status
           << "\n";
      text << "pipe RB" << i << " B" << i << " B" << i + 1 << " length=20 diameter=150" << status
           << "\n";
    }
  }
  return testing::parse_or_fail(text.str());
}

std::vector<std::string> lines_of(const std::string& text) {
  std::vector<std::string> out;
  std::istringstream in(text);
  for (std::string line; std::getline(in, line);) out.push_back(line + "\n");
  return out;
}

}  // namespace

TEST_CASE("a large report's table rows are the printf rows of every node and pipe, in order") {
  const Network net = ladder(12000);
  REQUIRE(static_cast<std::ptrdiff_t>(net.pipes.size()) > kParallelElements);
  REQUIRE(static_cast<std::ptrdiff_t>(net.nodes.size()) > kParallelElements);
  const SolveResult r = solve(net);
  REQUIRE(r.summary.converged());
  std::vector<std::string> pieces;
  write_solve_report(net, r, "ladder.gln", {}, [&](std::string_view p) { pieces.emplace_back(p); });
  CHECK(pieces.size() > 2);  // handed over in several pieces
  std::string whole;
  for (const std::string& p : pieces) whole += p;
  // The report ends with the engineer's caution, whatever was formed in blocks before it.
  const std::string caution = kCaution;
  REQUIRE(whole.size() > caution.size());
  CHECK(whole.compare(whole.size() - caution.size(), caution.size(), caution) == 0);

  const std::vector<std::string> lines = lines_of(whole);
  std::size_t at = 0;
  while (at < lines.size() && lines[at] != "nodes\n") ++at;
  REQUIRE(at + 3 + net.nodes.size() < lines.size());
  at += 3;  // the title, the header and the rule
  const DisplayUnit len = display_length(net.units), pres = display_pressure(net.units);
  const DisplayUnit flow = display_flow(net.units), dia = display_diameter(net.units);
  const DisplayUnit vel = display_velocity(net.units);
  char row[512];
  std::size_t unsupplied = 0;
  for (std::size_t n = 0; n < net.nodes.size(); ++n) {
    const NodeState& ns = r.nodes[n];
    if (!ns.supplied) {
      ++unsupplied;
      std::snprintf(row, sizeof row, "  %-14s %10.2f %10s %11s %11s %11.3f  %s\n",
                    net.nodes[n].id.c_str(), net.nodes[n].elevation_m * len.per_si, "-", "-", "-",
                    ns.demand_m3s * flow.per_si, "UNSUPPLIED");
    } else {
      std::snprintf(row, sizeof row, "  %-14s %10.2f %10.2f %11.2f %11.1f %11.3f  %s\n",
                    net.nodes[n].id.c_str(), net.nodes[n].elevation_m * len.per_si,
                    ns.head_m * len.per_si, ns.pressure_m * len.per_si,
                    ns.pressure_pa * pres.per_si, ns.demand_m3s * flow.per_si,
                    net.nodes[n].is_fixed_head() ? "fixed head" : "");
    }
    REQUIRE(lines[at + n] == row);
  }
  CHECK(unsupplied == 20);
  at += net.nodes.size();
  while (at < lines.size() && lines[at] != "pipes\n") ++at;
  at += 3;
  REQUIRE(at + net.pipes.size() <= lines.size());
  std::size_t not_open = 0;
  for (std::size_t k = 0; k < net.pipes.size(); ++k) {
    const Pipe& p = net.pipes[k];
    const LinkState& ls = r.links[k];
    if (!ls.open) {
      ++not_open;
      std::snprintf(row, sizeof row,
                    "  %-10s %-10s %-10s %9.1f %8.1f %10s %8s %8s %9s %9s %7s  %s\n",
                    p.id.c_str(), net.nodes[p.from].id.c_str(), net.nodes[p.to].id.c_str(),
                    p.length_m * len.per_si, p.diameter_m * dia.per_si, "0", "-", "-", "-", "-",
                    "-", p.status == LinkStatus::kClosed ? "closed" : "unsupplied");
      REQUIRE(lines[at + k] == row);
      continue;
    }
    std::snprintf(row, sizeof row,
                  "  %-10s %-10s %-10s %9.1f %8.1f %10.3f %8.3f %8.3f %9.3f %9.3g %7.4f  %s\n",
                  p.id.c_str(), net.nodes[p.from].id.c_str(), net.nodes[p.to].id.c_str(),
                  p.length_m * len.per_si, p.diameter_m * dia.per_si, ls.flow_m3s * flow.per_si,
                  ls.velocity_ms * vel.per_si, ls.headloss_m * len.per_si,
                  ls.headloss_m / p.length_m * 1e3, ls.reynolds, ls.friction_factor,
                  regime_name(ls.regime));
    REQUIRE(lines[at + k] == row);
  }
  CHECK(not_open == 2 + 10 + 2 * 9);  // the closed pair, then the isolated rungs and rails
}
