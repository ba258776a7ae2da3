// The sparse-factorisation floor of a gradeline solve: times CHOLMOD's symbolic analysis,
// numeric factorisation and triangular solve alone, on the global-gradient matrix of the whole
// network at its converged flows (the floor of the unreduced method), and on the matrix
// gradeline assembles after its topological reduction (core_*).
//   build/gradeline_floor NETWORK [REPEATS]
// Prints one line: "floor analyse_s=... factor_s=... solve_s=... unknowns=... nnz=... core_...",
// with the factor and solve times the median of REPEATS runs (default 7): the faster of the
// matrix in file order under AMD and the matrix renumbered by the postordered AMD order under
// the natural ordering (the file-order times are also printed, as file_order_*), through
// CHOLMOD's own calls on one core; two_core_* are the renumbered matrix's factor and solve
// shared between two cores as gradeline shares them (src/solver/cholmod_ldlt.h).
#include <algorithm>
#include <chrono>
#include <cstdio>
#include <cstdlib>
#include <string>
#include <vector>

#include "gradeline/solver.h"
#include "hydraulics/link_law.h"
#include "io/parser.h"
#include "solver/assembly.h"
#include "solver/reduced_solve.h"
#include "solver/reduction.h"
#include "solver/sparse_cholesky.h"

using namespace gradeline;
using Clock = std::chrono::steady_clock;

namespace {
double since(Clock::time_point t) { return std::chrono::duration<double>(Clock::now() - t).count(); }
double median(std::vector<double> v) {
  std::sort(v.begin(), v.end());
  return v[v.size() / 2];
}
}  // namespace

