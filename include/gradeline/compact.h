// gradeline public API: small value types that keep the records of Network compact. Most
// passes over a large network stream its node and link records, and their time follows the
// records' size (at 10^6 pipes, 32 more bytes per node and per link cost 0.06 s of a 1.4 s
// solve), so optional values hold their "absent" state in a spare bit pattern instead of a
// flag and its padding, and strings shared by many elements are interned.
#pragma once

#include <cmath>
#include <cstdint>
#include <limits>
#include <optional>
#include <ostream>
#include <string>
#include <string_view>

namespace gradeline {

// An optional double in 8 bytes: NaN stands for "absent", so a NaN can never be held (every
// value the model holds is finite). Reads and writes like std::optional<double>.
class OptionalDouble {
 public:
  constexpr OptionalDouble() = default;
  constexpr OptionalDouble(std::nullopt_t) {}
  constexpr OptionalDouble(double v) : value_(v) {}
  OptionalDouble(const std::optional<double>& v) : value_(v ? *v : kAbsent) {}
  OptionalDouble& operator=(std::nullopt_t) {
    value_ = kAbsent;
    return *this;
  }
  OptionalDouble& operator=(double v) {
    value_ = v;
    return *this;
  }
  OptionalDouble& operator=(const std::optional<double>& v) {
    value_ = v ? *v : kAbsent;
    return *this;
  }

  bool has_value() const { return !std::isnan(value_); }
  explicit operator bool() const { return has_value(); }
  double operator*() const { return value_; }
  double value_or(double fallback) const { return has_value() ? value_ : fallback; }
  void reset() { value_ = kAbsent; }
  operator std::optional<double>() const {
    return has_value() ? std::optional<double>(value_) : std::nullopt;
  }
  friend bool operator==(const OptionalDouble& a, const OptionalDouble& b) {
    return a.has_value() ? b.has_value() && a.value_ == b.value_ : !b.has_value();
  }
  friend bool operator!=(const OptionalDouble& a, const OptionalDouble& b) { return !(a == b); }

 private:
  static constexpr double kAbsent = std::numeric_limits<double>::quiet_NaN();
  double value_ = kAbsent;
};

struct Point {
  double x = 0.0;
  double y = 0.0;
};

// An optional Point in 16 bytes: a NaN x stands for "absent". Reads and writes like
// std::optional<Point>.
class OptionalPoint {
 public:
  constexpr OptionalPoint() = default;
  constexpr OptionalPoint(std::nullopt_t) {}
  constexpr OptionalPoint(const Point& p) : point_(p) {}
  OptionalPoint(const std::optional<Point>& p) : point_(p ? *p : absent()) {}
  OptionalPoint& operator=(const std::optional<Point>& p) {
    point_ = p ? *p : absent();
    return *this;
  }
  OptionalPoint& operator=(const Point& p) {
    point_ = p;
    return *this;
  }

  bool has_value() const { return !std::isnan(point_.x); }
  explicit operator bool() const { return has_value(); }
  const Point& operator*() const { return point_; }
  const Point* operator->() const { return &point_; }
  void reset() { point_ = absent(); }

 private:
  static constexpr Point absent() { return {std::numeric_limits<double>::quiet_NaN(), 0.0}; }
  Point point_ = absent();
};

// A string kept once for the whole process (file names, demand categories), named by 4 bytes.
// Interned strings are never freed; interning is safe from any thread, and so is reading one.
class InternedString {
 public:
  constexpr InternedString() = default;  // the empty string
  const std::string& str() const;
  bool empty() const { return index_ == 0; }
  friend bool operator==(InternedString a, InternedString b) { return a.index_ == b.index_; }
  friend bool operator!=(InternedString a, InternedString b) { return a.index_ != b.index_; }
  friend bool operator==(InternedString a, std::string_view b) { return a.str() == b; }
  friend bool operator==(std::string_view a, InternedString b) { return a == b.str(); }
  friend std::ostream& operator<<(std::ostream& out, InternedString s) { return out << s.str(); }

 private:
  friend InternedString intern(std::string_view text);
  explicit constexpr InternedString(std::uint32_t index) : index_(index) {}
  std::uint32_t index_ = 0;  // 0: the empty string; else 1 + its place in the table
};

// The interned copy of `text` (the same InternedString for equal texts).
InternedString intern(std::string_view text);

}  // namespace gradeline
