// The subcommands of the gradeline command line, registered from one table.
#pragma once

#include <CLI/CLI.hpp>
#include <functional>
#include <iosfwd>
#include <string>
#include <vector>

#include "io/json_stream.h"
#include "analysis/case_run.h"
#include "io/parser.h"

namespace gradeline {

enum ExitCode : int {
  kExitOk = 0,         // solved (and every stated criterion met)
  kExitCriteria = 1,   // solved, but a stated criterion is violated
  kExitInput = 2,      // input error: bad file, bad option, unwritable output
  kExitNotSolved = 3,  // no valid solution
};

struct Streams {
  std::ostream& out;
  std::ostream& err;
};

// A command adds its options to `app` and returns the function that runs it after parsing.
using Runner = std::function<int(Streams)>;
struct CommandSpec {
  const char* name;
  const char* summary;
  std::function<Runner(CLI::App*)> attach;
};

const std::vector<CommandSpec>& command_table();

CommandSpec check_command();
CommandSpec solve_command();
CommandSpec compare_command();
CommandSpec size_command();

// Parses a network file and prints its errors. False on any error.
bool load_network(const std::string& path, Streams io, Network* network);

// Applies change files in order, printing their errors. False on any error.
bool apply_changes(const std::vector<std::string>& change_files, Streams io, Network* network);

// Writes `text` to `path` atomically unless `path` names one of `inputs`. Prints the error.
bool write_output(const std::string& path, const std::string& text,
                  const std::vector<std::string>& inputs, Streams io);
// The same for JSON written by `produce` straight to the temporary file, a megabyte at a time,
// with each element of the top-level arrays on one line.
bool write_json_output(const std::string& path, const std::vector<std::string>& inputs, Streams io,
                       const std::function<void(JsonStream*)>& produce);

// Options shared by the commands that solve: criteria on the command line, iteration limit,
// case selection.
struct SolveFlags {
  std::string case_name;
  std::string min_pressure, max_pressure, max_velocity;
  int max_iterations = SolveOptions{}.max_iterations;
  bool no_reduction = false;

  void add_to(CLI::App* app);
  // Converts the criteria for `network` (its units and fluid). Prints the error.
  bool criteria(const Network& network, Streams io, CriteriaOverride* out) const;
  SolveOptions options() const;
};

}  // namespace gradeline