int main(int argc, char** argv) {
  if (argc < 2) {
    std::fprintf(stderr, "usage: gradeline_floor NETWORK [REPEATS]\n");
    return 2;
  }
  const int repeats = argc > 2 ? std::max(1, std::atoi(argv[2])) : 7;
  ParseResult parsed = parse_network_file(argv[1]);
  if (!parsed.ok()) {
    for (const auto& e : parsed.errors) std::fprintf(stderr, "%s\n", e.format().c_str());
    return 2;
  }
  const Network& net = parsed.network;
  SolveResult r = solve(net);
  if (!r.summary.converged()) {
    std::fprintf(stderr, "not converged: %s\n", r.summary.message.c_str());
    return 3;
  }
  // The matrix of the converged state: conductance 1/(dh/dQ) of every open link, assembled
  // in file order (for the AMD analysis) and renumbered by the postordered AMD order, as the
  // solver does (for the factorisation, with the natural ordering, which is CHOLMOD's fastest).
  const Topology ends = build_link_ends(net);
  AssemblyPlan file_order = plan_assembly(ends);
  AssemblyPlan plan = plan_assembly(ends, junction_order(ends));
  std::vector<double> conductance(net.pipes.size(), 0.0);
  std::vector<char> unsupplied(net.nodes.size(), 0);
  for (std::size_t n = 0; n < net.nodes.size(); ++n) unsupplied[n] = !r.nodes[n].supplied;
  for (std::size_t k = 0; k < net.pipes.size(); ++k) {
    if (!r.links[k].open) continue;
    PipeLaw law = make_pipe_law(net.pipes[k], net.headloss, net.fluid, SolveOptions{}.hw_regularisation_flow_m3s);
    conductance[k] = 1.0 / evaluate_pipe(law, r.links[k].flow_m3s).dh_dq;
  }
  assemble_matrix(conductance, unsupplied, &file_order);
  assemble_matrix(conductance, unsupplied, &plan);
  Eigen::VectorXd rhs = Eigen::VectorXd::Ones(plan.unknowns), x;

  const char* env = std::getenv("GRADELINE_BACKEND");
  // CHOLMOD's own calls, one core (the floor as the ratio takes it); the two-core figures are
  // gradeline's shared refactorisation and solves (src/solver/cholmod_ldlt.h) on the same
  // matrix.
  const CholeskyBackend backend = env && std::string(env) == "simplicial"
                                      ? CholeskyBackend::kCholmodSimplicial
                                      : CholeskyBackend::kCholmodAutoOneCore;
  std::vector<double> analyse;
  for (int i = 0; i < 3; ++i) {
    auto chol = make_sparse_cholesky(backend, Ordering::kAmd);
    auto t = Clock::now();
    chol->analyze(file_order.matrix);
    analyse.push_back(since(t));
  }
  // Factor and solve times, median of `repeats`, for one matrix and ordering.
  double flops_per_entry = 0;
  auto time_factor = [&](const AssemblyPlan& p, Ordering ordering, double* factor_s, double* solve_s,
                         const char** name, CholeskyBackend which) {
    auto chol = make_sparse_cholesky(which, ordering);
    if (!chol->analyze(p.matrix)) return false;
    std::vector<double> factor, solve_times;
    for (int i = 0; i < repeats; ++i) {
      auto t = Clock::now();
      if (!chol->factorize(p.matrix)) return false;
      factor.push_back(since(t));
      t = Clock::now();
      chol->solve(rhs, &x);
      solve_times.push_back(since(t));
    }
    flops_per_entry = chol->flops_per_entry();
    *factor_s = median(factor);
    *solve_s = median(solve_times);
    *name = chol->backend();
    return true;
  };
  double factor_s = 0, solve_s = 0, factor_file_s = 0, solve_file_s = 0;
  const char* name = "";
  double factor_2core_s = 0, solve_2core_s = 0;
  const char* name_2core = "";
  if (!time_factor(plan, Ordering::kNatural, &factor_2core_s, &solve_2core_s, &name_2core,
                   CholeskyBackend::kCholmodAuto) ||
      !time_factor(plan, Ordering::kNatural, &factor_s, &solve_s, &name, backend) ||
      !time_factor(file_order, Ordering::kAmd, &factor_file_s, &solve_file_s, &name, backend)) {
    return 3;
  }
  std::printf("floor analyse_s=%.6f factor_s=%.6f solve_s=%.6f unknowns=%d nnz=%lld backend=%s "
              "file_order_factor_s=%.6f file_order_solve_s=%.6f renumbered_factor_s=%.6f "
              "flops_per_entry=%.1f two_core_factor_s=%.6f two_core_solve_s=%.6f\n",
              median(analyse), std::min(factor_s, factor_file_s), std::min(solve_s, solve_file_s),
              plan.unknowns, static_cast<long long>(plan.matrix.nonZeros()), name, factor_file_s,
              solve_file_s, factor_s, flops_per_entry, factor_2core_s, solve_2core_s);
  // The reduced system: the core network with one link per series chain, at the same flows.
  const Topology topology = build_topology(net);
  const Reduction reduction = reduce_topology(net, topology, eliminable_links(net));
  std::vector<double> demand(net.nodes.size());
  for (std::size_t n = 0; n < net.nodes.size(); ++n) demand[n] = r.nodes[n].demand_m3s;
  CoreProblem core = make_core_problem(net, reduction, SolveOptions{}, demand);
  const Network& cn = core.network;
  std::vector<double> core_conductance(cn.pipes.size(), 0.0);
  std::vector<char> core_unsupplied(cn.nodes.size(), 0);
  for (std::size_t c = 0; c < cn.nodes.size(); ++c) {
    core_unsupplied[c] = !r.nodes[reduction.core_nodes[c]].supplied;
  }
  for (std::size_t i = 0; i < reduction.kept_links.size(); ++i) {
    core_conductance[i] = conductance[reduction.kept_links[i]];
  }
  for (std::size_t c = 0; c < reduction.chains(); ++c) {
    const std::uint32_t first = reduction.chain_start[c];
    const LinkState& l = r.links[reduction.member_link[first]];
    if (!l.open) continue;
    const double q = reduction.member_sign[first] * l.flow_m3s;
    core_conductance[reduction.kept_links.size() + c] = 1.0 / core.chains.evaluate(c, q).dh_dq;
  }
  const Topology core_ends = build_link_ends(cn);
  AssemblyPlan core_file_order = plan_assembly(core_ends);
  AssemblyPlan core_plan = plan_assembly(core_ends, junction_order(core_ends));
  assemble_matrix(core_conductance, core_unsupplied, &core_file_order);
  assemble_matrix(core_conductance, core_unsupplied, &core_plan);
  std::vector<double> core_analyse;
  for (int i = 0; i < 3; ++i) {
    auto chol = make_sparse_cholesky(backend, Ordering::kAmd);
    auto t = Clock::now();
    chol->analyze(core_file_order.matrix);
    core_analyse.push_back(since(t));
  }
  rhs = Eigen::VectorXd::Ones(core_plan.unknowns);
  double core_factor_s = 0, core_solve_s = 0;
  if (core_plan.unknowns > 0 &&
      !time_factor(core_plan, Ordering::kNatural, &core_factor_s, &core_solve_s, &name, backend)) {
    return 3;
  }
  std::printf("core core_analyse_s=%.6f core_factor_s=%.6f core_solve_s=%.6f core_unknowns=%d\n",
              median(core_analyse), core_factor_s, core_solve_s, core_plan.unknowns);
  return 0;
}
