// gradeline public API: the network model.
//
// Everything in the model is SI: lengths and heads in m, flows in m^3/s, densities in kg/m^3,
// kinematic viscosity in m^2/s. Units are converted only when a file is read or a report is
// written. Node and link references are indices into Network::nodes / Network::pipes.
#pragma once

#include <cstddef>
#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "gradeline/compact.h"
#include "gradeline/id_index.h"

namespace gradeline {

enum class UnitSystem { kSI, kUS };

enum class NodeKind : std::uint8_t { kJunction, kReservoir, kTank };

// Where an element was read. The file name is interned (compact.h), so a location is 8 bytes,
// copied without touching a reference count: a million elements read on two cores would
// otherwise contend for one counter.
struct SourceLocation {
  InternedString file_name;
  int line = 0;
  const std::string& file() const { return file_name.str(); }
};

// A value kept on the heap, and only once it is written: copies copy it, moves move the
// pointer, and an empty box reads as T{}. For the fields only a few kinds of element have
// (pumps and valves, tanks), which would otherwise widen the record of every plain pipe and
// junction, and with it every pass over the links and nodes.
template <typename T>
class Boxed {
 public:
  Boxed() = default;
  Boxed(const Boxed& other) : value_(other.value_ ? std::make_unique<T>(*other.value_) : nullptr) {}
  Boxed(Boxed&&) noexcept = default;
  Boxed& operator=(const Boxed& other) {
    if (this != &other) value_ = other.value_ ? std::make_unique<T>(*other.value_) : nullptr;
    return *this;
  }
  Boxed& operator=(Boxed&&) noexcept = default;

  const T& get() const {
    static const T empty{};
    return value_ ? *value_ : empty;
  }
  T& edit() {
    if (!value_) value_ = std::make_unique<T>();
    return *value_;
  }
  bool empty() const { return !value_; }

 private:
  std::unique_ptr<T> value_;
};

// What only tanks have (steady state): head = bottom (elevation_m) + level.
struct TankLevels {
  double level_m = 0.0;
  double min_level_m = 0.0;
  std::optional<double> max_level_m;
  std::optional<double> tank_diameter_m;
};

// 96 bytes (see compact.h for why it matters).
struct Node {
  std::string id;
  double elevation_m = 0.0;  // ground / pipe invert reference for pressure
  double demand_m3s = 0.0;   // base demand, positive out of the network
  double head_m = 0.0;       // fixed hydraulic grade line, reservoirs and tanks
  Boxed<TankLevels> tank;    // tanks: read with levels(), write with edit_levels()
  OptionalPoint at;
  SourceLocation where;
  InternedString demand_category;  // empty: uncategorised
  NodeKind kind = NodeKind::kJunction;

  const TankLevels& levels() const { return tank.get(); }
  TankLevels& edit_levels() { return tank.edit(); }
  bool is_fixed_head() const { return kind != NodeKind::kJunction; }
  // A tank at or below its minimum level cannot supply: it may only receive.
  bool receives_only() const {
    return kind == NodeKind::kTank && levels().level_m <= levels().min_level_m;
  }
};

enum class LinkStatus : std::uint8_t { kOpen, kClosed };

enum class LinkKind : std::uint8_t { kPipe, kPump, kPrv, kPsv, kFcv, kThrottle };

const char* link_kind_name(LinkKind kind);  // "pipe", "pump", "prv", "psv", "fcv", "throttle"


// A pump's head-flow curve at full speed, H = a - b Q^c (H in m, Q in m^3/s), fitted through the
// points given. At relative speed s the affinity laws give H = a s^2 - b s^(2-c) Q^c.
struct PumpCurve {
  double shutoff_head_m = 0.0;  // a
  double coefficient = 0.0;     // b
  double exponent = 2.0;        // c
  double max_curve_flow_m3s = 0.0;  // the largest flow of the points given (full speed)
  std::vector<std::pair<double, double>> points;  // (Q m^3/s, H m) as given
};

// What only pumps and valves have.
struct LinkControls {
  // Pumps.
  PumpCurve curve;
  double speed = 1.0;                 // relative to the curve's speed
  std::optional<double> efficiency;   // 0-1, for the shaft power
  // Valves: PRV and PSV hold a head (downstream, upstream) given as a head or as a pressure at
  // that node; FCV holds a flow; all have a diameter and open-mode loss coefficient `minor_k`;
  // a throttle is a fixed loss K V^2/2g.
  double valve_head_m = 0.0;     // PRV, PSV: the head held (resolved from a pressure setting)
  double valve_flow_m3s = 0.0;   // FCV
  double valve_loss_m = 0.0;     // throttle given as a fixed head loss (loss=), else 0
};

// A link: a pipe, or a pump (which has no length or diameter of its own), or a valve.
// 104 bytes (see compact.h for why it matters).
struct Pipe {
  std::string id;
  LinkKind kind = LinkKind::kPipe;
  LinkStatus status = LinkStatus::kOpen;
  bool check_valve = false;  // flow only from `from` to `to`
  bool resizable = false;    // marked for `gradeline size` (resize=yes)
  std::uint32_t from = 0;    // index into Network::nodes
  std::uint32_t to = 0;
  SourceLocation where;
  double length_m = 0.0;
  double diameter_m = 0.0;
  OptionalDouble roughness_m;  // absolute roughness, Darcy-Weisbach
  OptionalDouble cfactor;      // Hazen-Williams C (dimensionless)
  double minor_k = 0.0;        // sum of minor-loss coefficients
  Boxed<LinkControls> controls;  // pumps and valves: read with control(), write with edit_control()

