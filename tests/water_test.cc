// Water properties against python3-iapws (IAPWS-95 density, IAPWS 2008 viscosity) at
// 0.101325 MPa, 0-40 C: tests/reference/water_iapws.csv, made by
// tools/make_water_reference.py.
#include <doctest/doctest.h>

#include <cmath>

#include "model/water.h"
#include "test_support.h"

using namespace gradeline;

namespace {
// Tanaka et al. (2001) fit air-free water to 1 ppm; IAPWS-95 at 1 atm agrees with it to a few
// ppm over 0-40 C. The viscosity uses the same IAPWS 2008 equations with the Tanaka density.
constexpr double kDensityRelTol = 1e-5;
constexpr double kViscosityRelTol = 2e-5;
}  // namespace

TEST_CASE("density of water matches IAPWS-95 from python3-iapws, 0-40 C") {
  double worst = 0.0;
  for (const auto& row : testing::read_csv("tests/reference/water_iapws.csv")) {
    double rel = std::abs(water_density_kgm3(row[0]) / row[1] - 1.0);
    worst = std::max(worst, rel);
    CHECK_MESSAGE(rel < kDensityRelTol, "T = " << row[0]);
  }
  MESSAGE("worst relative density error vs iapws: " << worst);
}

TEST_CASE("kinematic viscosity of water matches IAPWS 2008 from python3-iapws, 0-40 C") {
  double worst = 0.0;
  for (const auto& row : testing::read_csv("tests/reference/water_iapws.csv")) {
    double rel = std::abs(water_kinematic_viscosity_m2s(row[0]) / row[3] - 1.0);
    worst = std::max(worst, rel);
    CHECK_MESSAGE(rel < kViscosityRelTol, "T = " << row[0]);
  }
  MESSAGE("worst relative viscosity error vs iapws: " << worst);
}

TEST_CASE("the IAPWS 2008 viscosity reproduces the release's own check values") {
  // IAPWS R12-08 (2008), table 4, computer-program verification values (mu2 = 1 here); the
  // values are from memory of the release, and the first is also the docstring example of
  // python3-iapws _Viscosity.
  CHECK(iapws2008_viscosity_pas(298.15, 998.0) == doctest::Approx(889.735100e-6).epsilon(1e-9));
  CHECK(iapws2008_viscosity_pas(298.15, 1200.0) == doctest::Approx(1437.649467e-6).epsilon(1e-9));
  CHECK(iapws2008_viscosity_pas(373.15, 1000.0) == doctest::Approx(307.883622e-6).epsilon(1e-9));
}
