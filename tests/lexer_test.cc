// Splitting lines into statements.
#include <doctest/doctest.h>

#include <sstream>
#include <string>
#include <vector>

#include "io/lexer.h"

using namespace gradeline;

TEST_CASE("a statement has a keyword, positional fields, then key=value pairs") {
  Statement s;
  LexResult r = lex_line("pipe P1 N1 N2 length=410m diameter=300mm  # trunk", 7, &s);
  CHECK(r.error.empty());
  CHECK_FALSE(r.empty);
  CHECK(s.line == 7);
  CHECK(s.keyword == "pipe");
  CHECK(s.positional == std::vector<std::string_view>{"P1", "N1", "N2"});
  REQUIRE(s.options.size() == 2);
  CHECK(s.options[0] == std::make_pair(std::string_view("length"), std::string_view("410m")));
  CHECK(s.options[1].second == "300mm");
}

TEST_CASE("comments, blank lines, tabs and CR are whitespace") {
  Statement s;
  CHECK(lex_line("   # only a comment", 1, &s).empty);
  CHECK(lex_line("\t\r", 2, &s).empty);
  LexResult r = lex_line("node\tN1\televation=5\r", 3, &s);
  CHECK_FALSE(r.empty);
  CHECK(s.positional == std::vector<std::string_view>{"N1"});
  CHECK(s.options[0].second == "5");
}

TEST_CASE("a positional field after key=value pairs is an error") {
  Statement s;
  LexResult r = lex_line("node N1 elevation=5 N2", 1, &s);
  CHECK(r.error == "positional field 'N2' after key=value pairs");
}

TEST_CASE("a key=value pair needs a key") {
  Statement s;
  CHECK(lex_line("node N1 =5", 1, &s).error == "'=5' has no key before '='");
}

TEST_CASE("an over-long line is refused") {
  Statement s;
  std::string line(kMaxLineLength + 1, 'x');
  CHECK(lex_line(line, 1, &s).error == "line is longer than 4096 characters");
}

TEST_CASE("split_lines drops a UTF-8 byte-order mark and keeps a last line with no newline") {
  auto lines = split_lines("\xEF\xBB\xBFunits SI\r\nnode A elevation=1");
  REQUIRE(lines.size() == 2);
  CHECK(lines[0] == "units SI\r");
  CHECK(lines[1] == "node A elevation=1");
}

TEST_CASE("texts of every length up to 200 bytes split as std::getline splits them") {
  // Newlines on either side of the 64-byte blocks the newlines are looked for in.
  std::size_t differing = 0;
  for (std::size_t size = 0; size <= 200; ++size) {
    for (std::size_t every : {1, 2, 7, 63, 64, 65, 300}) {
      std::string text;
      for (std::size_t i = 0; i < size; ++i) text += (i + 1) % every == 0 ? '\n' : 'x';
      std::vector<std::string> expected;
      std::istringstream in(text);
      for (std::string line; std::getline(in, line);) expected.push_back(line);
      const std::vector<std::string_view> lines = split_lines(text);
      differing += lines.size() != expected.size();
      for (std::size_t i = 0; i < std::min(lines.size(), expected.size()); ++i) {
        differing += lines[i] != expected[i];
      }
    }
  }
  CHECK(differing == 0);
}

TEST_CASE("a text of several megabytes splits into the same lines on every core") {
  // Lines of varied length (empty ones, runs of newlines, a long one), no newline at the end;
  // the expected lines come from std::getline, which ends lines the same way.
  std::string text = "\xEF\xBB\xBF";
  for (int i = 0; i < 120000; ++i) {
    text += std::string(static_cast<std::size_t>(i % 97), static_cast<char>('a' + i % 26));
    text += i % 1000 == 0 ? "\n\n\n" : "\n";
  }
  text += std::string(3000, 'z');
  std::vector<std::string> expected;
  std::istringstream in(text.substr(3));
  for (std::string line; std::getline(in, line);) expected.push_back(line);
  const std::vector<std::string_view> lines = split_lines(text);
  REQUIRE(text.size() > (std::size_t{1} << 22));
  REQUIRE(lines.size() == expected.size());
  std::size_t differing = 0;
  for (std::size_t i = 0; i < lines.size(); ++i) differing += lines[i] != expected[i];
  CHECK(differing == 0);
}

TEST_CASE("IDs may hold unusual printable characters but no separators") {
  CHECK(is_valid_id("N-12.a/b:c(3)"));
  CHECK(is_valid_id("Zone\xC3\xA9-7"));  // UTF-8 letters
  CHECK_FALSE(is_valid_id(""));
  CHECK_FALSE(is_valid_id("a,b"));
  CHECK_FALSE(is_valid_id(std::string(kMaxIdLength + 1, 'a')));
}

TEST_CASE("a statement reused for the next line holds only that line's fields") {
  Statement s;
  REQUIRE(lex_line("pipe P1 N1 N2 length=410m diameter=300mm", 1, &s).error.empty());
  REQUIRE(lex_line("node N9 elevation=5", 2, &s).error.empty());
  CHECK(s.line == 2);
  CHECK(s.keyword == "node");
  CHECK(s.positional == std::vector<std::string_view>{"N9"});
  REQUIRE(s.options.size() == 1);
  CHECK(s.options[0].first == "elevation");
  CHECK(s.rest == "N9 elevation=5");
}
