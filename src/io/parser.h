// Reads the gradeline network format (version 1; see docs/format.md) into a Network.
// Every error found is reported as "FILE:LINE: error: message", up to a limit.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "gradeline/network.h"
#include "io/bulk_reader.h"
#include "io/diagnostics.h"

namespace gradeline {

inline constexpr int kMaxIncludeDepth = 16;
// Larger files are refused before they are read: 10^6 pipes take about 80 MB, and the model
// takes a few times the size of its text in memory.
inline constexpr long long kMaxFileBytes = 1LL << 30;

struct ParseResult {
  Network network;
  std::vector<Diagnostic> errors;
  bool truncated = false;  // the error limit was reached; later errors were not looked for
  bool bulk_read = false;  // node and pipe lines were read on every core (io/bulk_reader.h)

  bool ok() const { return errors.empty(); }
};

ParseResult parse_network_file(const std::string& path);

// `file_name` is used in messages and as the base of relative includes. Texts of at least
// `bulk_from_lines` lines are read in bulk when they can be (io/bulk_reader.h); the result is
// the same either way.
ParseResult parse_network_text(std::string_view text, const std::string& file_name,
                               std::size_t bulk_from_lines = kBulkReadFromLines);

// Reads a whole file; false with a reason when it cannot be read.
bool read_text_file(const std::string& path, std::string* text, std::string* error);

}  // namespace gradeline
