// A small streaming JSON writer: appends to a string with no document tree. With a sink, the
// text is handed on (to a file) whenever a megabyte has gathered, so writing the result of a
// million-pipe network costs one pass and a megabyte of memory. Objects and arrays opened
// deeper than the compact depth go on one line with no spaces (one element per line).
// Numbers use the shortest form that reads back exactly; non-finite numbers become null.
#pragma once

#include <functional>
#include <string>
#include <string_view>

namespace gradeline {

class JsonStream {
 public:
  explicit JsonStream(std::string* out) : out_(out) {}

  // `sink` receives the gathered text, which is then cleared.
  void set_sink(std::function<void(std::string_view)> sink) { sink_ = std::move(sink); }
  // Containers opened at this depth or deeper are written on one line (the top object is 1).
  void set_compact_depth(int depth) { compact_depth_ = depth; }
  // Hands the rest of the text to the sink.
  void flush();

  void begin_object() { open('{'); }
  void end_object() { close('}'); }
  void begin_array() { open('['); }
  void end_array() { close(']'); }
  void key(std::string_view k);

  void value(double v);
  void value(long long v);
  void value(int v) { value(static_cast<long long>(v)); }
  void value(std::size_t v) { value(static_cast<long long>(v)); }
  void value(bool v);
  void value(std::string_view v);
  void value(const char* v) { value(std::string_view(v)); }
  void null();

  // A stream that continues this one's layout (depth, compactness) into `out`, as if the
  // container open here were empty when `first` is true and not otherwise: elements formatted
  // there (on another thread, say) and appended in order with append_elements() give exactly
  // the text this stream would have written itself.
  JsonStream continuation(std::string* out, bool first) const;
  void append_elements(std::string_view text);
  // True when the container open here has no element yet.
  bool container_empty() const { return first_; }

  template <typename T>
  void field(std::string_view k, const T& v) {
    key(k);
    value(v);
  }

 private:
  void separate();
  void open(char c);
  void close(char c);
  void string(std::string_view s);

  bool compact() const { return depth_ >= compact_depth_; }

  std::string* out_;
  std::function<void(std::string_view)> sink_;
  bool first_ = true;      // no element yet at this level
  bool after_key_ = false;
  int depth_ = 0;
  int compact_depth_ = 1 << 20;
};

}  // namespace gradeline
