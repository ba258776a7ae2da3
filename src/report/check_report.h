// The report of `gradeline check`: counts, sources, islands and unsupplied nodes of a network
// that parsed without error.
#pragma once

#include <string>

#include "gradeline/network.h"

namespace gradeline {

struct CheckFindings {
  std::size_t junctions = 0;
  std::size_t reservoirs = 0;
  std::size_t pipes_open = 0;
  std::size_t pipes_closed = 0;
  std::size_t check_valves = 0;
  std::size_t tanks = 0;  // counted among the fixed-head nodes too
  std::size_t pumps = 0;
  std::size_t islands = 0;
  std::vector<std::size_t> unsupplied;  // node indices
  double total_demand_m3s = 0.0;
};

CheckFindings check_network(const Network& network);
std::string check_report_text(const Network& network, const CheckFindings& findings,
                              const std::string& file);

}  // namespace gradeline
