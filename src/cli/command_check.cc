// gradeline check FILE: parse and validate a network, then report its counts, sources,
// islands and unsupplied nodes.
#include <memory>
#include <ostream>

#include "cli/commands.h"
#include "report/check_report.h"

namespace gradeline {

CommandSpec check_command() {
  return {"check", "Parse and validate a network file; report counts, sources and islands",
          [](CLI::App* app) -> Runner {
            auto file = std::make_shared<std::string>();
            app->add_option("FILE", *file, "network file")->required();
            return [file](Streams io) {
              Network net;
              if (!load_network(*file, io, &net)) return int(kExitInput);
              io.out << check_report_text(net, check_network(net), *file);
              return int(kExitOk);
            };
          }};
}

}  // namespace gradeline
