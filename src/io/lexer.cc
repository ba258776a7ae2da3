#include "io/lexer.h"

#include <algorithm>
#include <cstring>

#include "gradeline/prefault.h"
#include "io/byte_masks.h"

namespace gradeline {
namespace {

bool is_space(char c) { return c == ' ' || c == '\t' || c == '\r' || c == '\f' || c == '\v'; }

// The lexer's classes of byte, from one table lookup: blanks (is_space), '#', '=' and the rest.
enum CharKind : unsigned char { kOther, kBlank, kHash, kEquals };

struct CharKinds {
  CharKind of[256] = {};
  constexpr CharKinds() {
    for (unsigned char c : {' ', '\t', '\r', '\f', '\v'}) of[c] = kBlank;
    of[static_cast<unsigned char>('#')] = kHash;
    of[static_cast<unsigned char>('=')] = kEquals;
  }
};
constexpr CharKinds kCharKinds;

CharKind kind_of(char c) { return kCharKinds.of[static_cast<unsigned char>(c)]; }

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

// Calls f(line) for every line of `text`, whose last line may lack its '\n'. The newlines are
// found 64 bytes at a time (byte_masks.h), the last few bytes one by one.
template <typename F>
void for_each_line(std::string_view text, F&& f) {
  const char* const data = text.data();
  std::size_t start = 0;
  std::size_t block = 0;
  for (; block + kMaskBytes <= text.size(); block += kMaskBytes) {
    for (std::uint64_t m = newline_mask(data + block); m != 0; m &= m - 1) {
      const std::size_t end = block + static_cast<std::size_t>(__builtin_ctzll(m));
      f(text.substr(start, end - start));
      start = end + 1;
    }
  }
  for (std::size_t i = block; i < text.size(); ++i) {
    if (data[i] != '\n') continue;
    f(text.substr(start, i - start));
    start = i + 1;
  }
  if (start < text.size()) f(text.substr(start));
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
  // One pass over the line: fields end at a blank, and the first '#' ends the line.
  const char* c = line.data();
  const char* const end = c + line.size();
  const char* keyword_end = nullptr;
  // The text after the keyword up to the comment, trimmed (for `title`).
  auto rest_from = [&](const char* from) {
    const char* stop = from;
    while (stop < end && *stop != '#') ++stop;
    return trim(std::string_view(from, static_cast<std::size_t>(stop - from)));
  };
  while (true) {
    while (c < end && kind_of(*c) == kBlank) ++c;
    if (c == end || *c == '#') break;
    const char* const field_start = c;
    const char* eq = nullptr;
    for (; c < end; ++c) {
      const CharKind k = kind_of(*c);
      if (k == kOther) continue;
      if (k != kEquals) break;
      if (eq == nullptr) eq = c;
    }
    const std::string_view field(field_start, static_cast<std::size_t>(c - field_start));
    if (keyword_end == nullptr) {
      result.empty = false;
      out->line = line_number;
      out->keyword = field;
      out->positional.clear();
      out->options.clear();
      out->rest = {};
      keyword_end = c;
      continue;
    }
    if (eq == nullptr) {
      if (!out->options.empty()) {
        out->rest = rest_from(keyword_end);
        result.error = "positional field '" + std::string(field) + "' after key=value pairs";
        return result;
      }
      out->positional.emplace_back(field);
    } else if (eq == field_start) {
      out->rest = rest_from(keyword_end);
      result.error = "'" + std::string(field) + "' has no key before '='";
      return result;
    } else {
      const std::size_t at = static_cast<std::size_t>(eq - field_start);
      out->options.emplace_back(field.substr(0, at), field.substr(at + 1));
    }
  }
  if (keyword_end != nullptr) {
    out->rest = trim(std::string_view(keyword_end, static_cast<std::size_t>(c - keyword_end)));
  }
  return result;
}

}  // namespace gradeline
