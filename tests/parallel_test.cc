// The loops shared among the cores (src/model/parallel.h): the same answers as one serial pass.
#include <doctest/doctest.h>

#include <cmath>
#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

#include "model/parallel.h"

using namespace gradeline;

namespace {

// A reproducible pseudo-random sequence (64-bit linear congruential generator, Knuth's MMIX
// constants), so the tests need no seed from outside.
struct Lcg {
  std::uint64_t state = 12345;
  std::uint64_t next() {
    state = state * 6364136223846793005ull + 1442695040888963407ull;
    return state >> 33;
  }
};

}  // namespace

TEST_CASE("indices_where finds, in order, what a serial filter finds, below and above the threshold") {
  for (std::ptrdiff_t count : {std::ptrdiff_t{0}, std::ptrdiff_t{17}, kParallelElements - 1,
                               kParallelElements, 3 * kParallelElements + 7}) {
    Lcg g;
    std::vector<int> value(static_cast<std::size_t>(count));
    for (int& v : value) v = static_cast<int>(g.next() % 97);
    std::vector<std::size_t> serial;
    for (std::size_t i = 0; i < value.size(); ++i) {
      if (value[i] < 3) serial.push_back(i);
    }
    const std::vector<std::size_t> found =
        indices_where(count, [&](std::ptrdiff_t i) { return value[static_cast<std::size_t>(i)] < 3; });
    CHECK(found == serial);
  }
}

TEST_CASE("sum_by_index gives the serial sums, to round-off, with every contribution counted once") {
  // Exact check on integers (every partial sum representable), then round-off on reals.
  constexpr double kRelativeTolerance = 1e-12;
  const std::ptrdiff_t links = 2 * kParallelElements + 3;
  const std::size_t nodes = 5000;
  Lcg g;
  std::vector<std::uint32_t> from(static_cast<std::size_t>(links)), to(from.size());
  std::vector<double> flow(from.size()), unit(from.size(), 1.0);
  for (std::size_t k = 0; k < from.size(); ++k) {
    from[k] = static_cast<std::uint32_t>(g.next() % nodes);
    to[k] = static_cast<std::uint32_t>(g.next() % nodes);
    flow[k] = static_cast<double>(g.next() % 100000) * 1e-7;
  }
  auto balance = [&](const std::vector<double>& q) {
    return sum_by_index(nodes, links, [&](std::ptrdiff_t k, double* into) {
      into[from[k]] -= q[k];
      into[to[k]] += q[k];
    });
  };
  std::vector<double> serial(nodes, 0.0), degree(nodes, 0.0);
  for (std::size_t k = 0; k < from.size(); ++k) {
    serial[from[k]] -= flow[k];
    serial[to[k]] += flow[k];
    degree[from[k]] -= 1.0;
    degree[to[k]] += 1.0;
  }
  CHECK(balance(unit) == degree);
  const std::vector<double> sums = balance(flow);
  for (std::size_t n = 0; n < nodes; ++n) {
    CHECK(std::abs(sums[n] - serial[n]) <= kRelativeTolerance * (1.0 + std::abs(serial[n])));
  }
}

TEST_CASE("text_in_order hands over the serial loop's text, in order, below and above the threshold") {
  for (std::ptrdiff_t count : {std::ptrdiff_t{0}, std::ptrdiff_t{17}, kParallelElements - 1,
                               kParallelElements, 3 * kParallelElements + 7, std::ptrdiff_t{300000}}) {
    Lcg g;
    std::vector<int> value(static_cast<std::size_t>(count));
    for (int& v : value) v = static_cast<int>(g.next() % 1000);
    // Element i writes a line whose length varies, or nothing when its value ends in 7.
    auto write = [&](std::size_t i, std::string* text) {
      if (value[i] % 10 == 7) return;
      *text += std::to_string(i) + ":" + std::string(static_cast<std::size_t>(value[i] % 13), '#') + "\n";
    };
    std::string serial;
    for (std::size_t i = 0; i < value.size(); ++i) write(i, &serial);
    std::string joined;
    int pieces = 0;
    text_in_order(static_cast<std::size_t>(count), write, [&](std::string_view piece) {
      joined += piece;
      ++pieces;
    });
    CHECK(joined == serial);
    CHECK(pieces >= (count >= kParallelElements ? 2 : 1));
  }
}
