// Unit conversions at the input boundary. Exact factors are those of NIST Special Publication
// 811 (2008), appendix B: 1 ft = 0.3048 m and 1 in = 0.0254 m exactly (the 1959 international
// yard), 1 US gallon = 231 in^3 = 3.785411784 L exactly, 1 psi = 6894.757 Pa (lbf/in^2).
#include <doctest/doctest.h>

#include <cstdlib>
#include <cstring>
#include <random>
#include <string>

#include "model/units.h"

using namespace gradeline;

namespace {
constexpr double kExact = 1e-15;  // relative: factors are exact or exactly derived

double si(const char* text, Dimension d, UnitSystem s = UnitSystem::kSI) {
  UnitParse p = parse_quantity(text, d, s);
  REQUIRE_MESSAGE(p.ok, p.error);
  return p.quantity.value;
}
}  // namespace

TEST_CASE("lengths convert with the exact NIST SP 811 factors") {
  CHECK(si("410m", Dimension::kLength) == doctest::Approx(410.0).epsilon(kExact));
  CHECK(si("1ft", Dimension::kLength) == doctest::Approx(0.3048).epsilon(kExact));
  CHECK(si("8in", Dimension::kDiameter) == doctest::Approx(0.2032).epsilon(kExact));
  CHECK(si("250mm", Dimension::kDiameter) == doctest::Approx(0.25).epsilon(kExact));
  CHECK(si("2.5km", Dimension::kLength) == doctest::Approx(2500.0).epsilon(kExact));
  CHECK(si("0.26mm", Dimension::kRoughness) == doctest::Approx(0.26e-3).epsilon(kExact));
}

TEST_CASE("bare numbers take the defaults of the unit system") {
  CHECK(si("300", Dimension::kDiameter) == doctest::Approx(0.3).epsilon(kExact));
  CHECK(si("12", Dimension::kDiameter, UnitSystem::kUS) == doctest::Approx(0.3048).epsilon(kExact));
  CHECK(si("100", Dimension::kLength, UnitSystem::kUS) == doctest::Approx(30.48).epsilon(kExact));
  CHECK(si("5", Dimension::kFlow) == doctest::Approx(5e-3).epsilon(kExact));
  CHECK(si("60", Dimension::kFlow, UnitSystem::kUS) ==
        doctest::Approx(3.785411784e-3).epsilon(kExact));
}

TEST_CASE("every required flow unit converts (US gallon = 3.785411784 L exactly)") {
  CHECK(si("3.2L/s", Dimension::kFlow) == doctest::Approx(3.2e-3).epsilon(kExact));
  CHECK(si("60L/min", Dimension::kFlow) == doctest::Approx(1e-3).epsilon(kExact));
  CHECK(si("1m3/s", Dimension::kFlow) == doctest::Approx(1.0).epsilon(kExact));
  CHECK(si("120m3/h", Dimension::kFlow) == doctest::Approx(120.0 / 3600.0).epsilon(kExact));
  CHECK(si("86.4ML/d", Dimension::kFlow) == doctest::Approx(1.0).epsilon(kExact));
  CHECK(si("35gpm", Dimension::kFlow) ==
        doctest::Approx(35 * 3.785411784e-3 / 60).epsilon(kExact));
  CHECK(si("2MGD", Dimension::kFlow) ==
        doctest::Approx(2e6 * 3.785411784e-3 / 86400).epsilon(kExact));
  CHECK(si("1cfs", Dimension::kFlow) == doctest::Approx(0.028316846592).epsilon(kExact));
}

TEST_CASE("unit names match without regard to case") {
  CHECK(si("3.2l/s", Dimension::kFlow) == si("3.2L/s", Dimension::kFlow));
  CHECK(si("3.2LPS", Dimension::kFlow) == si("3.2L/s", Dimension::kFlow));
  CHECK(si("2mgd", Dimension::kFlow) == si("2MGD", Dimension::kFlow));
  CHECK(si("400KPA", Dimension::kPressure) == si("400kPa", Dimension::kPressure));
}

