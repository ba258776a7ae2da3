// The bulk reader's quick path for plain node and pipe lines (io/plain_lines.h) reads a line
// exactly as the general reader does, and leaves every other line to it. The expected values
// are the general reader's, which the parser tests check against the format's definition.
#include "io/plain_lines.h"

#include <doctest/doctest.h>

#include <string>

#include "io/diagnostics.h"
#include "io/lexer.h"

using namespace gradeline;

namespace {

const std::string kFile = "plain.gln";

std::string optional_text(const std::optional<double>& v) {
  return v ? std::to_string(*v) : std::string("-");
}

// Every field the readers write, as text (doubles to 17 significant digits).
std::string node_text(const Node& n) {
  char buffer[256];
  std::snprintf(buffer, sizeof buffer, "%s|%.17g|%.17g|%s|%d|%.17g|%.17g|%d", n.id.c_str(),
                n.elevation_m, n.demand_m3s, n.demand_category.str().c_str(), n.at ? 1 : 0,
                n.at ? n.at->x : 0.0, n.at ? n.at->y : 0.0, n.where.line);
  return buffer;
}

std::string pipe_text(const Pipe& p, const PipeEnds& e) {
  char buffer[256];
  std::snprintf(buffer, sizeof buffer, "%s|%.*s|%.*s|%.17g|%.17g|%.17g|%d%d%d|%d%d%d|%d",
                p.id.c_str(), static_cast<int>(e.from_id.size()), e.from_id.data(),
                static_cast<int>(e.to_id.size()), e.to_id.data(), p.length_m, p.diameter_m,
                p.minor_k, static_cast<int>(p.status), p.check_valve, p.resizable,
                e.roughness_given, e.cfactor_given, e.minor_given, p.where.line);
  return buffer + optional_text(p.roughness_m) + "|" + optional_text(p.cfactor);
}

struct Read {
  bool ok = false;
  std::string text;
  bool reported = false;  // the reader reported an error
};

enum class Element { kNode, kPipe };
enum class Path { kGeneral, kQuick };

// How `line` reads as a node or pipe: the general way (the lexer, then read_*_in_place) or by
// the quick path.
Read read(std::string_view line, UnitSystem units, Element element, Path path) {
  Diagnostics d;
  const ReadContext c{kFile, intern(kFile), units, &d};
  Node n;
  Pipe p;
  PipeEnds e;
  const bool pipe = element == Element::kPipe;
  Read r;
  if (path == Path::kQuick) {
    r.ok = pipe ? read_plain_pipe(line, 7, c, &p, &e) : read_plain_junction(line, 7, c, &n);
  } else {
    Statement s;
    const LexResult lexed = lex_line(line, 7, &s);
    r.ok = lexed.error.empty() && !lexed.empty &&
           (pipe ? read_pipe_in_place(s, c, &p, &e) : read_junction_in_place(s, c, &n)) &&
           d.empty();
    r.reported = !lexed.error.empty();
  }
  r.reported = r.reported || !d.empty();
  if (r.ok) r.text = pipe ? pipe_text(p, e) : node_text(n);
  return r;
}

// Every line, in both unit systems, reads the same both ways.
void check_same(Element element, std::initializer_list<const char*> lines) {
  for (UnitSystem units : {UnitSystem::kSI, UnitSystem::kUS}) {
    for (std::string line : lines) {
      CAPTURE(line);
      const Read general = read(line, units, element, Path::kGeneral);
      REQUIRE(general.ok);
      const Read plain = read(line, units, element, Path::kQuick);
      CHECK(plain.ok);
      CHECK(plain.text == general.text);
    }
  }
}

// Every line is declined with nothing reported.
void check_declined(Element element, std::initializer_list<const char*> lines) {
  for (std::string line : lines) {
    CAPTURE(line);
    const Read plain = read(line, UnitSystem::kSI, element, Path::kQuick);
    CHECK_FALSE(plain.ok);
    CHECK_FALSE(plain.reported);
  }
}

}  // namespace

TEST_CASE("a plain node line reads as the general reader reads it") {
  check_same(Element::kNode, {
                                 "node D0 elevation=30.00 demand=0.1740L/s at=0,0",
                                 "node J-7 elevation=12.5",
                                 "node J7\televation=-3e1\tdemand=2.5:homes",
                                 "  node K at=-254.5,44 demand=-0.25 elevation=100ft  ",
                                 "node Ünter elevation=0 demand=3gpm",
                             });
}

TEST_CASE("a plain pipe line reads as the general reader reads it") {
  check_same(Element::kPipe,
             {
                 "pipe P0 D0 D1 length=48 diameter=300",
                 "pipe P1 A B length=1.2km diameter=8in roughness=0.05mm minor=2.5 status=closed",
                 "pipe P2 A B diameter=150 length=300 cfactor=120 check=yes resize=no",
                 "pipe\tP3\tA\tB\tlength=10\tdiameter=100\tresize=yes\tcheck=no\tstatus=open",
                 "pipe Main-Street-0042 Junction-North-0041 Junction-North-0043 length=1234.5 "
                 "diameter=150 roughness=0.1",  // over 64 bytes
             });
}

TEST_CASE("node lines out of the plain form are left to the general reader, unreported") {
  check_declined(
      Element::kNode,
      {
          "node A elevation=1 # a comment", "node A elevation=1\r",
          "node A demand=1",                 // no elevation: an error there
          "node A elevation=1 elevation=2",  // a repeated key
          "node A elevation=1 colour=red",   // an unknown key
          "node A B elevation=1",            // two IDs
          "node A elevation=1 extra",        // a positional field after the keys
          "node A elevation=x",              // not a number
          "node A elevation=20000",          // out of range
          "node A elevation=1 demand=1:",    // an empty category
          "node A elevation=1 at=1",         // one coordinate
          "node A elevation=1 demand=1kPa",  // a unit of another dimension
          "node A =1 elevation=1",           // no key before '='
          "node A,B elevation=1",            // a comma in the ID
          "node A elevation=1.00000000000000000000000000000000000000000000000000000000000000000"
          "00000000000000000000000000000000000000000000000000000",  // 128 bytes and more
      });
}

TEST_CASE("pipe lines out of the plain form are left to the general reader, unreported") {
  check_declined(
      Element::kPipe,
      {
          "pipe P A B length=1 diameter=100 # a comment", "pipe P A B length=1 diameter=100\r",
          "pipe P A B length=1",                        // no diameter
          "pipe P A B diameter=100",                    // no length
          "pipe P A A length=1 diameter=100",           // both ends at one node
          "pipe P A length=1 diameter=100",             // two IDs
          "pipe P A B C length=1 diameter=100",         // four IDs
          "pipe P A B length=1 length=2 diameter=100",  // a repeated key
          "pipe P A B length=1 diameter=100 status=shut",
          "pipe P A B length=1 diameter=100 check=true",
          "pipe P A B length=1 diameter=100 resize=1",
          "pipe P A B length=0 diameter=100",  // out of range
          "pipe P A B length=1 diameter=100 cfactor=120mm",
          "pipe P A B length=1 diameter=100 roughness=2m",
          "pipe P A=B length=1 diameter=100",  // '=' in a positional field
      });
}
