// The native JSON format: lossless round trips, exact times, and located errors.
#include <catch2/catch.hpp>
#include <cctype>
#include <cmath>
#include <limits>

#include "detail/json_text.hpp"
#include "support.hpp"

using namespace tiers;
using namespace tiers::test;

TEST_CASE("json keeps every part of the model", "[json]") {
  const document doc = rich_document();
  const std::string text = write_as("json", doc);
  CHECK(read_as("json", text) == doc);
  // Writing what was read gives the same bytes: the output is canonical.
  CHECK(write_as("json", read_as("json", text)) == text);
}

TEST_CASE("json times are exact decimal seconds without exponent", "[json]") {
  document doc;
  tier& t = doc.tiers.emplace_back();
  t.name = "t";
  for (time_ns v : {time_ns{1}, time_ns{1'249'999'999}, time_ns{-500'000'000},
                    time_ns{123'456'789'012'345'678}}) {
    annotation a;
    a.start = v;
    a.end = v + 1;
    t.annotations.push_back(a);
  }
  const std::string text = write_as("json", doc);
  CHECK(text.find("\"start\": 0.000000001, \"end\": 0.000000002") != std::string::npos);
  CHECK(text.find("\"start\": 1.249999999,") != std::string::npos);
  CHECK(text.find("\"start\": -0.5,") != std::string::npos);
  CHECK(text.find("\"start\": 123456789.012345678,") != std::string::npos);
  for (std::size_t i = 0; i + 1 < text.size(); ++i) {  // no exponent anywhere
    INFO(text.substr(i, 20));
    CHECK_FALSE((std::isdigit(static_cast<unsigned char>(text[i])) &&
                 (text[i + 1] == 'e' || text[i + 1] == 'E')));
  }
  CHECK(read_as("json", text) == doc);
}

TEST_CASE("json reads numbers in any JSON form exactly", "[json]") {
  const document doc = read_as("json", R"({"format": "tiers", "version": 1, "tiers": [
    {"name": "t", "kind": "interval", "annotations": [
      {"start": 2.5e3, "end": 2500.000000001, "text": ""},
      {"start": 12345678.987654321, "end": 12345679, "text": "", "confidence": 1}]}]})");
  const tier& t = doc.tiers.at(0);
  CHECK(t.annotations[0].start == 2'500'000'000'000);
  CHECK(t.annotations[0].end == 2'500'000'000'001);
  CHECK(t.annotations[1].start == 12'345'678'987'654'321);
  CHECK(t.annotations[1].confidence == 1.0);
}

TEST_CASE("json defaults: instant annotations may omit end, kind defaults to interval", "[json]") {
  const document doc = read_as("json", R"({"format": "tiers", "version": 1, "tiers": [
    {"name": "p", "kind": "instant", "annotations": [{"start": 5, "text": "x"}]},
    {"annotations": [{"start": 1, "end": 2, "text": "y"}], "name": "i"}]})");
  CHECK(doc.tiers[0].annotations[0].end == 5 * ns_per_second);
  CHECK(doc.tiers[1].kind == tier_kind::interval);
}

TEST_CASE("json accepts a byte order mark", "[json]") {
  const document doc = read_as("json", "\xEF\xBB\xBF{\"format\": \"tiers\", \"version\": 1}");
  CHECK(doc.tiers.empty());
}

