#include "io/parser.h"

#include <algorithm>
#include <cerrno>
#include <cmath>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "io/lexer.h"
#include "io/statement_options.h"
#include "model/water.h"

namespace gradeline {
namespace {

namespace fs = std::filesystem;

// Bounds that no real water main reaches; a value outside is a typing or unit error.
const Range kLengthRange{0.0, 1e6, false, "1000 km"};
const Range kDiameterRange{0.0, 20.0, false, "20 m"};
const Range kRoughnessRange{0.0, 1.0, true, "1 m"};
const Range kElevationRange{-1e4, 1e4, true, "10000 m"};
const Range kDemandRange{-100.0, 100.0, true, "100 m3/s"};
const Range kMinorRange{0.0, 1e5, true, "100000"};
const Range kCfactorRange{0.0, 300.0, false, "300"};
const Range kTemperatureRange{kWaterMinTemperature_c, kWaterMaxTemperature_c, true, "40 C"};
const Range kViscosityRange{0.0, 1e-2, false, "0.01 m2/s"};
const Range kDensityRange{0.0, 2e4, false, "20000 kg/m3"};
const Range kPressureRange{-1e5, 1e8, true, "100 MPa"};
const Range kHwCoefficientRange{0.0, 100.0, false, "100"};
const Range kHwExponentRange{0.0, 10.0, false, "10"};

const std::vector<std::string> kKeywords = {"title", "units", "headloss", "fluid",   "reservoir",
                                            "node",  "pipe",  "defaults", "include"};

struct PendingPipe {
  Pipe pipe;
  bool roughness_given = false;  // given, even if its value was refused
  bool cfactor_given = false;
  std::string from_id;
  std::string to_id;
};

struct PendingReservoir {
  std::size_t node = 0;
  double pressure = 0.0;
  bool is_head = false;
};

class NetworkParser {
 public:
  void parse_file(const std::string& path, int depth, const std::string& from_file,
                  int from_line);
  void parse_text(std::string_view text, const std::string& file, int depth);
  ParseResult finish();

 private:
  void statement(const Statement& s, const std::string& file, int depth);
  void units(const Statement& s, const std::string& file);
  void headloss(const Statement& s, const std::string& file);
  void fluid(const Statement& s, const std::string& file);
  void defaults(const Statement& s, const std::string& file);
  void reservoir(const Statement& s, const std::string& file);
  void node(const Statement& s, const std::string& file);
  void pipe(const Statement& s, const std::string& file);
  void include(const Statement& s, const std::string& file, int depth);
  bool element_id(const Statement& s, const std::string& file, std::size_t count,
                  const char* shape);
  std::optional<Point> coordinates(StatementOptions& o);
  bool claim_node_id(const std::string& id, const SourceLocation& where);
  void error(const std::string& file, int line, std::string message) {
    diagnostics_.error(file, line, std::move(message));
  }

