// A small streaming JSON writer: appends to a string with no document tree, so writing the
// result of a million-pipe network costs one pass and no more memory than the text itself.
// Numbers use the shortest form that reads back exactly; non-finite numbers become null.
#pragma once

#include <string>
#include <string_view>

namespace gradeline {

class JsonStream {
 public:
  explicit JsonStream(std::string* out) : out_(out) {}

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

  std::string* out_;
  bool first_ = true;      // no element yet at this level
  bool after_key_ = false;
  int depth_ = 0;
};

}  // namespace gradeline