TEST_CASE("bad json is rejected with its location", "[json][bad-input]") {
  struct row {
    const char* input;
    const char* code;
    std::size_t line, column;
    const char* message_part;
  };
  // The location is where a person should look: the offending byte, or the member's key.
  const row rows[] = {
      {"", "json.syntax", 1, 1, "end of input"},
      {"{\"format\": \"tiers\",\n \"version\": 1,\n \"tiers\": [", "json.syntax", 3, 12,
       "end of input"},
      {"{\"format\": \"tiers\", \"version\": 1, \"tiers\": [}", "json.syntax", 1, 45,
       "invalid JSON"},
      {"[1, 2]", "json.value", 1, 1, "JSON object"},
      {"{\"format\": \"other\", \"version\": 1}", "json.value", 1, 2, "not a tiers JSON document"},
      {"{\"format\": \"tiers\"}", "json.member", 1, 1, "no 'version'"},
      {"{\"format\": \"tiers\", \"version\": 2}", "json.value", 1, 21, "newer than this build"},
      {"{\"format\": \"tiers\", \"version\": 1, \"colour\": 1}", "json.member", 1, 35,
       "unknown member 'colour'"},
      {"{\"format\": \"tiers\", \"format\": \"tiers\", \"version\": 1}", "json.duplicate", 1, 21,
       "duplicate member 'format'"},
      {"{\"format\": \"tiers\", \"version\": 1, \"tiers\": [{\"kind\": \"interval\"}]}",
       "json.member", 1, 45, "tier has no 'name'"},
      {"{\"format\": \"tiers\", \"version\": 1, \"tiers\": [{\"name\": \"t\", \"kind\": "
       "\"span\"}]}",
       "json.value", 1, 59, "'kind' must be \"interval\" or \"instant\""},
      {"{\"format\": \"tiers\", \"version\": 1, \"tiers\": [{\"name\": \"t\", \"annotations\": [\n"
       "  {\"start\": 1, \"text\": \"no end\"}]}]}",
       "json.member", 2, 3, "has no 'end'"},
      {"{\"format\": \"tiers\", \"version\": 1, \"tiers\": [{\"name\": \"t\", \"annotations\": [\n"
       "  {\"start\": \"1.5\", \"end\": 2}]}]}",
       "json.value", 2, 4, "'start' must be a number of seconds"},
      {"{\"format\": \"tiers\", \"version\": 1, \"tiers\": [{\"name\": \"t\", \"annotations\": [\n"
       "  {\"start\": 1e300, \"end\": 2}]}]}",
       "time.range", 2, 4, "out of range"},
      {"{\"format\": \"tiers\", \"version\": 1, \"tiers\": [{\"name\": \"t\", \"annotations\": [\n"
       "  {\"start\": 99999999999999999999, \"end\": 2}]}]}",
       "time.range", 2, 4, "out of range"},
      {"{\"format\": \"tiers\", \"version\": 1, \"tiers\": [{\"name\": \"t\", \"annotations\": [\n"
       "  {\"start\": 1, \"end\": 2, \"confidence\": 1.5}]}]}",
       "json.value", 2, 26, "'confidence' must be a number from 0 to 1"},
      {"{\"format\": \"tiers\", \"version\": 1, \"tiers\": [{\"name\": \"t\", \"annotations\": [\n"
       "  {\"start\": 1, \"end\": 2, \"attributes\": {\"n\": 3}}]}]}",
       "json.value", 2, 41, "'n' must be a string"},
      {"{\"format\": \"tiers\", \"version\": 1, \"metadata\": {\"a\": {\"deep\": 1}}}",
       "json.value", 1, 48, "'a' must be a string"},
      {"{\"format\": \"tiers\", \"version\": 1, \"media\": {\"frame_rate\": \"0/1\"}}",
       "json.value", 1, 45, "positive rational"},
      {"{\"format\": \"tiers\", \"version\": 1, \"tiers\": [{\"name\": \"t\", \"source\": {}}]}",
       "json.member", 1, 69, "source has no 'kind'"},
      {"{\"format\": \"tiers\", \"version\": 1, \"tiers\": [\"t\"]}", "json.value", 1, 45,
       "each tier must be an object"},
      {"{\"format\": \"tiers\", \"version\": 1} trailing", "json.syntax", 1, 35,
       "unexpected text after the document"},
      {"{\"format\": \"t\xC3\xA9\", \"version\": 1}", "json.value", 1, 2, "not a tiers JSON"},
  };
  for (const row& r : rows) {
    INFO(r.input);
    const diagnostic d = first_error("json", r.input);
    CHECK(d.code == r.code);
    CHECK(d.line == r.line);
    CHECK(d.column == r.column);
    CHECK_THAT(d.message, Catch::Contains(r.message_part));
  }
}

