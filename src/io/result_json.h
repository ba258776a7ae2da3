// The JSON form of a solve result. Keys are SI with the unit in the key name; other tools rely
// on the keys of docs/json.md. Values that are not defined (the head of an unsupplied node) are
// written as null.
#pragma once

#include <nlohmann/json.hpp>

#include "gradeline/network.h"
#include "gradeline/solve_summary.h"

namespace gradeline {

nlohmann::json result_to_json(const Network& network, const SolveResult& result);

}  // namespace gradeline
