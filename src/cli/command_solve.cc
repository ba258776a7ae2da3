// gradeline solve FILE [--case NAME|all] [--apply CHANGES]... [--json PATH]
//                      [--write-network OUT] [--min-pressure P] ...
// Steady-state solve of one or all demand cases, with the report on stdout.
#include <chrono>
#include <iomanip>
#include <memory>
#include <ostream>
#include <sstream>

#include "cli/commands.h"
#include "cli/keep_until_exit.h"
#include "io/network_writer.h"
#include "io/result_json.h"
#include "model/demand_cases.h"
#include "report/criteria_report.h"
#include "report/text_report.h"

namespace gradeline {
namespace {

struct SolveArgs {
  std::string file;
  std::vector<std::string> applies;
  std::string json_path;
  std::string write_network;
  bool summary_only = false;
  bool timing = false;
  SolveFlags flags;
};

std::string timing_text(const SolveSummary& s, double parse_s) {
  std::ostringstream t;
  t << std::fixed << std::setprecision(4) << "timing      parse " << parse_s << " s, topology "
    << s.timing.topology_s << " s, symbolic " << s.timing.symbolic_s << " s, numeric factor "
    << s.timing.numeric_factor_s << " s, solve " << s.timing.triangular_solve_s
    << " s, assembly+friction " << s.timing.assembly_s << " s, solver total " << s.timing.total_s
    << " s (" << s.iterations << " iterations)\n"
    << "timing      link laws evaluated " << s.timing.link_evaluations << ", reused "
    << s.timing.reused_link_evaluations << " (updated from the last evaluation: flow moved by at most 1e-8)\n";
  if (s.reduction.applied) {
    t << "timing      reduction " << s.timing.reduction_s << " s, recovery " << s.timing.recovery_s
      << " s\n";
    t << "timing      reduced to " << s.reduction.core_junctions << " junctions and "
      << s.reduction.core_links << " links: " << s.reduction.tree_links
      << " dead-end links by continuity, " << s.reduction.chain_links << " pipes in "
      << s.reduction.chains << " series chains\n";
  }
  return t.str();
}

void cases_json(const Network& net, const std::vector<CaseOutcome>& outcomes, JsonStream* out) {
  JsonStream& j = *out;
  std::vector<Violation> all;
  for (const CaseOutcome& o : outcomes) all.insert(all.end(), o.violations.begin(), o.violations.end());
  if (outcomes.size() == 1) {
    // One case: the core result shape, with the case named and the violations beside it.
    write_result_json(net, outcomes[0].result, &j, [&](JsonStream* more) {
      more->field("case", outcomes[0].demand_case.name);
      write_violations_json(net, all, more);
    });
    return;
  }
  j.begin_object();
  j.key("cases");
  j.begin_object();
  for (const CaseOutcome& o : outcomes) {
    j.key(o.demand_case.name);
    write_result_json(net, o.result, &j);
  }
  j.end_object();
  write_violations_json(net, all, &j);
  j.end_object();
}

// Sum of the demands of the junctions (m^3/s).
double total_demand(const Network& net, const std::vector<double>& demand_m3s) {
  double total = 0.0;
  for (std::size_t n = 0; n < net.nodes.size(); ++n) {
    if (!net.nodes[n].is_fixed_head()) total += demand_m3s[n];
  }
  return total;
}

int run_solve(const SolveArgs& a, Streams io) {
  auto start = std::chrono::steady_clock::now();
  Network net;
  if (!load_network(a.file, io, &net) || !apply_changes(a.applies, io, &net)) return kExitInput;
  const double parse_s =
      std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  std::vector<std::string> inputs = a.applies;
  inputs.push_back(a.file);
  if (!a.write_network.empty() &&
      !write_output(a.write_network, write_network(net), inputs, io)) {
    return kExitInput;
  }
  CriteriaOverride criteria;
  std::vector<DemandCase> cases;
  std::string why;
  if (!a.flags.criteria(net, io, &criteria)) return kExitInput;
  if (!select_cases(net, a.flags.case_name, &cases, &why)) {
    io.err << "gradeline: error: " << why << "\n";
    return kExitInput;
  }
  SolveOptions options = a.flags.options();
  options.stage_timing = a.timing;
  std::vector<CaseOutcome> outcomes;
  auto session = std::make_unique<SolverSession>();  // the cases share one symbolic analysis
  // Each case starts from the last solved case's flows, scaled by the ratio of their total
  // demands (exact in branches when a case scales every demand alike).
  std::vector<double> previous_flows, start_flows;
  double previous_demand = 0.0;
  for (const DemandCase& c : cases) {
    // Only a later case starts from an earlier one's flows.
    const double demand = cases.size() > 1 ? total_demand(net, case_demands(net, c)) : 0.0;
    start_flows = previous_flows;
    if (previous_demand > 0.0 && demand > 0.0) {
      for (double& q : start_flows) q *= demand / previous_demand;
    }
    outcomes.push_back(run_case(net, c, options, criteria, session.get(),
                                start_flows.empty() ? nullptr : &start_flows));
    const SolveSummary& s = outcomes.back().result.summary;
    if (s.converged() && &c != &cases.back()) {  // the next case starts from these flows
      const std::vector<LinkState>& links = outcomes.back().result.links;
      previous_flows.resize(links.size());
      for (std::size_t k = 0; k < links.size(); ++k) previous_flows[k] = links[k].flow_m3s;
      previous_demand = demand;
    }
    if (a.timing) io.err << timing_text(s, parse_s);
    if (!s.converged()) {
      io.err << solve_summary_text(net, outcomes.back().result, a.file, c.name);
      io.err << "gradeline: error: no solution for case '" << c.name << "': " << s.message << "\n";
      return kExitNotSolved;
    }
  }
  bool violated = false;
  for (const CaseOutcome& o : outcomes) {
    ReportOptions report;
    report.tables = !a.summary_only;
    if (!net.cases.empty()) report.case_name = o.demand_case.name;
    if (has_criteria(o.criteria)) {
      report.criteria_block = criteria_line(net, o.criteria) + violations_text(net, o.violations);
    }
    if (outcomes.size() > 1) io.out << "\n";
    write_solve_report(net, o.result, a.file, report, [&](std::string_view piece) {
      io.out.write(piece.data(), static_cast<std::streamsize>(piece.size()));
    });
    violated = violated || !o.violations.empty();
  }
  if (!a.json_path.empty() && !write_json_output(a.json_path, inputs, io,
                                                     [&](JsonStream* j) { cases_json(net, outcomes, j); })) {
    return kExitInput;
  }
  // The output is written: the network, the results and the solver's caches are left to the
  // process's exit rather than freed element by element.
  keep_until_exit(std::move(outcomes));
  keep_until_exit(std::move(session));
  keep_until_exit(std::move(net));
  return violated ? kExitCriteria : kExitOk;
}

}  // namespace

CommandSpec solve_command() {
  return {"solve", "Solve a network for heads, pressures and flows",
          [](CLI::App* app) -> Runner {
            auto a = std::make_shared<SolveArgs>();
            app->add_option("FILE", a->file, "network file")->required();
            app->add_option("--apply", a->applies, "apply a change set first (repeatable, in order)");
            app->add_option("--json", a->json_path, "also write the result as JSON to PATH");
            app->add_option("--write-network", a->write_network,
                            "write the network, with changes applied, to OUT");
            app->add_flag("--summary", a->summary_only, "print the summary and warnings only");
            app->add_flag("--timing", a->timing, "print the time of each solver stage to stderr");
            a->flags.add_to(app);
            return [a](Streams io) { return run_solve(*a, io); };
          }};
}

}  // namespace gradeline
