#include "report/check_report.h"

#include <cstdio>

#include "model/topology.h"
#include "model/units.h"

namespace gradeline {

CheckFindings check_network(const Network& net) {
  CheckFindings f;
  for (const Node& n : net.nodes) {
    if (n.is_fixed_head()) {
      ++f.reservoirs;
    } else {
      ++f.junctions;
      f.total_demand_m3s += n.demand_m3s;
    }
  }
  for (const Node& n : net.nodes) {
    if (n.kind == NodeKind::kTank) ++f.tanks;
  }
  for (const Pipe& p : net.pipes) {
    if (p.is_pump()) {
      ++f.pumps;
      continue;
    }
    if (p.status == LinkStatus::kOpen) ++f.pipes_open; else ++f.pipes_closed;
    if (p.check_valve) ++f.check_valves;
  }
  Topology t = build_topology(net);
  std::vector<char> open = links_open_in_file(net);
  f.islands = find_islands(net, t, open).count;
  std::vector<char> supplied = find_supplied(net, t, open);
  for (std::size_t i = 0; i < net.nodes.size(); ++i) {
    if (!supplied[i]) f.unsupplied.push_back(i);
  }
  return f;
}

std::string check_report_text(const Network& net, const CheckFindings& f, const std::string& file) {
  const DisplayUnit flow = display_flow(net.units);
  const DisplayUnit len = display_length(net.units);
  std::string out;
  char line[512];
  std::snprintf(line, sizeof line, "network     %s%s%s\n", file.c_str(),
                net.title.empty() ? "" : "  -  ", net.title.c_str());
  out += line;
  std::snprintf(line, sizeof line,
                "elements    %zu junctions, %zu reservoirs, %zu pipes (%zu closed, %zu check "
                "valves)\n",
                f.junctions, f.reservoirs - f.tanks, f.pipes_open + f.pipes_closed, f.pipes_closed,
                f.check_valves);
  out += line;
  if (f.tanks + f.pumps > 0) {
    std::snprintf(line, sizeof line, "            %zu tanks, %zu pumps\n", f.tanks, f.pumps);
    out += line;
  }
  std::snprintf(line, sizeof line, "demand      %.3f %s in total\n",
                f.total_demand_m3s * flow.per_si, flow.name);
  out += line;
  for (const Node& n : net.nodes) {
    if (!n.is_fixed_head()) continue;
    std::snprintf(line, sizeof line, "source      %-12s head %.2f %s\n", n.id.c_str(),
                  n.head_m * len.per_si, len.name);
    out += line;
  }
  std::snprintf(line, sizeof line, "islands     %zu (through open pipes)\n", f.islands);
  out += line;
  std::snprintf(line, sizeof line, "unsupplied  %zu nodes with no open path to a source\n",
                f.unsupplied.size());
  out += line;
  const std::size_t shown = std::min<std::size_t>(f.unsupplied.size(), 50);
  for (std::size_t i = 0; i < shown; ++i) out += "  - " + net.nodes[f.unsupplied[i]].id + "\n";
  if (shown < f.unsupplied.size()) {
    out += "  ... and " + std::to_string(f.unsupplied.size() - shown) + " more\n";
  }
  return out;
}

}  // namespace gradeline
