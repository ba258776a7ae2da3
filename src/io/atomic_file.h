// Writes a file atomically: the text goes to a temporary file in the same folder, which is
// flushed and then renamed over the target, so a reader never sees a half-written file and a
// failed write leaves nothing behind.
#pragma once

#include <string>

namespace gradeline {

// False with a reason when the file cannot be written. The caller refuses output paths that
// name an input (see same_file).
bool write_file_atomically(const std::string& path, const std::string& text, std::string* error);

// True when `a` and `b` name the same existing file (or the same path when they do not exist).
bool same_file(const std::string& a, const std::string& b);

}  // namespace gradeline
