// Reading node and pipe lines in bulk on every core gives the network, and the errors, that
// reading line by line gives (io/bulk_reader.h). The expected values here are those of the
// line-by-line reader, which the other parser tests check against the format's definition.
#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>

#include "gradeline/prefault.h"
#include "io/network_writer.h"
#include "io/parser.h"
#include "test_support.h"

using namespace gradeline;

namespace {

constexpr std::size_t kAlwaysBulk = 1;  // any text with a node or pipe line
constexpr std::size_t kNeverBulk = static_cast<std::size_t>(-1);

// Every element kind, statements between the elements, comments, a blank line and CRLF.
const char* kMixed =
    "title Mixed zone\n"
    "units US\n"
    "headloss darcy-weisbach\n"
    "# supplies first\n"
    "reservoir R1 head=300 at=0,0\n"
    "node A elevation=100 demand=50:homes at=1,2\n"
    "node B elevation=90 demand=20\r\n"
    "defaults roughness=0.01\n"
    "pipe P1 R1 A length=1000 diameter=8\n"
    "\n"
    "tank T1 bottom=120 level=10 min_level=1 max_level=20 diameter=40\n"
    "pipe P2 A B length=800 diameter=6 roughness=0.02 minor=2 status=open check=yes\n"
    "pump K1 R1 B curve=500:150 speed=0.9\n"
    "node C elevation=95   # a comment after a node\n"
    "valve V1 B C type=prv diameter=6 pressure=50psi\n"
    "pipe P3 C T1 length=500 diameter=6 resize=yes\n"
    "pipe P4 A C length=700 diameter=4 status=closed\n"
    "case peak factor=1.8 factor.homes=2.1 draw=C:250\n"
    "limit pressure min=20psi\n";

// The network as text, with the source line of every element.
std::string fingerprint(const Network& n) {
  std::string out = write_network(n);
  for (const Node& node : n.nodes)
    out += node.id + "@" + node.where.file() + ":" + std::to_string(node.where.line) + "\n";
  for (const Pipe& pipe : n.pipes)
    out += pipe.id + "@" + pipe.where.file() + ":" + std::to_string(pipe.where.line) + "\n";
  return out;
}

std::string errors_text(const ParseResult& r) {
  std::string out;
  for (const Diagnostic& d : r.errors) out += d.format() + "\n";
  return out;
}

}  // namespace

TEST_CASE("a network with every element kind reads the same in bulk as line by line") {
  ParseResult bulk = parse_network_text(kMixed, "mixed.gln", kAlwaysBulk);
  ParseResult lines = parse_network_text(kMixed, "mixed.gln", kNeverBulk);
  REQUIRE(lines.ok());
  REQUIRE(bulk.ok());
  CHECK(bulk.bulk_read);
  CHECK_FALSE(lines.bulk_read);
  CHECK(bulk.network.nodes.size() == 5);
  CHECK(bulk.network.pipes.size() == 6);
  CHECK(fingerprint(bulk.network) == fingerprint(lines.network));
  // The ID lookup holds every element at its place in file order.
  CHECK(*bulk.network.find_node("T1") == 3);
  CHECK(*bulk.network.find_pipe("V1") == 3);
}

TEST_CASE("the unit system set before the first node applies to the lines read in bulk") {
  ParseResult bulk = parse_network_text(kMixed, "mixed.gln", kAlwaysBulk);
  REQUIRE(bulk.ok());
  // 100 ft = 30.48 m (US survey foot not used: international foot, exact by definition).
  CHECK(bulk.network.nodes[1].elevation_m == doctest::Approx(30.48));
  CHECK(bulk.network.pipes[0].diameter_m == doctest::Approx(0.2032));  // 8 in
}

TEST_CASE("a units statement after the first node is refused as when read line by line") {
  const std::string text =
      "node A elevation=10\nunits US\nreservoir R head=50\n"
      "pipe P R A length=100 diameter=6 roughness=0.01\n";
  ParseResult bulk = parse_network_text(text, "late.gln", kAlwaysBulk);
  ParseResult lines = parse_network_text(text, "late.gln", kNeverBulk);
  REQUIRE(lines.errors.size() == 1);
  CHECK(lines.errors[0].format() ==
        "late.gln:2: error: 'units' must come before the first value with a unit default");
  CHECK(errors_text(bulk) == errors_text(lines));
}

TEST_CASE("a file with an include is read line by line") {
  const std::string dir = testing::temp_dir();
  std::ofstream(dir + "/bulk_part.gln") << "node Z elevation=1\n";
  std::ofstream(dir + "/bulk_main.gln")
      << "reservoir R head=10\nnode A elevation=0\ninclude bulk_part.gln\n"
         "pipe P R A length=1 diameter=100 roughness=0\n"
         "pipe Q A Z length=1 diameter=100 roughness=0\n";
  std::ifstream in(dir + "/bulk_main.gln");
  const std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  ParseResult r = parse_network_text(text, dir + "/bulk_main.gln", kAlwaysBulk);
  REQUIRE(r.ok());
  CHECK_FALSE(r.bulk_read);
  CHECK(r.network.nodes.size() == 3);
}

