#include "solver/newton.h"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <limits>
#include <sstream>

#include "gradeline/prefault.h"
#include "hydraulics/chain_law.h"
#include "hydraulics/link_law.h"
#include "model/parallel.h"
#include "model/topology.h"
#include "solver/assembly.h"
#include "solver/control_valves.h"
#include "solver/link_batch.h"
#include "solver/reduced_solve.h"
#include "solver/residuals.h"
#include "solver/solver_cache.h"
#include "solver/sparse_cholesky.h"

namespace gradeline {
namespace {

using Clock = std::chrono::steady_clock;

double seconds_since(Clock::time_point t) {
  return std::chrono::duration<double>(Clock::now() - t).count();
}

constexpr int kMaxStatusToggles = 8;  // per check valve, against cycling
constexpr std::ptrdiff_t kParallelLinks = kParallelElements;
constexpr std::ptrdiff_t kEvaluationBlock = 2048;  // links per block of evaluation (LinkBatch)
constexpr double kValveHeadTolerance_m = 1e-6;  // band for valve mode decisions

struct State {
  std::vector<double> flow;
  std::vector<double> head;
};

class GradientSolver {
 public:
  GradientSolver(const Network& net, const SolveOptions& options,
                 const std::vector<double>& demand_m3s, SolverCache* cache,
                 const std::vector<double>* initial_flows, ChainLaws* chains)
      : net_(net), options_(options), given_demand_(demand_m3s), cache_(*cache),
        initial_flows_(initial_flows), valves_(net), chains_(chains),
        first_chain_(net.pipes.size() - (chains ? chains->size() : 0)) {}
  SolveResult run();

 private:
  void update_active_set();
  // h and dh/dQ of link k: its own law, or the chain's for a link that stands for a chain.
  LinkEval evaluate_link(std::size_t k, double flow_m3s) {
    return k >= first_chain_ ? chains_->evaluate(k - first_chain_, flow_m3s)
                             : evaluate_pipe(laws_[k], flow_m3s, &colebrook_x_[k]);
  }
  // h and dh/dQ of every active link at s: from the last evaluation where the flow has barely
  // moved (kUpdateRelativeFlow), unless `exact`. With `report` (exact only), each plain link's
  // Reynolds number, friction factor and regime are written to its LinkState there.
  void evaluate(const State& s, bool exact = false, std::vector<LinkState>* report = nullptr);
  ResidualNorms residuals(const State& s) {
    return compute_residuals(cache_.topology, s.flow, headloss_, s.head, demand_, supplied_, active_,
                             &balance_, nullptr);
  }
  bool newton_step(State* next);
  void set_directions();
  bool update_check_valves(const State& s);
  bool check_valves_consistent(const State& s, std::string* why) const;
  void analyse_pattern(bool reuse);
  void prepare_links();
  void start_state(State* s, ResidualNorms* norms);
  SolveResult finish(const State& s, Termination t, std::string message);