TEST_CASE("pressures convert to pascals, and a length unit means a head") {
  CHECK(si("400kPa", Dimension::kPressure) == doctest::Approx(400e3).epsilon(kExact));
  CHECK(si("60psi", Dimension::kPressure) ==
        doctest::Approx(60 * 6894.757293168361).epsilon(kExact));
  CHECK(si("3.5bar", Dimension::kPressure) == doctest::Approx(3.5e5).epsilon(kExact));
  UnitParse head = parse_quantity("30m", Dimension::kPressure, UnitSystem::kSI);
  REQUIRE(head.ok);
  CHECK(head.quantity.is_head);
  CHECK(head.quantity.value == 30.0);
}

TEST_CASE("temperatures are stored in degrees Celsius") {
  CHECK(si("15C", Dimension::kTemperature) == 15.0);
  CHECK(si("59F", Dimension::kTemperature) == doctest::Approx(15.0).epsilon(1e-14));
  CHECK(si("288.15K", Dimension::kTemperature) == doctest::Approx(15.0).epsilon(1e-13));
}

TEST_CASE("a unit of another dimension is refused with the list of valid units") {
  UnitParse p = parse_quantity("250kPa", Dimension::kDiameter, UnitSystem::kSI);
  CHECK_FALSE(p.ok);
  CHECK(p.error ==
        "bad unit 'kPa' in '250kPa': expected a diameter (m, km, cm, mm, ft, in, yd, mi)");
}

TEST_CASE("non-finite and malformed numbers are refused") {
  for (const char* text : {"nan", "inf", "0x10", "-infinity", "m", ".", "1e999"}) {
    UnitParse p = parse_quantity(text, Dimension::kLength, UnitSystem::kSI);
    CHECK_MESSAGE(!p.ok, text);
  }
  CHECK(parse_quantity("1e999", Dimension::kLength, UnitSystem::kSI).error ==
        "'1e999' is not a finite number");
  CHECK(parse_quantity("abc", Dimension::kLength, UnitSystem::kSI).error == "'abc' is not a number");
}

TEST_CASE("an exponent needs digits, so 5e is a number with an unknown unit") {
  UnitParse p = parse_quantity("5e", Dimension::kLength, UnitSystem::kSI);
  CHECK_FALSE(p.ok);
  CHECK(si("1e3m", Dimension::kLength) == 1000.0);
  CHECK(si("1.0e-6m2/s", Dimension::kViscosity) == doctest::Approx(1e-6).epsilon(kExact));
}

TEST_CASE("decimals read to the double nearest them, as glibc's strtod reads them") {
  // strtod (glibc) rounds correctly; the reader's quick path (m / 10^k, both exact) must give
  // the same double, bit for bit, and so must its fall-back for longer numbers and exponents.
  std::mt19937_64 rng(42);
  for (int trial = 0; trial < 200000; ++trial) {
    std::string text = rng() % 4 == 0 ? "-" : "";
    const int digits = 1 + static_cast<int>(rng() % 18);
    const int point = static_cast<int>(rng() % (digits + 2)) - 1;  // -1: none; digits: at the end
    for (int i = 0; i < digits; ++i) {
      if (i == point) text += i == 0 ? "0." : ".";
      text += static_cast<char>('0' + rng() % 10);
    }
    if (point == digits) text += ".";
    if (trial % 7 == 0) text += "e" + std::to_string(static_cast<int>(rng() % 40) - 20);
    double ours = 0.0;
    REQUIRE_MESSAGE(parse_number(text, &ours), text);
    const double reference = std::strtod(text.c_str(), nullptr);
    CAPTURE(text);
    REQUIRE(std::memcmp(&ours, &reference, sizeof ours) == 0);
  }
  // Values at the quick path's limits: 2^53 - 1 and 2^53 digits, 22 places, negative zero.
  for (const char* text : {"9007199254740991", "9007199254740993", "0.0000000000000000000001",
                           "1.2345678901234567", "-0", "-0.0", "5.", "0.1", "0.3", "100.0000"}) {
    double ours = 0.0;
    REQUIRE(parse_number(text, &ours));
    const double reference = std::strtod(text, nullptr);
    CAPTURE(text);
    CHECK(std::memcmp(&ours, &reference, sizeof ours) == 0);
  }
}
