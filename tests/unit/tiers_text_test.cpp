// The plain-text tier format: its layout, identity round trips of awkward text, and
// located errors with recovery (docs/formats/tiers.md).
#include <catch2/catch.hpp>
#include <random>

#include "support.hpp"

using namespace tiers;
using namespace tiers::test;

namespace {

// Every ASCII control character, the delimiters of the format, and Unicode that editors and
// terminals treat specially: combining marks, right-to-left text, emoji, invisible separators.
std::vector<std::string> awkward_strings() {
  std::vector<std::string> out;
  std::string controls;
  for (int c = 0; c < 0x20; ++c)
    controls += static_cast<char>(c);
  controls += '\x7F';
  out.push_back(controls);
  out.push_back("| = \" \\ # @ -->");
  out.push_back("  leading and trailing  \t ");
  out.push_back("e\xCC\x81 a\xCC\x8A\xCC\x81");  // combining acute and ring
  out.push_back("\xD7\xA9\xD7\x9C\xD7\x95\xD7\x9D \xD8\xB3\xD9\x84\xD8\xA7\xD9\x85");  // RTL
  out.push_back("\xF0\x9F\x98\x80\xF0\x9F\x91\xA9\xE2\x80\x8D\xF0\x9F\x94\xAC");       // emoji, ZWJ
  out.push_back(
      "\xE2\x80\xA8line\xE2\x80\xA9para\xEF\xBB\xBF"
      "bom\xC2\x85nel");
  out.push_back("\\n is not a newline, \\u{41} is not A");
  out.push_back(std::string(100'000, 'x') + "\n" + std::string(50'000, ' '));
  out.push_back("");
  out.push_back(" ");
  out.push_back("#comment-like");
  out.push_back("@attribute-like");  // a bare word starting with '@' would read as @key=value
  out.push_back("00:00:01.000 looks like a time");
  return out;
}

}  // namespace

TEST_CASE("tiers text: the layout of a small document", "[tiers-text]") {
  document doc;
  doc.media = {"a b.mp4", 90 * ns_per_second, rational{30000, 1001}};
  doc.metadata = {{"k", "v"}};
  tier& t = doc.tiers.emplace_back();
  t.name = "gesture phases";
  t.source = tier_source{source_kind::machine, "detector", "2"};
  t.parent = parent_link{"turns", relation::partition};
  t.vocabulary = std::vector<std::string>{"beat", "hold still"};
  t.attributes = {{"coder", "B"}};
  annotation a;
  a.start = 1'500'000'000;
  a.end = 2'000'000'001;
  a.text = "beat";
  a.id = "g1";
  a.confidence = 0.25;
  a.attributes = {{"hand", "left"}};
  t.annotations = {a};
  tier& p = doc.tiers.emplace_back();
  p.name = "nods";
  p.kind = tier_kind::instant;
  annotation n;
  n.start = n.end = 3723 * ns_per_second;
  p.annotations = {n};
  const std::string text = write_as("tiers", doc);
  CHECK(text ==
        "tiers 1\n"
        "media uri=\"a b.mp4\" duration=00:01:30.000 rate=30000/1001\n"
        "meta k=v\n"
        "\n"
        "tier \"gesture phases\" interval\n"
        "  source machine agent=detector version=2\n"
        "  parent turns partition\n"
        "  vocabulary beat \"hold still\"\n"
        "  attr coder=B\n"
        "  00:00:01.500 00:00:02.000000001 id=g1 conf=0.25 @hand=left | beat\n"
        "\n"
        "tier nods instant\n"
        "  01:02:03.000 |\n");
  CHECK(read_as("tiers", text) == doc);
}

TEST_CASE("tiers text: json -> tiers -> json is the identity for awkward text",
          "[tiers-text][round-trip]") {
  const std::vector<std::string> strings = awkward_strings();
  document doc = rich_document();
  for (const std::string& s : strings) {
    tier& t = doc.tiers.emplace_back();
    t.name = s;
    t.vocabulary = std::vector<std::string>{s, "plain"};
    t.attributes = {{s, s}};
    t.parent = parent_link{s, relation::refers};
    t.source = tier_source{source_kind::human, s, s};
    annotation a;
    a.start = -1;
    a.end = std::numeric_limits<time_ns>::max();
    a.text = s;
    a.markup = s;
    a.id = s;
    a.parent = s;
    a.attributes = {{s, s}, {"k", s}};
    t.annotations.push_back(a);
    doc.metadata.emplace(s, s);
  }
  const std::string text = write_as("tiers", doc);
  CHECK(read_as("tiers", text) == doc);
  // One annotation per line: no raw line break, tab or carriage return inside any line.
  std::size_t lines = 0;
  for (char c : text)
    lines += c == '\n' ? 1 : 0;
  std::size_t annotations = 0;
  for (const tier& t : doc.tiers)
    annotations += t.annotations.size();
  CHECK(text.find('\r') == std::string::npos);
  CHECK(text.find('\t') == std::string::npos);
  CHECK(lines < annotations + 8 * doc.tiers.size() + doc.metadata.size() + 4);
}

