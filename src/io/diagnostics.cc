#include "io/diagnostics.h"

#include <algorithm>

namespace gradeline {

std::string Diagnostic::format() const {
  if (line <= 0) return file + ": error: " + message;  // about the file as a whole
  return file + ":" + std::to_string(line) + ": error: " + message;
}

void Diagnostics::error(const std::string& file, int line, std::string message) {
  if (full()) return;
  errors_.push_back(Diagnostic{file, line, std::move(message)});
}

std::size_t edit_distance(const std::string& a, const std::string& b) {
  std::vector<std::size_t> row(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) row[j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    std::size_t diagonal = row[0];
    row[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      std::size_t above = row[j];
      row[j] = std::min({row[j] + 1, row[j - 1] + 1, diagonal + (a[i - 1] == b[j - 1] ? 0 : 1)});
      diagonal = above;
    }
  }
  return row[b.size()];
}

std::string nearest_word(const std::string& word, const std::vector<std::string>& candidates) {
  std::string best;
  std::size_t best_distance = std::max<std::size_t>(2, word.size() / 3) + 1;
  for (const std::string& c : candidates) {
    std::size_t d = edit_distance(word, c);
    if (d < best_distance) {
      best_distance = d;
      best = c;
    }
  }
  return best;
}

}  // namespace gradeline
