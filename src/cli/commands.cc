#include "cli/commands.h"

#include <ostream>

#include "io/atomic_file.h"
#include "io/background_writer.h"
#include "io/change_set.h"
#include "model/units.h"

namespace gradeline {

const std::vector<CommandSpec>& command_table() {
  static const std::vector<CommandSpec> table = {check_command(), solve_command(),
                                                 compare_command(), size_command()};
  return table;
}

namespace {
void print_errors(const std::vector<Diagnostic>& errors, bool truncated, Streams io) {
  for (const Diagnostic& d : errors) io.err << d.format() << "\n";
  if (truncated) io.err << "gradeline: stopped after " << errors.size() << " errors\n";
}
}  // namespace

bool load_network(const std::string& path, Streams io, Network* network) {
  ParseResult parsed = parse_network_file(path);
  print_errors(parsed.errors, parsed.truncated, io);
  if (!parsed.ok()) return false;
  *network = std::move(parsed.network);
  return true;
}

bool apply_changes(const std::vector<std::string>& files, Streams io, Network* network) {
  for (const std::string& file : files) {
    ChangeResult r = apply_change_file(file, network);
    print_errors(r.errors, r.truncated, io);
    if (!r.ok()) return false;
  }
  return true;
}

bool write_output(const std::string& path, const std::string& text,
                  const std::vector<std::string>& inputs, Streams io) {
  for (const std::string& input : inputs) {
    if (same_file(path, input)) {
      io.err << "gradeline: error: refusing to write over the input file '" << input << "'\n";
      return false;
    }
  }
  std::string why;
  if (!write_file_atomically(path, text, &why)) {
    io.err << "gradeline: error: " << why << "\n";
    return false;
  }
  return true;
}

bool write_json_output(const std::string& path, const std::vector<std::string>& inputs, Streams io,
                       const std::function<void(JsonStream*)>& produce) {
  for (const std::string& input : inputs) {
    if (same_file(path, input)) {
      io.err << "gradeline: error: refusing to write over the input file '" << input << "'\n";
      return false;
    }
  }
  std::string why;
  AtomicFile file;
  if (!file.open(path, &why)) {
    io.err << "gradeline: error: " << why << "\n";
    return false;
  }
  std::string buffer;
  JsonStream j(&buffer);
  j.set_compact_depth(3);  // top object, its arrays, then one line per element
  BackgroundWriter writer(&file);
  j.set_sink([&](std::string_view text) { writer.write(text); });
  produce(&j);
  j.flush();
  if (!writer.finish(&why) || !file.commit(&why)) {
    io.err << "gradeline: error: " << why << "\n";
    return false;
  }
  return true;
}

void SolveFlags::add_to(CLI::App* app) {
  app->add_option("--case", case_name, "demand case to solve, or 'all' (default: the first)");
  app->add_option("--min-pressure", min_pressure, "minimum pressure for every case, e.g. 280kPa");
  app->add_option("--max-pressure", max_pressure, "maximum pressure for every case, e.g. 700kPa");
  app->add_option("--max-velocity", max_velocity, "maximum pipe velocity, e.g. 2.5m/s");
  app->add_option("--max-iterations", max_iterations, "Newton iteration limit")
      ->check(CLI::Range(1, 10000));
  app->add_flag("--no-reduction", no_reduction,
                "iterate on every node and link (no elimination of dead ends and series chains)");
}

bool SolveFlags::criteria(const Network& net, Streams io, CriteriaOverride* out) const {
  struct Flag {
    const char* name;
    const std::string* text;
    Dimension dimension;
    std::optional<double>* target;
  } flags[] = {{"--min-pressure", &min_pressure, Dimension::kPressure, &out->min_pressure_m},
               {"--max-pressure", &max_pressure, Dimension::kPressure, &out->max_pressure_m},
               {"--max-velocity", &max_velocity, Dimension::kVelocity, &out->max_velocity_ms}};
  for (const Flag& f : flags) {
    if (f.text->empty()) continue;
    UnitParse p = parse_quantity(*f.text, f.dimension, net.units);
    if (!p.ok || !(p.quantity.value > -1e9)) {
      io.err << "gradeline: error: " << f.name << ": " << p.error << "\n";
      return false;
    }
    double v = p.quantity.value;
    if (f.dimension == Dimension::kPressure && !p.quantity.is_head) {
      v /= net.fluid.density_kgm3 * kGravity_ms2;
    }
    *f.target = v;
  }
  return true;
}

SolveOptions SolveFlags::options() const {
  SolveOptions o;
  o.max_iterations = max_iterations;
  o.topological_reduction = !no_reduction;
  return o;
}

}  // namespace gradeline