TEST_CASE("tiers text: random documents round-trip", "[tiers-text][round-trip]") {
  std::minstd_rand rng(7);
  const std::vector<std::string> strings = awkward_strings();
  auto pick = [&] {
    return strings[rng() % (strings.size() - 1)].substr(0, 40) + std::to_string(rng() % 10);
  };
  for (int round = 0; round < 50; ++round) {
    document doc;
    for (int k = static_cast<int>(rng() % 4); k > 0; --k) {
      tier& t = doc.tiers.emplace_back();
      t.name = pick();
      t.kind = rng() % 3 == 0 ? tier_kind::instant : tier_kind::interval;
      for (int n = static_cast<int>(rng() % 6); n > 0; --n) {
        annotation a;
        a.start = static_cast<time_ns>(rng()) * 1'000 - 5'000'000;
        a.end = t.kind == tier_kind::instant && rng() % 2
                    ? a.start
                    : a.start + static_cast<time_ns>(rng() % 1'000'000'007);
        a.text = pick();
        if (rng() % 2)
          a.confidence = static_cast<double>(rng()) / static_cast<double>(std::minstd_rand::max());
        if (rng() % 2) a.id = pick();
        if (rng() % 3 == 0) a.attributes.emplace(pick(), pick());
        t.annotations.push_back(a);
      }
    }
    INFO(round);
    CHECK(read_as("tiers", write_as("tiers", doc)) == doc);
  }
}

TEST_CASE("tiers text: hand-written files with comments, indentation and seconds", "[tiers-text]") {
  const document doc = read_as("tiers",
                               "# made by hand\r\n"
                               "tiers 1\r\n"
                               "\r\n"
                               "tier notes\r\n"
                               "# a comment between lines\r\n"
                               "1.5 2 | in seconds\r\n"
                               "\t00:00:03 00:00:04.25   id=\"x y\"   | clock time\r\n"
                               "5 | a point in an interval tier\r\n");
  const tier& t = doc.tiers.at(0);
  REQUIRE(t.annotations.size() == 3);
  CHECK(t.annotations[0].start == 1'500'000'000);
  CHECK(t.annotations[1].end == 4'250'000'000);
  CHECK(t.annotations[1].id == "x y");
  CHECK(t.annotations[2].end == 5 * ns_per_second);
}

TEST_CASE("tiers text: every bad line is reported with its place, and reading goes on",
          "[tiers-text][bad-input]") {
  const std::string text =
      "tiers 1\n"
      "00:00:01 | before any tier\n"
      "media uri=a.mp4 uri=b.mp4\n"
      "media rate=25\n"
      "tier t\n"
      "  00:00:01 00:00:02 colour=red | unknown field\n"
      "  00:61:00 | bad time\n"
      "  00:00:01 conf=2 | confidence\n"
      "  00:00:01 id=\"open | quote\n"
      "  00:00:01 |no space\n"
      "  00:00:01 | bad \\q escape\n"
      "  shape t | unknown keyword\n"
      "  00:00:05 | fine\n";
  const read_result r = read_document(text, *find_format("tiers"), {}, "t");
  struct where {
    std::size_t line, column;
    const char* part;
  };
  // A media field given twice, or a second media line, would replace the first silently.
  const where expected[] = {{2, 1, "before any 'tier' line"},
                            {3, 17, "uri is given twice"},
                            {4, 1, "a second 'media' line"},
                            {6, 21, "unknown field 'colour'"},
                            {7, 3, "time '00:61:00' has a field out of range"},
                            {8, 12, "conf '2' is not a number from 0 to 1"},
                            {9, 15, "quoted string is not closed"},
                            {10, 12, "followed by a space"},
                            {11, 18, "unknown escape"},
                            {12, 3, "only annotation lines have a text"}};
  REQUIRE(r.diagnostics.size() == std::size(expected));
  for (std::size_t k = 0; k < std::size(expected); ++k) {
    INFO(k << ": " << format_diagnostic(r.diagnostics[k]));
    CHECK(r.diagnostics[k].line == expected[k].line);
    CHECK(r.diagnostics[k].column == expected[k].column);
    CHECK_THAT(r.diagnostics[k].message, Catch::Contains(expected[k].part));
  }
  CHECK_FALSE(r.ok());
}

TEST_CASE("tiers text: the signature and the version", "[tiers-text][bad-input]") {
  CHECK(first_error("tiers", "").code == "tiers.signature");
  CHECK(first_error("tiers", "tier x\n").code == "tiers.signature");
  // A text after the signature is not ignored: it would be data dropped without a word.
  CHECK(first_error("tiers", "tiers 1 | \x11 text\n").code == "tiers.version");
  const diagnostic v = first_error("tiers", "# comment\ntiers 2\n");
  CHECK(v.code == "tiers.version");
  CHECK(v.line == 2);
  CHECK(v.column == 7);
  CHECK_THAT(v.message, Catch::Contains("version 2 is newer"));
}
