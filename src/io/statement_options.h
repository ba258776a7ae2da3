// Reading the key=value pairs of one statement: unknown and repeated keys are reported with a
// suggestion, and values are converted to SI with their range checked.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "gradeline/network.h"
#include "io/diagnostics.h"
#include "io/lexer.h"
#include "model/units.h"

namespace gradeline {

struct Range {
  double min = 0.0;      // SI
  double max = 0.0;      // SI
  bool min_inclusive = false;
  const char* max_text = "";  // the bound as written in messages, e.g. "20 m"
};

// Whether `value` (SI) lies in `range`.
inline bool within(double value, const Range& range) {
  const bool below = range.min_inclusive ? value < range.min : value <= range.min;
  return !below && value <= range.max;
}

class StatementOptions {
 public:
  // Reports every key of `statement` that is not in `allowed`, and every repeated key other
  // than those in `repeatable`. An allowed entry ending in '.' admits any key with that prefix
  // ("factor." admits "factor.residential").
  StatementOptions(const Statement& statement, const std::vector<std::string>& allowed,
                   const std::string& file, UnitSystem units, Diagnostics* diagnostics,
                   const std::vector<std::string>& repeatable = {});

  bool has(std::string_view key) const { return find(key) != nullptr; }
  // The value of `key` (a view into the line), or null when absent.
  const std::string_view* find(std::string_view key) const;
  // Every value of a repeatable key, in file order.
  std::vector<std::string> all(std::string_view key) const;
  // (suffix, value) of every key that starts with `prefix`.
  std::vector<std::pair<std::string, std::string>> with_prefix(std::string_view prefix) const;
  // Parses `text` (not necessarily a key's whole value) as a quantity; reports errors under `key`.
  std::optional<double> parse(std::string_view key, std::string_view text, Dimension dimension,
                              const Range& range);

  // The value as a quantity of `dimension`, in SI; nullopt (with an error reported) when it is
  // missing, malformed or outside `range`.
  std::optional<double> quantity(std::string_view key, Dimension dimension, const Range& range);
  std::optional<Quantity> raw_quantity(std::string_view key, Dimension dimension);
  void error(std::string message);

 private:
  const Statement& statement_;
  const std::string& file_;
  UnitSystem units_;
  Diagnostics* diagnostics_;
};

}  // namespace gradeline
