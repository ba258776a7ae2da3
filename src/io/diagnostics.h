// Input errors in the form "FILE:LINE: error: message", collected so a whole file can be
// reported at once, up to a limit.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

namespace gradeline {

struct Diagnostic {
  std::string file;
  int line = 0;
  std::string message;

  std::string format() const;
};

class Diagnostics {
 public:
  explicit Diagnostics(std::size_t limit = 20) : limit_(limit) {}

  void error(const std::string& file, int line, std::string message);
  bool full() const { return errors_.size() >= limit_; }
  bool empty() const { return errors_.empty(); }
  const std::vector<Diagnostic>& errors() const { return errors_; }
  std::size_t limit() const { return limit_; }

 private:
  std::size_t limit_;
  std::vector<Diagnostic> errors_;
};

// Edit distance, for "did you mean" suggestions.
std::size_t edit_distance(const std::string& a, const std::string& b);

// The candidate closest to `word`, or "" when none is close enough to suggest.
std::string nearest_word(const std::string& word, const std::vector<std::string>& candidates);

}  // namespace gradeline
