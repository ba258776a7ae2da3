// libFuzzer target: change sets applied to a fixed small network.
#include <cstddef>
#include <cstdint>
#include <string>

#include "io/change_set.h"
#include "io/network_writer.h"
#include "io/parser.h"

using namespace gradeline;

namespace {
const char* kBase =
    "reservoir R head=50\nnode A elevation=0 demand=2\nnode B elevation=0 demand=1:homes\n"
    "pipe P1 R A length=100 diameter=150 roughness=0.1\n"
    "pipe P2 A B length=100 diameter=100 roughness=0.1\n"
    "pipe P3 R B length=300 diameter=100 roughness=0.1 status=closed\n"
    "case fire factor=1.5 draw=B:5\nlimit pressure min=20m\n";
}

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  static const Network base = parse_network_text(kBase, "base.gln").network;
  Network net = base;
  std::string text(reinterpret_cast<const char*>(data), size);
  ChangeResult r = apply_change_text(text, "fuzz.chg", &net);
  if (r.ok()) {
    ParseResult again = parse_network_text(write_network(net), "merged.gln");
    (void)again;
  }
  return 0;
}
