// The report of `gradeline compare`: per case, the nodes whose pressure changed most, the nodes
// the changes fixed, those still failing and those newly failing; then the length of new or
// resized pipe by diameter.
#pragma once

#include <string>

#include "analysis/compare.h"
#include "io/json_stream.h"

namespace gradeline {

std::string compare_text(const Network& before, const Comparison& comparison,
                         const std::string& title, std::size_t max_rows = 15);

void write_compare_json(const Comparison& comparison, JsonStream* json);

}  // namespace gradeline
