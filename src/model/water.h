// Properties of liquid water at atmospheric pressure (0.101325 MPa), 0-40 C.
//
// Density: Tanaka, Girard, Davis, Peuto & Bignell (2001), "Recommended table for the density of
//   water between 0 C and 40 C based on recent experimental reports", Metrologia 38, 301-309:
//   rho = a5 * (1 - (t + a1)^2 (t + a2) / (a3 (t + a4))), t in C, rho in kg/m^3.
//   (Air-free water of standard isotopic composition.)
// Dynamic viscosity: IAPWS (2008), "Release on the IAPWS Formulation 2008 for the Viscosity of
//   Ordinary Water Substance", mu = mu0(T) * mu1(T, rho); the critical enhancement mu2 is 1
//   to far better than 1e-6 this far from the critical point.
// Kinematic viscosity nu = mu / rho, m^2/s.
#pragma once

namespace gradeline {

inline constexpr double kWaterMinTemperature_c = 0.0;
inline constexpr double kWaterMaxTemperature_c = 40.0;

double water_density_kgm3(double temperature_c);
double water_dynamic_viscosity_pas(double temperature_c);
// The IAPWS 2008 equations at a given temperature (K) and density (kg/m^3), without mu2.
double iapws2008_viscosity_pas(double temperature_k, double density_kgm3);
double water_kinematic_viscosity_m2s(double temperature_c);

}  // namespace gradeline
