// Fixed-width fields of a text table, appended to a string: the same characters as the printf
// conversions named beside each function, without a format string to parse per field.
//
// A report of a million-element network writes some twenty million fields; through
// vsnprintf each cost about 100 ns. A row is gathered in a small buffer and appended to the
// string once. Fixed-point numbers whose rounding the double product |x| 10^precision settles
// are written from that integer (fast_fixed below); the others, and %g, go through
// std::to_chars with a precision, which the C++ standard defines "as if by printf" in the C
// locale; non-finite values through snprintf itself. tests/columns_test.cc compares every
// function with snprintf, rounding ties included.
#pragma once

#include <cstddef>
#include <string>
#include <string_view>

namespace gradeline {

class Columns {
 public:
  explicit Columns(std::string* out) : out_(*out) {}
  ~Columns() { flush(); }
  Columns(const Columns&) = delete;
  Columns& operator=(const Columns&) = delete;

  Columns& text(std::string_view s) {  // as it is
    put(s.data(), s.size());
    return *this;
  }
  Columns& left(std::string_view s, int width) {  // %-WIDTHs
    put(s.data(), s.size());
    spaces(width - static_cast<int>(s.size()));
    return *this;
  }
  Columns& right(std::string_view s, int width) {  // %WIDTHs
    spaces(width - static_cast<int>(s.size()));
    put(s.data(), s.size());
    return *this;
  }
  Columns& fixed(double value, int width, int precision);    // %WIDTH.PRECISIONf
  Columns& general(double value, int width, int precision);  // %WIDTH.PRECISIONg

 private:
  static constexpr std::size_t kBuffer = 256;
  void put(const char* s, std::size_t n);
  void spaces(int n);
  void flush() {
    out_.append(buffer_, used_);
    used_ = 0;
  }
  Columns& printf_number(double value, int width, int precision, bool general);

  std::string& out_;
  char buffer_[kBuffer];
  std::size_t used_ = 0;
};

// The characters of printf("%.*f", precision, value) when the double product
// |value| 10^precision decides the rounding: precision 0 to 6, the product below 2^40 (its
// own rounding error is then below 2^-13) and its fraction not within 1e-3 of one half.
// Writes them to `out` (room for 32) and returns their count, or 0 where it does not decide.
std::size_t fast_fixed(double value, int precision, char* out);

}  // namespace gradeline
