// gradeline size FILE --catalogue CAT [--pipes ID,ID|all] [--new] --changes OUT [--json PATH]:
// least-cost commercial sizes that meet the criteria in every case, written as a change set.
#include <unistd.h>

#include <memory>
#include <ostream>
#include <sstream>

#include "cli/commands.h"
#include "design/sizing.h"
#include "report/sizing_report.h"

namespace gradeline {
namespace {

struct SizeArgs {
  std::string file;
  std::string catalogue;
  std::string pipes;
  bool new_pipes = false;
  std::string changes;
  std::string json_path;
  SolveFlags flags;
};

bool candidate_pipes(const Network& net, const std::string& spec, Streams io,
                     std::vector<std::size_t>* out) {
  if (spec == "all") {
    for (std::size_t k = 0; k < net.pipes.size(); ++k) {
      if (!net.pipes[k].is_pump()) out->push_back(k);
    }
    return true;
  }
  if (spec.empty()) {
    for (std::size_t k = 0; k < net.pipes.size(); ++k) {
      if (net.pipes[k].resizable) out->push_back(k);
    }
    if (out->empty()) {
      io.err << "gradeline: error: no pipes to size: give --pipes, or mark pipes resize=yes\n";
      return false;
    }
    return true;
  }
  std::stringstream list(spec);
  for (std::string id; std::getline(list, id, ',');) {
    auto k = net.find_pipe(id);
    if (!k || net.pipes[*k].is_pump()) {
      io.err << "gradeline: error: --pipes: no pipe '" << id << "' in the network\n";
      return false;
    }
    out->push_back(*k);
  }
  return true;
}

int run_size(const SizeArgs& a, Streams io) {
  Network net;
  if (!load_network(a.file, io, &net)) return kExitInput;
  CatalogueResult cat = parse_catalogue_file(a.catalogue, net.headloss.law);
  for (const Diagnostic& d : cat.errors) io.err << d.format() << "\n";
  if (!cat.ok()) return kExitInput;
  SizingProblem problem;
  problem.new_pipes = a.new_pipes;
  problem.solve_options = a.flags.options();
  std::string why;
  if (!candidate_pipes(net, a.pipes, io, &problem.pipes) ||
      !a.flags.criteria(net, io, &problem.criteria)) {
    return kExitInput;
  }
  if (!select_cases(net, a.flags.case_name.empty() ? "all" : a.flags.case_name, &problem.cases, &why)) {
    io.err << "gradeline: error: " << why << "\n";
    return kExitInput;
  }
  for (std::size_t k : problem.pipes) {
    if (size_options(net, k, cat.catalogue, a.new_pipes).size() <= (a.new_pipes ? 0u : 1u) &&
        a.new_pipes) {
      io.err << "gradeline: error: no catalogue size fits pipe '" << net.pipes[k].id << "'\n";
      return kExitInput;
    }
  }
  if (isatty(STDERR_FILENO)) {
    problem.progress = [&io](long long solves, double best) {
      io.err << "\rsizing: " << solves << " solves, best cost " << best << "   " << std::flush;
    };
  }
  SizingResult r = size_pipes(net, cat.catalogue, problem);
  if (problem.progress) io.err << "\n";
  io.out << sizing_text(net, cat.catalogue, r);
  const std::vector<std::string> inputs = {a.file, a.catalogue};
  const std::string title = std::string(r.feasible ? "least-cost sizes" : "BEST EFFORT sizes") +
                            " from " + a.catalogue;
  if (!write_output(a.changes, sizing_change_set(net, cat.catalogue, r, title), inputs, io)) {
    return kExitInput;
  }
  if (!a.json_path.empty()) {
    std::string text;
    JsonStream j(&text);
    write_sizing_json(net, cat.catalogue, r, &j);
    if (!write_output(a.json_path, text, inputs, io)) return kExitInput;
  }
  return r.feasible ? kExitOk : kExitCriteria;
}

}  // namespace

CommandSpec size_command() {
  return {"size", "Least-cost commercial pipe sizes that meet the criteria in every case",
          [](CLI::App* app) -> Runner {
            auto a = std::make_shared<SizeArgs>();
            app->add_option("FILE", a->file, "network file")->required();
            app->add_option("--catalogue", a->catalogue, "catalogue of sizes and costs")->required();
            app->add_option("--pipes", a->pipes, "pipes that may change: ID,ID,... or all "
                                                 "(default: those marked resize=yes)");
            app->add_flag("--new", a->new_pipes, "the pipes are new: any catalogue size is allowed");
            app->add_option("--changes", a->changes, "write the chosen sizes as a change set")
                ->required();
            app->add_option("--json", a->json_path, "also write the result as JSON to PATH");
            a->flags.add_to(app);
            return [a](Streams io) { return run_size(*a, io); };
          }};
}

}  // namespace gradeline
