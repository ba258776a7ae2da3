#include "gradeline/network.h"

#include <cstdlib>
#include <mutex>
#include <unordered_map>

namespace gradeline {

namespace {

// The interned strings: a table of chunks that never move (chunk c holds strings
// c * kChunkSize ...), filled under a lock; a string is read without one, since whoever holds
// its InternedString obtained it after the string was stored.
constexpr std::size_t kChunkBits = 12;
constexpr std::size_t kChunkSize = std::size_t{1} << kChunkBits;
constexpr std::size_t kMaxChunks = std::size_t{1} << 12;  // 16.7 million strings

struct InternTable {
  std::mutex guard;
  std::unordered_map<std::string_view, std::uint32_t> index;  // views of the strings below
  const std::string** chunks[kMaxChunks] = {};
  std::uint32_t count = 0;
};

InternTable& intern_table() {
  static InternTable* table = new InternTable;  // never freed, like the strings
  return *table;
}

}  // namespace

const std::string& InternedString::str() const {
  static const std::string empty;
  if (index_ == 0) return empty;
  const std::uint32_t i = index_ - 1;
  return *intern_table().chunks[i >> kChunkBits][i & (kChunkSize - 1)];
}

InternedString intern(std::string_view text) {
  if (text.empty()) return InternedString();
  // The last string interned on this thread, without the lock: the bulk reader interns the
  // same file name, or runs of the same demand category, line after line.
  thread_local std::string last_text;
  thread_local InternedString last;
  if (!last.empty() && text == last_text) return last;
  InternTable& t = intern_table();
  std::lock_guard<std::mutex> lock(t.guard);
  auto found = t.index.find(text);
  std::uint32_t index = 0;
  if (found != t.index.end()) {
    index = found->second;
  } else {
    const std::uint32_t i = t.count;
    if ((i >> kChunkBits) >= kMaxChunks) std::abort();  // more distinct names than any model has
    const std::string**& chunk = t.chunks[i >> kChunkBits];
    if (chunk == nullptr) chunk = new const std::string*[kChunkSize];
    const std::string* stored = new std::string(text);
    chunk[i & (kChunkSize - 1)] = stored;
    ++t.count;
    index = i + 1;
    t.index.emplace(*stored, index);
  }
  last_text.assign(text.data(), text.size());
  last = InternedString(index);
  return last;
}

const char* link_kind_name(LinkKind kind) {
  switch (kind) {
    case LinkKind::kPipe:
      return "pipe";
    case LinkKind::kPump:
      return "pump";
    case LinkKind::kPrv:
      return "prv";
    case LinkKind::kPsv:
      return "psv";
    case LinkKind::kFcv:
      return "fcv";
    case LinkKind::kThrottle:
      return "throttle";
  }
  return "pipe";
}

std::optional<std::size_t> Network::find_node(std::string_view id) const {
  return node_index_.find(id, [this](std::size_t i) -> std::string_view { return nodes[i].id; });
}

std::optional<std::size_t> Network::find_pipe(std::string_view id) const {
  return pipe_index_.find(id, [this](std::size_t i) -> std::string_view { return pipes[i].id; });
}

void Network::reindex() {
  node_index_.clear();
  pipe_index_.clear();
  node_index_.reserve(nodes.size());
  pipe_index_.reserve(pipes.size());
  auto node_id = [this](std::size_t i) -> std::string_view { return nodes[i].id; };
  auto pipe_id = [this](std::size_t i) -> std::string_view { return pipes[i].id; };
  for (std::size_t i = 0; i < nodes.size(); ++i) node_index_.insert(nodes[i].id, i, node_id);
  for (std::size_t i = 0; i < pipes.size(); ++i) pipe_index_.insert(pipes[i].id, i, pipe_id);
}

void Network::reserve(std::size_t node_count, std::size_t pipe_count) {
  nodes.reserve(node_count);
  pipes.reserve(pipe_count);
  node_index_.reserve(node_count);
  pipe_index_.reserve(pipe_count);
}

std::size_t Network::add_node(Node node) {
  const std::size_t index = nodes.size();
  node_index_.insert(node.id, index,
                     [this](std::size_t i) -> std::string_view { return nodes[i].id; });
  nodes.push_back(std::move(node));
  return index;
}

std::optional<std::size_t> Network::try_add_node(Node&& node) {
  auto [index, inserted] = node_index_.insert(
      node.id, nodes.size(), [this](std::size_t i) -> std::string_view { return nodes[i].id; });
  if (!inserted) return std::nullopt;
  nodes.push_back(std::move(node));
  return index;
}

std::optional<std::size_t> Network::try_add_pipe(Pipe&& pipe) {
  auto [index, inserted] = pipe_index_.insert(
      pipe.id, pipes.size(), [this](std::size_t i) -> std::string_view { return pipes[i].id; });
  if (!inserted) return std::nullopt;
  pipes.push_back(std::move(pipe));
  return index;
}

bool Network::try_index_node(std::size_t k) {
  return node_index_
      .insert(nodes[k].id, k, [this](std::size_t i) -> std::string_view { return nodes[i].id; })
      .second;
}

bool Network::index_all_pipes(const std::vector<IdIndex::Staged>& staged) {
  if (pipe_index_.insert_all(staged,
                             [this](std::size_t i) -> std::string_view { return pipes[i].id; })) {
    return true;
  }
  pipe_index_.clear();
  return false;
}

bool Network::try_index_pipe(std::size_t k) {
  return pipe_index_
      .insert(pipes[k].id, k, [this](std::size_t i) -> std::string_view { return pipes[i].id; })
      .second;
}

std::size_t Network::add_pipe(Pipe pipe) {
  const std::size_t index = pipes.size();
  pipe_index_.insert(pipe.id, index,
                     [this](std::size_t i) -> std::string_view { return pipes[i].id; });
  pipes.push_back(std::move(pipe));
  return index;
}

}  // namespace gradeline
