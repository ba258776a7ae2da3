#include "io/element_reader.h"

#include <algorithm>
#include <cmath>
#include <sstream>

namespace gradeline {

const Range kLengthRange{0.0, 1e6, false, "1000 km"};
const Range kDiameterRange{0.0, 20.0, false, "20 m"};
const Range kRoughnessRange{0.0, 1.0, true, "1 m"};
const Range kElevationRange{-1e4, 1e4, true, "10000 m"};
const Range kDemandRange{-100.0, 100.0, true, "100 m3/s"};
const Range kMinorRange{0.0, 1e5, true, "100000"};
const Range kCfactorRange{0.0, 300.0, false, "300"};
const Range kFactorRange{0.0, 100.0, true, "100"};
const Range kVelocityRange{0.0, 100.0, false, "100 m/s"};

namespace {

std::optional<Point> coordinates(StatementOptions& o) {
  const std::string_view* at = o.find("at");
  if (at == nullptr) return std::nullopt;
  std::size_t comma = at->find(',');
  Point p;
  if (comma == std::string::npos || !parse_number(at->substr(0, comma), &p.x) ||
      !parse_number(at->substr(comma + 1), &p.y)) {
    o.error("at must be X,Y with two numbers, got '" + std::string(*at) + "'");
    return std::nullopt;
  }
  return p;
}

void error(Diagnostics* d, const SourceLocation& w, std::string message) {
  d->error(w.file(), w.line, std::move(message));
}

}  // namespace

bool read_ids(const Statement& s, std::size_t count, const char* shape, const ReadContext& c) {
  if (s.positional.size() < count) {
    c.diagnostics->error(c.file, s.line, std::string(s.keyword) + " needs " + shape);
    return false;
  }
  if (s.positional.size() > count) {
    c.diagnostics->error(c.file, s.line,
                         "too many fields for " + std::string(s.keyword) + ": '" + std::string(s.positional[count]) + "'");
    return false;
  }
  for (std::string_view id : s.positional) {
    if (!is_valid_id(id)) {
      c.diagnostics->error(
          c.file, s.line,
          "invalid ID '" + std::string(id) + "': an ID has 1 to 64 characters and no space, '#', '=' or ','");
      return false;
    }
  }
  return true;
}

std::optional<ReservoirRead> read_reservoir(const Statement& s, const ReadContext& c) {
  StatementOptions o(s, {"head", "elevation", "pressure", "at"}, c.file, c.units, c.diagnostics);
  if (!read_ids(s, 1, "an ID", c)) return std::nullopt;
  ReservoirRead r;
  Node& n = r.node;
  n.id = s.positional[0];
  n.kind = NodeKind::kReservoir;
  n.where = {c.file_name, s.line};
  n.at = coordinates(o);
  std::optional<double> head = o.quantity("head", Dimension::kLength, kElevationRange);
  std::optional<double> elevation = o.quantity("elevation", Dimension::kLength, kElevationRange);
  if (o.has("pressure")) {
    if (auto q = o.raw_quantity("pressure", Dimension::kPressure)) {
      r.pressure = PendingPressure{q->value, q->is_head};
    }
    if (o.has("head")) o.error("reservoir '" + n.id + "': give head= or pressure=, not both");
    if (!o.has("elevation")) o.error("reservoir '" + n.id + "': pressure= needs elevation=");
  } else if (!o.has("head")) {
    o.error("reservoir '" + n.id + "': missing required key 'head'");
  }
  if (head) n.head_m = *head;
  n.elevation_m = elevation.value_or(head.value_or(0.0));
  if (!elevation) r.pressure.reset();
  return r;
}

const std::vector<std::string> kJunctionKeys = {"elevation", "demand", "at"};

void read_junction_keys(StatementOptions& o, Node* n) {
  if (o.has("at")) n->at = coordinates(o);
  if (auto z = o.quantity("elevation", Dimension::kLength, kElevationRange)) n->elevation_m = *z;
  if (const std::string_view* demand = o.find("demand")) {
    // demand=FLOW or demand=FLOW:CATEGORY
    std::string text(*demand);
    std::size_t colon = text.find(':');
    std::string category;
    if (colon != std::string::npos) {
      category = text.substr(colon + 1);
      text = text.substr(0, colon);
      if (category.empty() || !is_valid_id(category)) {
        o.error("demand category must be a name after ':', got '" + std::string(*demand) + "'");
        return;
      }
    }
    if (auto q = o.parse("demand", text, Dimension::kFlow, kDemandRange)) {
      n->demand_m3s = *q;
      n->demand_category = intern(category);
    }
  }
}

bool read_junction_in_place(const Statement& s, const ReadContext& c, Node* n) {
  StatementOptions o(s, kJunctionKeys, c.file, c.units, c.diagnostics);
  if (!read_ids(s, 1, "an ID", c)) return false;
  n->id = s.positional[0];
  n->where = {c.file_name, s.line};
  if (!o.has("elevation")) o.error("node '" + n->id + "': missing required key 'elevation'");
  read_junction_keys(o, n);
  return true;
}

std::optional<Node> read_junction(const Statement& s, const ReadContext& c) {
  Node n;
  if (!read_junction_in_place(s, c, &n)) return std::nullopt;
  return n;
}

const std::vector<std::string> kPipeKeys = {"length", "diameter", "roughness", "cfactor",
                                            "minor",  "status",   "check",     "resize"};

namespace {

// read_pipe_keys into *pipe, with the keys given noted in *given.
void read_pipe_fields(StatementOptions& o, Pipe* pipe, PipeEnds* given) {
  if (auto v = o.quantity("length", Dimension::kLength, kLengthRange)) pipe->length_m = *v;
  if (auto v = o.quantity("diameter", Dimension::kDiameter, kDiameterRange)) pipe->diameter_m = *v;
  if (o.has("roughness")) {
    given->roughness_given = true;
    pipe->roughness_m = o.quantity("roughness", Dimension::kRoughness, kRoughnessRange);
  }
  if (o.has("cfactor")) {
    given->cfactor_given = true;
    pipe->cfactor = o.quantity("cfactor", Dimension::kDimensionless, kCfactorRange);
  }
  if (o.has("minor")) {
    given->minor_given = true;
    if (auto v = o.quantity("minor", Dimension::kDimensionless, kMinorRange)) pipe->minor_k = *v;
  }
  if (const std::string_view* status = o.find("status")) {
    if (*status == "open") {
      pipe->status = LinkStatus::kOpen;
    } else if (*status == "closed") {
      pipe->status = LinkStatus::kClosed;
    } else {
      o.error("status must be 'open' or 'closed', got '" + std::string(*status) + "'");
    }
  }
  if (const std::string_view* resize = o.find("resize")) {
    if (*resize == "yes" || *resize == "no") {
      pipe->resizable = *resize == "yes";
    } else {
      o.error("resize must be 'yes' or 'no', got '" + std::string(*resize) + "'");
    }
  }
  if (const std::string_view* check = o.find("check")) {
    if (*check == "yes" || *check == "no") {
      pipe->check_valve = *check == "yes";
    } else {
      o.error("check must be 'yes' or 'no', got '" + std::string(*check) + "'");
    }
  }
}

}  // namespace

void read_pipe_keys(StatementOptions& o, PipeRead* p) {
  PipeEnds given;
  read_pipe_fields(o, &p->pipe, &given);
  p->roughness_given = p->roughness_given || given.roughness_given;
  p->cfactor_given = p->cfactor_given || given.cfactor_given;
  p->minor_given = p->minor_given || given.minor_given;
}

bool read_pipe_in_place(const Statement& s, const ReadContext& c, Pipe* pipe, PipeEnds* ends) {
  StatementOptions o(s, kPipeKeys, c.file, c.units, c.diagnostics);
  if (!read_ids(s, 3, "ID FROM TO", c)) return false;
  pipe->id = s.positional[0];
  ends->from_id = s.positional[1];
  ends->to_id = s.positional[2];
  pipe->where = {c.file_name, s.line};
  for (const char* key : {"length", "diameter"}) {
    if (!o.has(key)) o.error("pipe '" + pipe->id + "': missing required key '" + key + "'");
  }
  read_pipe_fields(o, pipe, ends);
  if (ends->from_id == ends->to_id) {
    o.error("pipe '" + pipe->id + "' connects node '" + std::string(ends->from_id) + "' to itself");
  }
  return true;
}

std::optional<PipeRead> read_pipe(const Statement& s, const ReadContext& c) {
  PipeRead p;
  PipeEnds e;
  if (!read_pipe_in_place(s, c, &p.pipe, &e)) return std::nullopt;
  p.from_id = e.from_id;
  p.to_id = e.to_id;
  p.roughness_given = e.roughness_given;
  p.cfactor_given = e.cfactor_given;
  p.minor_given = e.minor_given;
  return p;
}

std::optional<Node> read_tank(const Statement& s, const ReadContext& c) {
  StatementOptions o(s, {"bottom", "level", "min_level", "max_level", "diameter", "at"}, c.file,
                     c.units, c.diagnostics);
  if (!read_ids(s, 1, "an ID", c)) return std::nullopt;
  Node n;
  n.id = s.positional[0];
  n.kind = NodeKind::kTank;
  n.where = {c.file_name, s.line};
  n.at = coordinates(o);
  for (const char* key : {"bottom", "level"}) {
    if (!o.has(key)) o.error("tank '" + n.id + "': missing required key '" + key + "'");
  }
  const Range level_range{0.0, 1000.0, true, "1000 m"};
  if (auto z = o.quantity("bottom", Dimension::kLength, kElevationRange)) n.elevation_m = *z;
  TankLevels& t = n.edit_levels();
  if (auto l = o.quantity("level", Dimension::kLength, level_range)) t.level_m = *l;
  if (auto l = o.quantity("min_level", Dimension::kLength, level_range)) t.min_level_m = *l;
  t.max_level_m = o.quantity("max_level", Dimension::kLength, level_range);
  t.tank_diameter_m = o.quantity("diameter", Dimension::kLength, {0.0, 1000.0, false, "1000 m"});
  if (t.max_level_m && t.level_m > *t.max_level_m) {
    o.error("tank '" + n.id + "': level is above max_level");
  }
  if (t.max_level_m && t.min_level_m > *t.max_level_m) {
    o.error("tank '" + n.id + "': min_level is above max_level");
  }
  n.head_m = n.elevation_m + t.level_m;
  return n;
}

std::string fit_pump_curve(PumpCurve* c) {
  const auto& p = c->points;
  if (p.size() == 1) {
    const double q = p[0].first, h = p[0].second;
    if (!(q > 0.0 && h > 0.0)) return "a one-point curve needs a positive flow and head";
    c->shutoff_head_m = 4.0 / 3.0 * h;
    c->exponent = 2.0;
    c->coefficient = (c->shutoff_head_m - h) / (q * q);
    c->max_curve_flow_m3s = 2.0 * q;  // where this curve reaches zero head
    return "";
  }
  if (p.size() != 3) return "curve= takes one design point or three points";
  if (p[0].first != 0.0) return "a three-point curve starts at zero flow (the shut-off head)";
  const double a = p[0].second;
  const double q2 = p[1].first, h2 = p[1].second, q3 = p[2].first, h3 = p[2].second;
  if (!(q2 > 0.0 && q3 > q2)) return "curve flows must increase";
  if (!(a > h2 && h2 > h3 && h3 >= 0.0)) return "curve heads must fall as the flow rises";
  const double exponent = std::log((a - h2) / (a - h3)) / std::log(q2 / q3);
  if (!(exponent > 0.0 && exponent <= 10.0)) return "these points give no curve H = a - b Q^c";
  c->shutoff_head_m = a;
  c->exponent = exponent;
  c->coefficient = (a - h2) / std::pow(q2, exponent);
  c->max_curve_flow_m3s = q3;
  return "";
}

std::optional<PipeRead> read_valve(const Statement& s, const ReadContext& c) {
  StatementOptions o(s, {"type", "diameter", "pressure", "head", "flow", "minor", "loss", "status"}, c.file,
                     c.units, c.diagnostics);
  if (!read_ids(s, 3, "ID FROM TO", c)) return std::nullopt;
  PipeRead p;
  p.pipe.id = s.positional[0];
  p.from_id = s.positional[1];
  p.to_id = s.positional[2];
  p.pipe.where = {c.file_name, s.line};
  p.roughness_given = p.cfactor_given = true;
  const std::string_view* type = o.find("type");
  if (type == nullptr) {
    o.error("valve '" + p.pipe.id + "': missing required key 'type'");
    return std::nullopt;
  }
  if (*type == "prv") {
    p.pipe.kind = LinkKind::kPrv;
  } else if (*type == "psv") {
    p.pipe.kind = LinkKind::kPsv;
  } else if (*type == "fcv") {
    p.pipe.kind = LinkKind::kFcv;
  } else if (*type == "throttle") {
    p.pipe.kind = LinkKind::kThrottle;
  } else {
    o.error("valve type must be prv, psv, fcv or throttle, got '" + std::string(*type) + "'");
    return std::nullopt;
  }
  if (!o.has("diameter")) o.error("valve '" + p.pipe.id + "': missing required key 'diameter'");
  if (auto v = o.quantity("diameter", Dimension::kDiameter, kDiameterRange)) p.pipe.diameter_m = *v;
  if (auto v = o.quantity("minor", Dimension::kDimensionless, kMinorRange)) p.pipe.minor_k = *v;
  p.minor_given = true;
  p.pipe.length_m = 1.0;  // nominal, for loss-per-length reports
  const bool pressure_valve = p.pipe.kind == LinkKind::kPrv || p.pipe.kind == LinkKind::kPsv;
  if (pressure_valve) {
    if (o.has("pressure") == o.has("head")) {
      o.error("valve '" + p.pipe.id + "': give the setting as pressure= or head=");
    } else if (o.has("head")) {
      if (auto h = o.quantity("head", Dimension::kLength, kElevationRange)) p.pipe.edit_control().valve_head_m = *h;
    } else if (auto q = o.raw_quantity("pressure", Dimension::kPressure)) {
      p.valve_pressure = PendingPressure{q->value, q->is_head};  // resolved at the node later
    }
  }
  if (o.has("loss")) {
    if (p.pipe.kind != LinkKind::kThrottle) {
      o.error("loss= is for a throttle valve");
    } else if (auto v = o.quantity("loss", Dimension::kLength, {0.0, 1000.0, false, "1000 m"})) {
      p.pipe.edit_control().valve_loss_m = *v;
    }
  }
  if (p.pipe.kind == LinkKind::kFcv) {
    if (!o.has("flow")) o.error("valve '" + p.pipe.id + "': missing required key 'flow'");
    if (auto q = o.quantity("flow", Dimension::kFlow, {0.0, 100.0, true, "100 m3/s"})) {
      p.pipe.edit_control().valve_flow_m3s = *q;
    }
  }
  if (const std::string_view* status = o.find("status")) {
    if (*status == "open" || *status == "closed") {
      p.pipe.status = *status == "open" ? LinkStatus::kOpen : LinkStatus::kClosed;
    } else {
      o.error("status must be 'open' or 'closed', got '" + std::string(*status) + "'");
    }
  }
  if (p.from_id == p.to_id) {
    o.error("valve '" + p.pipe.id + "' connects node '" + p.from_id + "' to itself");
  }
  return p;
}

std::optional<PipeRead> read_pump(const Statement& s, const ReadContext& c) {
  StatementOptions o(s, {"curve", "speed", "efficiency", "status"}, c.file, c.units, c.diagnostics);
  if (!read_ids(s, 3, "ID FROM TO", c)) return std::nullopt;
  PipeRead p;
  p.pipe.id = s.positional[0];
  p.pipe.kind = LinkKind::kPump;
  p.pipe.check_valve = true;  // a pump never runs backwards
  p.from_id = s.positional[1];
  p.to_id = s.positional[2];
  p.pipe.where = {c.file_name, s.line};
  p.roughness_given = p.cfactor_given = true;  // no friction law applies
  if (!o.has("curve")) o.error("pump '" + p.pipe.id + "': missing required key 'curve'");
  if (const std::string_view* curve = o.find("curve")) {
    std::size_t start = 0;
    bool ok = true;
    while (ok && start <= curve->size()) {
      std::size_t comma = curve->find(',', start);
      std::string point(curve->substr(start, comma == std::string::npos ? std::string::npos : comma - start));
      std::size_t colon = point.find(':');
      if (colon == std::string::npos) {
        o.error("curve points are FLOW:HEAD, got '" + point + "'");
        ok = false;
        break;
      }
      auto q = o.parse("curve", point.substr(0, colon), Dimension::kFlow, {0.0, 100.0, true, "100 m3/s"});
      auto h = o.parse("curve", point.substr(colon + 1), Dimension::kLength, {0.0, 5000.0, true, "5000 m"});
      if (!q || !h) ok = false; else p.pipe.edit_control().curve.points.emplace_back(*q, *h);
      if (comma == std::string::npos) break;
      start = comma + 1;
    }
    if (ok) {
      std::string why = fit_pump_curve(&p.pipe.edit_control().curve);
      if (!why.empty()) o.error("pump '" + p.pipe.id + "': " + why);
    }
  }
  if (auto v = o.quantity("speed", Dimension::kDimensionless, {0.0, 3.0, false, "3"})) p.pipe.edit_control().speed = *v;
  p.pipe.edit_control().efficiency = o.quantity("efficiency", Dimension::kDimensionless, {0.0, 1.0, false, "1"});
  if (const std::string_view* status = o.find("status")) {
    if (*status == "open" || *status == "on") {
      p.pipe.status = LinkStatus::kOpen;
    } else if (*status == "closed" || *status == "off") {
      p.pipe.status = LinkStatus::kClosed;
    } else {
      o.error("status must be 'on' or 'off', got '" + std::string(*status) + "'");
    }
  }
  if (p.from_id == p.to_id) {
    o.error("pump '" + p.pipe.id + "' connects node '" + p.from_id + "' to itself");
  }
  return p;
}

bool check_pipe(const Pipe& p, HeadlossLaw law, bool law_value_given, Diagnostics* d) {
  if (p.is_pump() || p.is_valve()) return true;
  bool ok = true;
  if (law == HeadlossLaw::kDarcyWeisbach && !p.roughness_m && !law_value_given) {
    error(d, p.where,
          "pipe '" + p.id +
              "': missing roughness (darcy-weisbach needs roughness= or 'defaults roughness=')");
    ok = false;
  }
  if (law == HeadlossLaw::kHazenWilliams && !p.cfactor && !law_value_given) {
    error(d, p.where,
          "pipe '" + p.id + "': missing cfactor (hazen-williams needs cfactor= or 'defaults cfactor=')");
    ok = false;
  }
  if (p.roughness_m && p.diameter_m > 0.0 && *p.roughness_m >= 0.5 * p.diameter_m) {
    std::ostringstream m;
    m << "pipe '" << p.id << "': roughness " << *p.roughness_m * 1e3
      << " mm is not smaller than the pipe radius " << p.diameter_m * 500.0 << " mm";
    error(d, p.where, m.str());
    ok = false;
  }
  return ok;
}

PipeEnds ends_of(const PipeRead& p) {
  PipeEnds e;
  e.from_id = p.from_id;
  e.to_id = p.to_id;
  if (p.valve_pressure) {
    e.valve_pressure = p.valve_pressure->value;
    e.valve_pressure_is_head = p.valve_pressure->is_head;
  }
  e.roughness_given = p.roughness_given;
  e.cfactor_given = p.cfactor_given;
  e.minor_given = p.minor_given;
  return e;
}

bool settle_pipe(Pipe* pipe, const PipeEnds& e, const PipeDefaults& defaults, const Network& net,
                 Diagnostics* d, bool* valid) {
  const SourceLocation& w = pipe->where;
  const std::optional<std::size_t> from = net.find_node(e.from_id);
  const std::optional<std::size_t> to = net.find_node(e.to_id);
  if (!from) {
    error(d, w, "pipe '" + pipe->id + "' refers to unknown node '" + std::string(e.from_id) + "'");
  }
  if (!to) error(d, w, "pipe '" + pipe->id + "' refers to unknown node '" + std::string(e.to_id) + "'");
  pipe->from = from.value_or(0);
  pipe->to = to.value_or(0);
  if (!e.roughness_given) pipe->roughness_m = defaults.roughness_m;
  if (!e.cfactor_given) pipe->cfactor = defaults.cfactor;
  if (!e.minor_given && defaults.minor_k) pipe->minor_k = *defaults.minor_k;
  const bool given = net.headloss.law == HeadlossLaw::kDarcyWeisbach ? e.roughness_given
                                                                     : e.cfactor_given;
  if (!from || !to) return false;
  if (e.valve_pressure) {
    // A pressure setting is held at the controlled node: downstream for a PRV, upstream for a
    // PSV; the valve holds the head elevation + pressure head there.
    const Node& at = net.nodes[pipe->kind == LinkKind::kPrv ? *to : *from];
    const PendingPressure pressure{*e.valve_pressure, e.valve_pressure_is_head};
    pipe->edit_control().valve_head_m = at.elevation_m + pressure.to_head_m(net.fluid.density_kgm3);
  }
  *valid = check_pipe(*pipe, net.headloss.law, given, d);
  return true;
}

void duplicate_pipe_error(const Pipe& pipe, const Network& net, Diagnostics* d) {
  const SourceLocation& first = net.pipes[*net.find_pipe(pipe.id)].where;
  error(d, pipe.where,
        "duplicate pipe ID '" + pipe.id + "' (first defined at " + first.file() + ":" +
            std::to_string(first.line) + ")");
}

bool add_pipe_to_network(PipeRead p, const PipeDefaults& defaults, Network* net, Diagnostics* d) {
  bool valid = true;
  if (!settle_pipe(&p.pipe, ends_of(p), defaults, *net, d, &valid)) return false;
  if (!net->try_add_pipe(std::move(p.pipe))) {  // p.pipe is left as it was when refused
    duplicate_pipe_error(p.pipe, *net, d);
    return false;
  }
  return valid;
}

std::optional<CaseRead> read_case(const Statement& s, const ReadContext& c) {
  StatementOptions o(s, {"factor", "factor.", "draw"}, c.file, c.units, c.diagnostics, {"draw"});
  if (!read_ids(s, 1, "a name", c)) return std::nullopt;
  CaseRead r;
  r.demand_case.name = s.positional[0];
  r.demand_case.where = {c.file_name, s.line};
  if (auto f = o.quantity("factor", Dimension::kDimensionless, kFactorRange)) {
    r.demand_case.factor = *f;
  }
  for (const auto& [category, text] : o.with_prefix("factor.")) {
    if (auto f = o.parse("factor." + category, text, Dimension::kDimensionless, kFactorRange)) {
      r.demand_case.category_factors.emplace_back(category, *f);
    }
  }
  for (const std::string& draw : o.all("draw")) {
    std::size_t colon = draw.rfind(':');
    if (colon == std::string::npos || colon == 0) {
      o.error("draw must be NODE:FLOW, got '" + draw + "'");
      continue;
    }
    if (auto q = o.parse("draw", draw.substr(colon + 1), Dimension::kFlow, kDemandRange)) {
      r.draw_ids.emplace_back(draw.substr(0, colon), *q);
    }
  }
  return r;
}

bool resolve_case(CaseRead* r, const Network& net, Diagnostics* d) {
  DemandCase& dc = r->demand_case;
  bool ok = true;
  for (const auto& [id, flow] : r->draw_ids) {
    auto n = net.find_node(id);
    if (!n) {
      error(d, dc.where, "case '" + dc.name + "': draw at unknown node '" + id + "'");
      ok = false;
    } else if (net.nodes[*n].is_fixed_head()) {
      error(d, dc.where, "case '" + dc.name + "': draw at reservoir '" + id + "'");
      ok = false;
    } else {
      dc.draws_m3s.emplace_back(*n, flow);
    }
  }
  for (const auto& entry : dc.category_factors) {
    const std::string& category = entry.first;
    bool used = std::any_of(net.nodes.begin(), net.nodes.end(),
                            [&](const Node& n) { return n.demand_category == category; });
    if (!used) {
      error(d, dc.where,
            "case '" + dc.name + "': no node has demand category '" + category + "'");
      ok = false;
    }
  }
  return ok;
}

std::optional<LimitRead> read_limit(const Statement& s, const ReadContext& c) {
  if (s.positional.size() != 1 || (s.positional[0] != "pressure" && s.positional[0] != "velocity")) {
    c.diagnostics->error(c.file, s.line, "limit needs one field: pressure or velocity");
    return std::nullopt;
  }
  LimitRead r;
  r.where = {c.file_name, s.line};
  if (s.positional[0] == "pressure") {
    StatementOptions o(s, {"min", "max", "case"}, c.file, c.units, c.diagnostics);
    for (const char* key : {"min", "max"}) {
      if (auto q = o.raw_quantity(key, Dimension::kPressure)) {
        (key[1] == 'i' ? r.min_pressure : r.max_pressure) = PendingPressure{q->value, q->is_head};
      }
    }
    if (!o.has("min") && !o.has("max")) o.error("limit pressure needs min= or max=");
    if (const std::string_view* name = o.find("case")) r.case_name = *name;
  } else {
    StatementOptions o(s, {"max", "case"}, c.file, c.units, c.diagnostics);
    r.max_velocity_ms = o.quantity("max", Dimension::kVelocity, kVelocityRange);
    if (!o.has("max")) o.error("limit velocity needs max=");
    if (const std::string_view* name = o.find("case")) r.case_name = *name;
  }
  return r;
}

bool apply_limit(const LimitRead& limit, Network* net, Diagnostics* d) {
  Criteria* target = &net->limits;
  if (!limit.case_name.empty()) {
    bool known = std::any_of(net->cases.begin(), net->cases.end(),
                             [&](const DemandCase& c) { return c.name == limit.case_name; });
    if (!known) {
      error(d, limit.where, "limit for unknown case '" + limit.case_name + "'");
      return false;
    }
    auto it = std::find_if(net->case_limits.begin(), net->case_limits.end(),
                           [&](const CaseCriteria& c) { return c.case_name == limit.case_name; });
    if (it == net->case_limits.end()) {
      net->case_limits.push_back({limit.case_name, {}});
      it = net->case_limits.end() - 1;
    }
    target = &it->criteria;
  }
  const double rho = net->fluid.density_kgm3;
  if (limit.min_pressure) target->min_pressure_m = limit.min_pressure->to_head_m(rho);
  if (limit.max_pressure) target->max_pressure_m = limit.max_pressure->to_head_m(rho);
  if (limit.max_velocity_ms) target->max_velocity_ms = limit.max_velocity_ms;
  return true;
}

}  // namespace gradeline
