#include "hydraulics/link_law.h"

#include <cmath>

#include "hydraulics/friction.h"

namespace gradeline {
namespace {
constexpr double kPi = 3.14159265358979323846;
}

PipeLaw make_pipe_law(const Pipe& pipe, const HeadlossModel& model, const Fluid& fluid,
                      double hw_regularisation_flow_m3s) {
  PipeLaw p;
  if (pipe.is_pump()) {
    const double s = pipe.control().speed;
    const PumpCurve& c = pipe.control().curve;
    p.kind = LawKind::kPump;
    p.pump.gain_m = c.shutoff_head_m * s * s;
    p.pump.coefficient = c.coefficient * std::pow(s, 2.0 - c.exponent);
    p.pump.exponent = c.exponent;
    return p;
  }
  if (pipe.is_valve()) {
    const double d = pipe.diameter_m;
    p.kind = LawKind::kValve;
    p.area_m2 = kPi * d * d / 4.0;
    p.minor_coef = pipe.minor_k / (2.0 * kGravity_ms2 * p.area_m2 * p.area_m2);
    p.laminar_coef = kValveLinearResistance;
    p.fixed_loss_m = pipe.control().valve_loss_m;
    return p;
  }
  const double d = pipe.diameter_m;
  const double a = kPi * d * d / 4.0;
  p.area_m2 = a;
  p.reynolds_per_flow = d / (fluid.kinematic_viscosity_m2s * a);
  p.turbulent_coef = pipe.length_m / (2.0 * kGravity_ms2 * d * a * a);
  p.laminar_coef = 32.0 * fluid.kinematic_viscosity_m2s * pipe.length_m / (kGravity_ms2 * d * d * a);
  p.minor_coef = pipe.minor_k / (2.0 * kGravity_ms2 * a * a);
  if (model.law == HeadlossLaw::kHazenWilliams) {
    const double c = pipe.cfactor.value_or(100.0);
    p.kind = LawKind::kHazenWilliams;
    p.hw.exponent = model.hw_flow_exponent;
    p.hw.coef = model.hw_coefficient * pipe.length_m /
                (std::pow(c, model.hw_flow_exponent) * std::pow(d, model.hw_diameter_exponent));
    p.hw.q0_m3s = hw_regularisation_flow_m3s;
  } else {
    p.relative_roughness = pipe.roughness_m.value_or(0.0) / d;
  }
  return p;
}

LinkEval evaluate_pipe(const PipeLaw& p, double flow, double* colebrook_x) {
  LinkEval e;
  if (p.is_valve()) {
    const double q = std::abs(flow);
    e.headloss_m = p.minor_coef * q * flow + p.laminar_coef * flow;
    e.dh_dq = 2.0 * p.minor_coef * q + p.laminar_coef;
    if (p.fixed_loss_m > 0.0) {
      const double qs2 = kFixedLossSmoothingFlow_m3s * kFixedLossSmoothingFlow_m3s;
      const double root = std::sqrt(flow * flow + qs2);
      e.headloss_m += p.fixed_loss_m * flow / root;
      e.dh_dq += p.fixed_loss_m * qs2 / (root * root * root);
    }
    return e;
  }
  if (p.is_pump()) {
    const double q0 = kPumpRegularisationFlow_m3s;
    const double c = p.pump.exponent;
    const double sq = flow * flow + q0 * q0;
    const double base = p.pump.coefficient * std::pow(sq, 0.5 * (c - 3.0));
    e.headloss_m = -p.pump.gain_m + base * sq * flow;
    e.dh_dq = base * (c * flow * flow + q0 * q0);
    return e;
  }
  double reynolds = 0.0;
  if (needs_colebrook(p, flow, &reynolds)) {
    const ColebrookSolution c = colebrook_friction(reynolds, p.relative_roughness, colebrook_x);
    return turbulent_pipe(p, flow, reynolds, c.f, c.df_dre);
  }
  if (p.kind == LawKind::kDarcyWeisbach && reynolds <= kLaminarLimitRe) {
    return laminar_pipe(p, flow, reynolds);
  }
  const double q = std::abs(flow);
  const double sign = flow < 0.0 ? -1.0 : 1.0;
  e.reynolds = q * p.reynolds_per_flow;
  double h = 0.0;
  double dh = 0.0;
  if (p.kind == LawKind::kDarcyWeisbach) {  // transitional, 2000 < Re < 4000
    FrictionFactor f = darcy_friction(e.reynolds, p.relative_roughness, colebrook_x);
    h = f.f * p.turbulent_coef * q * q;
    dh = p.turbulent_coef * q * (2.0 * f.f + f.df_dre * e.reynolds);
    e.regime = f.regime;
    e.friction_factor = f.f;
  } else {
    const double n = p.hw.exponent;
    const double q0 = p.hw.q0_m3s;
    const double s = q * q + q0 * q0;
    const double base = p.hw.coef * std::pow(s, 0.5 * (n - 3.0));
    h = base * s * q;
    dh = base * (n * q * q + q0 * q0);
    if (q > 0.0) {
      e.friction_factor = h / (p.turbulent_coef * q * q);
      e.regime = e.reynolds <= kLaminarLimitRe    ? FlowRegime::kLaminar
                 : e.reynolds < kTurbulentLimitRe ? FlowRegime::kTransitional
                                                  : FlowRegime::kTurbulent;
    }
  }
  h += p.minor_coef * q * q;
  dh += 2.0 * p.minor_coef * q;
  e.headloss_m = sign * h;
  e.dh_dq = dh;
  return e;
}

}  // namespace gradeline