  const Network& net_;
  const SolveOptions& options_;
  const std::vector<double>& given_demand_;
  std::vector<PipeLaw> laws_;
  bool any_valve_law_ = false;  // some link's law is a valve's
  SolverCache& cache_;
  const std::vector<double>* initial_flows_;
  ControlValves valves_;
  ChainLaws* chains_;         // null, or the laws of the last chains_->size() links
  std::size_t first_chain_;
  std::vector<char> file_open_, cv_closed_, link_open_, supplied_, unsupplied_, active_;
  std::vector<int> toggles_;
  std::vector<int> direction_;  // +1, -1: one-way link; 0: two-way
  std::vector<double> demand_, headloss_, dh_dq_, conductance_;
  std::vector<double> colebrook_x_;  // per pipe: last Colebrook root, warm start of the next
  std::vector<double> evaluated_flow_;  // per link: the flow of its last evaluation, Q0
  std::vector<double> evaluated_loss_;  // per link: h(Q0); dh_dq_ holds h'(Q0)
  std::vector<double> balance_;         // per node: continuity residuals (workspace)
  Eigen::VectorXd rhs_, x_;
  SolveTiming timing_;
  int iterations_ = 0;
  Clock::time_point start_ = Clock::now();
  // The clock of the stage timings: read only when they are asked for (stage_timing), since a
  // read costs about 20 ns and a small solve has some forty stages.
  Clock::time_point stage_clock() const {
    return options_.stage_timing ? Clock::now() : Clock::time_point{};
  }
  double stage_seconds(Clock::time_point t) const {
    return options_.stage_timing ? seconds_since(t) : 0.0;
  }
};

void GradientSolver::update_active_set() {
  const std::ptrdiff_t links = static_cast<std::ptrdiff_t>(net_.pipes.size());
  for_each_index(links, [&](std::ptrdiff_t k) {
    link_open_[k] = file_open_[k] && !cv_closed_[k] && !valves_.closed(static_cast<std::size_t>(k));
  });
  supplied_ = find_supplied(net_, cache_.topology, link_open_);
  for_each_index(static_cast<std::ptrdiff_t>(net_.nodes.size()),
                 [&](std::ptrdiff_t n) { unsupplied_[n] = !supplied_[n]; });
  const std::vector<std::uint32_t>& from = cache_.topology.from;
  for_each_index(links, [&](std::ptrdiff_t k) { active_[k] = link_open_[k] && supplied_[from[k]]; });
}

void GradientSolver::evaluate(const State& s, bool exact, std::vector<LinkState>* report) {
  auto t = stage_clock();
  const std::ptrdiff_t links = static_cast<std::ptrdiff_t>(laws_.size());
  // Each link's law is independent of the others, so large networks share the links among the
  // cores; the result does not depend on how they are shared. They are dealt in blocks, not
  // halves: the chains, each a sum over its pipes, all sit at the end of the list, and a
  // static split gave one core 2.3 times the other's work on tree-like networks. Within a
  // block, the turbulent pipes' friction factors are found together (LinkBatch).
  // Partial update (kUpdateRelativeFlow). Valves are always evaluated, since their losses are
  // overridden by their mode.
  long long reused = 0, evaluated = 0;
  // Link k needs no new evaluation: inactive, or (unless exact) barely moved since its last.
  auto settled = [&](std::ptrdiff_t k, long long& reused_here) {
    if (!active_[k]) {
      headloss_[k] = 0.0;
      dh_dq_[k] = 0.0;
      evaluated_flow_[k] = std::numeric_limits<double>::quiet_NaN();
      return true;
    }
    const double moved = s.flow[k] - evaluated_flow_[k];
    if (!exact && std::abs(moved) <= kUpdateRelativeFlow * std::abs(s.flow[k]) &&
        !(any_valve_law_ && laws_[k].is_valve())) {  // the law is read only where valves are
      headloss_[k] = evaluated_loss_[k] + dh_dq_[k] * moved;
      ++reused_here;
      return true;
    }
    return false;
  };
  auto store = [&](std::ptrdiff_t k, const LinkEval& e, long long& evaluated_here) {
    if (report != nullptr && static_cast<std::size_t>(k) < first_chain_) {
      LinkState& ls = (*report)[k];
      ls.reynolds = e.reynolds;
      ls.friction_factor = e.friction_factor;
      ls.regime = e.regime;
    }
    headloss_[k] = evaluated_loss_[k] = e.headloss_m;
    dh_dq_[k] = e.dh_dq;
    evaluated_flow_[k] = s.flow[k];
    ++evaluated_here;
  };
  if (links < kParallelLinks) {
    // Small networks link by link: a batch's bookkeeping costs more than its vector friction
    // saves on a few dozen links (sizing makes hundreds of thousands of such solves).
    for (std::ptrdiff_t k = 0; k < links; ++k) {  // no OpenMP region
      if (settled(k, reused)) continue;
      store(k, evaluate_link(static_cast<std::size_t>(k), s.flow[k]), evaluated);
    }
  } else {
    // Links begin..end-1; the counts are each core's own.
    auto block = [&](std::ptrdiff_t begin, std::ptrdiff_t end, long long& reused_here,
                     long long& evaluated_here) {
      thread_local LinkBatch batch;  // each core's own, kept from block to block
      thread_local std::vector<std::ptrdiff_t> batched;
      batch.clear();
      batched.clear();
      for (std::ptrdiff_t k = begin; k < end; ++k) {
        if (settled(k, reused_here)) continue;
        batched.push_back(k);
        if (static_cast<std::size_t>(k) >= first_chain_) {
          batch.add_chain(chains_, static_cast<std::size_t>(k) - first_chain_, s.flow[k]);
        } else {
          batch.add_link(laws_[k], s.flow[k], &colebrook_x_[k]);
        }
      }
      batch.evaluate();
      for (std::size_t i = 0; i < batched.size(); ++i) {
        store(batched[i], batch.result(i), evaluated_here);
      }
    };
    const std::ptrdiff_t blocks = (links + kEvaluationBlock - 1) / kEvaluationBlock;
#pragma omp parallel for schedule(dynamic, 1) reduction(+ : reused, evaluated)
    for (std::ptrdiff_t b = 0; b < blocks; ++b) {
      block(b * kEvaluationBlock, std::min(links, (b + 1) * kEvaluationBlock), reused, evaluated);
    }
  }
  timing_.reused_link_evaluations += reused;
  timing_.link_evaluations += evaluated;
  if (valves_.any()) valves_.override_losses(s.head, &headloss_);
  timing_.assembly_s += stage_seconds(t);
}

bool GradientSolver::newton_step(State* next) {
  auto t = stage_clock();
  const std::size_t links = net_.pipes.size();
  const std::ptrdiff_t link_count = static_cast<std::ptrdiff_t>(links);
  const std::vector<std::uint32_t>& from = cache_.topology.from;
  const std::vector<std::uint32_t>& to = cache_.topology.to;
  // rhs = -demand + B^T (C (h(Q) - B0 H0) - Q), in one pass over the links.
  auto assemble_rhs = [&] {
    rhs_.setZero();
    for (std::size_t n = 0; n < net_.nodes.size(); ++n) {
      const int u = cache_.plan.unknown_of_node[n];
      if (u >= 0 && supplied_[n]) rhs_[u] = -demand_[n];
    }
    for (std::size_t k = 0; k < links; ++k) {
      if (!active_[k]) continue;
      const int a = cache_.plan.unknown_of_node[from[k]];
      const int b = cache_.plan.unknown_of_node[to[k]];
      double y = headloss_[k];  // h(Q) - B0 H0
      if (a < 0) y -= next->head[from[k]];
      if (b < 0) y += next->head[to[k]];
      const double contribution = conductance_[k] * y - next->flow[k];
      if (a >= 0) rhs_[a] += contribution;
      if (b >= 0) rhs_[b] -= contribution;
    }
  };
  auto set_conductances = [&] {
    for_each_index(link_count, [&](std::ptrdiff_t k) {
      conductance_[k] = active_[k] && !valves_.active(k) ? 1.0 / dh_dq_[k] : 0.0;
    });
  };
  if (!valves_.any() && link_count >= kParallelLinks) {
    // The matrix and the right-hand side are each one pass over the links, reading the
    // conductances and writing nothing the other reads: one core each.
    set_conductances();
#pragma omp parallel sections num_threads(2)
    {
#pragma omp section
      assemble_matrix(conductance_, unsupplied_, &cache_.plan);
#pragma omp section
      assemble_rhs();
    }
  } else {
    for (int pass = 0; pass < 4; ++pass) {
      set_conductances();
      assemble_matrix(conductance_, unsupplied_, &cache_.plan);
      if (!valves_.any() || !valves_.release_floating(cache_.plan, cache_.plan.matrix, supplied_)) break;
      evaluate(*next);  // an opened valve obeys its loss law from here on
    }
    if (valves_.any()) valves_.fix_flows(&next->flow);
    assemble_rhs();
    if (valves_.any()) valves_.assemble(cache_.plan, active_, &rhs_, &cache_.plan.matrix);
  }
  timing_.assembly_s += stage_seconds(t);

  if (cache_.plan.unknowns > 0) {  // with only fixed-head nodes there is no system to solve
    t = stage_clock();
    const bool factored = cache_.cholesky->factorize(cache_.plan.matrix);
    timing_.numeric_factor_s += stage_seconds(t);
    if (!factored) return false;
    t = stage_clock();
    const bool solved = cache_.cholesky->solve(rhs_, &x_);
    timing_.triangular_solve_s += stage_seconds(t);
    if (!solved) return false;
  }

  for (std::size_t n = 0; n < net_.nodes.size(); ++n) {
    const int u = cache_.plan.unknown_of_node[n];
    if (u >= 0) next->head[n] = supplied_[n] ? x_[u] : 0.0;
  }
  for_each_index(link_count, [&](std::ptrdiff_t k) {
    if (!active_[k]) {
      next->flow[k] = 0.0;
      return;
    }
    const double dh = next->head[from[k]] - next->head[to[k]];
    next->flow[k] += conductance_[k] * (dh - headloss_[k]);
  });
  if (valves_.any()) valves_.update_flows(active_, next->head, &next->flow);
  return true;
}

// One-way links: check valves and pumps allow flow from `from` to `to` (direction +1); a link
// at a tank that may only receive allows flow into the tank. Conflicting demands close it.
void GradientSolver::set_directions() {
  // receives(n): node n may only receive.
  auto set = [&](std::ptrdiff_t k, const auto& receives) {
    const Pipe& p = net_.pipes[k];
    int forward = p.check_valve ? 1 : 0;
    int conflict = 0;
    auto require = [&](int d) {
      if (forward != 0 && forward != d) conflict = 1;
      forward = d;
    };
    if (receives(p.to)) require(1);
    if (receives(p.from)) require(-1);
    direction_[k] = conflict ? 0 : forward;
    if (conflict) {
      cv_closed_[k] = 1;
      toggles_[k] = kMaxStatusToggles;  // stays closed
    }
  };
  const std::ptrdiff_t links = static_cast<std::ptrdiff_t>(net_.pipes.size());
  if (links < kParallelLinks) {
    const auto node_receives = [&](std::size_t n) { return net_.nodes[n].receives_only(); };
    for (std::ptrdiff_t k = 0; k < links; ++k) set(k, node_receives);
    return;
  }
  // Large networks: which nodes may only receive, in one pass over the nodes, so the pass over
  // the links (on every core) reads a byte per end instead of a whole node.
  std::vector<char> receives(net_.nodes.size());
  for_each_index(static_cast<std::ptrdiff_t>(net_.nodes.size()),
                 [&](std::ptrdiff_t n) { receives[n] = net_.nodes[n].receives_only(); });
  const auto flag = [&](std::size_t n) { return receives[n] != 0; };
  for_each_index(links, [&](std::ptrdiff_t k) { set(k, flag); });
}

bool GradientSolver::update_check_valves(const State& s) {
  bool changed = false;
  for (std::size_t k = 0; k < net_.pipes.size(); ++k) {
    const Pipe& p = net_.pipes[k];
    const int d = direction_[k];
    if (d == 0 || !file_open_[k] || toggles_[k] >= kMaxStatusToggles) continue;
    const std::size_t up = d > 0 ? p.from : p.to;
    const std::size_t down = d > 0 ? p.to : p.from;
    // Head that would drive flow the allowed way at zero flow (a pump adds its shut-off head).
    const double drive = d * (s.head[p.from] - s.head[p.to] - laws_[k].zero_flow_headloss_m());
    if (!cv_closed_[k] && active_[k] && d * s.flow[k] < 0.0) {
      cv_closed_[k] = 1;
    } else if (cv_closed_[k] && supplied_[up] && supplied_[down] && drive > 0.0) {
      cv_closed_[k] = 0;
    } else if (cv_closed_[k] && supplied_[up] && !supplied_[down]) {
      cv_closed_[k] = 0;  // the downstream side is fed only through this link
    } else {
      continue;
    }
    ++toggles_[k];
    changed = true;
  }
  if (changed) update_active_set();
  return changed;
}

bool GradientSolver::check_valves_consistent(const State& s, std::string* why) const {
  for (std::size_t k = 0; k < net_.pipes.size(); ++k) {
    const Pipe& p = net_.pipes[k];
    const int d = direction_[k];
    if (d == 0 || !file_open_[k]) continue;
    const double drive = d * (s.head[p.from] - s.head[p.to] - laws_[k].zero_flow_headloss_m());
    const char* what = p.is_pump() ? "pump" : p.check_valve ? "check valve" : "link at an empty tank";
    if (cv_closed_[k] && supplied_[p.from] && supplied_[p.to] && toggles_[k] < kMaxStatusToggles &&
        drive > options_.energy_tolerance_m) {
      *why = std::string(what) + " '" + p.id + "' is closed with a head favouring forward flow";
      return false;
    }
    if (!cv_closed_[k] && active_[k] && d * s.flow[k] < -options_.continuity_tolerance_m3s) {
      *why = std::string(what) + " '" + p.id + "' is open with reverse flow";
      return false;
    }
  }
  return true;
}

// The symbolic side of a solve: AMD order, assembly plan and CHOLMOD's analysis, unless the
// cache already holds them for this topology.
void GradientSolver::analyse_pattern(bool reuse) {
  const auto ts = stage_clock();
  if (!reuse) {
    // The pattern depends on the topology only: plan and analyse once, refactorise after.
    // Renumber the junctions once by the postordered AMD order, then factorise as numbered.
    const std::vector<int> order = junction_order(cache_.topology);
    cache_.plan = plan_assembly(cache_.topology, order);
    cache_.cholesky = make_sparse_cholesky(CholeskyBackend::kCholmodAuto,
                                           order.empty() ? Ordering::kAmd : Ordering::kNatural);
    cache_.analysed = cache_.plan.unknowns == 0 || cache_.cholesky->analyze(cache_.plan.matrix);
    cache_.remember(net_);
    ++cache_.analyses;
  }
  timing_.symbolic_s = stage_seconds(ts);
}

// Each link's law and status: open in the file, closed as a check valve, one-way; then the
// active set. Timed as part of the topology stage.
void GradientSolver::prepare_links() {
  const auto t = stage_clock();
  const std::size_t nodes = net_.nodes.size();
  const std::size_t links = net_.pipes.size();
  resize_prefaulted(laws_, links);
  for_each_index(static_cast<std::ptrdiff_t>(links), [&](std::ptrdiff_t k) {
    laws_[k] = make_pipe_law(net_.pipes[k], net_.headloss, net_.fluid,
                             options_.hw_regularisation_flow_m3s);
  });
  any_valve_law_ = std::any_of(net_.pipes.begin(), net_.pipes.end(),
                               [](const Pipe& p) { return p.is_valve(); });
  file_open_ = links_open_in_file(net_);
  cv_closed_.assign(links, 0);
  toggles_.assign(links, 0);
  direction_.assign(links, 0);
  set_directions();
  link_open_.assign(links, 0);
  unsupplied_.assign(nodes, 0);
  active_.assign(links, 0);
  update_active_set();
  timing_.topology_s += stage_seconds(t);
}

// The starting state (a cold start, or the given flows) and its first evaluation.
void GradientSolver::start_state(State* s, ResidualNorms* norms) {
  const std::size_t nodes = net_.nodes.size();
  const std::size_t links = net_.pipes.size();
  s->flow.assign(links, 0.0);
  s->head.assign(nodes, 0.0);
  demand_.resize(nodes);
  double mean_fixed = 0.0;
  int fixed = 0;
  for (std::size_t n = 0; n < nodes; ++n) {
    demand_[n] = net_.nodes[n].is_fixed_head() ? 0.0 : given_demand_[n];
    if (net_.nodes[n].is_fixed_head()) {
      s->head[n] = net_.nodes[n].head_m;
      mean_fixed += s->head[n];
      ++fixed;
    }
  }
  if (fixed > 0) mean_fixed /= fixed;
  for (std::size_t n = 0; n < nodes; ++n) {
    if (!net_.nodes[n].is_fixed_head()) s->head[n] = mean_fixed;
  }
  const bool warm = initial_flows_ != nullptr && initial_flows_->size() == links;
  for (std::size_t k = 0; k < links; ++k) {
    if (!active_[k]) continue;
    s->flow[k] = warm ? (*initial_flows_)[k]
                : k >= first_chain_ ? chains_->cold_start_flow(k - first_chain_, kInitialVelocity_ms)
                                    : kInitialVelocity_ms * laws_[k].area_m2;
    if (!warm && laws_[k].is_pump()) {  // start where the pump gives three quarters of its shut-off head
      const PipeLaw& law = laws_[k];
      s->flow[k] = std::pow(0.25 * law.pump.gain_m / law.pump.coefficient, 1.0 / law.pump.exponent);
    }
    if (warm && s->flow[k] == 0.0) s->flow[k] = 1e-3 * kInitialVelocity_ms * laws_[k].area_m2;
  }
  headloss_.assign(links, 0.0);
  dh_dq_.assign(links, 0.0);
  colebrook_x_.assign(links, 0.0);
  evaluated_flow_.assign(links, std::numeric_limits<double>::quiet_NaN());
  evaluated_loss_.assign(links, 0.0);
  evaluate(*s);
  *norms = residuals(*s);
}

SolveResult GradientSolver::run() {
  const std::size_t nodes = net_.nodes.size();
  const std::size_t links = net_.pipes.size();
  const std::ptrdiff_t link_count = static_cast<std::ptrdiff_t>(links);
  const auto t = stage_clock();
  const bool reuse = cache_.matches(net_);
  if (!reuse) cache_.topology = build_link_ends(net_);  // the incidence lists follow below
  timing_.topology_s = stage_seconds(t);

  // The symbolic analysis needs the link ends only; the incidence lists, the laws, the links'
  // statuses, the starting state and its first evaluation need nothing the analysis writes. On large networks one
  // core analyses while the other does the rest (each stage timed on its own, so under
  // --timing they overlap).
  State s;
  ResidualNorms norms;
  if (link_count >= kParallelLinks) {
#pragma omp parallel sections num_threads(2)
    {
#pragma omp section
      analyse_pattern(reuse);
#pragma omp section
      {
        if (!reuse) add_incidence(&cache_.topology);  // the analysis reads only the link ends
        prepare_links();
        start_state(&s, &norms);
      }
    }
  } else {  // no OpenMP region
    analyse_pattern(reuse);
    if (!reuse) add_incidence(&cache_.topology);
    prepare_links();
    start_state(&s, &norms);
  }
  conductance_.assign(links, 0.0);
  rhs_.resize(cache_.plan.unknowns);
  if (!cache_.analysed) return finish(s, Termination::kLinearSolverFailed, "symbolic analysis failed");

  bool evaluated = true;      // s was evaluated above
  bool status_changed = true;
  bool norms_known = true;   // `norms` already holds the residuals of `s`
  State next, trial;         // reused from iteration to iteration: no allocation in the loop
  for (int iteration = 0;; ++iteration) {
    if (!evaluated) evaluate(s);
    if (!norms_known) norms = residuals(s);
    norms_known = false;
    if (!norms.finite) return finish(s, Termination::kNonFinite, "the state is not finite");
    const bool small = norms.max_energy_m <= options_.energy_tolerance_m &&
                       norms.max_continuity_m3s <= options_.continuity_tolerance_m3s;
    if (iteration > 0 && small && !status_changed) {
      std::string why;
      if (!check_valves_consistent(s, &why)) return finish(s, Termination::kMaxIterations, why);
      if (!valves_.consistent(supplied_, s.head, s.flow, kValveHeadTolerance_m,
                              options_.continuity_tolerance_m3s, &why)) {
        return finish(s, Termination::kMaxIterations, why);
      }
      return finish(s, Termination::kConverged, "");
    }
    if (iteration >= options_.max_iterations) {
      return finish(s, Termination::kMaxIterations, "");
    }
    iterations_ = iteration + 1;
    next = s;
    if (!newton_step(&next)) {
      return finish(s, Termination::kLinearSolverFailed,
                    "the global-gradient matrix is not positive definite");
    }
    // Backtracking: from the second step on, the direction keeps continuity satisfied and
    // the energy residual should fall.
    evaluate(next);
    if (iteration > 0 && !status_changed && !valves_.any()) {
      const double old_merit = norms.energy_sum_squares;
      bool halved = false;
      double alpha = 1.0;
      for (int halving = 0; halving < options_.max_step_halvings; ++halving) {
        ResidualNorms r = residuals(halved ? trial : next);
        if (r.finite && r.energy_sum_squares <= old_merit) {
          norms = r;
          norms_known = true;
          break;
        }
        alpha *= 0.5;
        if (!halved) trial = next;
        halved = true;
        for (std::size_t k = 0; k < links; ++k)
          trial.flow[k] = s.flow[k] + alpha * (next.flow[k] - s.flow[k]);
        for (std::size_t n = 0; n < nodes; ++n)
          trial.head[n] = s.head[n] + alpha * (next.head[n] - s.head[n]);
        evaluate(trial);
      }
      if (halved) std::swap(next, trial);
    }
    std::swap(s, next);
    evaluated = true;
    status_changed = update_check_valves(s);
    if (valves_.any() && valves_.update_modes(supplied_, s.head, s.flow, kValveHeadTolerance_m,
                                              options_.continuity_tolerance_m3s)) {
      update_active_set();
      status_changed = true;
    }
    if (status_changed) {
      for (std::size_t k = 0; k < links; ++k) {
        if (!active_[k]) s.flow[k] = 0.0;
      }
      evaluated = false;
      norms_known = false;
    }
  }
}

SolveResult GradientSolver::finish(const State& s, Termination termination, std::string message) {
  SolveResult result;
  SolveSummary& sum = result.summary;
  sum.termination = termination;
  sum.iterations = iterations_;
  const std::size_t nodes = net_.nodes.size();
  const std::size_t links = net_.pipes.size();

  std::vector<double> node_res, link_res;
  resize_prefaulted(result.links, links);
  evaluate(s, true, &result.links);  // what is reported comes from exact evaluations
  ResidualNorms norms = compute_residuals(cache_.topology, s.flow, headloss_, s.head, demand_, supplied_,
                                          active_, &node_res, &link_res);
  sum.max_continuity_residual_m3s = norms.max_continuity_m3s;
  sum.max_energy_residual_m = norms.max_energy_m;
  sum.worst_continuity_node = norms.worst_node;
  sum.worst_energy_link = norms.worst_link;

  resize_prefaulted(result.nodes, nodes);
  const double nan = std::numeric_limits<double>::quiet_NaN();
  // Each record on its own, on every core for large networks.
  for_each_index(static_cast<std::ptrdiff_t>(nodes), [&](std::ptrdiff_t n) {
    NodeState& ns = result.nodes[n];
    const Node& node = net_.nodes[n];
    ns.supplied = supplied_[n];
    ns.demand_m3s = demand_[n];
    ns.continuity_residual_m3s = node_res[n];
    ns.head_m = supplied_[n] ? s.head[n] : nan;
    ns.pressure_m = ns.head_m - node.elevation_m;
    ns.pressure_pa = ns.pressure_m * net_.fluid.density_kgm3 * kGravity_ms2;
  });
  sum.unsupplied_nodes = static_cast<std::size_t>(std::count(supplied_.begin(), supplied_.end(), 0));
  for_each_index(static_cast<std::ptrdiff_t>(links), [&](std::ptrdiff_t i) {
    const std::size_t k = static_cast<std::size_t>(i);
    LinkState& ls = result.links[k];
    ls.open = active_[k];
    ls.closed_by_check_valve = cv_closed_[k];
    ls.valve_mode = valves_.mode(k);
    ls.energy_residual_m = link_res[k];
    if (!active_[k]) return;
    ls.flow_m3s = s.flow[k];
    if (k >= first_chain_) {  // a chain: its pipes are reported by the recovery, not here
      ls.headloss_m = headloss_[k];
      return;
    }
    // Reynolds number, friction factor and regime: written by the exact evaluation above.
    ls.velocity_ms = laws_[k].is_pump() ? 0.0 : s.flow[k] / laws_[k].area_m2;
    ls.headloss_m = valves_.active(k) ? s.head[net_.pipes[k].from] - s.head[net_.pipes[k].to]
                                      : evaluated_loss_[k];
  });

  if (termination != Termination::kConverged && message.empty()) {
    std::ostringstream m;
    m << "no convergence after " << sum.iterations << " iterations";
    if (links > 0) {
      m << ": largest energy residual " << norms.max_energy_m << " m on pipe '"
        << net_.pipes[norms.worst_link].id << "'";
    }
    if (nodes > 0) {
      m << ", largest continuity residual " << norms.max_continuity_m3s << " m3/s at node '"
        << net_.nodes[norms.worst_node].id << "'";
    }
    message = m.str();
  }
  sum.message = std::move(message);
  timing_.total_s = seconds_since(start_);
  sum.timing = timing_;
  return result;
}

}  // namespace

std::string SolveOptions::validate() const {
  if (max_iterations < 1 || max_iterations > 10000) return "max_iterations must be in 1..10000";
  if (!(energy_tolerance_m > 0.0)) return "energy_tolerance_m must be positive";
  if (!(continuity_tolerance_m3s > 0.0)) return "continuity_tolerance_m3s must be positive";
  if (max_step_halvings < 0 || max_step_halvings > 60) return "max_step_halvings must be in 0..60";
  if (!(hw_regularisation_flow_m3s > 0.0)) return "hw_regularisation_flow_m3s must be positive";
  if (reduction_min_nodes < 0) return "reduction_min_nodes must not be negative";
  return "";
}

SolveResult run_gradient_method(const Network& network, const SolveOptions& options,
                                const std::vector<double>& demand_m3s, SolverCache* cache,
                                const std::vector<double>* initial_flows, ChainLaws* chains) {
  return GradientSolver(network, options, demand_m3s, cache, initial_flows, chains).run();
}

SolveResult solve_with_cache(const Network& network, const SolveOptions& options,
                             const std::vector<double>& demand_m3s, SolverCache* cache,
                             const std::vector<double>* initial_flows) {
  std::string invalid = options.validate();
  if (invalid.empty() && demand_m3s.size() != network.nodes.size()) {
    invalid = "one demand per node is needed";
  }
  if (!invalid.empty()) {
    SolveResult r;
    r.summary.termination = Termination::kInvalidOptions;
    r.summary.message = invalid;
    return r;
  }
  if (options.topological_reduction &&
      network.nodes.size() >= static_cast<std::size_t>(options.reduction_min_nodes)) {
    std::optional<SolveResult> reduced =
        solve_reduced(network, options, demand_m3s, cache, initial_flows);
    if (reduced) return std::move(*reduced);
  }
  return run_gradient_method(network, options, demand_m3s, cache, initial_flows, nullptr);
}

SolveResult solve(const Network& network, const SolveOptions& options,
                  const std::vector<double>& demand_m3s) {
  SolverCache cache;
  return solve_with_cache(network, options, demand_m3s, &cache, nullptr);
}

SolverSession::SolverSession() : cache_(std::make_unique<SolverCache>()) {}
SolverSession::~SolverSession() = default;

SolveResult SolverSession::solve(const Network& network, const SolveOptions& options,
                                 const std::vector<double>& demand_m3s,
                                 const std::vector<double>* initial_flows_m3s) {
  return solve_with_cache(network, options, demand_m3s, cache_.get(), initial_flows_m3s);
}

int SolverSession::symbolic_analyses() const { return cache_->analyses; }

SolveResult solve(const Network& network, const SolveOptions& options) {
  std::vector<double> demand(network.nodes.size());
  for (std::size_t n = 0; n < demand.size(); ++n) demand[n] = network.nodes[n].demand_m3s;
  return solve(network, options, demand);
}

const char* termination_name(Termination t) {
  switch (t) {
    case Termination::kConverged: return "converged";
    case Termination::kMaxIterations: return "iteration limit reached";
    case Termination::kLinearSolverFailed: return "linear solver failed";
    case Termination::kNonFinite: return "non-finite state";
    case Termination::kInvalidOptions: return "invalid options";
    case Termination::kSelfCheckFailed: return "self-check failed";
  }
  return "unknown";
}

const char* regime_name(FlowRegime r) {
  switch (r) {
    case FlowRegime::kNone: return "none";
    case FlowRegime::kLaminar: return "laminar";
    case FlowRegime::kTransitional: return "transitional";
    case FlowRegime::kTurbulent: return "turbulent";
  }
  return "none";
}

}  // namespace gradeline
