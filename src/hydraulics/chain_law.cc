#include "hydraulics/chain_law.h"

namespace gradeline {

LinkEval ChainLaws::evaluate(std::size_t c, double flow_m3s) {
  LinkEval out;
  for (std::uint32_t i = start[c]; i < start[c + 1]; ++i) {
    const LinkEval e = evaluate_pipe(law[i], flow_m3s - offset_m3s[i], &colebrook_x[i]);
    out.headloss_m += e.headloss_m;
    out.dh_dq += e.dh_dq;
  }
  return out;
}

double ChainLaws::cold_start_flow(std::size_t c, double velocity_ms) const {
  double sum = 0.0, weights = 0.0;
  for (std::uint32_t i = start[c]; i < start[c + 1]; ++i) {
    const double w = law[i].turbulent_coef;  // proportional to L / D^5
    sum += w * (sign[i] * velocity_ms * law[i].area_m2 + offset_m3s[i]);
    weights += w;
  }
  return sum / weights;
}

}  // namespace gradeline