  Diagnostics diagnostics_;
  Network net_;
  std::vector<PendingPipe> pipes_;
  std::vector<PendingReservoir> pending_reservoirs_;
  std::vector<std::string> include_stack_;
  bool units_locked_ = false;
  bool seen_units_ = false;
  std::optional<double> default_roughness_m_;
  std::optional<double> default_cfactor_;
  std::optional<double> default_minor_;
  std::optional<double> fluid_density_;
  std::optional<double> fluid_viscosity_;
  std::string last_file_;
  int last_line_ = 1;
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
  std::string text, why;
  if (!read_text_file(path, &text, &why)) {
    if (from_file.empty()) {
      error(path, 0, "cannot read file: " + why);
    } else {
      error(from_file, from_line, "cannot read '" + path + "': " + why);
    }
    return;
  }
  include_stack_.push_back(key);
  parse_text(text, path, depth);
  include_stack_.pop_back();
}

void NetworkParser::parse_text(std::string_view text, const std::string& file, int depth) {
  std::vector<std::string_view> lines = split_lines(text);
  if (depth == 0) {
    last_file_ = file;
    last_line_ = std::max<int>(1, static_cast<int>(lines.size()));
  }
  Statement s;
  for (std::size_t i = 0; i < lines.size() && !diagnostics_.full(); ++i) {
    const int line = static_cast<int>(i) + 1;
    LexResult lexed = lex_line(lines[i], line, &s);
    if (!lexed.error.empty()) {
      error(file, line, lexed.error);
      continue;
    }
    if (!lexed.empty) statement(s, file, depth);
  }
}

void NetworkParser::statement(const Statement& s, const std::string& file, int depth) {
  const std::string& k = s.keyword;
  if (k == "title") {
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
  } else if (k == "node") {
    node(s, file);
  } else if (k == "pipe") {
    pipe(s, file);
  } else if (k == "include") {
    include(s, file, depth);
  } else {
    std::string message = "unknown statement '" + k + "'";
    std::string near = nearest_word(k, kKeywords);
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
  std::string v = s.positional[0];
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
    o.error("unknown unit system '" + s.positional[0] + "' (expected SI or US)");
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
  const std::string& law = s.positional[0];
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
    default_roughness_m_ = v;
  if (auto v = o.quantity("cfactor", Dimension::kDimensionless, kCfactorRange)) default_cfactor_ = v;
  if (auto v = o.quantity("minor", Dimension::kDimensionless, kMinorRange)) default_minor_ = v;
}

bool NetworkParser::element_id(const Statement& s, const std::string& file, std::size_t count,
                               const char* shape) {
  if (s.positional.size() < count) {
    error(file, s.line, s.keyword + " needs " + shape);
    return false;
  }
  if (s.positional.size() > count) {
    error(file, s.line, "too many fields for " + s.keyword + ": '" + s.positional[count] + "'");
    return false;
  }
  for (const std::string& id : s.positional) {
    if (!is_valid_id(id)) {
      error(file, s.line,
            "invalid ID '" + id + "': an ID has 1 to 64 characters and no space, '#', '=' or ','");
      return false;
    }
  }
  return true;
}

std::optional<Point> NetworkParser::coordinates(StatementOptions& o) {
  const std::string* at = o.find("at");
  if (at == nullptr) return std::nullopt;
  std::size_t comma = at->find(',');
  Point p;
  if (comma == std::string::npos || !parse_number(at->substr(0, comma), &p.x) ||
      !parse_number(at->substr(comma + 1), &p.y)) {
    o.error("at must be X,Y with two numbers, got '" + *at + "'");
    return std::nullopt;
  }
  return p;
}

bool NetworkParser::claim_node_id(const std::string& id, const SourceLocation& where) {
  if (auto existing = net_.find_node(id)) {
    const SourceLocation& first = net_.nodes[*existing].where;
    error(where.file, where.line,
          "duplicate node ID '" + id + "' (first defined at " + first.file + ":" +
              std::to_string(first.line) + ")");
    return false;
  }
  return true;
}

void NetworkParser::reservoir(const Statement& s, const std::string& file) {
  units_locked_ = true;
  StatementOptions o(s, {"head", "elevation", "pressure", "at"}, file, net_.units, &diagnostics_);
  if (!element_id(s, file, 1, "an ID")) return;
  Node n;
  n.id = s.positional[0];
  n.kind = NodeKind::kReservoir;
  n.where = {file, s.line};
  n.at = coordinates(o);
  std::optional<double> head = o.quantity("head", Dimension::kLength, kElevationRange);
  std::optional<double> elevation = o.quantity("elevation", Dimension::kLength, kElevationRange);
  std::optional<Quantity> pressure;
  if (o.has("pressure")) {
    pressure = o.raw_quantity("pressure", Dimension::kPressure);
    if (o.has("head")) o.error("reservoir '" + n.id + "': give head= or pressure=, not both");
    if (!o.has("elevation")) o.error("reservoir '" + n.id + "': pressure= needs elevation=");
  } else if (!o.has("head")) {
    o.error("reservoir '" + n.id + "': missing required key 'head'");
  }
  if (!claim_node_id(n.id, n.where)) return;
  if (head) n.head_m = *head;
  n.elevation_m = elevation.value_or(head.value_or(0.0));
  std::size_t index = net_.add_node(n);
  if (pressure && elevation) {
    pending_reservoirs_.push_back({index, pressure->value, pressure->is_head});
  }
}

void NetworkParser::node(const Statement& s, const std::string& file) {
  units_locked_ = true;
  StatementOptions o(s, {"elevation", "demand", "at"}, file, net_.units, &diagnostics_);
  if (!element_id(s, file, 1, "an ID")) return;
  Node n;
  n.id = s.positional[0];
  n.where = {file, s.line};
  n.at = coordinates(o);
  if (!o.has("elevation")) o.error("node '" + n.id + "': missing required key 'elevation'");
  if (auto z = o.quantity("elevation", Dimension::kLength, kElevationRange)) n.elevation_m = *z;
  if (auto q = o.quantity("demand", Dimension::kFlow, kDemandRange)) n.demand_m3s = *q;
  if (claim_node_id(n.id, n.where)) net_.add_node(n);
}

void NetworkParser::pipe(const Statement& s, const std::string& file) {
  units_locked_ = true;
  StatementOptions o(s,
                     {"length", "diameter", "roughness", "cfactor", "minor", "status", "check"},
                     file, net_.units, &diagnostics_);
  if (!element_id(s, file, 3, "ID FROM TO")) return;
  PendingPipe p;
  p.pipe.id = s.positional[0];
  p.from_id = s.positional[1];
  p.to_id = s.positional[2];
  p.pipe.where = {file, s.line};
  for (const char* key : {"length", "diameter"}) {
    if (!o.has(key)) o.error("pipe '" + p.pipe.id + "': missing required key '" + key + "'");
  }
  if (auto v = o.quantity("length", Dimension::kLength, kLengthRange)) p.pipe.length_m = *v;
  if (auto v = o.quantity("diameter", Dimension::kDiameter, kDiameterRange)) p.pipe.diameter_m = *v;
  p.roughness_given = o.has("roughness");
  p.cfactor_given = o.has("cfactor");
  p.pipe.roughness_m = o.quantity("roughness", Dimension::kRoughness, kRoughnessRange);
  p.pipe.cfactor = o.quantity("cfactor", Dimension::kDimensionless, kCfactorRange);
  if (auto v = o.quantity("minor", Dimension::kDimensionless, kMinorRange)) p.pipe.minor_k = *v;
  if (const std::string* status = o.find("status")) {
    if (*status == "open") {
      p.pipe.status = LinkStatus::kOpen;
    } else if (*status == "closed") {
      p.pipe.status = LinkStatus::kClosed;
    } else {
      o.error("status must be 'open' or 'closed', got '" + *status + "'");
    }
  }
  if (const std::string* check = o.find("check")) {
    if (*check == "yes" || *check == "no") {
      p.pipe.check_valve = *check == "yes";
    } else {
      o.error("check must be 'yes' or 'no', got '" + *check + "'");
    }
  }
  if (p.from_id == p.to_id) {
    o.error("pipe '" + p.pipe.id + "' connects node '" + p.from_id + "' to itself");
  }
  pipes_.push_back(std::move(p));
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
    const double head = r.is_head ? r.pressure : r.pressure / (fluid.density_kgm3 * kGravity_ms2);
    n.head_m = n.elevation_m + head;
  }

  net_.pipes.reserve(pipes_.size());
  for (PendingPipe& p : pipes_) {
    if (diagnostics_.full()) break;
    const SourceLocation& w = p.pipe.where;
    if (auto existing = net_.find_pipe(p.pipe.id)) {
      const SourceLocation& first = net_.pipes[*existing].where;
      error(w.file, w.line,
            "duplicate pipe ID '" + p.pipe.id + "' (first defined at " + first.file + ":" +
                std::to_string(first.line) + ")");
      continue;
    }
    bool ends_ok = true;
    for (const std::string* end : {&p.from_id, &p.to_id}) {
      if (!net_.find_node(*end)) {
        std::string message = "pipe '" + p.pipe.id + "' refers to unknown node '" + *end + "'";
        error(w.file, w.line, message);
        ends_ok = false;
      }
    }
    if (!ends_ok) continue;
    p.pipe.from = *net_.find_node(p.from_id);
    p.pipe.to = *net_.find_node(p.to_id);
    if (!p.roughness_given) p.pipe.roughness_m = default_roughness_m_;
    if (!p.cfactor_given) p.pipe.cfactor = default_cfactor_;
    if (p.pipe.minor_k == 0.0 && default_minor_) p.pipe.minor_k = *default_minor_;
    if (net_.headloss.law == HeadlossLaw::kDarcyWeisbach && !p.pipe.roughness_m &&
        !p.roughness_given) {
      error(w.file, w.line,
            "pipe '" + p.pipe.id +
                "': missing roughness (darcy-weisbach needs roughness= or 'defaults roughness=')");
    }
    if (net_.headloss.law == HeadlossLaw::kHazenWilliams && !p.pipe.cfactor &&
        !p.cfactor_given) {
      error(w.file, w.line,
            "pipe '" + p.pipe.id +
                "': missing cfactor (hazen-williams needs cfactor= or 'defaults cfactor=')");
    }
    if (p.pipe.roughness_m && p.pipe.diameter_m > 0.0 &&
        *p.pipe.roughness_m >= 0.5 * p.pipe.diameter_m) {
      std::ostringstream m;
      m << "pipe '" << p.pipe.id << "': roughness " << *p.pipe.roughness_m * 1e3
        << " mm is not smaller than the pipe radius " << p.pipe.diameter_m * 500.0 << " mm";
      error(w.file, w.line, m.str());
    }
    net_.add_pipe(std::move(p.pipe));
  }

  bool has_fixed_head = std::any_of(net_.nodes.begin(), net_.nodes.end(),
                                    [](const Node& n) { return n.is_fixed_head(); });
  if (!has_fixed_head && diagnostics_.empty()) {
    error(last_file_, last_line_, "the network has no fixed-head node: add a reservoir");
  }
  ParseResult result;
  result.truncated = diagnostics_.full();
  result.errors = diagnostics_.errors();
  result.network = std::move(net_);
  return result;
}

}  // namespace

bool read_text_file(const std::string& path, std::string* text, std::string* error) {
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
  std::ostringstream buffer;
  buffer << in.rdbuf();
  *text = buffer.str();
  return true;
}

ParseResult parse_network_file(const std::string& path) {
  NetworkParser parser;
  parser.parse_file(path, 0, "", 0);
  return parser.finish();
}

ParseResult parse_network_text(std::string_view text, const std::string& file_name) {
  NetworkParser parser;
  parser.parse_text(text, file_name, 0);
  return parser.finish();
}

}  // namespace gradeline
