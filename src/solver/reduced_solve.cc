#include "solver/reduced_solve.h"

#include <chrono>
#include <cmath>
#include <limits>

#include "gradeline/prefault.h"
#include "hydraulics/chain_law.h"
#include "hydraulics/link_law.h"
#include "model/parallel.h"
#include "solver/newton.h"

namespace gradeline {
namespace {

using Clock = std::chrono::steady_clock;

constexpr std::ptrdiff_t kParallelChains = kParallelElements;

double seconds_since(Clock::time_point t) {
  return std::chrono::duration<double>(Clock::now() - t).count();
}

// Demands gathered down the branches (leaves first) and along the chains.
void gather_demands(const Network& net, const Reduction& r, const std::vector<double>& demand,
                    CoreProblem* p) {
  // The per-element steps on every core; the sums down the branches, in elimination order,
  // and into the chains' end nodes, in chain order, on one.
  std::vector<double>& carried = p->carried_m3s;
  carried.resize(net.nodes.size());
  for_each_index(static_cast<std::ptrdiff_t>(net.nodes.size()), [&](std::ptrdiff_t n) {
    carried[n] = net.nodes[n].is_fixed_head() ? 0.0 : demand[n];
  });
  for (std::size_t i = 0; i < r.tree_link.size(); ++i) {
    carried[r.tree_parent[i]] += carried[r.tree_leaf[i]];
  }
  p->demand_m3s.resize(r.core_nodes.size());
  for_each_index(static_cast<std::ptrdiff_t>(r.core_nodes.size()),
                 [&](std::ptrdiff_t c) { p->demand_m3s[c] = carried[r.core_nodes[c]]; });
  p->chains.offset_m3s.resize(r.member_link.size());
  std::vector<double> taken(r.chains());
  for_each_index(static_cast<std::ptrdiff_t>(r.chains()), [&](std::ptrdiff_t c) {
    double sum = 0.0;
    for (std::uint32_t i = r.chain_start[c]; i < r.chain_start[c + 1]; ++i) {
      p->chains.offset_m3s[i] = sum;
      if (i + 1 < r.chain_start[c + 1]) sum += carried[r.member_end[i]];
    }
    taken[c] = sum;
  });
  for (std::size_t c = 0; c < r.chains(); ++c) p->demand_m3s[r.core_of_node[r.chain_to[c]]] += taken[c];
}

void make_chain_laws(const Network& net, const Reduction& r, const SolveOptions& options,
                     ChainLaws* chains) {
  chains->start.assign(r.chain_start.begin(), r.chain_start.end());
  resize_prefaulted(chains->law, r.member_link.size());
  const std::ptrdiff_t members = static_cast<std::ptrdiff_t>(r.member_link.size());
#pragma omp parallel for schedule(static) if (members >= kParallelChains)
  for (std::ptrdiff_t i = 0; i < members; ++i) {
    chains->law[i] = make_pipe_law(net.pipes[r.member_link[i]], net.headloss, net.fluid,
                                   options.hw_regularisation_flow_m3s);
  }
  chains->colebrook_x.assign(r.member_link.size(), 0.0);
  chains->sign.assign(r.member_sign.begin(), r.member_sign.end());
}

// The core network (see CoreProblem), written over `core`: a session's next solve of the same
// shape refreshes the elements in place, with no allocation. Only what the solver reads is
// copied: no source locations, categories or coordinates, and a pump curve only for pumps.
void fill_core_network(const Network& net, const Reduction& r, Network* out) {
  // Elements are copied on every core on large networks; each writes only its own slot.
  Network& core = *out;
  core.units = net.units;
  core.headloss = net.headloss;
  core.fluid = net.fluid;
  resize_prefaulted(core.nodes, r.core_nodes.size());
  const std::ptrdiff_t nodes = static_cast<std::ptrdiff_t>(r.core_nodes.size());
#pragma omp parallel for schedule(static) if (nodes >= kParallelChains)
  for (std::ptrdiff_t c = 0; c < nodes; ++c) {
    const Node& n = net.nodes[r.core_nodes[c]];
    Node& m = core.nodes[c];
    m.id = n.id;
    m.kind = n.kind;
    m.elevation_m = n.elevation_m;
    m.demand_m3s = n.demand_m3s;
    m.head_m = n.head_m;
    if (!n.tank.empty() || !m.tank.empty()) m.tank = n.tank;
  }
  resize_prefaulted(core.pipes, r.kept_links.size() + r.chains());
  auto copy = [&](std::size_t at, std::uint32_t k, std::uint32_t from, std::uint32_t to) {
    const Pipe& p = net.pipes[k];
    Pipe& q = core.pipes[at];
    q.id = p.id;
    q.kind = p.kind;
    q.from = static_cast<std::size_t>(r.core_of_node[from]);
    q.to = static_cast<std::size_t>(r.core_of_node[to]);
    q.length_m = p.length_m;
    q.diameter_m = p.diameter_m;
    q.roughness_m = p.roughness_m;
    q.cfactor = p.cfactor;
    q.minor_k = p.minor_k;
    q.status = p.status;
    q.check_valve = p.check_valve;
    q.resizable = p.resizable;
    if (!p.controls.empty() || !q.controls.empty()) q.controls = p.controls;
  };
  const std::ptrdiff_t kept = static_cast<std::ptrdiff_t>(r.kept_links.size());
  const std::ptrdiff_t links = kept + static_cast<std::ptrdiff_t>(r.chains());
#pragma omp parallel for schedule(static) if (links >= kParallelChains)
  for (std::ptrdiff_t i = 0; i < links; ++i) {
    if (i < kept) {
      const std::uint32_t k = r.kept_links[i];
      copy(i, k, static_cast<std::uint32_t>(net.pipes[k].from),
           static_cast<std::uint32_t>(net.pipes[k].to));
    } else {
      const std::size_t c = static_cast<std::size_t>(i - kept);
      copy(i, r.member_link[r.chain_start[c]], r.chain_from[c], r.chain_to[c]);
    }
  }
}

// The largest value seen and the first index where it was seen; a value of zero (or NaN) never
// displaces index 0.
struct Worst {
  double value = 0.0;
  std::size_t index = 0;
  void see(double v, std::size_t i) {
    if (v > value) {
      value = v;
      index = i;
    }
  }
  void merge_into(double* best, std::size_t* at) const {
    if (value > *best || (value == *best && value > 0.0 && index < *at)) {
      *best = value;
      *at = index;
    }
  }
};

void set_node(const Network& net, std::size_t n, double head_m, bool supplied, NodeState* ns) {
  const double nan = std::numeric_limits<double>::quiet_NaN();
  ns->supplied = supplied;
  ns->head_m = supplied ? head_m : nan;
  ns->pressure_m = ns->head_m - net.nodes[n].elevation_m;
  ns->pressure_pa = ns->pressure_m * net.fluid.density_kgm3 * kGravity_ms2;
}

void set_link(const PipeLaw& law, double flow_m3s, const LinkEval& e, LinkState* ls) {
  ls->open = true;
  ls->flow_m3s = flow_m3s;
  ls->velocity_ms = flow_m3s / law.area_m2;
  ls->headloss_m = e.headloss_m;
  ls->reynolds = e.reynolds;
  ls->friction_factor = e.friction_factor;
  ls->regime = e.regime;
}

// The chains' pipes and interior nodes, from each chain's start node. Chains share nothing, so
// large networks share them among the cores.
void expand_chains(const Network& net, const Reduction& r, const SolveResult& core,
                   ChainLaws* chains, SolveResult* out) {
  const std::ptrdiff_t count = static_cast<std::ptrdiff_t>(r.chains());
#pragma omp parallel for schedule(static) if (count >= kParallelChains)
  for (std::ptrdiff_t c = 0; c < count; ++c) {
    const LinkState& chain = core.links[r.kept_links.size() + c];
    const NodeState& start = out->nodes[r.chain_from[c]];
    double head = start.head_m;
    for (std::uint32_t i = r.chain_start[c]; i < r.chain_start[c + 1]; ++i) {
      const bool last = i + 1 == r.chain_start[c + 1];
      LinkState& ls = out->links[r.member_link[i]];
      NodeState* interior = last ? nullptr : &out->nodes[r.member_end[i]];
      if (!chain.open) {
        ls.open = false;
        if (interior) set_node(net, r.member_end[i], 0.0, false, interior);
        continue;
      }
      const double q = r.member_sign[i] * (chain.flow_m3s - chains->offset_m3s[i]);
      const LinkEval e = evaluate_pipe(chains->law[i], q, &chains->colebrook_x[i]);
      set_link(chains->law[i], q, e, &ls);
      head -= r.member_sign[i] * e.headloss_m;
      if (interior) set_node(net, r.member_end[i], head, start.supplied, interior);
    }
  }
}

// The dead-end links: flows and losses link by link (in parallel), then heads from the core
// outward, the reverse of the elimination order.
void expand_trees(const Network& net, const Reduction& r, const SolveOptions& options,
                  const std::vector<double>& carried_m3s, SolveResult* out) {
  const std::ptrdiff_t count = static_cast<std::ptrdiff_t>(r.tree_link.size());
#pragma omp parallel for schedule(static) if (count >= kParallelChains)
  for (std::ptrdiff_t i = 0; i < count; ++i) {
    const Pipe& p = net.pipes[r.tree_link[i]];
    const std::uint32_t leaf = r.tree_leaf[i];
    const double q = p.to == leaf ? carried_m3s[leaf] : -carried_m3s[leaf];
    const PipeLaw law = make_pipe_law(p, net.headloss, net.fluid, options.hw_regularisation_flow_m3s);
    set_link(law, q, evaluate_pipe(law, q), &out->links[r.tree_link[i]]);
  }
  for (std::size_t i = r.tree_link.size(); i-- > 0;) {
    const std::uint32_t leaf = r.tree_leaf[i];
    const NodeState& up = out->nodes[r.tree_parent[i]];
    LinkState& ls = out->links[r.tree_link[i]];
    if (!up.supplied) {
      ls = LinkState{};
      ls.open = false;
      set_node(net, leaf, 0.0, false, &out->nodes[leaf]);
      continue;
    }
    const double drop = net.pipes[r.tree_link[i]].to == leaf ? ls.headloss_m : -ls.headloss_m;
    set_node(net, leaf, up.head_m - drop, true, &out->nodes[leaf]);
  }
}

// The records of a full-network result, every one default (a no-op when already so sized).
void size_result(const Network& net, SolveResult* out) {
  resize_prefaulted(out->nodes, net.nodes.size());
  resize_prefaulted(out->links, net.pipes.size());
}

// Spreads the core solution over the full network and recomputes the residuals there.
// `sized` is sized by size_result, or empty.
SolveResult expand(const Network& net, const Topology& topology, const Reduction& r,
                   const SolveOptions& options,
                   const std::vector<double>& demand, const std::vector<double>& carried_m3s, ChainLaws* chains,
                   SolveResult&& core, SolveResult&& sized) {
  SolveResult out = std::move(sized);
  out.summary = std::move(core.summary);
  size_result(net, &out);
  const std::ptrdiff_t nodes = static_cast<std::ptrdiff_t>(net.nodes.size());
  const std::ptrdiff_t core_nodes = static_cast<std::ptrdiff_t>(r.core_nodes.size());
  const std::ptrdiff_t kept = static_cast<std::ptrdiff_t>(r.kept_links.size());
#pragma omp parallel if (nodes >= kParallelChains)
  {
#pragma omp for schedule(static)
    for (std::ptrdiff_t n = 0; n < nodes; ++n) {
      out.nodes[n].demand_m3s = net.nodes[n].is_fixed_head() ? 0.0 : demand[n];
    }
#pragma omp for schedule(static)
    for (std::ptrdiff_t c = 0; c < core_nodes; ++c) {
      NodeState& ns = out.nodes[r.core_nodes[c]];
      const double d = ns.demand_m3s;
      ns = core.nodes[c];
      ns.demand_m3s = d;
    }
#pragma omp for schedule(static) nowait
    for (std::ptrdiff_t i = 0; i < kept; ++i) out.links[r.kept_links[i]] = core.links[i];
  }
  expand_chains(net, r, core, chains, &out);
  expand_trees(net, r, options, carried_m3s, &out); 
  // Residuals on the full network: continuity at every supplied junction, energy on every
  // eliminated link (the kept links keep the core's, which account for valve settings).
  const std::vector<double> balance = sum_by_index(
      net.nodes.size(), static_cast<std::ptrdiff_t>(net.pipes.size()),
      [&](std::ptrdiff_t k, double* into) {
        into[topology.from[k]] -= out.links[k].flow_m3s;
        into[topology.to[k]] += out.links[k].flow_m3s;
      });
  auto energy = [&](std::uint32_t k) {
    LinkState& ls = out.links[k];
    if (!ls.open) return;
    const Pipe& p = net.pipes[k];
    ls.energy_residual_m = ls.headloss_m - (out.nodes[p.from].head_m - out.nodes[p.to].head_m);
  };
  // Every link and node below is visited on its own, so large networks share them among the
  // cores; each core keeps the first worst of its share and the first worst of all is chosen
  // after, so the result does not depend on how they were shared.
  const std::ptrdiff_t members = static_cast<std::ptrdiff_t>(r.member_link.size());
  const std::ptrdiff_t trees = static_cast<std::ptrdiff_t>(r.tree_link.size());
  const std::ptrdiff_t links = static_cast<std::ptrdiff_t>(net.pipes.size());
  SolveSummary& s = out.summary;
  s.max_continuity_residual_m3s = s.max_energy_residual_m = 0.0;
  s.worst_continuity_node = s.worst_energy_link = 0;
  std::size_t unsupplied = 0;
  int finite = 1;
#pragma omp parallel if (links >= kParallelChains) reduction(+ : unsupplied) reduction(&& : finite)
  {
#pragma omp for schedule(static)
    for (std::ptrdiff_t i = 0; i < members; ++i) energy(r.member_link[i]);
#pragma omp for schedule(static)
    for (std::ptrdiff_t i = 0; i < trees; ++i) energy(r.tree_link[i]);
    Worst node_worst, link_worst;
#pragma omp for schedule(static) nowait
    for (std::ptrdiff_t n = 0; n < nodes; ++n) {
      NodeState& ns = out.nodes[n];
      if (!ns.supplied) ++unsupplied;
      const bool counts = !net.nodes[n].is_fixed_head() && ns.supplied;
      ns.continuity_residual_m3s = counts ? balance[n] - demand[n] : 0.0;
      if (counts && !(std::isfinite(ns.head_m) && std::isfinite(ns.continuity_residual_m3s))) {
        finite = 0;
      }
      node_worst.see(std::abs(ns.continuity_residual_m3s), static_cast<std::size_t>(n));
    }
#pragma omp for schedule(static) nowait
    for (std::ptrdiff_t k = 0; k < links; ++k) {
      const LinkState& ls = out.links[k];
      if (!std::isfinite(ls.energy_residual_m) || !std::isfinite(ls.flow_m3s)) finite = 0;
      link_worst.see(std::abs(ls.energy_residual_m), static_cast<std::size_t>(k));
    }
#pragma omp critical(gradeline_recovery_worst)
    {
      node_worst.merge_into(&s.max_continuity_residual_m3s, &s.worst_continuity_node);
      link_worst.merge_into(&s.max_energy_residual_m, &s.worst_energy_link);
    }
  }
  s.unsupplied_nodes = unsupplied;
  // A branch or chain can carry what the core never saw (a pipe too narrow for any finite
  // loss): such a state is no solution, as in an unreduced solve.
  if (!finite && s.converged()) {
    s.termination = Termination::kNonFinite;
    s.message = "the state is not finite";
  }
  return out;
}

}  // namespace

void make_core_problem(const Network& net, const Reduction& r, const SolveOptions& options,
                       const std::vector<double>& demand, CoreProblem* p) {
  make_chain_laws(net, r, options, &p->chains);
  gather_demands(net, r, demand, p);
  fill_core_network(net, r, &p->network);
}

CoreProblem make_core_problem(const Network& net, const Reduction& r, const SolveOptions& options,
                              const std::vector<double>& demand) {
  CoreProblem p;
  make_core_problem(net, r, options, demand, &p);
  return p;
}

bool ReductionCache::matches(const Network& net, const std::vector<char>& eliminable_now) const {
  if (topology.fixed_head.size() != net.nodes.size() || topology.from.size() != net.pipes.size() ||
      eliminable != eliminable_now) {
    return false;
  }
  for (std::size_t n = 0; n < net.nodes.size(); ++n) {
    if (topology.fixed_head[n] != static_cast<char>(net.nodes[n].is_fixed_head())) return false;
  }
  for (std::size_t k = 0; k < net.pipes.size(); ++k) {
    if (topology.from[k] != net.pipes[k].from || topology.to[k] != net.pipes[k].to) return false;
  }
  return true;
}

std::optional<SolveResult> solve_reduced(const Network& net, const SolveOptions& options,
                                         const std::vector<double>& demand, SolverCache* cache,
                                         const std::vector<double>* initial_flows) {
  const auto start = Clock::now();
  std::vector<char> eliminable = eliminable_links(net);
  SolveResult sized;  // the result's records, once sized
  if (!cache->reduction || !cache->reduction->matches(net, eliminable)) {
    auto rc = std::make_shared<ReductionCache>();
    rc->topology = build_link_ends(net);
    // The reduction is one core's work: the other maps and fills the result's records (wasted
    // only where the reduction turns out not worthwhile, on grids, while the first core works).
    if (net.pipes.size() >= static_cast<std::size_t>(kParallelElements)) {
#pragma omp parallel sections num_threads(2)
      {
#pragma omp section
        rc->reduction = reduce_topology(net, rc->topology, eliminable);
#pragma omp section
        size_result(net, &sized);
      }
    } else {
      rc->reduction = reduce_topology(net, rc->topology, eliminable);
    }
    rc->eliminable = std::move(eliminable);
    rc->worthwhile = rc->reduction.eliminated_nodes() > 0 &&
                     rc->reduction.eliminated_nodes() >= kMinReducedShare * net.nodes.size();
    cache->reduction = std::move(rc);
  }
  ReductionCache& rc = *cache->reduction;
  if (!rc.worthwhile) return std::nullopt;
  const Reduction& r = rc.reduction;

  CoreProblem& p = rc.problem;  // kept for the session's next solve of this shape
  make_core_problem(net, r, options, demand, &p);
  std::vector<double> core_initial;
  if (initial_flows && initial_flows->size() == net.pipes.size()) {
    core_initial.reserve(p.network.pipes.size());
    for (std::uint32_t k : r.kept_links) core_initial.push_back((*initial_flows)[k]);
    for (std::size_t c = 0; c < r.chains(); ++c) {
      const std::uint32_t i = r.chain_start[c];
      core_initial.push_back(r.member_sign[i] * (*initial_flows)[r.member_link[i]]);
    }
  }
  const double prepare_s = seconds_since(start);
  const int analyses_before = rc.core.analyses;
  SolveResult core_result = run_gradient_method(p.network, options, p.demand_m3s, &rc.core,
                                                core_initial.empty() ? nullptr : &core_initial,
                                                &p.chains);
  cache->analyses += rc.core.analyses - analyses_before; 
  const auto recovery_start = Clock::now();
  SolveResult out =
      expand(net, rc.topology, r, options, demand, p.carried_m3s, &p.chains, std::move(core_result),
             std::move(sized));
  out.summary.timing.recovery_s = seconds_since(recovery_start);
  ReductionSummary& rs = out.summary.reduction;
  rs.applied = true;
  rs.core_junctions = 0;
  for (const Node& n : p.network.nodes) rs.core_junctions += !n.is_fixed_head();
  rs.core_links = p.network.pipes.size();
  rs.tree_links = r.tree_link.size();
  rs.chain_links = r.member_link.size();
  rs.chains = r.chains();
  out.summary.timing.reduction_s = prepare_s;
  out.summary.timing.total_s = seconds_since(start);
  return out;
}

}  // namespace gradeline
