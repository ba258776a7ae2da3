// The streaming JSON writer produces JSON that a general-purpose parser (nlohmann_json) reads
// back to the same values.
#include <doctest/doctest.h>

#include <cmath>
#include <nlohmann/json.hpp>

#include "io/json_stream.h"

using namespace gradeline;

TEST_CASE("nested objects, arrays, escapes and non-finite numbers read back") {
  std::string text;
  JsonStream j(&text);
  j.begin_object();
  j.field("name", "quote \" backslash \\ tab \t");
  j.field("x", 0.1);
  j.field("n", 42);
  j.field("ok", true);
  j.field("missing", std::nan(""));
  j.key("list");
  j.begin_array();
  j.value(1.5);
  j.begin_object();
  j.end_object();
  j.begin_array();
  j.end_array();
  j.end_array();
  j.end_object();
  nlohmann::json parsed = nlohmann::json::parse(text);
  CHECK(parsed["name"] == "quote \" backslash \\ tab \t");
  CHECK(parsed["x"].get<double>() == 0.1);
  CHECK(parsed["n"] == 42);
  CHECK(parsed["ok"] == true);
  CHECK(parsed["missing"].is_null());
  CHECK(parsed["list"].size() == 3);
  CHECK(parsed["list"][0] == 1.5);
}

TEST_CASE("containers at the compact depth go on one line, and a sink receives all the text") {
  std::string buffer, received;
  JsonStream j(&buffer);
  j.set_compact_depth(3);
  j.set_sink([&](std::string_view text) { received += text; });
  j.begin_object();
  j.key("nodes");
  j.begin_array();
  for (int i = 0; i < 2; ++i) {
    j.begin_object();
    j.field("id", std::to_string(i));
    j.field("head_m", 1.5);
    j.end_object();
  }
  j.end_array();
  j.end_object();
  j.flush();
  CHECK(buffer.empty());
  CHECK(received ==
        "{\n \"nodes\": [\n  {\"id\":\"0\",\"head_m\":1.5},\n  {\"id\":\"1\",\"head_m\":1.5}\n ]\n}\n");
}

TEST_CASE("elements formatted in continuations and appended in order give the same text") {
  // The writer of large results formats blocks of elements apart (on several threads) and
  // appends them; the text must be exactly what one stream writes, first element included.
  auto element = [](JsonStream* j, int i) {
    j->begin_object();
    j->field("id", "N" + std::to_string(i));
    j->field("head_m", 100.0 + i / 7.0);
    j->end_object();
  };
  std::string whole;
  {
    JsonStream j(&whole);
    j.set_compact_depth(3);
    j.begin_object();
    j.key("nodes");
    j.begin_array();
    for (int i = 0; i < 10; ++i) element(&j, i);
    j.end_array();
    j.end_object();
  }
  std::string joined;
  {
    JsonStream j(&joined);
    j.set_compact_depth(3);
    j.begin_object();
    j.key("nodes");
    j.begin_array();
    for (int start : {0, 4, 7}) {  // three blocks: 0-3, 4-6, 7-9
      std::string part_text;
      JsonStream part = j.continuation(&part_text, j.container_empty());
      for (int i = start; i < (start == 0 ? 4 : start == 4 ? 7 : 10); ++i) element(&part, i);
      j.append_elements(part_text);
    }
    j.end_array();
    j.end_object();
  }
  CHECK(joined == whole);
  CHECK(nlohmann::json::parse(joined)["nodes"].size() == 10);
}