TEST_CASE("errors in lines meant for the bulk read come out as when read line by line") {
  const std::string text = std::string(kMixed) +
                           "node D elevation=high\n"                  // a bad number
                           "node A elevation=3\n"                     // a duplicate
                           "pipe P9 A Nowhere length=1 diameter=2\n"  // an unknown node
                           "pipe P10 A B length=-1 diameter=2\n";     // out of range
  ParseResult bulk = parse_network_text(text, "bad.gln", kAlwaysBulk);
  ParseResult lines = parse_network_text(text, "bad.gln", kNeverBulk);
  CHECK_FALSE(bulk.ok());
  CHECK(lines.errors.size() == 4);
  CHECK(errors_text(bulk) == errors_text(lines));
  CHECK_FALSE(bulk.bulk_read);  // the result is that of the reading line by line
}

TEST_CASE("an error in a line read line by line makes the whole file read that way") {
  const std::string text = std::string(kMixed) + "tank T2 bottom=1\n" + "unknownword x\n";
  ParseResult bulk = parse_network_text(text, "bad.gln", kAlwaysBulk);
  ParseResult lines = parse_network_text(text, "bad.gln", kNeverBulk);
  CHECK(lines.errors.size() == 2);
  CHECK(errors_text(bulk) == errors_text(lines));
}

TEST_CASE("a large file is read in bulk by default, and gives the same network") {
  // A chain of junctions from one reservoir, longer than kBulkReadFromLines lines.
  std::string text = "units SI\nreservoir R head=80\n";
  const int count = static_cast<int>(kBulkReadFromLines);
  for (int i = 0; i < count; ++i) {
    text +=
        "node N" + std::to_string(i) + " elevation=" + std::to_string(i % 17) + " demand=0.01\n";
  }
  for (int i = 0; i < count; ++i) {
    text += "pipe P" + std::to_string(i) + " " +
            (i == 0 ? std::string("R") : "N" + std::to_string(i - 1)) + " N" + std::to_string(i) +
            " length=" + std::to_string(10 + i % 7) + " diameter=150 roughness=0.1\n";
  }
  const std::string path = testing::temp_dir() + "/bulk_chain.gln";
  std::ofstream(path) << text;
  ParseResult bulk = parse_network_file(path);
  ParseResult lines = parse_network_text(text, path, kNeverBulk);
  REQUIRE(bulk.ok());
  CHECK(bulk.bulk_read);
  CHECK(bulk.network.nodes.size() == static_cast<std::size_t>(count) + 1);
  CHECK(fingerprint(bulk.network) == fingerprint(lines.network));
}

TEST_CASE("a duplicate link ID in a large file is reported as when read line by line") {
  // Enough links for the link lookup to be filled by parts on every core (IdIndex::insert_all).
  constexpr int kLinks = 70000;
  std::string text = "units SI\nreservoir R head=80\n";
  for (int i = 0; i < kLinks; ++i) text += "node N" + std::to_string(i) + " elevation=1\n";
  for (int i = 0; i < kLinks; ++i) {
    const int id = i == 61234 ? 4321 : i;  // the second P4321
    text += "pipe P" + std::to_string(id) + " " +
            (i == 0 ? std::string("R") : "N" + std::to_string(i - 1)) + " N" + std::to_string(i) +
            " length=10 diameter=150 roughness=0.1\n";
  }
  const std::string path = testing::temp_dir() + "/bulk_duplicate.gln";
  std::ofstream(path) << text;
  ParseResult bulk = parse_network_file(path);
  ParseResult lines = parse_network_text(text, path, kNeverBulk);
  CHECK_FALSE(bulk.ok());
  REQUIRE(lines.errors.size() == 1);
  CHECK(errors_text(bulk) == errors_text(lines));
  CHECK(lines.errors[0].format().find("P4321") != std::string::npos);
}

TEST_CASE("every shipped, test and pathological network reads the same in bulk") {
  int files = 0;
  for (const char* dir : {"networks", "tests/networks", "tests/pathological"}) {
    for (const auto& e : std::filesystem::directory_iterator(testing::source_path(dir))) {
      if (e.path().extension() != ".gln") continue;
      ++files;
      CAPTURE(e.path().string());
      std::ifstream in(e.path());
      const std::string text((std::istreambuf_iterator<char>(in)),
                             std::istreambuf_iterator<char>());
      ParseResult bulk = parse_network_text(text, e.path().string(), kAlwaysBulk);
      ParseResult lines = parse_network_text(text, e.path().string(), kNeverBulk);
      CHECK(errors_text(bulk) == errors_text(lines));
      if (bulk.ok() && lines.ok()) CHECK(fingerprint(bulk.network) == fingerprint(lines.network));
    }
  }
  CHECK(files > 10);
}

TEST_CASE("prefaulting a block leaves what it holds as it was") {
  // madvise(MADV_POPULATE_WRITE) maps pages without writing them (Linux man page madvise(2)).
  std::vector<double> v(std::size_t{3} << 20);  // 24 MB, above kPrefaultBytes
  for (std::size_t i = 0; i < v.size(); ++i) v[i] = static_cast<double>(i) * 0.5;
  v.reserve(v.size() * 2);
  prefault_capacity(v);
  std::size_t changed = 0;
  for (std::size_t i = 0; i < v.size(); ++i) changed += v[i] != static_cast<double>(i) * 0.5;
  CHECK(changed == 0);
  resize_prefaulted(v, v.capacity() + 1);
  CHECK(v[12345] == 12345 * 0.5);
  CHECK(v.back() == 0.0);
}
