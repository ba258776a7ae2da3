#include "io/json_stream.h"

#include <charconv>
#include <cmath>
#include <cstdio>

namespace gradeline {

constexpr std::size_t kSinkChunk = 1 << 20;

void JsonStream::flush() {
  if (sink_ && !out_->empty()) {
    sink_(*out_);
    out_->clear();
  }
}

JsonStream JsonStream::continuation(std::string* out, bool first) const {
  JsonStream part(out);
  part.depth_ = depth_;
  part.compact_depth_ = compact_depth_;
  part.first_ = first;
  return part;
}

void JsonStream::append_elements(std::string_view text) {
  if (text.empty()) return;
  out_->append(text);
  first_ = false;
  after_key_ = false;
  if (sink_ && out_->size() >= kSinkChunk) flush();
}

void JsonStream::separate() {
  if (after_key_) {
    after_key_ = false;
    return;
  }
  if (!first_) *out_ += ',';
  if (depth_ > 0 && depth_ < compact_depth_) {  // the current container is not compact
    if (sink_ && out_->size() >= kSinkChunk) flush();
    *out_ += '\n';
    out_->append(static_cast<std::size_t>(depth_), ' ');
  }
  first_ = false;
}

void JsonStream::open(char c) {
  separate();
  *out_ += c;
  ++depth_;
  first_ = true;
}

void JsonStream::close(char c) {
  --depth_;
  if (!first_ && depth_ + 1 < compact_depth_) {  // the container closed was not compact
    *out_ += '\n';
    out_->append(static_cast<std::size_t>(depth_), ' ');
  }
  *out_ += c;
  first_ = false;
  if (depth_ == 0) *out_ += '\n';
}

void JsonStream::key(std::string_view k) {
  separate();
  string(k);
  *out_ += compact() ? ":" : ": ";
  after_key_ = true;
}

void JsonStream::value(double v) {
  separate();
  if (!std::isfinite(v)) {
    *out_ += "null";
    return;
  }
  char buffer[32];
  auto [end, ec] = std::to_chars(buffer, buffer + sizeof buffer, v);
  out_->append(buffer, end);
}

void JsonStream::value(long long v) {
  separate();
  *out_ += std::to_string(v);
}

void JsonStream::value(bool v) {
  separate();
  *out_ += v ? "true" : "false";
}

void JsonStream::value(std::string_view v) {
  separate();
  string(v);
}

void JsonStream::null() {
  separate();
  *out_ += "null";
}

void JsonStream::string(std::string_view s) {
  *out_ += '"';
  std::size_t run = 0;  // start of the characters that need no escape, appended in one go
  for (std::size_t i = 0; i < s.size(); ++i) {
    const unsigned char u = static_cast<unsigned char>(s[i]);
    if (u >= 0x20 && u != '"' && u != '\\') continue;
    out_->append(s.data() + run, i - run);
    run = i + 1;
    if (u == '"' || u == '\\') {
      *out_ += '\\';
      *out_ += static_cast<char>(u);
    } else {
      char escape[8];
      std::snprintf(escape, sizeof escape, "\\u%04x", u);
      *out_ += escape;
    }
  }
  out_->append(s.data() + run, s.size() - run);
  *out_ += '"';
}

}  // namespace gradeline
