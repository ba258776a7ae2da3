// The bulk reader's quick path for the two statements that make up nearly every line of a large
// network file, in their plain form:
//   node ID [elevation=Z] [demand=Q[:CATEGORY]] [at=X,Y]
//   pipe ID FROM TO [length=L] [diameter=D] [roughness=E] [cfactor=C] [minor=K]
//        [status=open|closed] [check=yes|no] [resize=yes|no]
// fields separated by spaces or tabs, each key at most once, no comment and no other control
// character. Such a line is read into its default-constructed slot exactly as
// read_junction_in_place / read_pipe_in_place would (the same unit conversions, through
// parse_quantity, and the same range checks). Anything else, an error above all, makes the
// function return false having reported nothing; the caller then resets the slot and reads
// the line the general way, which gives any message. Neither function allocates.
#pragma once

#include <string_view>

#include "gradeline/network.h"
#include "io/element_reader.h"

namespace gradeline {

bool read_plain_junction(std::string_view line, int line_number, const ReadContext& c, Node* node);
bool read_plain_pipe(std::string_view line, int line_number, const ReadContext& c, Pipe* pipe,
                     PipeEnds* ends);

}  // namespace gradeline
