// Control valves in the global gradient method: pressure-reducing (PRV), pressure-sustaining
// (PSV) and flow-control (FCV) valves, by mode switching with a lagged flow, the treatment of
// Rossman (2000, U.S. EPA report EPA/600/R-00/057, appendix D) in the gradient algorithm of Todini & Pilati.
//
// ACTIVE PRV from i to j with setting H_set: j is tied to a virtual fixed head H_set through a
//   conductance C = 1e4 m^2/s, and the valve's flow from the
//   previous iteration is an outflow at i. The new flow is Q + C (H_set - H_j); at the fixed
//   point Q no longer changes, so H_j = H_set exactly whatever C is. C only sets how fast the
//   pin takes hold: large against ordinary conductances (1e-3 to 10 m^2/s), yet small enough
//   that C times the round-off of a head (1e-14 m) stays below the continuity tolerance.
// ACTIVE PSV: the same at the upstream node i, so H_i = H_set; new flow Q + C (H_i - H_set).
// ACTIVE FCV: the set flow is an outflow at i and an inflow at j; the heads are free.
// OPEN: the valve is a fixed loss K V|V|/2g plus a tiny linear term. CLOSED: no flow.
//
// Modes change after each Newton step (tolerances below):
//   PRV  ACTIVE -> CLOSED if Q < 0; -> OPEN if H_i < H_set.
//        OPEN   -> CLOSED if Q < 0; -> ACTIVE if H_j > H_set.
//        CLOSED -> (if H_i > H_j and H_j < H_set) ACTIVE if H_i > H_set, else OPEN.
//   PSV  ACTIVE -> CLOSED if Q < 0; -> OPEN if H_j > H_set.
//        OPEN   -> CLOSED if Q < 0; -> ACTIVE if H_i < H_set.
//        CLOSED -> (if H_i > H_j and H_i > H_set) OPEN if H_j > H_set, else ACTIVE.
//   FCV  ACTIVE -> OPEN if H_i < H_j; OPEN -> ACTIVE if Q > Q_set; OPEN -> CLOSED if Q < 0;
//        CLOSED -> OPEN if H_i > H_j.
// A zero flow is not "negative": at zero demand an active PRV stays active with Q = 0 rather
// than closing and cutting off the zone, which keeps it from cycling. Each valve may change
// mode at most 12 times in a solve; a solve converges only when no mode changed in its last
// step, and the final modes are checked against the final heads and flows.
#pragma once

#include <string>
#include <vector>

#include "gradeline/network.h"
#include "gradeline/solve_summary.h"
#include "solver/assembly.h"

namespace gradeline {

inline constexpr double kValvePinConductance = 1e4;  // m^2/s
inline constexpr int kMaxValveModeChanges = 12;

class ControlValves {
 public:
  explicit ControlValves(const Network& net);

  bool any() const { return !valves_.empty(); }
  ValveMode mode(std::size_t link) const { return mode_[link]; }
  bool closed(std::size_t link) const { return mode_[link] == ValveMode::kClosed; }
  bool active(std::size_t link) const { return mode_[link] == ValveMode::kActive; }

  // Head losses that make the energy residual of an active valve its control error.
  void override_losses(const std::vector<double>& head, std::vector<double>* headloss) const;
  // Flows fixed by an active FCV.
  void fix_flows(std::vector<double>* flow) const;
  // Matrix and right-hand side terms of the active valves (after the ordinary assembly).
  void assemble(const AssemblyPlan& plan, const std::vector<char>& link_active,
                Eigen::VectorXd* rhs, SymmetricMatrix* matrix) const;
  // New flows of the active valves from the new heads.
  void update_flows(const std::vector<char>& link_active, const std::vector<double>& head,
                    std::vector<double>* flow) const;
  // A node held only by active valves (a zone fed through an active PSV or FCV alone) has no
  // head reference: such a valve cannot control, so it is opened. True when any was opened.
  bool release_floating(const AssemblyPlan& plan, const SymmetricMatrix& matrix,
                        const std::vector<char>& supplied);
  // Mode changes after a step; true when any mode changed.
  bool update_modes(const std::vector<char>& supplied, const std::vector<double>& head,
                    const std::vector<double>& flow, double head_tol, double flow_tol);
  // Final check: no mode contradicts the heads and flows. False with the reason.
  bool consistent(const std::vector<char>& supplied, const std::vector<double>& head,
                  const std::vector<double>& flow, double head_tol, double flow_tol,
                  std::string* why) const;

 private:
  const Network& net_;
  std::vector<std::size_t> valves_;
  std::vector<ValveMode> mode_;
  std::vector<int> changes_;
};

}  // namespace gradeline
