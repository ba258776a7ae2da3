// The report of `gradeline size`: total cost; each changed pipe (old size, new size, length,
// cost) and what it bought; the minimum pressure per case; and the change set to apply.
#pragma once

#include <string>

#include "design/sizing.h"
#include "io/json_stream.h"

namespace gradeline {

std::string sizing_text(const Network& network, const Catalogue& catalogue, const SizingResult& r);
void write_sizing_json(const Network& network, const Catalogue& catalogue, const SizingResult& r,
                       JsonStream* json);
// A change set that `solve --apply` and `compare --apply` accept as it stands.
std::string sizing_change_set(const Network& network, const Catalogue& catalogue,
                              const SizingResult& r, const std::string& title);

}  // namespace gradeline
