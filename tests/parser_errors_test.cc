// The exact text of every input error, in the form FILE:LINE: error: message.
#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>

#include "io/parser.h"
#include "test_support.h"

using namespace gradeline;

namespace {

const char* kHead = "reservoir R head=50\nnode A elevation=0\n";  // lines 1-2

// All messages for `text`, one per line.
std::string messages(const ParseResult& r) {
  std::string out;
  for (const Diagnostic& d : r.errors) out += d.format() + "\n";
  return out;
}

// Read line by line, and checked to come out the same when the node and pipe lines are read
// in bulk (io/bulk_reader.h: any error sends the bulk read back to line by line).
std::string errors_of(const std::string& text) {
  const std::string out = messages(parse_network_text(text, "net.gln", static_cast<std::size_t>(-1)));
  CHECK(messages(parse_network_text(text, "net.gln", 1)) == out);
  return out;
}

std::string one_error(const std::string& body) { return errors_of(std::string(kHead) + body); }

}  // namespace

TEST_CASE("unknown node") {
  CHECK(one_error("pipe P1 A N99 length=1 diameter=100 roughness=0\n") ==
        "net.gln:3: error: pipe 'P1' refers to unknown node 'N99'\n");
}

TEST_CASE("duplicate node and pipe IDs name the first definition") {
  CHECK(one_error("node A elevation=3\n") ==
        "net.gln:3: error: duplicate node ID 'A' (first defined at net.gln:2)\n");
  CHECK(one_error("pipe P R A length=1 diameter=100 roughness=0\n"
                  "pipe P R A length=1 diameter=100 roughness=0\n") ==
        "net.gln:4: error: duplicate pipe ID 'P' (first defined at net.gln:3)\n");
}

TEST_CASE("missing required keys") {
  CHECK(one_error("pipe P R A diameter=100 roughness=0\n") ==
        "net.gln:3: error: pipe 'P': missing required key 'length'\n");
  CHECK(one_error("node B demand=1\n") ==
        "net.gln:3: error: node 'B': missing required key 'elevation'\n");
  CHECK(one_error("reservoir S\n") == "net.gln:3: error: reservoir 'S': missing required key 'head'\n");
  CHECK(one_error("pipe P R A length=1 diameter=100\n") ==
        "net.gln:3: error: pipe 'P': missing roughness (darcy-weisbach needs roughness= or "
        "'defaults roughness=')\n");
}

TEST_CASE("unknown keys and statements suggest the nearest valid word") {
  CHECK(one_error("pipe P R A length=1 diamter=100 roughness=0\n") ==
        "net.gln:3: error: unknown key 'diamter' for pipe (did you mean 'diameter'?)\n"
        "net.gln:3: error: pipe 'P': missing required key 'diameter'\n");
  CHECK(one_error("pipee P R A length=1\n") ==
        "net.gln:3: error: unknown statement 'pipee' (did you mean 'pipe'?)\n");
  CHECK(one_error("node B elevation=1 colour=red\n") ==
        "net.gln:3: error: unknown key 'colour' for node\n");
}

TEST_CASE("a repeated key is an error") {
  CHECK(one_error("node B elevation=1 elevation=2\n") ==
        "net.gln:3: error: key 'elevation' given twice\n");
}

TEST_CASE("a bad unit names the expected dimension") {
  CHECK(one_error("pipe P R A length=1 diameter=250L/s roughness=0\n") ==
        "net.gln:3: error: diameter: bad unit 'L/s' in '250L/s': expected a diameter "
        "(m, km, cm, mm, ft, in, yd, mi)\n");
}

TEST_CASE("non-finite, non-positive and absurd numbers") {
  CHECK(one_error("pipe P R A length=nan diameter=100 roughness=0\n") ==
        "net.gln:3: error: length: 'nan' is not a number\n");
  CHECK(one_error("pipe P R A length=-3m diameter=100 roughness=0\n") ==
        "net.gln:3: error: length must be positive, got '-3m'\n");
  CHECK(one_error("pipe P R A length=1 diameter=0 roughness=0\n") ==
        "net.gln:3: error: diameter must be positive, got '0'\n");
  CHECK(one_error("pipe P R A length=1 diameter=25m roughness=0\n") ==
        "net.gln:3: error: diameter '25m' is out of range: at most 20 m\n");
  CHECK(one_error("pipe P R A length=1 diameter=100 roughness=-0.1\n") ==
        "net.gln:3: error: roughness must not be negative, got '-0.1'\n");
  CHECK(one_error("node B elevation=1e9\n") ==
        "net.gln:3: error: elevation '1e9' is out of range: at most 10000 m\n");
}

