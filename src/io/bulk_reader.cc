#include "io/bulk_reader.h"

#include <algorithm>
#include <atomic>
#include <functional>
#include <memory>
#include <thread>

#include "io/diagnostics.h"
#include "io/lexer.h"
#include "io/plain_lines.h"

namespace gradeline {
namespace {

// Lines are shared among the threads in this many contiguous chunks, dealt to the cores as
// they come free: a node line costs more than a pipe line, and the nodes come first, so
// fixed halves left one core waiting for the other.
constexpr std::size_t kChunks = 64;

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
  const int line = static_cast<int>(index) + 1;
  // Each slot is still as default-constructed. A plain line is read straight into it; any
  // other is read the general way, into a slot made default again.
  if (kind == LineKind::kNode) {
    if (read_plain_junction(text, line, c, node)) return true;
    *node = Node{};
  } else {
    if (read_plain_pipe(text, line, c, pipe, ends)) return true;
    *pipe = Pipe{};
    *ends = PipeEnds{};
  }
  const LexResult lexed = lex_line(text, line, s);
  if (lexed.empty || !lexed.error.empty()) return false;
  if (kind == LineKind::kNode) {
    return s->keyword == "node" && read_junction_in_place(*s, c, node) && c.diagnostics->empty();
  }
  return s->keyword == "pipe" && read_pipe_in_place(*s, c, pipe, ends) && c.diagnostics->empty();
}

}  // namespace

std::string_view take_word(std::string_view* line) {
  auto blank = [](char c) { return c == ' ' || c == '\t'; };
  std::size_t i = 0;
  while (i < line->size() && blank((*line)[i])) ++i;
  std::size_t j = i;
  while (j < line->size() && !blank((*line)[j]) && (*line)[j] != '#') ++j;
  const std::string_view word = line->substr(i, j - i);
  line->remove_prefix(j);
  return word;
}

LineKinds classify_lines(const std::vector<std::string_view>& lines) {
  LineKinds out;
  out.kinds.resize(lines.size());
  const std::ptrdiff_t count = static_cast<std::ptrdiff_t>(lines.size());
  std::size_t node_lines = 0, link_lines = 0, includes = 0;
#pragma omp parallel for schedule(static) if (count >= static_cast<std::ptrdiff_t>(kBulkReadFromLines)) \
    reduction(+ : node_lines, link_lines, includes)
  for (std::ptrdiff_t i = 0; i < count; ++i) {
    std::string_view line = lines[static_cast<std::size_t>(i)];
    const LineKind k = kind_of(take_word(&line));
    out.kinds[static_cast<std::size_t>(i)] = k;
    node_lines += takes_node_slot(k);
    link_lines += takes_link_slot(k);
    includes += k == LineKind::kInclude;
  }
  out.node_lines = node_lines;
  out.link_lines = link_lines;
  out.includes = includes;
  return out;
}

bool read_in_bulk(const std::vector<std::string_view>& lines, const LineKinds& kinds,
                  std::size_t first, const std::string& file, UnitSystem units,
                  std::vector<Node>* nodes, std::vector<Pipe>* pipes, std::vector<PipeEnds>* ends,
                  const std::function<bool()>& index_nodes) {
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
  // The node lookup is built as the work item after the last chunk with a node line.
  std::size_t index_item = 0;
  for (std::size_t c = 0; c < kChunks; ++c) {
    node_slot[c] = nodes_before;
    link_slot[c] = links_before;
    const std::size_t end = std::min(count, first + (c + 1) * per_chunk);
    for (std::size_t i = std::min(count, first + c * per_chunk); i < end; ++i) {
      nodes_before += takes_node_slot(kind[i]);
      links_before += takes_link_slot(kind[i]);
      if (kind[i] == LineKind::kNode) index_item = c + 1;
    }
  }
  std::atomic<bool> failed{false};
  std::atomic<std::size_t> next_item{0};
  std::atomic<std::size_t> node_chunks_read{0};  // of the chunks before index_item
  // Work items in order, taken by the cores as they come free: chunks (dealt one at a time,
  // as a node line costs more than a pipe line and the nodes come first) and, once every
  // node line is read, the node lookup, which one core builds while the others read on.
#pragma omp parallel
  for (;;) {
    const std::size_t item = next_item.fetch_add(1);
    if (item > kChunks) break;
    if (item == index_item) {
      while (node_chunks_read.load(std::memory_order_acquire) < index_item &&
             !failed.load(std::memory_order_relaxed)) {
        std::this_thread::yield();
      }
      if (!failed.load() && !index_nodes()) failed.store(true);
      continue;
    }
    const std::size_t chunk = item < index_item ? item : item - 1;
    Diagnostics diagnostics;
    const ReadContext context{file, intern(file), units, &diagnostics};
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
    if (chunk < index_item) node_chunks_read.fetch_add(1, std::memory_order_release);
  }
  return !failed.load();
}

bool settle_in_bulk(const std::vector<PipeEnds>& ends, const PipeDefaults& defaults, Network* net) {
  std::vector<Pipe>& pipes = net->pipes;
  const std::size_t count = pipes.size();
  const std::size_t per_chunk = (count + kChunks - 1) / kChunks;
  // Resolving an end is a hash lookup, mostly a cache miss on large networks: the slots a few
  // links ahead are requested early, then the nodes they point to (as in the line-by-line
  // reading). The lookups only read the node index, so the chunks run side by side.
  constexpr std::size_t kAhead = 16;
  std::atomic<bool> failed{false};
  // Each link's slot in the link lookup is made beside its settling, while its record is in
  // the cache; the lookup is then filled by parts on every core (IdIndex::insert_all).
  std::vector<IdIndex::Staged> staged(count);
#pragma omp parallel for schedule(static)
  for (std::ptrdiff_t c = 0; c < static_cast<std::ptrdiff_t>(kChunks); ++c) {
    Diagnostics diagnostics;
    const std::size_t begin = std::min(count, static_cast<std::size_t>(c) * per_chunk);
    const std::size_t end = std::min(count, begin + per_chunk);
    for (std::size_t k = begin; k < end; ++k) {
      if (k + 2 * kAhead < end) {
        net->prefetch_node(ends[k + 2 * kAhead].from_id);
        net->prefetch_node(ends[k + 2 * kAhead].to_id);
      }
      if (k + kAhead < end) {
        net->prefetch_node_element(ends[k + kAhead].from_id);
        net->prefetch_node_element(ends[k + kAhead].to_id);
      }
      bool valid = true;
      if (!settle_pipe(&pipes[k], ends[k], defaults, *net, &diagnostics, &valid) || !valid ||
          failed.load(std::memory_order_relaxed)) {
        failed.store(true, std::memory_order_relaxed);
        break;
      }
      staged[k] = IdIndex::stage(pipes[k].id, k);
    }
  }
  if (failed.load()) return false;
  return net->index_all_pipes(staged);
}

}  // namespace gradeline
