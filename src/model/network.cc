#include "gradeline/network.h"

namespace gradeline {

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

std::optional<std::size_t> Network::find_node(const std::string& id) const {
  auto it = node_index_.find(id);
  if (it == node_index_.end()) return std::nullopt;
  return it->second;
}

std::optional<std::size_t> Network::find_pipe(const std::string& id) const {
  auto it = pipe_index_.find(id);
  if (it == pipe_index_.end()) return std::nullopt;
  return it->second;
}

void Network::reindex() {
  node_index_.clear();
  pipe_index_.clear();
  node_index_.reserve(nodes.size());
  pipe_index_.reserve(pipes.size());
  for (std::size_t i = 0; i < nodes.size(); ++i) node_index_.emplace(nodes[i].id, i);
  for (std::size_t i = 0; i < pipes.size(); ++i) pipe_index_.emplace(pipes[i].id, i);
}

void Network::reserve(std::size_t node_count, std::size_t pipe_count) {
  nodes.reserve(node_count);
  pipes.reserve(pipe_count);
  node_index_.reserve(node_count);
  pipe_index_.reserve(pipe_count);
}

std::size_t Network::add_node(Node node) {
  std::size_t index = nodes.size();
  node_index_.emplace(node.id, index);
  nodes.push_back(std::move(node));
  return index;
}

std::optional<std::size_t> Network::try_add_node(Node node) {
  auto [it, inserted] = node_index_.try_emplace(node.id, nodes.size());
  if (!inserted) return std::nullopt;
  nodes.push_back(std::move(node));
  return it->second;
}

std::optional<std::size_t> Network::try_add_pipe(Pipe pipe) {
  auto [it, inserted] = pipe_index_.try_emplace(pipe.id, pipes.size());
  if (!inserted) return std::nullopt;
  pipes.push_back(std::move(pipe));
  return it->second;
}

std::size_t Network::add_pipe(Pipe pipe) {
  std::size_t index = pipes.size();
  pipe_index_.emplace(pipe.id, index);
  pipes.push_back(std::move(pipe));
  return index;
}

}  // namespace gradeline
