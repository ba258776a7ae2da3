// Table fields against the C library's printf, the definition they follow (ISO C 7.21.6.1).
#include <doctest/doctest.h>

#include <cmath>
#include <cstdio>
#include <limits>
#include <random>
#include <string>
#include <vector>

#include "report/columns.h"

using namespace gradeline;

namespace {

std::string printf_text(const char* format, int width, int precision, double value) {
  char buffer[512];
  std::snprintf(buffer, sizeof buffer, format, width, precision, value);
  return buffer;
}

// Values a report meets, and the ones that test the rounding: exact binary ties at every
// precision used (0.125 is exact, and %.2f must round it to even), signed zeros, values that
// round to a negative zero, huge and non-finite ones.
std::vector<double> test_values() {
  std::vector<double> v = {0.0, -0.0, 0.5, -0.5, 1.5, 2.5, 0.125, 0.375, -0.625, 1.0625,
                           0.005, 0.015, -0.004, -0.0004, 1e-300, 9.9995, 99.95, 999.5,
                           1e15, 1e20, -1e22, 1e300, -1e300,
                           std::numeric_limits<double>::infinity(),
                           -std::numeric_limits<double>::infinity(),
                           std::numeric_limits<double>::quiet_NaN(),
                           std::numeric_limits<double>::denorm_min()};
  std::mt19937_64 random(20261202);
  std::uniform_real_distribution<double> exponent(-9.0, 13.0);
  for (int i = 0; i < 20000; ++i) {
    const double x = std::pow(10.0, exponent(random));
    v.push_back(i % 2 ? -x : x);
  }
  for (int i = -4000; i <= 4000; ++i) v.push_back(i / 16.0);  // exact ties at %.1f .. %.3f
  return v;
}

}  // namespace

TEST_CASE("fixed(value, width, precision) writes what printf's %*.*f writes") {
  for (double value : test_values()) {
    for (int precision : {0, 1, 2, 3, 4}) {
      std::string s;
      Columns(&s).fixed(value, 10, precision);
      REQUIRE_MESSAGE(s == printf_text("%*.*f", 10, precision, value), value, " ", precision);
    }
  }
}

TEST_CASE("fast_fixed writes printf's digits where it decides, and declines near a tie") {
  char digits[32];
  int decided = 0;
  for (double value : test_values()) {
    for (int precision : {0, 1, 2, 3, 4, 6}) {
      const std::size_t n = fast_fixed(value, precision, digits);
      if (n == 0) continue;
      ++decided;
      REQUIRE_MESSAGE(std::string(digits, n) == printf_text("%*.*f", 0, precision, value), value);
    }
  }
  CHECK(decided > 100000);                         // nearly every ordinary value
  CHECK(fast_fixed(0.125, 2, digits) == 0);        // an exact tie: to printf
  CHECK(fast_fixed(1e13, 2, digits) == 0);         // beyond 2^40 once scaled
  CHECK(fast_fixed(std::nan(""), 2, digits) == 0);
}

TEST_CASE("a row longer than the field buffer comes out whole") {
  const std::string id(700, 'x');
  std::string s;
  Columns(&s).text("  ").left(id, 10).text(" ").fixed(-1.5, 12, 3).right("-", 300);
  CHECK(s == "  " + id + " " + printf_text("%*.*f", 12, 3, -1.5) + std::string(299, ' ') + "-");
}

TEST_CASE("general(value, width, precision) writes what printf's %*.*g writes") {
  for (double value : test_values()) {
    for (int precision : {1, 3, 6}) {
      std::string s;
      Columns(&s).general(value, 9, precision);
      REQUIRE_MESSAGE(s == printf_text("%*.*g", 9, precision, value), value, " ", precision);
    }
  }
}

TEST_CASE("left and right pad to the width and never cut a longer text") {
  std::string s;
  Columns(&s).left("P12", 6).text("|").right("ab", 4).text("|").left("much-too-long", 4).text("|")
      .right("also-too-long", 3);
  char expected[128];
  std::snprintf(expected, sizeof expected, "%-6s|%4s|%-4s|%3s", "P12", "ab", "much-too-long",
                "also-too-long");
  CHECK(s == expected);
}