  const LinkControls& control() const { return controls.get(); }
  LinkControls& edit_control() { return controls.edit(); }
  bool is_pump() const { return kind == LinkKind::kPump; }
  bool is_valve() const { return kind != LinkKind::kPipe && kind != LinkKind::kPump; }
  bool is_control_valve() const {
    return kind == LinkKind::kPrv || kind == LinkKind::kPsv || kind == LinkKind::kFcv;
  }
};

enum class HeadlossLaw { kDarcyWeisbach, kHazenWilliams };

// Hazen-Williams in SI form: h = coefficient * L * Q^flow_exponent / (C^flow_exponent *
// D^diameter_exponent), h and L in m, Q in m^3/s, D in m.
struct HeadlossModel {
  HeadlossLaw law = HeadlossLaw::kDarcyWeisbach;
  double hw_coefficient = 10.67;
  double hw_flow_exponent = 1.852;
  double hw_diameter_exponent = 4.87;
};

struct Fluid {
  double density_kgm3 = 999.1;            // water at 15 C
  double kinematic_viscosity_m2s = 1.138e-6;
  std::optional<double> temperature_c;    // set when given by temperature
};

// A demand case: every base demand scaled by `factor` (or by its category's factor), plus
// extra draws at named nodes (for example a fire flow).
struct DemandCase {
  std::string name;
  double factor = 1.0;
  std::vector<std::pair<std::string, double>> category_factors;
  std::vector<std::pair<std::size_t, double>> draws_m3s;  // node index, flow
  SourceLocation where;
};

// Design criteria. Pressures are held as pressure heads of the fluid (m).
struct Criteria {
  std::optional<double> min_pressure_m;
  std::optional<double> max_pressure_m;
  std::optional<double> max_velocity_ms;
};

struct CaseCriteria {
  std::string case_name;
  Criteria criteria;  // fields set here override the network-wide ones for that case
};

struct Network {
  std::string title;
  UnitSystem units = UnitSystem::kSI;
  HeadlossModel headloss;
  Fluid fluid;
  std::vector<Node> nodes;
  std::vector<Pipe> pipes;
  std::vector<DemandCase> cases;
  Criteria limits;
  std::vector<CaseCriteria> case_limits;

  std::optional<std::size_t> find_node(std::string_view id) const;
  std::optional<std::size_t> find_pipe(std::string_view id) const;
  // Hints that find_node(id) will be called soon (see IdIndex::prefetch).
  void prefetch_node(std::string_view id) const { node_index_.prefetch(id); }
  void prefetch_pipe(std::string_view id) const { pipe_index_.prefetch(id); }
  // A later stage of the same hint: once the ID's slot is in the cache, the node it names.
  void prefetch_node_element(std::string_view id) const {
    node_index_.prefetch_element(id, [this](std::size_t i) {
      const char* p = reinterpret_cast<const char*>(&nodes[i]);
      prefetch_address(p);
      prefetch_address(p + 32);
    });
  }
  // Rebuilds the ID lookup tables; call after editing `nodes` or `pipes` directly.
  void reindex();
  std::size_t add_node(Node node);
  std::size_t add_pipe(Pipe pipe);
  // Adds unless the ID is taken; then returns nullopt and leaves both the network and the
  // element as they were.
  std::optional<std::size_t> try_add_node(Node&& node);
  std::optional<std::size_t> try_add_pipe(Pipe&& pipe);
  // Adds nodes[k] / pipes[k], already in place, to the ID lookup unless the ID is taken (then
  // false).
  bool try_index_node(std::size_t k);
  bool try_index_pipe(std::size_t k);
  // Every link, already in place and none yet in the ID lookup, added at once, as staged
  // (IdIndex::stage(pipes[k].id, k) for each k, made on any core); false at a duplicate ID,
  // and the lookup is then left empty.
  bool index_all_pipes(const std::vector<IdIndex::Staged>& staged);
  void reserve(std::size_t nodes, std::size_t pipes);

 private:
  IdIndex node_index_;
  IdIndex pipe_index_;
};

// Standard gravity (CGPM 1901), m/s^2.
inline constexpr double kGravity_ms2 = 9.80665;

}  // namespace gradeline