TEST_CASE("json nested a million levels deep is refused at the first level", "[json][bad-input]") {
  const std::string deep = std::string(1'000'000, '[') + std::string(1'000'000, ']');
  const diagnostic d = first_error("json", deep);
  CHECK(d.code == "json.value");
  CHECK(d.column == 1);
  std::string deep_meta = "{\"format\": \"tiers\", \"version\": 1, \"metadata\": ";
  for (int k = 0; k < 100'000; ++k)
    deep_meta += "{\"a\": ";
  const diagnostic m = first_error("json", deep_meta);
  CHECK(m.code == "json.value");
  CHECK(m.column == 48);  // at the key whose value nests
}

TEST_CASE("the JSON scanner follows RFC 8259 and locates every mistake", "[json]") {
  // RFC 8259 §6 (numbers), §7 (strings: escapes, control characters, surrogate pairs).
  // Numbers stand as a start time, strings as a metadata value: both are accepted there, so
  // that the scanner, not the reader, finds each mistake.
  const std::string number_context =
      "{\"format\": \"tiers\", \"version\": 1, \"tiers\": [{\"name\": \"t\", \"annotations\": "
      "[{\"start\": ";
  const std::string string_context =
      "{\"format\": \"tiers\", \"version\": 1, \"metadata\": {\"k\": ";
  struct row {
    bool number;
    const char* value;
    std::size_t offset;  // from the value's first byte
    const char* message;
  };
  for (const row& r :
       {row{true, "01", 1, "invalid JSON: unexpected '1'; expected ',' or '}'"},
        row{true, "1.", 0, "invalid JSON: invalid number"},
        row{true, "-", 0, "invalid JSON: invalid number"},
        row{true, ".5", 0, "invalid JSON: unexpected '.'; expected a value"},
        row{true, "1e", 0, "invalid JSON: invalid number"},
        row{true, "tru", 0,
            "invalid JSON: invalid literal (true, false and null are the JSON literals)"},
        row{false, "\"a\tb\"", 2,
            "invalid JSON: invalid string: control character U+0009 must be escaped"},
        row{false, "\"\\x\"", 1, "invalid JSON: invalid string: forbidden escape '\\x'"},
        row{false, "\"\\u12\"", 1,
            "invalid JSON: invalid string: '\\u' must be followed by 4 hex digits"},
        row{false, "\"\\ud800\"", 1,
            "invalid JSON: invalid string: a high surrogate must be followed by a low surrogate"},
        row{false, "\"\\udc00\"", 1, "invalid JSON: invalid string: a low surrogate alone"}}) {
    INFO(r.value);
    const std::string& context = r.number ? number_context : string_context;
    const diagnostic d = first_error("json", context + r.value + "}]}]}");
    CHECK(d.code == "json.syntax");
    CHECK(d.offset == context.size() + r.offset);
    CHECK(d.message == r.message);
  }
  // What is well-formed reads as it should: escapes and a surrogate pair decoded.
  const document doc = test::read_as(
      "json", string_context + "\"\\\"\\\\\\/\\b\\f\\n\\r\\t\\u00e9\\ud83d\\ude00\"}}");
  CHECK(doc.metadata.at("k") == "\"\\/\b\f\n\r\t\xC3\xA9\xF0\x9F\x98\x80");
}

TEST_CASE("the JSON writer breaks the containers it is told to, and only those", "[json]") {
  std::string text;
  {
    string_sink out(text);
    detail::json_writer j(out);
    j.begin_object(true);
    j.string("a", "x\"y");
    j.key("list").begin_array(true);
    j.begin_object();
    j.count("n", 1);
    j.number("nan", std::nan(""));
    j.number("inf", std::numeric_limits<double>::infinity());
    j.end_object();
    j.begin_array();
    j.end_array();
    j.end_array();
    j.key("empty").begin_array(true);
    j.end_array();
    j.key("k\n").raw("[1]");
    j.seconds("t", -1'500'000'000);
    j.boolean("b", false);
    j.end_object();
  }
  // Layout as DEVELOPERS.md describes it: two spaces per broken container around a part;
  // a container that is not broken is one line with ", " and ": "; an empty one is [] even when
  // broken. Non-finite numbers are null: JSON has no NaN (RFC 8259 §6).
  CHECK(text ==
        "{\n"
        "  \"a\": \"x\\\"y\",\n"
        "  \"list\": [\n"
        "    {\"n\": 1, \"nan\": null, \"inf\": null},\n"
        "    []\n"
        "  ],\n"
        "  \"empty\": [],\n"
        "  \"k\\n\": [1],\n"
        "  \"t\": -1.5,\n"
        "  \"b\": false\n"
        "}");
}
