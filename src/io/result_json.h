// The JSON form of a solve result (docs/json.md). Keys are SI with the unit in the key name;
// other tools rely on them. Values that are not defined (the head of an unsupplied node) are
// written as null.
#pragma once

#include <functional>
#include <string>

#include "gradeline/network.h"
#include "gradeline/solve_summary.h"
#include "io/json_stream.h"

namespace gradeline {

// Writes the result object {"summary", "nodes", "links"} to `json`; `more` may add fields
// before the object closes.
void write_result_json(const Network& network, const SolveResult& result, JsonStream* json,
                       const std::function<void(JsonStream*)>& more = {});

std::string result_json_text(const Network& network, const SolveResult& result);

}  // namespace gradeline
