// gradeline: steady-state hydraulics of water distribution networks.
#include <iostream>

#include "cli/allocator.h"
#include "cli/commands.h"
#include "gradeline/version.h"

int main(int argc, char** argv) {
  using namespace gradeline;
  configure_allocator();
  CLI::App app{"gradeline: pressures and flows in water distribution networks"};
  app.set_version_flag("--version", std::string("gradeline ") + kVersion);
  app.require_subcommand(1);
  std::vector<std::pair<CLI::App*, Runner>> runners;
  for (const CommandSpec& spec : command_table()) {
    CLI::App* sub = app.add_subcommand(spec.name, spec.summary);
    runners.emplace_back(sub, spec.attach(sub));
  }
  try {
    app.parse(argc, argv);
  } catch (const CLI::ParseError& e) {
    int code = app.exit(e);
    return code == 0 ? kExitOk : kExitInput;
  }
  Streams io{std::cout, std::cerr};
  for (auto& [sub, run] : runners) {
    if (sub->parsed()) return run(io);
  }
  return kExitInput;
}
