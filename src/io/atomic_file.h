// Writes a file atomically: the text goes to a temporary file in the same folder, which is
// flushed and then renamed over the target, so a reader never sees a half-written file and a
// failed write leaves nothing behind.
#pragma once

#include <string>
#include <string_view>

namespace gradeline {

// A file written in pieces and then put in place atomically; abandoned (the temporary removed)
// unless commit() succeeds.
class AtomicFile {
 public:
  AtomicFile() = default;
  AtomicFile(const AtomicFile&) = delete;
  AtomicFile& operator=(const AtomicFile&) = delete;
  ~AtomicFile();

  bool open(const std::string& path, std::string* error);
  bool write(std::string_view text, std::string* error);
  // Flushes to disk and renames the temporary over the target.
  bool commit(std::string* error);

 private:
  void abandon();
  std::string path_, temp_;
  int fd_ = -1;
};

// False with a reason when the file cannot be written. The caller refuses output paths that
// name an input (see same_file).
bool write_file_atomically(const std::string& path, const std::string& text, std::string* error);

// True when `a` and `b` name the same existing file (or the same path when they do not exist).
bool same_file(const std::string& a, const std::string& b);

}  // namespace gradeline
