// libFuzzer target: the network parser. Any input must give a model or errors, never a crash,
// a hang or a sanitizer report, and the same when its node and pipe lines are read in bulk.
// A network that parses must also round-trip through the writer,
// and a small one must solve, unreduced and through the topological reduction, to a result
// that passes the self-check or report that it did not (GRADELINE_FUZZ_STRICT=1 aborts on a
// converged result that fails the self-check, for hunting rather than for CI).
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <string>

#include "analysis/self_check.h"
#include "gradeline/solver.h"
#include "io/network_writer.h"
#include "io/parser.h"

using namespace gradeline;

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  std::string text(reinterpret_cast<const char*>(data), size);
  ParseResult r = parse_network_text(text, "fuzz.gln");  // small inputs: read line by line
  // Read in bulk (io/bulk_reader.h) whatever the size: the same errors, or the same network.
  ParseResult bulk = parse_network_text(text, "fuzz.gln", 1);
  if (bulk.errors.size() != r.errors.size()) std::abort();
  for (std::size_t i = 0; i < r.errors.size(); ++i) {
    if (bulk.errors[i].format() != r.errors[i].format()) std::abort();
  }
  if (!r.ok()) return 0;
  std::string written = write_network(r.network);
  if (write_network(bulk.network) != written) std::abort();
  ParseResult again = parse_network_text(written, "written.gln");
  if (!again.ok() || write_network(again.network) != written) std::abort();
  if (r.network.pipes.size() <= 200) {
    // Once as given, once through the topological reduction whatever the network's size.
    for (int reduced = 0; reduced < 2; ++reduced) {
      SolveOptions options;
      options.max_iterations = 30;
      options.reduction_min_nodes = reduced ? 0 : 1 << 30;
      SolveResult s = solve(r.network, options);
      if (s.summary.converged()) {
        std::vector<double> demand;
        for (const Node& n : r.network.nodes) demand.push_back(n.demand_m3s);
        const SelfCheck check = check_result(r.network, demand, s, options);
        if (std::getenv("GRADELINE_FUZZ_STRICT") && !check.ok) std::abort();
      }
    }
  }
  return 0;
}
