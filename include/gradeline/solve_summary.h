// gradeline public API: what a solve returns. A summary says why the solve stopped, how far it
// got and what the residuals are; the result carries the state of every node and link.
#pragma once

#include <cstdint>
#include <cstddef>
#include <string>
#include <vector>

namespace gradeline {

enum class Termination {
  kConverged,          // residuals below tolerance, link statuses settled
  kMaxIterations,      // iteration limit reached first
  kLinearSolverFailed, // the Schur complement was not positive definite
  kNonFinite,          // NaN or infinity appeared in the state
  kInvalidOptions,
  kSelfCheckFailed,    // the result failed the independent recomputation of its residuals
};

const char* termination_name(Termination t);

enum class FlowRegime : std::uint8_t { kNone, kLaminar, kTransitional, kTurbulent };

const char* regime_name(FlowRegime r);

// The mode the solver chose for a control valve.
enum class ValveMode : std::uint8_t { kNone, kActive, kOpen, kClosed };
const char* valve_mode_name(ValveMode m);

struct NodeState {
  double head_m = 0.0;        // NaN when unsupplied
  double pressure_m = 0.0;    // head - elevation, NaN when unsupplied
  double pressure_pa = 0.0;   // density * g * pressure head
  double demand_m3s = 0.0;    // demand of this solve
  double continuity_residual_m3s = 0.0;
  bool supplied = true;
};

struct LinkState {
  double flow_m3s = 0.0;      // positive from `from` to `to`
  double velocity_ms = 0.0;
  double headloss_m = 0.0;    // h(Q), signed like the flow
  double reynolds = 0.0;
  double friction_factor = 0.0;  // Darcy f; 0 where not defined
  double energy_residual_m = 0.0;
  FlowRegime regime = FlowRegime::kNone;
  bool open = true;           // false: closed by the file, by a check valve, or unsupplied
  bool closed_by_check_valve = false;
  ValveMode valve_mode = ValveMode::kNone;  // control valves only
};

// Seconds per stage. The Newton stages (topology to assembly) are timed only when
// SolveOptions::stage_timing is set (`solve --timing`) and are zero otherwise; the reduction,
// recovery and total are always timed.
struct SolveTiming {
  double topology_s = 0.0;
  double symbolic_s = 0.0;
  double numeric_factor_s = 0.0;  // summed over iterations
  double triangular_solve_s = 0.0;
  double assembly_s = 0.0;        // friction evaluation and matrix assembly, summed
  double reduction_s = 0.0;       // topological reduction and the core problem, before the core solve
  double recovery_s = 0.0;        // eliminated flows and heads, and the full residuals, after it
  double total_s = 0.0;
  // Link-law evaluations: done, and updated to first order from the last one because the
  // link's flow had barely moved (partial update).
  long long link_evaluations = 0;
  long long reused_link_evaluations = 0;
};

// What the topological reduction left for the Newton iterations.
struct ReductionSummary {
  bool applied = false;
  std::size_t core_junctions = 0;  // unknowns of the Newton system
  std::size_t core_links = 0;      // links of the Newton system; a series chain counts once
  std::size_t tree_links = 0;      // links of dead-end branches, fixed by continuity
  std::size_t chain_links = 0;     // pipes inside series chains
  std::size_t chains = 0;
};

struct SolveSummary {
  Termination termination = Termination::kMaxIterations;
  int iterations = 0;
  double max_continuity_residual_m3s = 0.0;
  double max_energy_residual_m = 0.0;
  std::size_t worst_continuity_node = 0;
  std::size_t worst_energy_link = 0;
  std::size_t unsupplied_nodes = 0;
  std::string message;  // human detail for a failure
  SolveTiming timing;
  ReductionSummary reduction;

  bool converged() const { return termination == Termination::kConverged; }
};

struct SolveResult {
  SolveSummary summary;
  std::vector<NodeState> nodes;
  std::vector<LinkState> links;
};

}  // namespace gradeline
