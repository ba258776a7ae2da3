#include "io/parser.h"

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstring>
#include <deque>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "io/bulk_reader.h"
#include "io/element_reader.h"
#include "io/lexer.h"
#include "io/statement_options.h"
#include "gradeline/prefault.h"
#include "model/water.h"

namespace gradeline {
namespace {

namespace fs = std::filesystem;

const Range kTemperatureRange{kWaterMinTemperature_c, kWaterMaxTemperature_c, true, "40 C"};
const Range kViscosityRange{0.0, 1e-2, false, "0.01 m2/s"};
const Range kDensityRange{0.0, 2e4, false, "20000 kg/m3"};
const Range kHwCoefficientRange{0.0, 100.0, false, "100"};
const Range kHwExponentRange{0.0, 10.0, false, "10"};

const std::vector<std::string> kKeywords = {"title", "units",    "headloss", "fluid", "reservoir",
                                            "node",  "pipe",     "defaults", "include", "case",
                                            "limit", "tank",     "pump",     "valve"};

// Adding a node is a hash insertion, a cache miss on large networks: the slot of the node
// declared this many lines ahead is requested early.
constexpr std::size_t kNodeLookAhead = 16;

struct PendingReservoir {
  std::size_t node = 0;
  PendingPressure pressure;
};

constexpr std::size_t kNoSlot = static_cast<std::size_t>(-1);

class NetworkParser {
 public:
  // Files of at least `bulk_from_lines` lines may be read in bulk (io/bulk_reader.h).
  explicit NetworkParser(std::size_t bulk_from_lines) : bulk_from_lines_(bulk_from_lines) {}
  void parse_file(const std::string& path, int depth, const std::string& from_file,
                  int from_line);
  void parse_text(std::string_view text, const std::string& file, int depth);
  ParseResult finish();
  // The bulk read met something it does not handle: read the input again line by line.
  bool needs_line_by_line() const { return fall_back_; }

 private:
  void read_lines(const std::vector<std::string_view>& lines, const std::string& file, int depth);
  void read_placed(const std::vector<std::string_view>& lines, const LineKinds& kinds,
                   const std::string& file);
  void statement(const Statement& s, const std::string& file, int depth);
  void units(const Statement& s, const std::string& file);
  void headloss(const Statement& s, const std::string& file);
  void fluid(const Statement& s, const std::string& file);
  void defaults(const Statement& s, const std::string& file);
  void reservoir(const Statement& s, const std::string& file);
  void node(const Statement& s, const std::string& file);
  void pipe(const Statement& s, const std::string& file);
  void include(const Statement& s, const std::string& file, int depth);
  ReadContext context(const std::string& file) {
    return {file, file_names_.back(), net_.units, &diagnostics_};
  }
  bool add_node(Node n, std::size_t* index);
  // A hint only: the ID of a node statement on `line`, looked for without a full lex.
  void prefetch_node_slot(std::string_view line) const {
    const std::string_view word = take_word(&line);
    if (word == "node" || word == "reservoir" || word == "tank") {
      const std::string_view id = take_word(&line);
      if (!id.empty()) net_.prefetch_node(id);
    }
  }
  void error(const std::string& file, int line, std::string message) {
    diagnostics_.error(file, line, std::move(message));
  }

