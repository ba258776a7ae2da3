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

namespace {

// IDs of several shapes: short ones kept in the slots, long ones kept in the elements.
std::vector<std::string> many_ids(int count) {
  std::vector<std::string> ids;
  for (int i = 0; i < count; ++i) {
    ids.push_back(i % 3 == 0 ? "main-street-link-" + std::to_string(i) : "L" + std::to_string(i));
  }
  return ids;
}

bool fill_at_once(const std::vector<std::string>& ids, IdIndex* index) {
  std::vector<IdIndex::Staged> staged;
  for (std::size_t i = 0; i < ids.size(); ++i) staged.push_back(IdIndex::stage(ids[i], i));
  return index->insert_all(staged, [&](std::size_t i) -> std::string_view { return ids[i]; });
}

}  // namespace

TEST_CASE("a table filled at once by parts finds every ID, and only those, as one filled in turn") {
  // 98,000 IDs in 131,072 slots (three quarters full, the most before the table grows), so
  // that many probes run into the next part and are placed after the parts.
  for (int count : {200000, 98000, 1000}) {
    CAPTURE(count);
    const std::vector<std::string> ids = many_ids(count);
    IdIndex at_once;
    REQUIRE(fill_at_once(ids, &at_once));
    auto id_of = [&](std::size_t i) -> std::string_view { return ids[i]; };
    for (std::size_t i = 0; i < ids.size(); ++i) {
      const auto found = at_once.find(ids[i], id_of);
      REQUIRE(found);
      REQUIRE(*found == i);
    }
    for (const char* missing : {"L-1", "main-street-link-1", "", "L200000x"}) {
      CHECK_FALSE(at_once.find(missing, id_of));
    }
    // Growing after it keeps every ID.
    std::vector<std::string> more = ids;
    for (int i = 0; i < count; ++i) {
      more.push_back("extra-" + std::to_string(i));
      auto [at, inserted] = at_once.insert(
          more.back(), more.size() - 1, [&](std::size_t k) -> std::string_view { return more[k]; });
      REQUIRE(inserted);
    }
    CHECK(*at_once.find(ids[count / 2], id_of) == static_cast<std::size_t>(count / 2));
  }
}

TEST_CASE("a table filled at once refuses a duplicate ID, short or long, wherever it lies") {
  for (const std::string& dup : {std::string("L17"), std::string("main-street-link-99")}) {
    for (std::size_t where : {std::size_t{1}, std::size_t{150000}, std::size_t{199999}}) {
      CAPTURE(dup);
      CAPTURE(where);
      std::vector<std::string> ids = many_ids(200000);  // ids[17] is "L17", ids[99] the long one
      ids[where] = dup;
      IdIndex index;
      CHECK_FALSE(fill_at_once(ids, &index));
    }
  }
}
