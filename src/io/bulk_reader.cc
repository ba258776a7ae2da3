#include "io/bulk_reader.h"

#include <algorithm>
#include <atomic>
#include <memory>

#include "io/diagnostics.h"
#include "io/lexer.h"

namespace gradeline {
namespace {

// Lines are shared among the threads in this many contiguous chunks (static schedule).
constexpr std::size_t kChunks = 64;

bool is_blank(char c) { return c == ' ' || c == '\t'; }

// The first word of a line: after leading blanks, up to a blank or '#'.
std::string_view first_word(std::string_view line) {
  std::size_t i = 0;
  while (i < line.size() && is_blank(line[i])) ++i;
  std::size_t j = i;
  while (j < line.size() && !is_blank(line[j]) && line[j] != '#') ++j;
  return line.substr(i, j - i);
}

LineKind kind_of(std::string_view word) {
  if (word == "node") return LineKind::kNode;
  if (word == "pipe") return LineKind::kPipe;
  if (word == "reservoir" || word == "tank") return LineKind::kNodeOther;
  if (word == "pump" || word == "valve") return LineKind::kLinkOther;
  if (word == "include") return LineKind::kInclude;
  return LineKind::kOther;
}

bool takes_node_slot(LineKind k) { return k == LineKind::kNode || k == LineKind::kNodeOther; }
bool takes_link_slot(LineKind k) { return k == LineKind::kPipe || k == LineKind::kLinkOther; }

// Reads one kNode or kPipe line into its slot; false on any error.
bool read_line(std::string_view text, std::size_t index, LineKind kind, const ReadContext& c,
               Statement* s, Node* node, Pipe* pipe, PipeEnds* ends) {
  const LexResult lexed = lex_line(text, static_cast<int>(index) + 1, s);
  if (lexed.empty || !lexed.error.empty()) return false;
  if (kind == LineKind::kNode) {
    if (s->keyword != "node") return false;
    std::optional<Node> n = read_junction(*s, c);
    if (!n || !c.diagnostics->empty()) return false;
    *node = std::move(*n);
    return true;
  }
  if (s->keyword != "pipe") return false;
  std::optional<PipeRead> p = read_pipe(*s, c);
  if (!p || !c.diagnostics->empty()) return false;
  *ends = ends_of(*p);
  ends->from_id = s->positional[1];  // the same IDs, viewed in the text
  ends->to_id = s->positional[2];
  *pipe = std::move(p->pipe);
  return true;
}

}  // namespace

LineKinds classify_lines(const std::vector<std::string_view>& lines) {
  LineKinds out;
  out.kinds.resize(lines.size());
  for (std::size_t i = 0; i < lines.size(); ++i) {
    const LineKind k = kind_of(first_word(lines[i]));
    out.kinds[i] = k;
    out.node_lines += takes_node_slot(k);
    out.link_lines += takes_link_slot(k);
    out.includes += k == LineKind::kInclude;
  }
  return out;
}

bool read_in_bulk(const std::vector<std::string_view>& lines, const LineKinds& kinds,
                  std::size_t first, const std::string& file, UnitSystem units,
                  std::vector<Node>* nodes, std::vector<Pipe>* pipes, std::vector<PipeEnds>* ends) {
  const std::vector<LineKind>& kind = kinds.kinds;
  const std::size_t count = lines.size();
  const std::size_t per_chunk = (count - first + kChunks - 1) / kChunks;
  // The first node and link slot of each chunk: the node-like and link-like lines before it.
  std::vector<std::size_t> node_slot(kChunks), link_slot(kChunks);
  std::size_t nodes_before = 0, links_before = 0;
  for (std::size_t i = 0; i < first; ++i) {
    nodes_before += takes_node_slot(kind[i]);
    links_before += takes_link_slot(kind[i]);
  }
  for (std::size_t c = 0; c < kChunks; ++c) {
    node_slot[c] = nodes_before;
    link_slot[c] = links_before;
    const std::size_t end = std::min(count, first + (c + 1) * per_chunk);
    for (std::size_t i = std::min(count, first + c * per_chunk); i < end; ++i) {
      nodes_before += takes_node_slot(kind[i]);
      links_before += takes_link_slot(kind[i]);
    }
  }
  std::atomic<bool> failed{false};
#pragma omp parallel for schedule(static)
  for (std::ptrdiff_t c = 0; c < static_cast<std::ptrdiff_t>(kChunks); ++c) {
    const std::size_t chunk = static_cast<std::size_t>(c);
    // Each chunk has its own copy of the file name: elements read at the same time on
    // different cores then never count references on one shared counter.
    const auto name = std::make_shared<const std::string>(file);
    Diagnostics diagnostics;
    const ReadContext context{file, name, units, &diagnostics};
    Statement s;
    std::size_t node = node_slot[chunk], link = link_slot[chunk];
    const std::size_t end = std::min(count, first + (chunk + 1) * per_chunk);
    for (std::size_t i = std::min(count, first + chunk * per_chunk); i < end; ++i) {
      const LineKind k = kind[i];
      if (k == LineKind::kNode || k == LineKind::kPipe) {
        if (failed.load(std::memory_order_relaxed)) break;
        if (!read_line(lines[i], i, k, context, &s,
                       k == LineKind::kNode ? &(*nodes)[node] : nullptr,
                       k == LineKind::kPipe ? &(*pipes)[link] : nullptr,
                       k == LineKind::kPipe ? &(*ends)[link] : nullptr)) {
          failed.store(true, std::memory_order_relaxed);
          break;
        }
      }
      node += takes_node_slot(k);
      link += takes_link_slot(k);
    }
  }
  return !failed.load();
}

}  // namespace gradeline
