// Reading the element statements of the network format (reservoir, node, pipe, case, limit)
// into the model. Shared by the network parser and by change sets ("add pipe ...",
// "modify P7 diameter=300mm"), so both accept exactly the same keys and report the same errors.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "gradeline/network.h"
#include "io/diagnostics.h"
#include "io/lexer.h"
#include "io/statement_options.h"

namespace gradeline {

// Bounds that no real water system reaches; a value outside is a typing or unit error.
extern const Range kLengthRange, kDiameterRange, kRoughnessRange, kElevationRange, kDemandRange,
    kMinorRange, kCfactorRange, kFactorRange, kVelocityRange;

struct ReadContext {
  const std::string& file;
  InternedString file_name;  // `file`, interned
  UnitSystem units = UnitSystem::kSI;
  Diagnostics* diagnostics = nullptr;
};

// A pressure given in pascals waits for the fluid density before it becomes a head.
struct PendingPressure {
  double value = 0.0;
  bool is_head = false;
  double to_head_m(double density_kgm3) const {
    return is_head ? value : value / (density_kgm3 * kGravity_ms2);
  }
};

struct ReservoirRead {
  Node node;
  std::optional<PendingPressure> pressure;  // head = elevation + pressure
};

struct PipeRead {
  Pipe pipe;
  std::string from_id;
  std::string to_id;
  bool roughness_given = false;  // given, even if its value was refused
  bool cfactor_given = false;
  bool minor_given = false;
  std::optional<PendingPressure> valve_pressure;  // PRV/PSV setting given as pressure=
};

// Pipe defaults ("defaults roughness=... cfactor=... minor=...").
struct PipeDefaults {
  std::optional<double> roughness_m;
  std::optional<double> cfactor;
  std::optional<double> minor_k;
};

// Checks the count and form of the positional fields (`count` IDs).
bool read_ids(const Statement& s, std::size_t count, const char* shape, const ReadContext& c);

std::optional<ReservoirRead> read_reservoir(const Statement& s, const ReadContext& c);
std::optional<Node> read_junction(const Statement& s, const ReadContext& c);
std::optional<PipeRead> read_pipe(const Statement& s, const ReadContext& c);
// `tank ID bottom=Z level=L [min_level=L] [max_level=L] [diameter=D] [at=X,Y]`
std::optional<Node> read_tank(const Statement& s, const ReadContext& c);
// `pump ID FROM TO curve=Q:H[,Q:H,Q:H] [speed=S] [efficiency=E] [status=open|closed]`
std::optional<PipeRead> read_pump(const Statement& s, const ReadContext& c);
// `valve ID FROM TO type=prv|psv|fcv|throttle diameter=D [pressure=P|head=H] [flow=Q]
//  [minor=K] [status=open|closed]`
std::optional<PipeRead> read_valve(const Statement& s, const ReadContext& c);
// Fits H = a - b Q^c: through one design point (a = 4/3 H, c = 2: common practice), or three
// points starting at Q = 0. Returns an error message, or "" on success.
std::string fit_pump_curve(PumpCurve* curve);

// The keys a pipe statement accepts other than length and diameter requirements; used by
// `modify`. Only the keys present are changed.
extern const std::vector<std::string> kPipeKeys;
void read_pipe_keys(StatementOptions& o, PipeRead* p);
extern const std::vector<std::string> kJunctionKeys;
void read_junction_keys(StatementOptions& o, Node* n);

// Resolves the end nodes, applies defaults and checks the pipe against the head-loss law;
// adds it to `net` when all is well. False (with errors reported) otherwise.
bool add_pipe_to_network(PipeRead p, const PipeDefaults& defaults, Network* net,
                         Diagnostics* diagnostics);

// What a link statement leaves to settle once every node is known; the IDs view the text read.
// 48 bytes: the bulk reader keeps one per link of a large file.
struct PipeEnds {
  std::string_view from_id;
  std::string_view to_id;
  OptionalDouble valve_pressure;  // a PRV/PSV setting given as pressure= (PendingPressure)
  bool valve_pressure_is_head = false;
  bool roughness_given = false;
  bool cfactor_given = false;
  bool minor_given = false;
};
PipeEnds ends_of(const PipeRead& p);

// read_junction and read_pipe writing straight into a default-constructed element (and, for a
// pipe, its ends, whose IDs then view the statement's line): the same element and the same
// errors, without a temporary to build, move and destroy per line (the bulk reader's path).
// False where the other returns nullopt.
bool read_junction_in_place(const Statement& s, const ReadContext& c, Node* node);
bool read_pipe_in_place(const Statement& s, const ReadContext& c, Pipe* pipe, PipeEnds* ends);

// The part of add_pipe_to_network before the pipe joins the network: resolves the ends of
// `pipe` in `net`, applies the defaults and checks it. Returns false when an end node is
// unknown (the pipe cannot join); *valid is false when another check failed.
bool settle_pipe(Pipe* pipe, const PipeEnds& ends, const PipeDefaults& defaults,
                 const Network& net, Diagnostics* diagnostics, bool* valid);
// "duplicate pipe ID ..." for `pipe`, whose ID an earlier link of `net` has.
void duplicate_pipe_error(const Pipe& pipe, const Network& net, Diagnostics* diagnostics);

// Checks of a pipe that depend on more than one key: roughness against the radius, and the
// value the head-loss law needs.
bool check_pipe(const Pipe& p, HeadlossLaw law, bool law_value_given, Diagnostics* diagnostics);

// `case NAME factor=F [factor.CATEGORY=F] [draw=NODE:FLOW]...`: the draws hold node IDs until
// resolved by resolve_case.
struct CaseRead {
  DemandCase demand_case;
  std::vector<std::pair<std::string, double>> draw_ids;
};
std::optional<CaseRead> read_case(const Statement& s, const ReadContext& c);
bool resolve_case(CaseRead* read, const Network& net, Diagnostics* diagnostics);

// `limit pressure min=P max=P [case=NAME]` and `limit velocity max=V [case=NAME]`.
struct LimitRead {
  std::string case_name;  // empty: every case
  std::optional<PendingPressure> min_pressure, max_pressure;
  std::optional<double> max_velocity_ms;
  SourceLocation where;
};
std::optional<LimitRead> read_limit(const Statement& s, const ReadContext& c);
// Converts pressures to heads and merges the limit into `net`; checks the case name.
bool apply_limit(const LimitRead& limit, Network* net, Diagnostics* diagnostics);

}  // namespace gradeline
