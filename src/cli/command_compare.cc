// gradeline compare FILE --apply CHANGES [--apply MORE] [--case NAME|all] [--json PATH]:
// solve the network before and after the changes and show what they bought.
#include <memory>
#include <ostream>

#include "analysis/compare.h"
#include "cli/commands.h"
#include "design/catalogue.h"
#include "report/compare_report.h"

namespace gradeline {
namespace {

struct CompareArgs {
  std::string file;
  std::vector<std::string> applies;
  std::string json_path;
  std::string catalogue;
  SolveFlags flags;
};

int run_compare(const CompareArgs& a, Streams io) {
  Network before;
  if (!load_network(a.file, io, &before)) return kExitInput;
  Network after = before;
  if (!apply_changes(a.applies, io, &after)) return kExitInput;
  CriteriaOverride criteria;
  std::vector<DemandCase> cases;
  std::string why;
  if (!a.flags.criteria(before, io, &criteria)) return kExitInput;
  if (!select_cases(before, a.flags.case_name.empty() ? "all" : a.flags.case_name, &cases, &why)) {
    io.err << "gradeline: error: " << why << "\n";
    return kExitInput;
  }
  std::vector<std::string> names;
  for (const DemandCase& c : cases) names.push_back(c.name);
  Comparison cmp = compare_networks(before, after, names, a.flags.options(), criteria);
  if (!a.catalogue.empty()) {
    CatalogueResult cat = parse_catalogue_file(a.catalogue, before.headloss.law);
    for (const Diagnostic& d : cat.errors) io.err << d.format() << "\n";
    if (!cat.ok()) return kExitInput;
    price_changes(cat.catalogue, &cmp);
  }
  std::string title = a.file;
  for (const std::string& c : a.applies) title += " + " + c;
  io.out << compare_text(before, cmp, title);
  bool solved = true, failing = false;
  for (const CaseComparison& c : cmp.cases) {
    solved = solved && c.solved();
    failing = failing || !c.still_failing.empty() || !c.newly_failing.empty();
  }
  if (!solved) {
    io.err << "gradeline: error: a case did not solve; no comparison written\n";
    return kExitNotSolved;
  }
  if (!a.json_path.empty()) {
    std::string text;
    JsonStream j(&text);
    write_compare_json(cmp, &j);
    std::vector<std::string> inputs = a.applies;
    inputs.push_back(a.file);
    if (!write_output(a.json_path, text, inputs, io)) return kExitInput;
  }
  return failing ? kExitCriteria : kExitOk;
}

}  // namespace

CommandSpec compare_command() {
  return {"compare", "Solve before and after change sets; show what the changes bought",
          [](CLI::App* app) -> Runner {
            auto a = std::make_shared<CompareArgs>();
            app->add_option("FILE", a->file, "network file")->required();
            app->add_option("--apply", a->applies, "change set to apply (repeatable, in order)")
                ->required();
            app->add_option("--json", a->json_path, "also write the comparison as JSON to PATH");
            app->add_option("--catalogue", a->catalogue, "price new or resized pipe from a catalogue");
            a->flags.add_to(app);
            return [a](Streams io) { return run_compare(*a, io); };
          }};
}

}  // namespace gradeline
