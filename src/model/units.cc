#include "model/units.h"

#include <cctype>
#include <charconv>
#include <cmath>
#include <cstdint>

namespace gradeline {
namespace {

constexpr double kFoot_m = 0.3048;
constexpr double kInch_m = 0.0254;
constexpr double kUsGallon_m3 = 3.785411784e-3;
constexpr double kPsi_pa = 6894.757293168361;
constexpr double kPound_kg = 0.45359237;

struct UnitEntry {
  const char* name;  // lower case
  Dimension dimension;
  double factor;     // SI = value * factor + offset
  double offset;
  bool is_head;
};

constexpr UnitEntry kUnits[] = {
    // Lengths. A length unit also stands for a diameter, a roughness or a pressure head.
    {"m", Dimension::kLength, 1.0, 0.0, false},
    {"km", Dimension::kLength, 1000.0, 0.0, false},
    {"cm", Dimension::kLength, 0.01, 0.0, false},
    {"mm", Dimension::kLength, 0.001, 0.0, false},
    {"ft", Dimension::kLength, kFoot_m, 0.0, false},
    {"in", Dimension::kLength, kInch_m, 0.0, false},
    {"yd", Dimension::kLength, 3 * kFoot_m, 0.0, false},
    {"mi", Dimension::kLength, 1609.344, 0.0, false},
    // Flows.
    {"m3/s", Dimension::kFlow, 1.0, 0.0, false},
    {"cms", Dimension::kFlow, 1.0, 0.0, false},
    {"m3/h", Dimension::kFlow, 1.0 / 3600.0, 0.0, false},
    {"m3/d", Dimension::kFlow, 1.0 / 86400.0, 0.0, false},
    {"l/s", Dimension::kFlow, 1e-3, 0.0, false},
    {"lps", Dimension::kFlow, 1e-3, 0.0, false},
    {"l/min", Dimension::kFlow, 1e-3 / 60.0, 0.0, false},
    {"lpm", Dimension::kFlow, 1e-3 / 60.0, 0.0, false},
    {"ml/d", Dimension::kFlow, 1e3 / 86400.0, 0.0, false},  // megalitres: no millilitres here
    {"mld", Dimension::kFlow, 1e3 / 86400.0, 0.0, false},
    {"gpm", Dimension::kFlow, kUsGallon_m3 / 60.0, 0.0, false},
    {"mgd", Dimension::kFlow, 1e6 * kUsGallon_m3 / 86400.0, 0.0, false},
    {"cfs", Dimension::kFlow, kFoot_m * kFoot_m * kFoot_m, 0.0, false},
    {"ft3/s", Dimension::kFlow, kFoot_m * kFoot_m * kFoot_m, 0.0, false},
    // Pressures.
    {"pa", Dimension::kPressure, 1.0, 0.0, false},
    {"kpa", Dimension::kPressure, 1e3, 0.0, false},
    {"mpa", Dimension::kPressure, 1e6, 0.0, false},
    {"bar", Dimension::kPressure, 1e5, 0.0, false},
    {"psi", Dimension::kPressure, kPsi_pa, 0.0, false},
    // Temperatures, stored in C.
    {"c", Dimension::kTemperature, 1.0, 0.0, false},
    {"degc", Dimension::kTemperature, 1.0, 0.0, false},
    {"f", Dimension::kTemperature, 5.0 / 9.0, -32.0 * 5.0 / 9.0, false},
    {"degf", Dimension::kTemperature, 5.0 / 9.0, -32.0 * 5.0 / 9.0, false},
    {"k", Dimension::kTemperature, 1.0, -273.15, false},
    // Kinematic viscosities.
    {"m2/s", Dimension::kViscosity, 1.0, 0.0, false},
    {"mm2/s", Dimension::kViscosity, 1e-6, 0.0, false},
    {"cst", Dimension::kViscosity, 1e-6, 0.0, false},
    {"ft2/s", Dimension::kViscosity, kFoot_m * kFoot_m, 0.0, false},
    // Densities.
    {"kg/m3", Dimension::kDensity, 1.0, 0.0, false},
    {"g/cm3", Dimension::kDensity, 1000.0, 0.0, false},
    {"lb/ft3", Dimension::kDensity, kPound_kg / (kFoot_m * kFoot_m * kFoot_m), 0.0, false},
    // Velocities.
    {"m/s", Dimension::kVelocity, 1.0, 0.0, false},
    {"ft/s", Dimension::kVelocity, kFoot_m, 0.0, false},
    {"fps", Dimension::kVelocity, kFoot_m, 0.0, false},
};

// The dimension whose units a value of `d` is written in.
Dimension unit_family(Dimension d) {
  switch (d) {
    case Dimension::kDiameter:
    case Dimension::kRoughness:
      return Dimension::kLength;
    default:
      return d;
  }
}

const char* default_unit(Dimension d, UnitSystem s) {
  const bool si = s == UnitSystem::kSI;
  switch (d) {
    case Dimension::kLength: return si ? "m" : "ft";
    case Dimension::kDiameter:
    case Dimension::kRoughness: return si ? "mm" : "in";
    case Dimension::kFlow: return si ? "l/s" : "gpm";
    case Dimension::kPressure: return si ? "kpa" : "psi";
    case Dimension::kTemperature: return si ? "c" : "f";
    case Dimension::kViscosity: return si ? "m2/s" : "ft2/s";
    case Dimension::kDensity: return si ? "kg/m3" : "lb/ft3";
    case Dimension::kVelocity: return si ? "m/s" : "ft/s";
    case Dimension::kDimensionless: return "";
  }
  return "";
}

bool equal_ignoring_case(std::string_view a, const char* lower) {
  std::size_t i = 0;
  for (; i < a.size(); ++i) {
    const char c = a[i] >= 'A' && a[i] <= 'Z' ? static_cast<char>(a[i] - 'A' + 'a') : a[i];
    if (lower[i] == '\0' || c != lower[i]) {
      return false;
    }
  }
  return lower[i] == '\0';
}

const UnitEntry* find_unit(std::string_view name) {
  for (const UnitEntry& u : kUnits) {
    if (equal_ignoring_case(name, u.name)) return &u;
  }
  return nullptr;
}

bool is_digit(char c) { return static_cast<unsigned char>(c) - unsigned{'0'} < 10; }

// Length of the leading decimal number: [+-]digits[.digits][(e|E)[+-]digits].
std::size_t scan_number(std::string_view s) {
  std::size_t i = 0;
  if (i < s.size() && (s[i] == '+' || s[i] == '-')) ++i;
  std::size_t digits = 0;
  while (i < s.size() && is_digit(s[i])) ++i, ++digits;
  if (i < s.size() && s[i] == '.') {
    ++i;
    while (i < s.size() && is_digit(s[i])) ++i, ++digits;
  }
  if (digits == 0) return 0;
  if (i < s.size() && (s[i] == 'e' || s[i] == 'E')) {
    std::size_t j = i + 1;
    if (j < s.size() && (s[j] == '+' || s[j] == '-')) ++j;
    std::size_t exp_digits = 0;
    while (j < s.size() && is_digit(s[j])) ++j, ++exp_digits;
    if (exp_digits > 0) i = j;
  }
  return i;
}

// A decimal with no exponent, [-]digits[.digits], whose digits make an integer m below 2^53
// and with at most 22 after the point, is m / 10^k with both exactly representable: one IEEE
// division, correctly rounded, gives the double nearest the decimal, which is what
// std::from_chars gives (Clinger 1990, "How to read floating point numbers accurately",
// PLDI). Most values in network files are such; anything else goes to from_chars.
bool convert_short_decimal(std::string_view d, double* value) {
  static constexpr double kPowers[] = {1e0,  1e1,  1e2,  1e3,  1e4,  1e5,  1e6,  1e7,
                                       1e8,  1e9,  1e10, 1e11, 1e12, 1e13, 1e14, 1e15,
                                       1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22};
  constexpr std::uint64_t kExact = std::uint64_t{1} << 53;
  std::size_t i = 0;
  const bool negative = !d.empty() && d[0] == '-';
  i += negative;
  std::uint64_t m = 0;
  std::size_t digits = 0, after_point = 0;
  bool point = false;
  for (; i < d.size(); ++i) {
    const unsigned digit = static_cast<unsigned char>(d[i]) - unsigned{'0'};
    if (digit < 10) {
      if (++digits > 16) return false;  // m might pass 2^53
      m = m * 10 + digit;
      after_point += point;
    } else if (d[i] == '.' && !point) {
      point = true;
    } else {
      return false;  // an exponent
    }
  }
  if (digits == 0 || m >= kExact || after_point > 22) return false;
  const double magnitude = static_cast<double>(m) / kPowers[after_point];
  *value = negative ? -magnitude : magnitude;
  return true;
}

bool convert(std::string_view digits, double* value) {
  std::string_view d = digits;
  if (!d.empty() && d[0] == '+') d.remove_prefix(1);
  if (convert_short_decimal(d, value)) return true;
  auto [ptr, ec] = std::from_chars(d.data(), d.data() + d.size(), *value);
  return ec == std::errc() && ptr == d.data() + d.size() && std::isfinite(*value);
}

std::string join_names(Dimension d) {
  std::string out;
  for (const std::string& n : unit_names(d)) {
    if (!out.empty()) out += ", ";
    out += n;
  }
  return out;
}

}  // namespace

const char* dimension_name(Dimension d) {
  switch (d) {
    case Dimension::kLength: return "a length";
    case Dimension::kDiameter: return "a diameter";
    case Dimension::kRoughness: return "a roughness";
    case Dimension::kFlow: return "a flow";
    case Dimension::kPressure: return "a pressure";
    case Dimension::kTemperature: return "a temperature";
    case Dimension::kViscosity: return "a kinematic viscosity";
    case Dimension::kDensity: return "a density";
    case Dimension::kVelocity: return "a velocity";
    case Dimension::kDimensionless: return "a plain number";
  }
  return "a value";
}

bool parse_number(std::string_view text, double* value) {
  std::size_t n = scan_number(text);
  return n > 0 && n == text.size() && convert(text, value);
}

std::vector<std::string> unit_names(Dimension d) {
  std::vector<std::string> out;
  const Dimension family = unit_family(d);
  for (const UnitEntry& u : kUnits) {
    if (u.dimension == family || (d == Dimension::kPressure && u.dimension == Dimension::kLength &&
                                  (std::string_view(u.name) == "m" ||
                                   std::string_view(u.name) == "ft"))) {
      out.emplace_back(u.name);
    }
  }
  return out;
}

UnitParse parse_quantity(std::string_view text, Dimension dimension, UnitSystem system) {
  UnitParse result;
  const std::size_t n = scan_number(text);
  double number = 0.0;
  if (n == 0) {
    result.error = "'" + std::string(text) + "' is not a number";
    return result;
  }
  if (!convert(text.substr(0, n), &number)) {
    result.error = "'" + std::string(text) + "' is not a finite number";
    return result;
  }
  std::string_view unit = text.substr(n);
  if (dimension == Dimension::kDimensionless) {
    if (!unit.empty()) {
      result.error = "'" + std::string(text) + "' takes no unit";
      return result;
    }
    result.ok = true;
    result.quantity.value = number;
    return result;
  }
  if (unit.empty()) unit = default_unit(dimension, system);
  const UnitEntry* entry = find_unit(unit);
  const Dimension family = unit_family(dimension);
  bool fits = entry != nullptr && entry->dimension == family;
  bool head = false;
  if (entry != nullptr && dimension == Dimension::kPressure &&
      entry->dimension == Dimension::kLength) {
    fits = true;  // "30m": a pressure given as a head of the fluid
    head = true;
  }
  if (!fits) {
    result.error = "bad unit '" + std::string(unit) + "' in '" + std::string(text) +
                   "': expected " + dimension_name(dimension) + " (" + join_names(dimension) + ")";
    return result;
  }
  result.ok = true;
  result.quantity.value = number * entry->factor + entry->offset;
  result.quantity.is_head = head;
  return result;
}

DisplayUnit display_flow(UnitSystem s) {
  return s == UnitSystem::kSI ? DisplayUnit{"L/s", 1e3} : DisplayUnit{"gpm", 60.0 / kUsGallon_m3};
}
DisplayUnit display_length(UnitSystem s) {
  return s == UnitSystem::kSI ? DisplayUnit{"m", 1.0} : DisplayUnit{"ft", 1.0 / kFoot_m};
}
DisplayUnit display_diameter(UnitSystem s) {
  return s == UnitSystem::kSI ? DisplayUnit{"mm", 1e3} : DisplayUnit{"in", 1.0 / kInch_m};
}
DisplayUnit display_pressure(UnitSystem s) {
  return s == UnitSystem::kSI ? DisplayUnit{"kPa", 1e-3} : DisplayUnit{"psi", 1.0 / kPsi_pa};
}
DisplayUnit display_velocity(UnitSystem s) {
  return s == UnitSystem::kSI ? DisplayUnit{"m/s", 1.0} : DisplayUnit{"ft/s", 1.0 / kFoot_m};
}

}  // namespace gradeline
