#include "report/columns.h"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstring>

namespace gradeline {

std::size_t fast_fixed(double value, int precision, char* out) {
  static constexpr double kPowerOfTen[] = {1.0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6};
  constexpr double kLimit = 1099511627776.0;  // 2^40
  if (precision < 0 || precision > 6) return 0;
  const double scaled = std::fabs(value) * kPowerOfTen[precision];
  if (!(scaled < kLimit)) return 0;  // large, infinite or NaN
  const double whole = std::floor(scaled);
  const double fraction = scaled - whole;  // exact
  if (std::fabs(fraction - 0.5) < 1e-3) return 0;
  std::uint64_t rounded = static_cast<std::uint64_t>(whole) + (fraction > 0.5 ? 1 : 0);
  char digits[24];  // least significant first
  int count = 0;
  do {
    digits[count++] = static_cast<char>('0' + rounded % 10);
    rounded /= 10;
  } while (rounded != 0);
  while (count <= precision) digits[count++] = '0';  // a digit before the point
  char* p = out;
  if (std::signbit(value)) *p++ = '-';  // printf writes -0.00 for -0.001 and for -0.0
  for (int i = count - 1; i >= precision; --i) *p++ = digits[i];
  if (precision > 0) {
    *p++ = '.';
    for (int i = precision - 1; i >= 0; --i) *p++ = digits[i];
  }
  return static_cast<std::size_t>(p - out);
}

void Columns::put(const char* s, std::size_t n) {
  if (used_ + n > kBuffer) {
    flush();
    if (n > kBuffer) {
      out_.append(s, n);
      return;
    }
  }
  std::memcpy(buffer_ + used_, s, n);
  used_ += n;
}

void Columns::spaces(int n) {
  while (n > 0) {
    if (used_ == kBuffer) flush();
    const std::size_t run = std::min(static_cast<std::size_t>(n), kBuffer - used_);
    std::memset(buffer_ + used_, ' ', run);
    used_ += run;
    n -= static_cast<int>(run);
  }
}

Columns& Columns::fixed(double value, int width, int precision) {
  char digits[32];
  const std::size_t length = fast_fixed(value, precision, digits);
  if (length == 0) return printf_number(value, width, precision, false);
  return right(std::string_view(digits, length), width);
}

Columns& Columns::general(double value, int width, int precision) {
  return printf_number(value, width, precision, true);
}

Columns& Columns::printf_number(double value, int width, int precision, bool general) {
  char buffer[80];
  if (std::isfinite(value)) {
    const auto [end, error] =
        std::to_chars(buffer, buffer + sizeof buffer, value,
                      general ? std::chars_format::general : std::chars_format::fixed, precision);
    if (error == std::errc{}) return right(std::string_view(buffer, end - buffer), width);
  }
  // inf, nan, or a fixed-point number longer than the buffer: printf's own text.
  const char* format = general ? "%*.*g" : "%*.*f";
  const int length = std::snprintf(nullptr, 0, format, width, precision, value);
  std::string text(static_cast<std::size_t>(length) + 1, '\0');
  std::snprintf(text.data(), text.size(), format, width, precision, value);
  return this->text(std::string_view(text.data(), static_cast<std::size_t>(length)));
}

}  // namespace gradeline
