#include "hydraulics/friction.h"

#include <cmath>
#include <cstdint>
#include <cstring>

namespace gradeline {
namespace {
constexpr double kTwoOverLn10 = 2.0 / 2.302585092994045684;

// Colebrook's f and df/dRe at Re = 4000, the upper end of the transition, which depend on e/D
// alone. A network has few distinct e/D (a few commercial diameters per roughness), while a
// transitional pipe needs these values in every evaluation, so each thread keeps the last ones
// seen in a small direct-mapped table. An entry holds exactly what colebrook_friction returns
// for its e/D (the same call, cold), so results are those of calling it every time.
ColebrookSolution turbulent_edge(double rr) {
  struct Entry {
    double rr = -1.0;  // no e/D is negative: an empty entry matches nothing
    ColebrookSolution c;
  };
  constexpr int kBits = 8;
  thread_local Entry table[1 << kBits];
  std::uint64_t bits = 0;
  std::memcpy(&bits, &rr, sizeof bits);
  Entry& e = table[(bits * 0x9E3779B97F4A7C15ull) >> (64 - kBits)];
  if (!(e.rr == rr)) {
    e.c = colebrook_friction(kTurbulentLimitRe, rr);
    e.rr = rr;
  }
  return e.c;
}
}  // namespace

double swamee_jain_friction(double re, double rr) {
  const double l = std::log10(rr / 3.7 + 5.74 / std::pow(re, 0.9));
  return 0.25 / (l * l);
}

ColebrookSolution colebrook_friction(double re, double rr, double* x_hint) {
  // F(x) = x + 2 log10(a + b x) = 0, with x = 1/sqrt(f), a = (e/D)/3.7, b = 2.51/Re.
  // F is increasing and concave in x, so after the first step Newton's iterates approach the
  // root monotonically from below; Swamee-Jain starts within about 1% of it.
  const double a = rr / 3.7;
  const double b = 2.51 / re;
  // Swamee-Jain's f = 0.25 / l^2 gives x = 1/sqrt(f) = -2 l directly (l < 0), with
  // Re^0.9 = exp(0.9 ln Re).
  double x = x_hint != nullptr && *x_hint > 0.0
                 ? *x_hint
                 : -kTwoOverLn10 * std::log(a + 5.74 * std::exp(-0.9 * std::log(re)));
  ColebrookSolution out;
  double inner = a + b * x;
  double dF_dx = 1.0 + kTwoOverLn10 * b / inner;
  for (int i = 0; i < 50; ++i) {
    const double step = (x + kTwoOverLn10 * std::log(inner)) / dF_dx;
    x -= step;
    inner = a + b * x;
    dF_dx = 1.0 + kTwoOverLn10 * b / inner;
    out.iterations = i + 1;
    if (std::abs(step) <= 1e-8 * x) break;
  }
  if (x_hint != nullptr) *x_hint = x;
  const double dF_dre = -kTwoOverLn10 * b * x / (re * inner);  // db/dRe = -b/Re
  const double dx_dre = -dF_dre / dF_dx;
  out.f = 1.0 / (x * x);
  out.df_dre = -2.0 / (x * x * x) * dx_dre;
  return out;
}

FrictionFactor darcy_friction(double re, double rr, double* x_hint) {
  FrictionFactor out;
  if (re <= kLaminarLimitRe) {
    out.f = 64.0 / re;
    out.df_dre = -64.0 / (re * re);
    out.regime = FlowRegime::kLaminar;
    return out;
  }
  if (re >= kTurbulentLimitRe) {
    ColebrookSolution c = colebrook_friction(re, rr, x_hint);
    out.f = c.f;
    out.df_dre = c.df_dre;
    out.regime = FlowRegime::kTurbulent;
    return out;
  }
  // Cubic Hermite on [2000, 4000].
  const double f0 = 64.0 / kLaminarLimitRe;
  const double m0 = -64.0 / (kLaminarLimitRe * kLaminarLimitRe);
  const ColebrookSolution c = turbulent_edge(rr);
  const double f1 = c.f;
  const double m1 = c.df_dre;
  const double h = kTurbulentLimitRe - kLaminarLimitRe;
  const double t = (re - kLaminarLimitRe) / h;
  const double t2 = t * t;
  const double t3 = t2 * t;
  const double h00 = 2 * t3 - 3 * t2 + 1, h10 = t3 - 2 * t2 + t;
  const double h01 = -2 * t3 + 3 * t2, h11 = t3 - t2;
  const double d00 = 6 * t2 - 6 * t, d10 = 3 * t2 - 4 * t + 1;
  const double d01 = -6 * t2 + 6 * t, d11 = 3 * t2 - 2 * t;
  out.f = h00 * f0 + h10 * h * m0 + h01 * f1 + h11 * h * m1;
  out.df_dre = (d00 * f0 + d10 * h * m0 + d01 * f1 + d11 * h * m1) / h;
  out.regime = FlowRegime::kTransitional;
  return out;
}

}  // namespace gradeline
