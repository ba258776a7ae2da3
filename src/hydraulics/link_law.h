// Head-loss laws of a pipe: h(Q) and its exact derivative dh/dQ, with Q in m^3/s and h in m.
// h has the sign of Q (a loss in the direction of flow) and dh/dQ > 0 for every Q, which keeps
// the global-gradient matrix positive definite.
//
// Darcy-Weisbach (SI):   h = (f(Re) L/D + K) * V|V| / (2 g),   V = Q / A,  Re = |V| D / nu.
//   In laminar flow the friction part is evaluated as the Hagen-Poiseuille law
//   h_f = 32 nu L V / (g D^2), which is linear and finite at Q = 0.
//   dh/dQ = (f L/D + K) |Q| / (g A^2) + (df/dRe) Re L/D |Q| / (2 g A^2).
// Hazen-Williams (SI):   h = k L |Q|^(n-1) Q / (C^n D^m) + K V|V| / (2 g),
//   with k, n, m from HeadlossModel (defaults 10.67, 1.852, 4.87). Because dh/dQ -> 0 as Q -> 0
//   for n > 1, |Q|^(n-1) is replaced by (Q^2 + q0^2)^((n-1)/2), q0 = 1e-8 m^3/s by default.
//   The relative change in h is below 1e-10 for |Q| >= 1e-3 L/s, and dh/dQ(0) = k L q0^(n-1) /
//   (C^n D^m) > 0.
// Minor losses K V^2 / (2 g) are added under both laws.
//
// Pump (a head gain, so a negative loss), with the curve H = a - b Q^c at full speed and the
// affinity laws at relative speed s (Q ~ s, H ~ s^2):
//   h = -(a s^2 - b s^(2-c) g(Q)),   g(Q) = (Q^2 + q0^2)^((c-1)/2) Q,  q0 = 1e-6 m^3/s,
// so dh/dQ = b s^(2-c) g'(Q) > 0 even at Q = 0, where the plain law's slope vanishes. The gain
// changes by less than 1e-10 relative for Q >= 0.1 L/s. Reverse flow is prevented by the
// solver (a pump closes like a check valve), so g only needs to be monotone there.
#pragma once

#include <cstdint>

#include "gradeline/network.h"
#include "gradeline/solve_summary.h"
#include "hydraulics/friction.h"

namespace gradeline {

// Coefficients of one link's law, computed once per solve so the Newton loop does no division
// by geometry. 72 bytes: the Newton loop streams one of these per pipe per iteration, so the
// fields that only one kind of link uses share their storage (the union, chosen by `kind`).
enum class LawKind : std::uint8_t { kDarcyWeisbach, kHazenWilliams, kPump, kValve };

struct PipeLaw {
  LawKind kind = LawKind::kDarcyWeisbach;
  double area_m2 = 0.0;              // 0 for a pump
  double reynolds_per_flow = 0.0;    // Re = |Q| * this, s/m^3
  double turbulent_coef = 0.0;       // L / (2 g D A^2): h_f = f * this * Q^2, s^2/m^5
  double laminar_coef = 0.0;         // 32 nu L / (g D^2 A): h_f = this * Q, s/m^2
  double minor_coef = 0.0;           // K / (2 g A^2), s^2/m^5
  union {
    double relative_roughness = 0.0;  // Darcy-Weisbach pipes: e/D
    struct {
      double coef;       // k L / (C^n D^m)
      double exponent;   // n
      double q0_m3s;     // regularisation flow
    } hw;                // Hazen-Williams pipes
    struct {
      double gain_m;       // a s^2
      double coefficient;  // b s^(2-c)
      double exponent;     // c
    } pump;              // pumps
    double fixed_loss_m;  // valves: a throttle's fixed head loss, else 0
  };

