// Units at the input and output boundary. Inside gradeline every quantity is SI.
//
// A value in a network file is a number with an optional unit glued to it ("250mm", "3.2L/s").
// A bare number takes the default unit of the file's unit system (see docs/units.md). Unit
// names are matched without regard to case, the way engineers write them ("L/s", "l/s", "LPS").
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "gradeline/network.h"

namespace gradeline {

enum class Dimension {
  kLength,       // pipe length, elevation, head: default m | ft
  kDiameter,     // default mm | in
  kRoughness,    // default mm | in
  kFlow,         // default L/s | gpm
  kPressure,     // default kPa | psi; a length unit means a head of the fluid
  kTemperature,  // default C | F; stored in C
  kViscosity,    // kinematic; default m2/s | ft2/s
  kDensity,      // default kg/m3 | lb/ft3
  kVelocity,     // default m/s | ft/s
  kDimensionless,
};

const char* dimension_name(Dimension d);

struct Quantity {
  double value = 0.0;    // SI (temperature in C; a pressure given as head: m of fluid)
  bool is_head = false;  // kPressure only: the value is a head in m, not pascals
};

struct UnitParse {
  bool ok = false;
  Quantity quantity;
  std::string error;  // when !ok
};

// Parses "NUMBER[UNIT]". Rejects hexadecimal, inf and nan, and units of another dimension.
UnitParse parse_quantity(std::string_view text, Dimension dimension, UnitSystem system);

// Parses a plain finite number with no unit.
bool parse_number(std::string_view text, double* value);

// The unit names accepted for a dimension, for messages and docs.
std::vector<std::string> unit_names(Dimension dimension);

// Output conversions for reports in the file's unit system.
struct DisplayUnit {
  const char* name;
  double per_si;  // display value = SI value * per_si
};
DisplayUnit display_flow(UnitSystem system);
DisplayUnit display_length(UnitSystem system);
DisplayUnit display_diameter(UnitSystem system);
DisplayUnit display_pressure(UnitSystem system);
DisplayUnit display_velocity(UnitSystem system);

}  // namespace gradeline
