// Least-cost sizing: choose a commercial size for each candidate pipe so that every demand
// case meets its criteria, at minimum cost. See docs/sizing.md for the method.
#pragma once

#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "analysis/case_run.h"
#include "design/catalogue.h"

namespace gradeline {

struct SizingProblem {
  std::vector<std::size_t> pipes;    // candidate pipe indices
  bool new_pipes = false;            // true: any catalogue size; false: keep, or a size >= today's
  std::vector<DemandCase> cases;
  CriteriaOverride criteria;
  SolveOptions solve_options;
  // Exhaustive search when the number of designs is at most this.
  long long enumeration_limit = 50000;
  std::function<void(long long solves, double best_cost)> progress;  // may be empty
};

// One candidate size for one pipe: a catalogue item, or (item < 0) the pipe as it is.
struct SizeOption {
  int item = -1;
  double diameter_m = 0.0;
  double cost = 0.0;
};

struct PipeChange {
  std::size_t pipe = 0;
  std::optional<double> from_diameter_m;  // none for a new pipe
  int item = 0;
  double cost = 0.0;
  // What the size buys: the cheaper next-smaller option, and the worst pressure margin with it.
  std::optional<int> smaller_item;        // -1: the pipe as it is
  double saving_if_smaller = 0.0;
  double margin_if_smaller_m = 0.0;       // NaN when that design does not solve
};

// Hash of a design (one option index per candidate pipe), for memo tables of trial designs.
struct DesignHash {
  std::size_t operator()(const std::vector<int>& design) const {
    std::size_t h = 1469598103934665603ull;  // FNV-1a
    for (int v : design) h = (h ^ static_cast<std::size_t>(v)) * 1099511628211ull;
    return h;
  }
};

struct SizingResult {
  bool feasible = false;
  double cost = 0.0;
  std::vector<PipeChange> changes;                          // changed pipes only
  std::vector<std::pair<std::string, double>> min_pressure_m;  // per case, of the final design
  double min_margin_m = 0.0;                                // worst pressure margin, all cases
  std::vector<Violation> remaining;                         // when not feasible: what still fails
  std::string method;                                       // "enumeration" or "greedy+local"
  long long solves = 0;
  long long solves_to_best = 0;  // solves spent when the chosen design was first met
  double seconds = 0.0;
};

std::vector<SizeOption> size_options(const Network& network, std::size_t pipe,
                                     const Catalogue& catalogue, bool new_pipe);

SizingResult size_pipes(const Network& network, const Catalogue& catalogue,
                        const SizingProblem& problem);

// The network with the chosen sizes (what the change set describes).
Network apply_sizes(const Network& network, const Catalogue& catalogue,
                    const std::vector<PipeChange>& changes);

}  // namespace gradeline
