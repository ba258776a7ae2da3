#include "model/water.h"

#include <cmath>

namespace gradeline {

double water_density_kgm3(double t) {
  constexpr double a1 = -3.983035;   // C
  constexpr double a2 = 301.797;     // C
  constexpr double a3 = 522528.9;    // C^2
  constexpr double a4 = 69.34881;    // C
  constexpr double a5 = 999.974950;  // kg/m^3
  return a5 * (1.0 - (t + a1) * (t + a1) * (t + a2) / (a3 * (t + a4)));
}

double iapws2008_viscosity_pas(double temperature_k, double density_kgm3) {
  constexpr double kCriticalTemperature_k = 647.096;
  constexpr double kCriticalDensity_kgm3 = 322.0;
  const double tr = temperature_k / kCriticalTemperature_k;
  const double dr = density_kgm3 / kCriticalDensity_kgm3;

  // IAPWS 2008, eq. (11): the dilute-gas limit.
  constexpr double h0[4] = {1.67752, 2.20462, 0.6366564, -0.241605};
  double denominator = 0.0;
  for (int i = 0; i < 4; ++i) denominator += h0[i] / std::pow(tr, i);
  const double mu0 = 100.0 * std::sqrt(tr) / denominator;

  // IAPWS 2008, eq. (12), table 2: the residual contribution, H[i][j].
  constexpr double h1[6][7] = {
      {5.20094e-1, 2.22531e-1, -2.81378e-1, 1.61913e-1, -3.25372e-2, 0.0, 0.0},
      {8.50895e-2, 9.99115e-1, -9.06851e-1, 2.57399e-1, 0.0, 0.0, 0.0},
      {-1.08374, 1.88797, -7.72479e-1, 0.0, 0.0, 0.0, 0.0},
      {-2.89555e-1, 1.26613, -4.89837e-1, 0.0, 6.98452e-2, 0.0, -4.35673e-3},
      {0.0, 0.0, -2.57040e-1, 0.0, 0.0, 8.72102e-3, 0.0},
      {0.0, 1.20573e-1, 0.0, 0.0, 0.0, 0.0, -5.93264e-4},
  };
  double sum = 0.0;
  for (int i = 0; i < 6; ++i) {
    for (int j = 0; j < 7; ++j) {
      sum += h1[i][j] * std::pow(1.0 / tr - 1.0, i) * std::pow(dr - 1.0, j);
    }
  }
  const double mu1 = std::exp(dr * sum);
  return mu0 * mu1 * 1e-6;  // the release gives mu in micro-pascal seconds
}

double water_dynamic_viscosity_pas(double temperature_c) {
  return iapws2008_viscosity_pas(temperature_c + 273.15, water_density_kgm3(temperature_c));
}

double water_kinematic_viscosity_m2s(double temperature_c) {
  return water_dynamic_viscosity_pas(temperature_c) / water_density_kgm3(temperature_c);
}

}  // namespace gradeline