  Diagnostics diagnostics_;
  Network net_;
  // Links are placed in net_.pipes as read, with what they leave to settle in ends_ (the IDs
  // view texts_, kept until finish()); they join the ID lookup there, in file order.
  // While elements are placed (a bulk read), a link goes to the slot of its line.
  void stage(std::optional<PipeRead>&& p, const Statement& s) {
    if (!p) return;
    if (placing_ && place_link_ == kNoSlot) {
      fall_back_ = true;
      return;
    }
    PipeEnds& ends = placing_ ? ends_[place_link_] : ends_.emplace_back();
    ends = ends_of(*p);
    ends.from_id = s.positional[1];  // the same IDs, viewed in the text
    ends.to_id = s.positional[2];
    if (placing_) {
      net_.pipes[place_link_] = std::move(p->pipe);
      place_link_ = kNoSlot;
    } else {
      net_.pipes.push_back(std::move(p->pipe));
    }
  }
  std::vector<PipeEnds> ends_;
  std::deque<FileText> texts_;
  std::vector<PendingReservoir> pending_reservoirs_;
  std::vector<CaseRead> cases_;
  std::vector<LimitRead> limits_;
  std::vector<std::string> include_stack_;
  std::vector<InternedString> file_names_;  // of the files being read
  bool units_locked_ = false;
  bool seen_units_ = false;
  PipeDefaults defaults_;
  std::optional<double> fluid_density_;
  std::optional<double> fluid_viscosity_;
  std::string last_file_;
  int last_line_ = 1;
  // Bulk reading: elements are placed in the slots of their lines, not appended.
  std::size_t bulk_from_lines_;
  bool placing_ = false;
  std::size_t place_node_ = kNoSlot;  // the slot of the node-like line being read
  std::size_t place_link_ = kNoSlot;
  bool fall_back_ = false;
  bool bulk_read_ = false;
};

void NetworkParser::parse_file(const std::string& path, int depth, const std::string& from_file,
                               int from_line) {
  std::error_code ec;
  fs::path canonical = fs::weakly_canonical(fs::path(path), ec);
  std::string key = ec ? path : canonical.string();
  if (std::find(include_stack_.begin(), include_stack_.end(), key) != include_stack_.end()) {
    error(from_file, from_line, "include cycle: '" + path + "' is already being read");
    return;
  }
  std::string why;
  FileText& text = texts_.emplace_back();
  if (!read_text_file(path, &text, &why)) {
    if (from_file.empty()) {
      error(path, 0, "cannot read file: " + why);
    } else {
      error(from_file, from_line, "cannot read '" + path + "': " + why);
    }
    return;
  }
  include_stack_.push_back(key);
  parse_text(text.view(), path, depth);
  include_stack_.pop_back();
}

void NetworkParser::parse_text(std::string_view text, const std::string& file, int depth) {
  const std::vector<std::string_view> lines = split_lines(text);
  const LineKinds kinds = classify_lines(lines);
  if (depth == 0) {
    // Room for the elements this file declares, counted by first word (includes may add more).
    net_.reserve(kinds.node_lines, kinds.link_lines);
    ends_.reserve(kinds.link_lines);
    last_file_ = file;
    last_line_ = std::max<int>(1, static_cast<int>(lines.size()));
  }
  file_names_.push_back(intern(file));
  if (depth == 0 && lines.size() >= bulk_from_lines_ && kinds.includes == 0) {
    read_placed(lines, kinds, file);
  } else {
    read_lines(lines, file, depth);
  }
  file_names_.pop_back();
}

void NetworkParser::read_lines(const std::vector<std::string_view>& lines,
                               const std::string& file, int depth) {
  Statement s;
  for (std::size_t i = 0; i < lines.size() && !diagnostics_.full(); ++i) {
    if (i + kNodeLookAhead < lines.size()) prefetch_node_slot(lines[i + kNodeLookAhead]);
    const int line = static_cast<int>(i) + 1;
    LexResult lexed = lex_line(lines[i], line, &s);
    if (!lexed.error.empty()) {
      error(file, line, lexed.error);
      continue;
    }
    if (!lexed.empty) statement(s, file, depth);
  }
}

// Every element goes to the slot of its line. The lines before the first node or pipe
// statement are read first (they may set the units), then every node and pipe line in bulk,
// then the rest in file order, with each node joining the ID lookup in turn. Anything out of the
// ordinary (an error above all) sets fall_back_, and the caller reads the input line by line.
void NetworkParser::read_placed(const std::vector<std::string_view>& lines,
                                const LineKinds& kinds, const std::string& file) {
  placing_ = true;
  bulk_read_ = true;
  std::vector<Node>& nodes = net_.nodes;
  // Reserved by parse_text: the pages are mapped in one go before the slots are written.
  prefault_capacity(nodes);
  prefault_capacity(net_.pipes);
  prefault_capacity(ends_);
  // The slots are default-constructed, the nodes beside the links (one core each: filling
  // mapped pages computes little, but the two vectors share nothing).
#pragma omp parallel sections num_threads(2) if (kinds.link_lines >= kBulkReadFromLines)
  {
#pragma omp section
    nodes.resize(kinds.node_lines);
#pragma omp section
    {
      net_.pipes.resize(kinds.link_lines);
      ends_.resize(kinds.link_lines);
    }
  }
  const std::vector<LineKind>& kind = kinds.kinds;
  const std::size_t first = static_cast<std::size_t>(
      std::find_if(kind.begin(), kind.end(),
                   [](LineKind k) { return k == LineKind::kNode || k == LineKind::kPipe; }) -
      kind.begin());
  // The `node` lines join the ID lookup in file order, on one core while the others read the
  // pipe lines; reservoirs and tanks join it below, as they are read. A duplicate ID makes the
  // bulk read fail: its error comes from the reading line by line.
  auto index_nodes = [&] {
    std::size_t slot = 0;
    for (std::size_t i = 0; i < kind.size(); ++i) {
      if (kind[i] == LineKind::kNode) {
        if (slot + kNodeLookAhead < nodes.size()) {
          net_.prefetch_node(nodes[slot + kNodeLookAhead].id);
        }
        if (!net_.try_index_node(slot)) return false;
      }
      slot += kind[i] == LineKind::kNode || kind[i] == LineKind::kNodeOther;
    }
    return true;
  };
  std::size_t next_node = 0, next_link = 0;
  Statement s;
  for (std::size_t i = 0; i < lines.size(); ++i) {
    if (i == first && !read_in_bulk(lines, kinds, first, file, net_.units, &nodes, &net_.pipes,
                                    &ends_, index_nodes)) {
      fall_back_ = true;
      return;
    }
    const LineKind k = kind[i];
    if (k == LineKind::kNode || k == LineKind::kPipe) units_locked_ = true;  // as node() and pipe()
    if (k == LineKind::kNode) {
      ++next_node;
      continue;
    }
    if (k == LineKind::kPipe) {
      ++next_link;
      continue;
    }
    place_node_ = k == LineKind::kNodeOther ? next_node++ : kNoSlot;
    place_link_ = k == LineKind::kLinkOther ? next_link++ : kNoSlot;
    const LexResult lexed = lex_line(lines[i], static_cast<int>(i) + 1, &s);
    if (!lexed.error.empty()) fall_back_ = true;
    if (!lexed.empty && !fall_back_) statement(s, file, 0);
    // A slot left empty, or an element without one, is as much out of the ordinary as an error.
    if (place_node_ != kNoSlot || place_link_ != kNoSlot || !diagnostics_.empty()) {
      fall_back_ = true;
    }
    if (fall_back_) return;
  }
  placing_ = false;
}

void NetworkParser::statement(const Statement& s, const std::string& file, int depth) {
  const std::string_view k = s.keyword;
  // The two statements of nearly every line first.
  if (k == "pipe") {
    pipe(s, file);
  } else if (k == "node") {
    node(s, file);
  } else if (k == "title") {
    net_.title = s.rest;
  } else if (k == "units") {
    units(s, file);
  } else if (k == "headloss") {
    headloss(s, file);
  } else if (k == "fluid") {
    fluid(s, file);
  } else if (k == "defaults") {
    defaults(s, file);
  } else if (k == "reservoir") {
    reservoir(s, file);
  } else if (k == "include") {
    include(s, file, depth);
  } else if (k == "tank") {
    units_locked_ = true;
    std::optional<Node> n = read_tank(s, context(file));
    std::size_t index = 0;
    if (n) add_node(std::move(*n), &index);
  } else if (k == "valve") {
    units_locked_ = true;
    stage(read_valve(s, context(file)), s);
  } else if (k == "pump") {
    units_locked_ = true;
    stage(read_pump(s, context(file)), s);
  } else if (k == "case") {
    units_locked_ = true;
    if (auto c = read_case(s, context(file))) cases_.push_back(std::move(*c));
  } else if (k == "limit") {
    units_locked_ = true;
    if (auto l = read_limit(s, context(file))) limits_.push_back(std::move(*l));
  } else {
    std::string message = "unknown statement '" + std::string(k) + "'";
    std::string near = nearest_word(std::string(k), kKeywords);
    if (!near.empty()) message += " (did you mean '" + near + "'?)";
    error(file, s.line, message);
  }
}

void NetworkParser::units(const Statement& s, const std::string& file) {
  StatementOptions o(s, {}, file, net_.units, &diagnostics_);
  if (s.positional.size() != 1) {
    o.error("units needs one field: SI or US");
    return;
  }
  std::string v(s.positional[0]);
  std::transform(v.begin(), v.end(), v.begin(), ::toupper);
  if (units_locked_) {
    o.error("'units' must come before the first value with a unit default");
  } else if (seen_units_) {
    o.error("'units' given twice");
  } else if (v == "SI") {
    net_.units = UnitSystem::kSI;
  } else if (v == "US") {
    net_.units = UnitSystem::kUS;
  } else {
    o.error("unknown unit system '" + std::string(s.positional[0]) + "' (expected SI or US)");
  }
  seen_units_ = true;
}

void NetworkParser::headloss(const Statement& s, const std::string& file) {
  StatementOptions o(s, {"coefficient", "flow_exponent", "diameter_exponent"}, file, net_.units,
                     &diagnostics_);
  if (s.positional.size() != 1) {
    o.error("headloss needs one field: darcy-weisbach or hazen-williams");
    return;
  }
  const std::string law(s.positional[0]);
  if (law == "darcy-weisbach") {
    net_.headloss.law = HeadlossLaw::kDarcyWeisbach;
    if (!s.options.empty()) o.error("darcy-weisbach takes no options");
    return;
  }
  if (law != "hazen-williams") {
    o.error("unknown head-loss law '" + law + "' (expected darcy-weisbach or hazen-williams)");
    return;
  }
  net_.headloss.law = HeadlossLaw::kHazenWilliams;
  if (auto v = o.quantity("coefficient", Dimension::kDimensionless, kHwCoefficientRange))
    net_.headloss.hw_coefficient = *v;
  if (auto v = o.quantity("flow_exponent", Dimension::kDimensionless, kHwExponentRange))
    net_.headloss.hw_flow_exponent = *v;
  if (auto v = o.quantity("diameter_exponent", Dimension::kDimensionless, kHwExponentRange))
    net_.headloss.hw_diameter_exponent = *v;
}

void NetworkParser::fluid(const Statement& s, const std::string& file) {
  units_locked_ = true;
  StatementOptions o(s, {"temperature", "viscosity", "density"}, file, net_.units, &diagnostics_);
  if (s.positional.size() > 1 || (s.positional.size() == 1 && s.positional[0] != "water")) {
    o.error("fluid takes 'water' or no field before its keys");
    return;
  }
  if (o.has("temperature")) {
    if (auto t = o.quantity("temperature", Dimension::kTemperature, kTemperatureRange)) {
      net_.fluid.temperature_c = *t;
    }
  } else if (!o.has("viscosity") && !o.has("density")) {
    o.error("fluid needs temperature=, or viscosity= and density=");
  }
  if (auto v = o.quantity("viscosity", Dimension::kViscosity, kViscosityRange)) fluid_viscosity_ = v;
  if (auto v = o.quantity("density", Dimension::kDensity, kDensityRange)) fluid_density_ = v;
}

void NetworkParser::defaults(const Statement& s, const std::string& file) {
  units_locked_ = true;
  StatementOptions o(s, {"roughness", "cfactor", "minor"}, file, net_.units, &diagnostics_);
  if (!s.positional.empty()) o.error("defaults takes only key=value pairs");
  if (auto v = o.quantity("roughness", Dimension::kRoughness, kRoughnessRange))
    defaults_.roughness_m = v;
  if (auto v = o.quantity("cfactor", Dimension::kDimensionless, kCfactorRange)) defaults_.cfactor = v;
  if (auto v = o.quantity("minor", Dimension::kDimensionless, kMinorRange)) defaults_.minor_k = v;
}

bool NetworkParser::add_node(Node n, std::size_t* index) {
  if (placing_) {
    if (place_node_ == kNoSlot) {
      fall_back_ = true;
      return false;
    }
    net_.nodes[place_node_] = std::move(n);
    *index = place_node_;
    place_node_ = kNoSlot;
    if (!net_.try_index_node(*index)) fall_back_ = true;
    return !fall_back_;
  }
  if (auto added = net_.try_add_node(std::move(n))) {  // n is left as it was when refused
    *index = *added;
    return true;
  }
  const SourceLocation& first = net_.nodes[*net_.find_node(n.id)].where;
  error(n.where.file(), n.where.line,
        "duplicate node ID '" + n.id + "' (first defined at " + first.file() + ":" +
            std::to_string(first.line) + ")");
  return false;
}

void NetworkParser::reservoir(const Statement& s, const std::string& file) {
  units_locked_ = true;
  std::optional<ReservoirRead> r = read_reservoir(s, context(file));
  std::size_t index = 0;
  if (!r || !add_node(std::move(r->node), &index)) return;
  if (r->pressure) pending_reservoirs_.push_back({index, *r->pressure});
}

void NetworkParser::node(const Statement& s, const std::string& file) {
  units_locked_ = true;
  std::optional<Node> n = read_junction(s, context(file));
  std::size_t index = 0;
  if (n) add_node(std::move(*n), &index);
}

void NetworkParser::pipe(const Statement& s, const std::string& file) {
  units_locked_ = true;
  stage(read_pipe(s, context(file)), s);
}

void NetworkParser::include(const Statement& s, const std::string& file, int depth) {
  if (s.positional.size() != 1 || !s.options.empty()) {
    error(file, s.line, "include needs one file name");
    return;
  }
  if (depth + 1 >= kMaxIncludeDepth) {
    error(file, s.line,
          "includes nested deeper than " + std::to_string(kMaxIncludeDepth) + " levels");
    return;
  }
  fs::path target = fs::path(file).parent_path() / s.positional[0];
  parse_file(target.lexically_normal().string(), depth + 1, file, s.line);
}

ParseResult NetworkParser::finish() {
  // Fluid properties first: a reservoir given by pressure needs the density.
  Fluid& fluid = net_.fluid;
  const double t = fluid.temperature_c.value_or(15.0);
  fluid.density_kgm3 = fluid_density_.value_or(water_density_kgm3(t));
  fluid.kinematic_viscosity_m2s = fluid_viscosity_.value_or(water_kinematic_viscosity_m2s(t));
  if (fluid_density_ || fluid_viscosity_) fluid.temperature_c.reset();
  if (fluid_density_ && !fluid_viscosity_ && !fluid.temperature_c) {
    error(last_file_, last_line_, "fluid: density= needs viscosity= or temperature=");
  }
  for (const PendingReservoir& r : pending_reservoirs_) {
    Node& n = net_.nodes[r.node];
    n.head_m = n.elevation_m + r.pressure.to_head_m(fluid.density_kgm3);
  }

  // Resolving the end nodes is a hash lookup each, mostly cache misses on large networks, so
  // the slots a few links ahead are requested early. A link that cannot join (an unknown end,
  // a duplicate ID) is dropped and the later ones move up.
  // In two stages: the slots 32 links ahead, then, 16 ahead, the nodes those slots point to
  // (only for IDs too long to be kept in the slot).
  constexpr std::size_t kAhead = 16;
  std::vector<Pipe>& pipes = net_.pipes;
  std::size_t kept = 0;
  if (bulk_read_) {
    // Read in bulk, settled in bulk; any error reads the file again line by line.
    if (!settle_in_bulk(ends_, defaults_, &net_)) {
      fall_back_ = true;
      return {};
    }
    kept = pipes.size();
  }
  for (std::size_t k = kept; k < pipes.size(); ++k) {
    if (diagnostics_.full()) break;
    if (k + 2 * kAhead < pipes.size()) {
      net_.prefetch_node(ends_[k + 2 * kAhead].from_id);
      net_.prefetch_node(ends_[k + 2 * kAhead].to_id);
      net_.prefetch_pipe(pipes[k + 2 * kAhead].id);
    }
    if (k + kAhead < pipes.size()) {
      net_.prefetch_node_element(ends_[k + kAhead].from_id);
      net_.prefetch_node_element(ends_[k + kAhead].to_id);
    }
    bool valid = true;
    if (!settle_pipe(&pipes[k], ends_[k], defaults_, net_, &diagnostics_, &valid)) continue;
    if (kept != k) pipes[kept] = std::move(pipes[k]);
    if (!net_.try_index_pipe(kept)) {
      duplicate_pipe_error(pipes[kept], net_, &diagnostics_);
      continue;
    }
    ++kept;
  }
  pipes.resize(kept);
  for (std::size_t i = 0; i < cases_.size(); ++i) {
    CaseRead& c = cases_[i];
    const DemandCase& dc = c.demand_case;
    auto same = std::find_if(cases_.begin(), cases_.begin() + static_cast<std::ptrdiff_t>(i),
                             [&](const CaseRead& x) { return x.demand_case.name == dc.name; });
    if (same != cases_.begin() + static_cast<std::ptrdiff_t>(i)) {
      const SourceLocation& first = same->demand_case.where;
      error(dc.where.file(), dc.where.line,
            "duplicate case '" + dc.name + "' (first defined at " + first.file() + ":" +
                std::to_string(first.line) + ")");
      continue;
    }
    if (resolve_case(&c, net_, &diagnostics_)) net_.cases.push_back(std::move(c.demand_case));
  }
  for (const LimitRead& l : limits_) apply_limit(l, &net_, &diagnostics_);

  bool has_fixed_head = std::any_of(net_.nodes.begin(), net_.nodes.end(),
                                    [](const Node& n) { return n.is_fixed_head(); });
  if (!has_fixed_head && diagnostics_.empty()) {
    error(last_file_, last_line_, "the network has no fixed-head node: add a reservoir");
  }
  ParseResult result;
  result.bulk_read = bulk_read_;
  result.truncated = diagnostics_.full();
  result.errors = diagnostics_.errors();
  result.network = std::move(net_);
  return result;
}

}  // namespace

bool read_text_file(const std::string& path, FileText* text, std::string* error) {
  std::error_code ec;
  if (fs::is_directory(path, ec)) {
    *error = "is a directory";
    return false;
  }
  std::ifstream in(path, std::ios::binary);
  if (!in) {
    *error = std::strerror(errno);
    return false;
  }
  const auto size = fs::file_size(path, ec);
  if (!ec && static_cast<long long>(size) > kMaxFileBytes) {
    *error = "file is larger than 1 GiB (" + std::to_string(size >> 20) + " MiB)";
    return false;
  }
  if (!ec) {
    // One read into a buffer of the file's size, its pages mapped in one go.
    const std::size_t n = static_cast<std::size_t>(size);
    text->data_.reset(new char[n == 0 ? 1 : n]);
    prefault(text->data_.get(), n);
    in.read(text->data_.get(), static_cast<std::streamsize>(n));
    text->size_ = static_cast<std::size_t>(in.gcount());
    // Done unless the file grew while being read (one that shrank gives what was there).
    if (text->size_ < n || in.peek() == std::ifstream::traits_type::eof()) return true;
  }
  // A file whose size is not known in advance (a pipe), or that grew: the rest in chunks.
  std::string rest(text->data_ ? text->data_.get() : "", text->size_);
  char chunk[1 << 16];
  while (in.read(chunk, sizeof chunk) || in.gcount() > 0) {
    rest.append(chunk, static_cast<std::size_t>(in.gcount()));
    if (static_cast<long long>(rest.size()) > kMaxFileBytes) {
      *error = "file is larger than 1 GiB";
      return false;
    }
  }
  text->data_.reset(new char[rest.size() == 0 ? 1 : rest.size()]);
  std::memcpy(text->data_.get(), rest.data(), rest.size());
  text->size_ = rest.size();
  return true;
}

ParseResult parse_network_file(const std::string& path) {
  {
    NetworkParser bulk(kBulkReadFromLines);
    bulk.parse_file(path, 0, "", 0);
    if (!bulk.needs_line_by_line()) {
      ParseResult result = bulk.finish();
      if (!bulk.needs_line_by_line()) return result;
    }
  }
  NetworkParser parser(kNoSlot);
  parser.parse_file(path, 0, "", 0);
  return parser.finish();
}

ParseResult parse_network_text(std::string_view text, const std::string& file_name,
                               std::size_t bulk_from_lines) {
  {
    NetworkParser bulk(bulk_from_lines);
    bulk.parse_text(text, file_name, 0);
    if (!bulk.needs_line_by_line()) {
      ParseResult result = bulk.finish();
      if (!bulk.needs_line_by_line()) return result;
    }
  }
  NetworkParser parser(kNoSlot);
  parser.parse_text(text, file_name, 0);
  return parser.finish();
}

}  // namespace gradeline
