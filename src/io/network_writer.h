// Writes a Network in the gradeline format (version 1). Every value carries an explicit SI unit
// and the shortest decimal form that reads back to the same double, so
// parse(write(network)) reproduces the model exactly.
#pragma once

#include <string>

#include "gradeline/network.h"

namespace gradeline {

std::string write_network(const Network& network);

// Shortest decimal text that parses back to exactly `value`.
std::string exact_number(double value);

}  // namespace gradeline
