// The ID lookup: short IDs kept in the slots, long ones compared through their elements.
#include "gradeline/id_index.h"

#include <doctest/doctest.h>

#include <string>
#include <vector>

using namespace gradeline;

namespace {

struct Table {
  std::vector<std::string> ids;
  IdIndex index;
  bool add(const std::string& id) {
    auto [at, inserted] =
        index.insert(id, ids.size(), [this](std::size_t i) -> std::string_view { return ids[i]; });
    if (inserted) ids.push_back(id);
    return inserted && at == ids.size() - 1;
  }
  std::optional<std::size_t> find(std::string_view id) const {
    return index.find(id, [this](std::size_t i) -> std::string_view { return ids[i]; });
  }
};

}  // namespace

TEST_CASE("IDs of every length around the inline limit are found, and only those added") {
  Table t;
  // 7 bytes fit in a slot, 8 do not; prefixes and extensions of each other must not match.
  const std::vector<std::string> ids = {"A",        "J-1",       "ABCDEF",          "ABCDEFG",
                                        "ABCDEFGH", "ABCDEFGHI", "north_main_0001", "ABCDEFGX"};
  for (const std::string& id : ids) CHECK(t.add(id));
  for (std::size_t i = 0; i < ids.size(); ++i) {
    CAPTURE(ids[i]);
    REQUIRE(t.find(ids[i]));
    CHECK(*t.find(ids[i]) == i);
  }
  for (const char* missing : {"", "B", "ABCDE", "ABCDEFGHIJ", "ABCDEFGY", "J-2"}) {
    CAPTURE(missing);
    CHECK_FALSE(t.find(missing));
  }
}

TEST_CASE("a duplicate ID is refused and keeps the first element's index, short or long") {
  Table t;
  CHECK(t.add("N7"));
  CHECK(t.add("a-rather-long-node-id"));
  CHECK_FALSE(t.add("N7"));
  CHECK_FALSE(t.add("a-rather-long-node-id"));
  CHECK(*t.find("N7") == 0);
  CHECK(*t.find("a-rather-long-node-id") == 1);
}

TEST_CASE("lookups still hold after the table grows many times") {
  Table t;
  for (int i = 0; i < 20000; ++i) {
    REQUIRE(t.add((i % 2 ? "J" : "long-junction-id-") + std::to_string(i)));
  }
  for (int i = 0; i < 20000; i += 7) {
    const std::string id = (i % 2 ? "J" : "long-junction-id-") + std::to_string(i);
    REQUIRE(t.find(id));
    CHECK(*t.find(id) == static_cast<std::size_t>(i));
  }
  CHECK_FALSE(t.find("J20001"));
}
