// Reading the node and pipe statements of a large network file on every core.
//
// Nearly every line of a large network file is a `node` or a `pipe` statement, and reading one
// (lexing, numbers, units, range checks) depends on nothing but the line and the unit system,
// which no longer changes once the first such statement has been read (`units` must come
// before any value with a unit default). Those lines are read in parallel, each straight into
// the slot that its element takes in Network::nodes or Network::pipes; slots are numbered in
// file order over all node-like statements (node, reservoir, tank) and all link-like ones
// (pipe, pump, valve). The `node` lines join the ID lookup in file order on one core while
// the others read the pipe lines; the parser reads every other line in file order as usual,
// adding reservoirs and tanks to the lookup as it goes. Without duplicate IDs (any duplicate
// fails the bulk read) the network is the same as one read line by line.
//
// The bulk read only succeeds on input without errors: any line it cannot read cleanly makes
// it report failure, and the parser then reads the whole file again line by line, which gives
// the errors in their usual order and wording.
#pragma once

#include <cstddef>
#include <functional>
#include <string>
#include <string_view>
#include <vector>

#include "gradeline/network.h"
#include "io/element_reader.h"

namespace gradeline {

// Files with fewer lines are read line by line only (threads cost more than they save).
inline constexpr std::size_t kBulkReadFromLines = 20000;

enum class LineKind : unsigned char {
  kOther,      // any other statement, a comment or a blank line
  kNode,       // `node`: read in bulk
  kNodeOther,  // `reservoir`, `tank`: takes a node slot, read line by line
  kPipe,       // `pipe`: read in bulk
  kLinkOther,  // `pump`, `valve`: takes a link slot, read line by line
  kInclude,    // `include`: elements of another file would interleave, so no bulk read
};

// The first word of *line (after blanks, up to a blank or '#'), removed from *line with what
// precedes it.
std::string_view take_word(std::string_view* line);

// The kind of each line, by its first word (take_word), with the counts.
struct LineKinds {
  std::vector<LineKind> kinds;
  std::size_t node_lines = 0;  // node, reservoir, tank
  std::size_t link_lines = 0;  // pipe, pump, valve
  std::size_t includes = 0;
};
LineKinds classify_lines(const std::vector<std::string_view>& lines);

// Reads every kNode and kPipe line from line index `first` on (all earlier lines hold none)
// into its slot: `nodes` and `pipes` are sized to the counts of `kinds`, `ends` like `pipes`.
// Line k is line number k + 1 of `file`. The IDs in `ends` view `lines`. `index_nodes` runs
// once, on one core, as soon as every kNode line has been read, while the other cores read the
// rest; it returning false fails the read. False when any line read has an error (what is left
// in the slots is then unspecified).
bool read_in_bulk(const std::vector<std::string_view>& lines, const LineKinds& kinds,
                  std::size_t first, const std::string& file, UnitSystem units,
                  std::vector<Node>* nodes, std::vector<Pipe>* pipes, std::vector<PipeEnds>* ends,
                  const std::function<bool()>& index_nodes);

// Settles every link of `net` (settle_pipe: end nodes, defaults, checks) on every core, then
// adds the links to the pipe ID lookup in file order. `ends` is parallel to net->pipes. False
// when any link has an error (an unknown end, a failed check, a duplicate ID).
bool settle_in_bulk(const std::vector<PipeEnds>& ends, const PipeDefaults& defaults, Network* net);

}  // namespace gradeline
