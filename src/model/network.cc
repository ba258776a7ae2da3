#include "gradeline/network.h"

#include <mutex>
#include <unordered_set>

namespace gradeline {

const std::string* intern_file_name(std::string_view name) {
  // A node-based set: its strings never move, and are never freed (see the header).
  static std::mutex* guard = new std::mutex;
  static auto* names = new std::unordered_set<std::string>;
  std::lock_guard<std::mutex> lock(*guard);
  return &*names->emplace(name).first;
}

const char* link_kind_name(LinkKind kind) {
  switch (kind) {
    case LinkKind::kPipe: return "pipe";
    case LinkKind::kPump: return "pump";
    case LinkKind::kPrv: return "prv";
    case LinkKind::kPsv: return "psv";
    case LinkKind::kFcv: return "fcv";
    case LinkKind::kThrottle: return "throttle";
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
  node_index_.insert(node.id, index, [this](std::size_t i) -> std::string_view { return nodes[i].id; });
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

bool Network::try_index_pipe(std::size_t k) {
  return pipe_index_
      .insert(pipes[k].id, k, [this](std::size_t i) -> std::string_view { return pipes[i].id; })
      .second;
}

std::size_t Network::add_pipe(Pipe pipe) {
  const std::size_t index = pipes.size();
  pipe_index_.insert(pipe.id, index, [this](std::size_t i) -> std::string_view { return pipes[i].id; });
  pipes.push_back(std::move(pipe));
  return index;
}

}  // namespace gradeline
