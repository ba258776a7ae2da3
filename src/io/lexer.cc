#include "io/lexer.h"

#include <algorithm>
#include <cstring>

#include "gradeline/prefault.h"

namespace gradeline {
namespace {

bool is_space(char c) { return c == ' ' || c == '\t' || c == '\r' || c == '\f' || c == '\v'; }

std::string_view trim(std::string_view s) {
  while (!s.empty() && is_space(s.front())) s.remove_prefix(1);
  while (!s.empty() && is_space(s.back())) s.remove_suffix(1);
  return s;
}

}  // namespace

namespace {

// Texts of at least this many bytes are split on every core, in this many parts.
constexpr std::size_t kParallelSplitBytes = 1 << 20;
constexpr std::size_t kSplitParts = 16;

// Calls f(line) for every line of `text`, whose last line may lack its '\n'.
template <typename F>
void for_each_line(std::string_view text, F&& f) {
  std::size_t start = 0;
  while (start < text.size()) {
    const void* nl = std::memchr(text.data() + start, '\n', text.size() - start);
    const std::size_t end =
        nl ? static_cast<std::size_t>(static_cast<const char*>(nl) - text.data()) : text.size();
    f(text.substr(start, end - start));
    start = end + 1;
  }
}

}  // namespace

std::vector<std::string_view> split_lines(std::string_view text) {
  if (text.substr(0, 3) == "\xEF\xBB\xBF") text.remove_prefix(3);
  std::vector<std::string_view> lines;
  if (text.size() < kParallelSplitBytes) {
    for_each_line(text, [&](std::string_view line) { lines.push_back(line); });
    return lines;
  }
  // Parts of whole lines: each after the first '\n' at or beyond an even share of the bytes.
  // Their lines are counted, then written to their place, part by part on every core.
  std::size_t begin[kSplitParts + 1];
  begin[0] = 0;
  begin[kSplitParts] = text.size();
  for (std::size_t p = 1; p < kSplitParts; ++p) {
    const std::size_t nl = text.find('\n', p * (text.size() / kSplitParts));
    begin[p] = std::max(begin[p - 1], nl == std::string_view::npos ? text.size() : nl + 1);
  }
  std::size_t first_line[kSplitParts + 1] = {};
#pragma omp parallel for schedule(static)
  for (std::ptrdiff_t p = 0; p < static_cast<std::ptrdiff_t>(kSplitParts); ++p) {
    std::size_t count = 0;
    for_each_line(text.substr(begin[p], begin[p + 1] - begin[p]), [&](std::string_view) { ++count; });
    first_line[p + 1] = count;
  }
  for (std::size_t p = 0; p < kSplitParts; ++p) first_line[p + 1] += first_line[p];
  resize_prefaulted(lines, first_line[kSplitParts]);
#pragma omp parallel for schedule(static)
  for (std::ptrdiff_t p = 0; p < static_cast<std::ptrdiff_t>(kSplitParts); ++p) {
    std::string_view* out = lines.data() + first_line[p];
    // Views of `text` itself, not of the part (substr of a view keeps the same bytes).
    for_each_line(text.substr(begin[p], begin[p + 1] - begin[p]),
                  [&](std::string_view line) { *out++ = line; });
  }
  return lines;
}

bool is_valid_id(std::string_view id) {
  if (id.empty() || id.size() > kMaxIdLength) return false;
  for (char c : id) {
    unsigned char u = static_cast<unsigned char>(c);
    if (u <= 0x20 || u == 0x7F || c == '#' || c == '=' || c == ',') return false;
  }
  return true;
}

LexResult lex_line(std::string_view line, int line_number, Statement* out) {
  LexResult result;
  if (line.size() > kMaxLineLength) {
    result.empty = false;
    result.error = "line is longer than " + std::to_string(kMaxLineLength) + " characters";
    return result;
  }
  std::size_t hash = line.find('#');
  if (hash != std::string_view::npos) line = line.substr(0, hash);
  line = trim(line);
  if (line.empty()) return result;
  result.empty = false;

  out->line = line_number;
  out->keyword = {};
  out->positional.clear();
  out->options.clear();
  out->rest = {};
  std::size_t i = 0;
  bool first = true;
  while (i < line.size()) {
    while (i < line.size() && is_space(line[i])) ++i;
    if (i >= line.size()) break;
    std::size_t j = i;
    while (j < line.size() && !is_space(line[j])) ++j;
    std::string_view field = line.substr(i, j - i);
    if (first) {
      out->keyword = field;
      out->rest = trim(line.substr(j));
      first = false;
    } else {
      std::size_t eq = field.find('=');
      if (eq == std::string_view::npos) {
        if (!out->options.empty()) {
          result.error = "positional field '" + std::string(field) +
                         "' after key=value pairs";
          return result;
        }
        out->positional.emplace_back(field);
      } else if (eq == 0) {
        result.error = "'" + std::string(field) + "' has no key before '='";
        return result;
      } else {
        out->options.emplace_back(field.substr(0, eq), field.substr(eq + 1));
      }
    }
    i = j;
  }
  return result;
}

}  // namespace gradeline
