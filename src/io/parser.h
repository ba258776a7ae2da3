// Reads the gradeline network format (version 1; see docs/format.md) into a Network.
// Every error found is reported as "FILE:LINE: error: message", up to a limit.
#pragma once

#include <memory>
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

// The bytes of a file read whole, into a buffer that is not cleared first (at 10^6 pipes,
// zeroing the 100 MB before the read cost 0.01-0.02 s).
class FileText {
 public:
  std::string_view view() const { return {data_.get(), size_}; }

 private:
  friend bool read_text_file(const std::string& path, FileText* text, std::string* error);
  std::unique_ptr<char[]> data_;
  std::size_t size_ = 0;
};

// Reads a whole file; false with a reason when it cannot be read.
bool read_text_file(const std::string& path, FileText* text, std::string* error);

}  // namespace gradeline