TEST_CASE("roughness as large as the radius is refused") {
  CHECK(one_error("pipe P R A length=1 diameter=100 roughness=50\n") ==
        "net.gln:3: error: pipe 'P': roughness 50 mm is not smaller than the pipe radius 50 mm\n");
}

TEST_CASE("a self-loop pipe is refused") {
  CHECK(one_error("pipe P A A length=1 diameter=100 roughness=0\n") ==
        "net.gln:3: error: pipe 'P' connects node 'A' to itself\n");
}

TEST_CASE("a file with no fixed-head node is refused at its last line") {
  CHECK(errors_of("node A elevation=0\nnode B elevation=0\n"
                  "pipe P A B length=1 diameter=100 roughness=0\n") ==
        "net.gln:3: error: the network has no fixed-head node: add a reservoir\n");
}

TEST_CASE("bad field values") {
  CHECK(one_error("pipe P R A length=1 diameter=100 roughness=0 status=shut\n") ==
        "net.gln:3: error: status must be 'open' or 'closed', got 'shut'\n");
  CHECK(one_error("pipe P R A length=1 diameter=100 roughness=0 check=maybe\n") ==
        "net.gln:3: error: check must be 'yes' or 'no', got 'maybe'\n");
  CHECK(one_error("node B elevation=1 at=1;2\n") ==
        "net.gln:3: error: at must be X,Y with two numbers, got '1;2'\n");
  CHECK(one_error("headloss manning\n") ==
        "net.gln:3: error: unknown head-loss law 'manning' (expected darcy-weisbach or "
        "hazen-williams)\n");
  CHECK(errors_of("units metric\nreservoir R head=1\n") ==
        "net.gln:1: error: unknown unit system 'metric' (expected SI or US)\n");
  CHECK(one_error("fluid water temperature=60C\n") ==
        "net.gln:3: error: temperature '60C' is out of range: at most 40 C\n");
}

TEST_CASE("structure errors: fields, IDs and the place of units") {
  CHECK(one_error("pipe P R\n") == "net.gln:3: error: pipe needs ID FROM TO\n");
  CHECK(one_error("node B C elevation=1\n") == "net.gln:3: error: too many fields for node: 'C'\n");
  CHECK(one_error("node a,b elevation=1\n") ==
        "net.gln:3: error: invalid ID 'a,b': an ID has 1 to 64 characters and no space, '#', "
        "'=' or ','\n");
  CHECK(one_error("units US\n") ==
        "net.gln:3: error: 'units' must come before the first value with a unit default\n");
}

TEST_CASE("every error in a file is reported, not only the first") {
  std::string text = std::string(kHead) +
                     "pipe P1 A N9 length=1 diameter=100 roughness=0\n"
                     "node C elevation=x\n"
                     "pipe P2 A C length=-1 diameter=100 roughness=0\n";
  CHECK(errors_of(text) ==
        "net.gln:4: error: elevation: 'x' is not a number\n"
        "net.gln:5: error: length must be positive, got '-1'\n"
        "net.gln:3: error: pipe 'P1' refers to unknown node 'N9'\n");
}

TEST_CASE("the error count is limited") {
  std::string text = kHead;
  for (int i = 0; i < 40; ++i) text += "node X" + std::to_string(i) + " elevation=bad\n";
  ParseResult r = parse_network_text(text, "net.gln");
  CHECK(r.errors.size() == 20);
  CHECK(r.truncated);
}

TEST_CASE("include errors: a missing file, a cycle") {
  namespace fs = std::filesystem;
  fs::path dir = fs::path(testing::temp_dir()) / "include_bad";
  fs::create_directories(dir);
  std::ofstream(dir / "a.gln") << "reservoir R head=1\ninclude b.gln\n";
  std::ofstream(dir / "b.gln") << "node A elevation=0\ninclude a.gln\n";
  std::ofstream(dir / "c.gln") << "reservoir R head=1\ninclude nowhere.gln\n";
  ParseResult cycle = parse_network_file((dir / "a.gln").string());
  REQUIRE(cycle.errors.size() == 1);
  CHECK(cycle.errors[0].format() == (dir / "b.gln").string() + ":2: error: include cycle: '" +
                                        (dir / "a.gln").string() + "' is already being read");
  ParseResult missing = parse_network_file((dir / "c.gln").string());
  REQUIRE(missing.errors.size() == 1);
  CHECK(missing.errors[0].format() == (dir / "c.gln").string() + ":2: error: cannot read '" +
                                          (dir / "nowhere.gln").string() +
                                          "': No such file or directory");
}

TEST_CASE("a file that cannot be read is reported without a line") {
  ParseResult r = parse_network_file("/nonexistent/net.gln");
  REQUIRE(r.errors.size() == 1);
  CHECK(r.errors[0].format() == "/nonexistent/net.gln: error: cannot read file: No such file or directory");
}
