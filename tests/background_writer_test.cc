// The writer thread of large outputs: pieces arrive in order and complete, and the file
// appears only on commit.
#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>
#include <sstream>

#include "io/atomic_file.h"
#include "io/background_writer.h"
#include "test_support.h"

using namespace gradeline;

TEST_CASE("pieces handed to the writer thread are written whole and in order") {
  const std::string path = testing::temp_dir() + "/pieces.txt";
  std::string why, expected;
  AtomicFile file;
  REQUIRE(file.open(path, &why));
  {
    BackgroundWriter writer(&file);
    for (int i = 0; i < 2000; ++i) {  // far more pieces than may wait at once
      const std::string piece = "piece " + std::to_string(i) + std::string(i % 97, 'x') + "\n";
      expected += piece;
      writer.write(piece);
    }
    REQUIRE(writer.finish(&why));
    CHECK_FALSE(std::filesystem::exists(path));  // not in place before the commit
  }
  REQUIRE(file.commit(&why));
  std::ifstream in(path, std::ios::binary);
  std::stringstream text;
  text << in.rdbuf();
  CHECK(text.str() == expected);
}

TEST_CASE("a writer finished twice, or destroyed unfinished, stops cleanly") {
  const std::string path = testing::temp_dir() + "/twice.txt";
  std::string why;
  AtomicFile file;
  REQUIRE(file.open(path, &why));
  BackgroundWriter writer(&file);
  writer.write("a");
  CHECK(writer.finish(&why));
  CHECK(writer.finish(&why));
  AtomicFile other;
  REQUIRE(other.open(testing::temp_dir() + "/unfinished.txt", &why));
  { BackgroundWriter dropped(&other); dropped.write("b"); }
  CHECK_FALSE(std::filesystem::exists(testing::temp_dir() + "/unfinished.txt"));
}
