// gradeline solve FILE [--json PATH]: steady-state solve with the report on stdout.
#include <chrono>
#include <iomanip>
#include <sstream>
#include <memory>
#include <ostream>

#include "cli/commands.h"
#include "gradeline/solver.h"
#include "io/result_json.h"
#include "report/text_report.h"

namespace gradeline {
namespace {

struct SolveArgs {
  std::string file;
  std::string json_path;
  bool summary_only = false;
  bool timing = false;
  int max_iterations = SolveOptions{}.max_iterations;
};

std::string timing_text(const SolveSummary& s, double parse_s) {
  std::ostringstream t;
  t << std::fixed << std::setprecision(4) << "timing      parse " << parse_s << " s, topology "
    << s.timing.topology_s << " s, symbolic " << s.timing.symbolic_s << " s, numeric factor "
    << s.timing.numeric_factor_s << " s, solve " << s.timing.triangular_solve_s
    << " s, assembly+friction " << s.timing.assembly_s << " s, solver total " << s.timing.total_s
    << " s (" << s.iterations << " iterations)\n";
  return t.str();
}

int run_solve(const SolveArgs& a, Streams io) {
  auto start = std::chrono::steady_clock::now();
  Network net;
  if (!load_network(a.file, io, &net)) return kExitInput;
  const double parse_s =
      std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  SolveOptions options;
  options.max_iterations = a.max_iterations;
  SolveResult result = solve(net, options);
  if (!result.summary.converged()) {
    io.err << solve_summary_text(net, result, a.file);
    io.err << "gradeline: error: no solution: " << result.summary.message << "\n";
    if (a.timing) io.err << timing_text(result.summary, parse_s);
    return kExitNotSolved;
  }
  ReportOptions report;
  report.tables = !a.summary_only;
  io.out << solve_report_text(net, result, a.file, report);
  if (!a.json_path.empty()) {
    std::string text = result_json_text(net, result);
    if (!write_output(a.json_path, text, {a.file}, io)) return kExitInput;
  }
  if (a.timing) io.err << timing_text(result.summary, parse_s);
  return kExitOk;
}

}  // namespace

CommandSpec solve_command() {
  return {"solve", "Solve a network for heads, pressures and flows",
          [](CLI::App* app) -> Runner {
            auto a = std::make_shared<SolveArgs>();
            app->add_option("FILE", a->file, "network file")->required();
            app->add_option("--json", a->json_path, "also write the result as JSON to PATH");
            app->add_flag("--summary", a->summary_only, "print the summary and warnings only");
            app->add_flag("--timing", a->timing, "print the time of each solver stage to stderr");
            app->add_option("--max-iterations", a->max_iterations, "Newton iteration limit")
                ->check(CLI::Range(1, 10000));
            return [a](Streams io) { return run_solve(*a, io); };
          }};
}

}  // namespace gradeline
