// Violations of the design criteria, as text (in the file's units) and as JSON (SI).
#pragma once

#include <string>
#include <vector>

#include "analysis/criteria.h"
#include "io/json_stream.h"

namespace gradeline {

// A table of violations with case, element, quantity, value, limit and margin; `max_rows`
// bounds its length (the count is always given).
std::string violations_text(const Network& network, const std::vector<Violation>& violations,
                            std::size_t max_rows = 50);

// One line naming the criteria in force, or "" when there are none.
std::string criteria_line(const Network& network, const Criteria& criteria);

// Writes "violations": [{"case","id","quantity","value","limit","kind","unit",...}].
void write_violations_json(const Network& network, const std::vector<Violation>& violations,
                           JsonStream* json);

}  // namespace gradeline
