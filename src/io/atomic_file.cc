#include "io/atomic_file.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <filesystem>

namespace gradeline {

namespace fs = std::filesystem;

bool same_file(const std::string& a, const std::string& b) {
  std::error_code ec;
  if (fs::exists(a, ec) && fs::exists(b, ec)) return fs::equivalent(a, b, ec);
  return fs::weakly_canonical(a, ec) == fs::weakly_canonical(b, ec);
}

AtomicFile::~AtomicFile() { abandon(); }

void AtomicFile::abandon() {
  if (fd_ >= 0) ::close(fd_);
  if (!temp_.empty()) ::unlink(temp_.c_str());
  fd_ = -1;
  temp_.clear();
}

bool AtomicFile::open(const std::string& path, std::string* error) {
  abandon();
  path_ = path;
  fs::path target(path);
  fs::path dir = target.parent_path();
  if (dir.empty()) dir = ".";
  std::string temp = (dir / ("." + target.filename().string() + ".XXXXXX")).string();
  fd_ = mkstemp(temp.data());
  if (fd_ < 0) {
    *error = std::string("cannot create a file in '") + dir.string() + "': " + std::strerror(errno);
    return false;
  }
  temp_ = temp;
  return true;
}

bool AtomicFile::write(std::string_view text, std::string* error) {
  const char* data = text.data();
  std::size_t left = text.size();
  while (left > 0) {
    ssize_t n = ::write(fd_, data, left);
    if (n < 0) {
      if (errno == EINTR) continue;
      *error = std::string("cannot write '") + path_ + "': " + std::strerror(errno);
      abandon();
      return false;
    }
    data += n;
    left -= static_cast<std::size_t>(n);
  }
  return true;
}

bool AtomicFile::commit(std::string* error) {
  if (fd_ < 0) {
    *error = std::string("cannot write '") + path_ + "'";
    return false;
  }
  const int fd = fd_;
  fd_ = -1;
  if (::fsync(fd) != 0 || ::close(fd) != 0) {
    *error = std::string("cannot write '") + path_ + "': " + std::strerror(errno);
    abandon();
    return false;
  }
  ::chmod(temp_.c_str(), 0644);
  if (std::rename(temp_.c_str(), path_.c_str()) != 0) {
    *error = std::string("cannot write '") + path_ + "': " + std::strerror(errno);
    abandon();
    return false;
  }
  temp_.clear();
  return true;
}

bool write_file_atomically(const std::string& path, const std::string& text, std::string* error) {
  AtomicFile file;
  return file.open(path, error) && file.write(text, error) && file.commit(error);
}

}  // namespace gradeline
