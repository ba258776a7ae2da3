#include "cli/commands.h"

#include <ostream>

#include "io/atomic_file.h"

namespace gradeline {

const std::vector<CommandSpec>& command_table() {
  static const std::vector<CommandSpec> table = {check_command(), solve_command()};
  return table;
}

bool load_network(const std::string& path, Streams io, Network* network) {
  ParseResult parsed = parse_network_file(path);
  for (const Diagnostic& d : parsed.errors) io.err << d.format() << "\n";
  if (parsed.truncated) {
    io.err << "gradeline: stopped after " << parsed.errors.size() << " errors\n";
  }
  if (!parsed.ok()) return false;
  *network = std::move(parsed.network);
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

}  // namespace gradeline
