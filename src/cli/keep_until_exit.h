// Objects kept until the process ends, handed over instead of destroyed.
//
// Once a command has written its output, freeing a large network and its results walks every
// element (ID strings, the boxed pump, valve and tank data, the solver's caches) only to give
// back memory that the kernel takes back at exit anyway. An object handed to keep_until_exit
// is moved to the heap and never destroyed; it stays reachable from a static pointer, so leak
// checkers do not report it. Only `main`'s commands use this, just before they return.
#pragma once

#include <memory>
#include <utility>
#include <vector>

namespace gradeline {

template <typename T>
void keep_until_exit(T&& object) {
  struct Held {
    virtual ~Held() = default;
  };
  struct Kept : Held {
    explicit Kept(T&& v) : value(std::move(v)) {}
    T value;
  };
  static auto* const kept = new std::vector<std::unique_ptr<Held>>();  // never freed
  kept->push_back(std::make_unique<Kept>(std::move(object)));
}

}  // namespace gradeline
