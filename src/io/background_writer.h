// A writer thread for large outputs: the pieces handed to it are copied and written to the
// file in the order given, so forming the next piece overlaps with the system's copy of the
// last one into the page cache. At most kMaxPendingPieces wait; a caller that gets ahead of
// the disk waits for room.
#pragma once

#include <condition_variable>
#include <deque>
#include <mutex>
#include <string>
#include <string_view>
#include <thread>

#include "io/atomic_file.h"

namespace gradeline {

inline constexpr std::size_t kMaxPendingPieces = 8;

class BackgroundWriter {
 public:
  explicit BackgroundWriter(AtomicFile* file);
  ~BackgroundWriter();
  BackgroundWriter(const BackgroundWriter&) = delete;
  BackgroundWriter& operator=(const BackgroundWriter&) = delete;

  // Queues a copy of `text`. After a write has failed, further pieces are dropped.
  void write(std::string_view text);
  // Waits until every piece is written; false with the first write error.
  bool finish(std::string* error);

 private:
  void run();

  AtomicFile* file_;
  std::mutex mutex_;
  std::condition_variable changed_;
  std::deque<std::string> pending_;
  bool closing_ = false;
  bool failed_ = false;
  std::string error_;
  std::thread thread_;
};

}  // namespace gradeline
