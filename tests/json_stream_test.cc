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
