#include "io/change_set.h"

#include <algorithm>

#include "io/element_reader.h"
#include "io/parser.h"

namespace gradeline {
namespace {

const std::vector<std::string> kChangeKeywords = {"title", "units", "modify", "close",
                                                  "open",  "add",   "remove"};

enum class Target { kNone, kPipe, kNode };

class ChangeApplier {
 public:
  ChangeApplier(const std::string& file, Network* net)
      : file_(file), file_name_(intern(file)), net_(net) {}
  void statement(const Statement& s);
  ChangeResult finish(int last_line);
  void error(int line, std::string message) { diagnostics_.error(file_, line, std::move(message)); }

 private:
  ReadContext context() { return {file_, file_name_, units_, &diagnostics_}; }
  // Strips an optional kind word ("pipe", "node", "reservoir") and finds the element.
  Target find(const Statement& s, std::size_t* index, Statement* rest);
  void modify(const Statement& s);
  void set_status(const Statement& s, LinkStatus status);
  void add(const Statement& s);
  void remove(const Statement& s);

  std::string file_;
  InternedString file_name_;
  Network* net_;
  Diagnostics diagnostics_;
  UnitSystem units_ = net_->units;
  bool changed_ = false;
  std::string title_;
  int changes_ = 0;
};

Target ChangeApplier::find(const Statement& s, std::size_t* index, Statement* rest) {
  *rest = s;
  std::string kind;
  if (!rest->positional.empty() &&
      (rest->positional[0] == "pipe" || rest->positional[0] == "node" ||
       rest->positional[0] == "reservoir")) {
    kind = rest->positional[0];
    rest->positional.erase(rest->positional.begin());
  }
  if (rest->positional.size() != 1) {
    error(s.line, std::string(s.keyword) + " needs one element ID");
    return Target::kNone;
  }
  const std::string id(rest->positional[0]);
  auto pipe = net_->find_pipe(id);
  auto node = net_->find_node(id);
  if (kind == "pipe") node.reset();
  if (kind == "node" || kind == "reservoir") pipe.reset();
  if (pipe && node) {
    error(s.line, std::string(s.keyword) + ": '" + id + "' is both a node and a pipe; write '" + std::string(s.keyword) +
                      " pipe " + id + "' or '" + std::string(s.keyword) + " node " + id + "'");
    return Target::kNone;
  }
  if (pipe) {
    *index = *pipe;
    return Target::kPipe;
  }
  if (node) {
    *index = *node;
    return Target::kNode;
  }
  std::string what = kind.empty() ? "pipe or node" : kind;
  error(s.line, std::string(s.keyword) + ": no " + what + " '" + id + "' in the network");
  return Target::kNone;
}

void ChangeApplier::statement(const Statement& s) {
  const std::string_view k = s.keyword;
  if (k == "title") {
    title_ = s.rest;
    return;
  }
  if (k == "units") {
    std::string v = s.positional.size() == 1 ? std::string(s.positional[0]) : std::string();
    std::transform(v.begin(), v.end(), v.begin(), ::toupper);
    if (changed_) {
      error(s.line, "'units' must come before the first change");
    } else if (v == "SI" || v == "US") {
      units_ = v == "SI" ? UnitSystem::kSI : UnitSystem::kUS;
    } else {
      error(s.line, "units needs one field: SI or US");
    }
    return;
  }
  changed_ = true;
  const int before = static_cast<int>(diagnostics_.errors().size());
  if (k == "modify") {
    modify(s);
  } else if (k == "close") {
    set_status(s, LinkStatus::kClosed);
  } else if (k == "open") {
    set_status(s, LinkStatus::kOpen);
  } else if (k == "add") {
    add(s);
  } else if (k == "remove") {
    remove(s);
  } else {
    std::string message = "unknown change '" + std::string(k) + "'";
    std::string near = nearest_word(std::string(k), kChangeKeywords);
    if (!near.empty()) message += " (did you mean '" + near + "'?)";
    error(s.line, message);
  }
  if (static_cast<int>(diagnostics_.errors().size()) == before) ++changes_;
}

void ChangeApplier::modify(const Statement& s) {
  std::size_t index = 0;
  Statement rest;
  const Target target = find(s, &index, &rest);
  if (target == Target::kNone) return;
  if (s.options.empty()) {
    error(s.line, "modify needs at least one key=value");
    return;
  }
  if (target == Target::kPipe && net_->pipes[index].is_pump()) {
    StatementOptions o(rest, {"speed", "efficiency", "status"}, file_, units_, &diagnostics_);
    Pipe& pump = net_->pipes[index];
    if (auto v = o.quantity("speed", Dimension::kDimensionless, {0.0, 3.0, false, "3"})) pump.edit_control().speed = *v;
    if (auto v = o.quantity("efficiency", Dimension::kDimensionless, {0.0, 1.0, false, "1"})) {
      pump.edit_control().efficiency = v;
    }
    if (const std::string_view* status = o.find("status")) {
      if (*status == "on" || *status == "off") {
        pump.status = *status == "on" ? LinkStatus::kOpen : LinkStatus::kClosed;
      } else {
        o.error("status must be 'on' or 'off', got '" + std::string(*status) + "'");
      }
    }
    return;
  }
  if (target == Target::kPipe) {
    StatementOptions o(rest, kPipeKeys, file_, units_, &diagnostics_);
    PipeRead p;
    p.pipe = net_->pipes[index];
    read_pipe_keys(o, &p);
    p.pipe.where = {file_name_, s.line};
    if (check_pipe(p.pipe, net_->headloss.law, true, &diagnostics_)) {
      p.pipe.where = net_->pipes[index].where;
      net_->pipes[index] = p.pipe;
    }
    return;
  }
  Node& node = net_->nodes[index];
  if (node.is_fixed_head()) {
    StatementOptions o(rest, {"head"}, file_, units_, &diagnostics_);
    if (auto h = o.quantity("head", Dimension::kLength, kElevationRange)) node.head_m = *h;
    return;
  }
  StatementOptions o(rest, kJunctionKeys, file_, units_, &diagnostics_);
  read_junction_keys(o, &node);
}

void ChangeApplier::set_status(const Statement& s, LinkStatus status) {
  std::size_t index = 0;
  Statement rest;
  const Target target = find(s, &index, &rest);
  if (target == Target::kNone) return;
  if (target != Target::kPipe || !s.options.empty()) {
    error(s.line, std::string(s.keyword) + " takes one pipe ID");
    return;
  }
  net_->pipes[index].status = status;
}

void ChangeApplier::add(const Statement& s) {
  if (s.positional.empty()) {
    error(s.line, "add needs an element: pipe, pump, node, reservoir or tank");
    return;
  }
  Statement element = s;
  element.keyword = s.positional[0];
  element.positional.erase(element.positional.begin());
  auto claim = [&](const Node& n) {
    if (net_->find_node(n.id)) {
      error(s.line, "add: node '" + n.id + "' already exists");
      return false;
    }
    return true;
  };
  if (element.keyword == "pipe" || element.keyword == "pump") {
    auto p = element.keyword == "pipe" ? read_pipe(element, context()) : read_pump(element, context());
    if (p) add_pipe_to_network(std::move(*p), PipeDefaults{}, net_, &diagnostics_);
  } else if (element.keyword == "tank") {
    if (auto n = read_tank(element, context()); n && claim(*n)) net_->add_node(std::move(*n));
  } else if (element.keyword == "node") {
    if (auto n = read_junction(element, context()); n && claim(*n)) net_->add_node(std::move(*n));
  } else if (element.keyword == "reservoir") {
    if (auto r = read_reservoir(element, context()); r && claim(r->node)) {
      if (r->pressure) r->node.head_m += r->pressure->to_head_m(net_->fluid.density_kgm3);
      net_->add_node(std::move(r->node));
    }
  } else {
    error(s.line, "add needs an element: pipe, pump, node, reservoir or tank");
  }
}

void ChangeApplier::remove(const Statement& s) {
  std::size_t index = 0;
  Statement rest;
  const Target target = find(s, &index, &rest);
  if (target == Target::kNone) return;
  if (target == Target::kPipe) {
    net_->pipes.erase(net_->pipes.begin() + static_cast<std::ptrdiff_t>(index));
    net_->reindex();
    return;
  }
  const std::string id = net_->nodes[index].id;
  for (const Pipe& p : net_->pipes) {
    if (p.from == index || p.to == index) {
      error(s.line, "remove: node '" + id + "' still has pipe '" + p.id + "'; remove it first");
      return;
    }
  }
  for (const DemandCase& c : net_->cases) {
    for (const auto& [node, flow] : c.draws_m3s) {
      if (node == index) {
        error(s.line, "remove: node '" + id + "' has a draw in case '" + c.name + "'");
        return;
      }
    }
  }
  net_->nodes.erase(net_->nodes.begin() + static_cast<std::ptrdiff_t>(index));
  for (Pipe& p : net_->pipes) {
    if (p.from > index) --p.from;
    if (p.to > index) --p.to;
  }
  for (DemandCase& c : net_->cases) {
    for (auto& draw : c.draws_m3s) {
      if (draw.first > index) --draw.first;
    }
  }
  net_->reindex();
}

ChangeResult ChangeApplier::finish(int last_line) {
  bool has_fixed_head = std::any_of(net_->nodes.begin(), net_->nodes.end(),
                                    [](const Node& n) { return n.is_fixed_head(); });
  if (!has_fixed_head && diagnostics_.empty()) {
    error(last_line, "after the changes the network has no fixed-head node");
  }
  ChangeResult r;
  r.errors = diagnostics_.errors();
  r.truncated = diagnostics_.full();
  r.title = title_;
  r.changes = changes_;
  return r;
}

}  // namespace

ChangeResult apply_change_text(std::string_view text, const std::string& file, Network* net) {
  ChangeApplier applier(file, net);
  std::vector<std::string_view> lines = split_lines(text);
  Statement s;
  for (std::size_t i = 0; i < lines.size(); ++i) {
    const int line = static_cast<int>(i) + 1;
    LexResult lexed = lex_line(lines[i], line, &s);
    if (!lexed.error.empty()) {
      applier.error(line, lexed.error);
    } else if (!lexed.empty) {
      applier.statement(s);
    }
  }
  return applier.finish(std::max<int>(1, static_cast<int>(lines.size())));
}

ChangeResult apply_change_file(const std::string& path, Network* net) {
  FileText text;
  std::string why;
  if (!read_text_file(path, &text, &why)) {
    ChangeResult r;
    r.errors.push_back(Diagnostic{path, 0, "cannot read file: " + why});
    return r;
  }
  return apply_change_text(text.view(), path, net);
}

}  // namespace gradeline
