#include "io/background_writer.h"

namespace gradeline {

BackgroundWriter::BackgroundWriter(AtomicFile* file) : file_(file) {
  thread_ = std::thread([this] { run(); });
}

BackgroundWriter::~BackgroundWriter() {
  std::string ignored;
  finish(&ignored);
}

void BackgroundWriter::write(std::string_view text) {
  std::unique_lock<std::mutex> lock(mutex_);
  changed_.wait(lock, [this] { return pending_.size() < kMaxPendingPieces || failed_; });
  if (failed_) return;
  pending_.emplace_back(text);
  changed_.notify_all();
}

bool BackgroundWriter::finish(std::string* error) {
  {
    std::lock_guard<std::mutex> lock(mutex_);
    closing_ = true;
  }
  changed_.notify_all();
  if (thread_.joinable()) thread_.join();
  if (failed_) *error = error_;
  return !failed_;
}

void BackgroundWriter::run() {
  while (true) {
    std::string piece;
    {
      std::unique_lock<std::mutex> lock(mutex_);
      changed_.wait(lock, [this] { return !pending_.empty() || closing_; });
      if (pending_.empty()) return;  // closing, and nothing left
      piece = std::move(pending_.front());
      pending_.pop_front();
    }
    changed_.notify_all();  // room for the producer
    std::string why;
    if (!file_->write(piece, &why)) {
      std::lock_guard<std::mutex> lock(mutex_);
      failed_ = true;
      error_ = why;
      pending_.clear();
      changed_.notify_all();
      return;
    }
  }
}

}  // namespace gradeline
