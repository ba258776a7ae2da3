// Splits one line of a gradeline text file into a statement:
//   KEYWORD POSITIONAL... KEY=VALUE...
// '#' starts a comment; spaces and tabs separate fields; a trailing '\r' (CRLF files) is
// dropped. Positional fields come before the key=value pairs.
#pragma once

#include <string>
#include <string_view>
#include <utility>
#include <vector>

namespace gradeline {

inline constexpr std::size_t kMaxLineLength = 4096;
inline constexpr std::size_t kMaxIdLength = 64;

// The fields view the line they were split from, which must outlive the statement. A statement
// reused for line after line keeps the capacity of its vectors, so lexing does not allocate.
struct Statement {
  int line = 0;
  std::string_view keyword;
  std::vector<std::string_view> positional;
  std::vector<std::pair<std::string_view, std::string_view>> options;  // key, value in file order
  std::string_view rest;  // the raw text after the keyword, comment removed (for `title`)
};

struct LexResult {
  bool empty = true;   // blank or comment-only line
  std::string error;   // set when the line cannot be split
};

LexResult lex_line(std::string_view line, int line_number, Statement* out);

// Splits a whole text into lines, dropping a UTF-8 byte-order mark at the start.
std::vector<std::string_view> split_lines(std::string_view text);

// An ID is 1 to 64 bytes with no space, control character, '#', '=' or ','.
bool is_valid_id(std::string_view id);

}  // namespace gradeline
