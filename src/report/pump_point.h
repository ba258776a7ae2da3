// A pump's operating point as reported: head gain, hydraulic power rho g Q H (W), and whether
// the point lies on the curve's range (0 <= Q <= the largest flow given, scaled by the speed).
#pragma once

#include "gradeline/network.h"
#include "gradeline/solve_summary.h"

namespace gradeline {

struct PumpPoint {
  const char* mode = "running";  // running | off | closed (non-return)
  double head_gain_m = 0.0;
  double hydraulic_power_w = 0.0;
  bool on_curve = true;
};

inline PumpPoint pump_point(const Network& net, const Pipe& p, const LinkState& ls) {
  PumpPoint out;
  if (!ls.open) {
    out.mode = p.status == LinkStatus::kClosed ? "off" : "closed (non-return)";
    return out;
  }
  out.head_gain_m = -ls.headloss_m;
  out.hydraulic_power_w = net.fluid.density_kgm3 * kGravity_ms2 * ls.flow_m3s * out.head_gain_m;
  out.on_curve = ls.flow_m3s >= 0.0 && ls.flow_m3s <= p.control().curve.max_curve_flow_m3s * p.control().speed * (1 + 1e-12);
  return out;
}

}  // namespace gradeline
