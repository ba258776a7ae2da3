// Darcy friction factor f of full pipe flow (the Moody diagram).
//
// Laminar, Re <= 2000: f = 64 / Re (Hagen-Poiseuille).
// Turbulent, Re >= 4000: the Colebrook-White equation (Colebrook, 1939),
//     1/sqrt(f) = -2 log10( (e/D)/3.7 + 2.51 / (Re sqrt(f)) ),
//   solved exactly by Newton's method on x = 1/sqrt(f), started from Swamee-Jain. Valid for
//   4e3 <= Re <= 1e8 and 0 <= e/D <= 0.05 (the range of the Moody diagram).
// Transitional, 2000 < Re < 4000: a cubic Hermite interpolation in Re between the laminar law
//   at Re = 2000 and Colebrook at Re = 4000, matching value and slope df/dRe at both ends, so f
//   and the head loss are continuously differentiable through the transition. The physics here
//   is intermittent; the cubic only keeps Newton's method well behaved, and results in this band
//   are flagged "transitional" in reports.
// Swamee & Jain (1976), J. Hydraulics Div. ASCE 102(5):
//     f = 0.25 / [log10( (e/D)/3.7 + 5.74 / Re^0.9 )]^2,
//   explicit; for 1e-6 <= e/D <= 1e-2 and 5e3 <= Re <= 1e8 within 1.5% of Colebrook up to
//   e/D = 1e-3 and within 3% at the rough, low-Re corner (measured in tests/friction_test.cc).
//   Used only as the starting point of the exact solution.
#pragma once

#include "gradeline/solve_summary.h"

namespace gradeline {

inline constexpr double kLaminarLimitRe = 2000.0;
inline constexpr double kTurbulentLimitRe = 4000.0;

// Explicit approximation; Re > 0.
double swamee_jain_friction(double reynolds, double relative_roughness);

struct ColebrookSolution {
  double f = 0.0;
  double df_dre = 0.0;  // exact derivative by implicit differentiation
  int iterations = 0;
};

// Exact Colebrook-White solution; Re > 0, relative roughness >= 0. `x_hint`, when given and
// positive, is a previous root x = 1/sqrt(f) of the same pipe (Newton then starts there instead
// of at Swamee-Jain); the new root is stored back. Newton stops once a step is below 1e-8 x:
// the error left is about |F''/2F'| step^2 <= 0.05 (1e-8 x)^2, below 1e-15 x for x <= 20.
ColebrookSolution colebrook_friction(double reynolds, double relative_roughness,
                                     double* x_hint = nullptr);

struct FrictionFactor {
  double f = 0.0;
  double df_dre = 0.0;
  FlowRegime regime = FlowRegime::kNone;
};

// f over all regimes, with df/dRe. Re > 0. `x_hint` as for colebrook_friction (turbulent only).
FrictionFactor darcy_friction(double reynolds, double relative_roughness, double* x_hint = nullptr);

}  // namespace gradeline
