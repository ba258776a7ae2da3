// Change sets: a separate file of edits applied, in order, to a network that was read without
// error. The network file itself is never edited.
//
//   title Upsize the Mill Road main
//   modify P7 diameter=300mm roughness=0.0015mm    # any pipe key; the element must exist
//   modify node N4 demand=2.5L/s                   # a kind word settles an ID used twice
//   close P9
//   open P11
//   add pipe P40 N3 N18 length=220m diameter=200mm roughness=0.1mm
//   add node N90 elevation=61m demand=0.8L/s
//   remove P12
//
// Errors are reported as CHANGES:LINE: error: message, like network errors.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "gradeline/network.h"
#include "io/diagnostics.h"

namespace gradeline {

struct ChangeResult {
  std::vector<Diagnostic> errors;
  bool truncated = false;
  std::string title;
  int changes = 0;  // statements applied

  bool ok() const { return errors.empty(); }
};

ChangeResult apply_change_file(const std::string& path, Network* network);
ChangeResult apply_change_text(std::string_view text, const std::string& file_name,
                               Network* network);

}  // namespace gradeline