  bool is_pump() const { return kind == LawKind::kPump; }
  bool is_valve() const { return kind == LawKind::kValve; }
  // h(0): 0 for a pipe or valve, -a s^2 for a pump.
  double zero_flow_headloss_m() const { return is_pump() ? -pump.gain_m : 0.0; }
};

// A fully open valve with K = 0 still needs dh/dQ > 0: h = K V|V|/2g + r Q with r = 1e-3 s/m^2
// (1e-5 m at 10 L/s).
inline constexpr double kValveLinearResistance = 1e-3;
// A throttle given as a fixed head loss dH: h = dH Q / sqrt(Q^2 + qs^2) + r Q, a smooth sign
// function: within 0.5% of dH for |Q| >= 1 L/s, qs = 1e-4 m^3/s.
inline constexpr double kFixedLossSmoothingFlow_m3s = 1e-4;

inline constexpr double kPumpRegularisationFlow_m3s = 1e-6;

PipeLaw make_pipe_law(const Pipe& pipe, const HeadlossModel& model, const Fluid& fluid,
                      double hw_regularisation_flow_m3s);

struct LinkEval {
  double headloss_m = 0.0;
  double dh_dq = 0.0;   // s/m^2
  double reynolds = 0.0;
  double friction_factor = 0.0;  // Darcy f (equivalent f under Hazen-Williams)
  FlowRegime regime = FlowRegime::kNone;
};

// Partial update: once a link's flow Q has moved from the flow Q0 of its last evaluation by
// at most this relative difference d, h(Q) = h(Q0) + h'(Q0) (Q - Q0) may stand for a new
// evaluation. The error, h''(Q0) (Q - Q0)^2 / 2, is about d^2 h = 1e-16 h for a pipe (h'' is
// about 2h/Q^2 in turbulent flow, 0 in laminar), the round-off of an exact evaluation; dh/dQ
// keeps its value at Q0, 1e-8 relative off, which only a Newton step's direction sees.
inline constexpr double kUpdateRelativeFlow = 1e-8;

// `colebrook_x`: optional per-pipe warm start of the Colebrook root (see colebrook_friction).
LinkEval evaluate_pipe(const PipeLaw& law, double flow_m3s, double* colebrook_x = nullptr);

// evaluate_pipe in two parts, for callers that find many friction factors at once
// (colebrook_batch): whether `law` at `flow_m3s` is a Darcy-Weisbach pipe in turbulent flow
// (Re >= 4000), with *reynolds set; if so, turbulent_pipe gives evaluate_pipe's result from
// Colebrook's f and df/dRe at that Reynolds number.
// (Inline: the solver calls them for every pipe in every iteration.)
inline bool needs_colebrook(const PipeLaw& law, double flow_m3s, double* reynolds) {
  if (law.kind != LawKind::kDarcyWeisbach) return false;
  *reynolds = (flow_m3s < 0.0 ? -flow_m3s : flow_m3s) * law.reynolds_per_flow;
  return *reynolds >= kTurbulentLimitRe;
}
inline LinkEval turbulent_pipe(const PipeLaw& law, double flow_m3s, double reynolds, double f,
                               double df_dre) {
  // As evaluate_pipe's Darcy-Weisbach branch, with darcy_friction's turbulent regime.
  LinkEval e;
  const double q = flow_m3s < 0.0 ? -flow_m3s : flow_m3s;
  const double sign = flow_m3s < 0.0 ? -1.0 : 1.0;
  e.reynolds = reynolds;
  e.regime = FlowRegime::kTurbulent;
  e.friction_factor = f;
  double h = f * law.turbulent_coef * q * q;
  double dh = law.turbulent_coef * q * (2.0 * f + df_dre * reynolds);
  h += law.minor_coef * q * q;
  dh += 2.0 * law.minor_coef * q;
  e.headloss_m = sign * h;
  e.dh_dq = dh;
  return e;
}

// evaluate_pipe's result for a Darcy-Weisbach pipe in laminar flow (Re <= 2000, `reynolds` as
// needs_colebrook sets it): Hagen-Poiseuille plus the minor loss.
inline LinkEval laminar_pipe(const PipeLaw& law, double flow_m3s, double reynolds) {
  LinkEval e;
  const double q = flow_m3s < 0.0 ? -flow_m3s : flow_m3s;
  const double sign = flow_m3s < 0.0 ? -1.0 : 1.0;
  e.reynolds = reynolds;
  e.regime = q > 0.0 ? FlowRegime::kLaminar : FlowRegime::kNone;
  e.friction_factor = q > 0.0 ? 64.0 / reynolds : 0.0;
  double h = law.laminar_coef * q;
  double dh = law.laminar_coef;
  h += law.minor_coef * q * q;
  dh += 2.0 * law.minor_coef * q;
  e.headloss_m = sign * h;
  e.dh_dq = dh;
  return e;
}

}  // namespace gradeline
