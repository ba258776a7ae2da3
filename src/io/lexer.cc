#include "io/lexer.h"

namespace gradeline {
namespace {

bool is_space(char c) { return c == ' ' || c == '\t' || c == '\r' || c == '\f' || c == '\v'; }

std::string_view trim(std::string_view s) {
  while (!s.empty() && is_space(s.front())) s.remove_prefix(1);
  while (!s.empty() && is_space(s.back())) s.remove_suffix(1);
  return s;
}

}  // namespace

std::vector<std::string_view> split_lines(std::string_view text) {
  if (text.substr(0, 3) == "\xEF\xBB\xBF") text.remove_prefix(3);
  std::vector<std::string_view> lines;
  std::size_t start = 0;
  while (start < text.size()) {
    std::size_t end = text.find('\n', start);
    if (end == std::string_view::npos) end = text.size();
    lines.push_back(text.substr(start, end - start));
    start = end + 1;
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
