// WebVTT: the parser algorithm of the W3C specification (w3c/webvtt, index.bs §6), cue text
// (§6.4), settings (§6.3), and a writer whose output reads back the same.
#include <catch2/catch.hpp>
#include <fstream>
#include <iterator>
#include <random>

#include "support.hpp"

using namespace tiers;
using namespace tiers::test;

namespace {

const annotation& cue(const document& doc, std::size_t k) {
  return doc.tiers.at(0).annotations.at(k);
}

std::vector<diagnostic> warnings_of(std::string_view text, bool strict = false) {
  read_options o;
  o.strict = strict;
  return read_document(text, *find_format("vtt"), o, "test").diagnostics;
}

bool has_code(const std::vector<diagnostic>& ds, std::string_view code, severity level) {
  return std::any_of(ds.begin(), ds.end(),
                     [&](const diagnostic& d) { return d.code == code && d.level == level; });
}

}  // namespace

TEST_CASE("vtt signature: optional BOM, WEBVTT, then end, space, tab or line break", "[vtt]") {
  // Source: WebVTT §6.1 steps 4–6 (CHECKS.md, read).
  for (std::string_view good : {"WEBVTT", "WEBVTT\n", "WEBVTT \n", "WEBVTT\tsome header\n",
                                "\xEF\xBB\xBFWEBVTT\n", "WEBVTT\r\n", "WEBVTT\r"}) {
    INFO(good);
    CHECK(read_document(good, *find_format("vtt"), {}, "t").ok());
  }
  struct row {
    const char* input;
    std::size_t line, column;
  };
  const row bad[] = {{"", 1, 1},
                     {"WEBVT", 1, 6},
                     {"WEBVTTX\n", 1, 7},
                     {" WEBVTT\n", 1, 1},
                     {"webvtt\n", 1, 1},
                     {"WEBVTT-x\n", 1, 7},
                     {"\xEF\xBB\xBF"
                      "FOO",
                      1, 2}};
  for (const row& r : bad) {
    INFO(r.input);
    const diagnostic d = first_error("vtt", r.input);
    CHECK(d.code == "vtt.signature");
    CHECK(d.line == r.line);
    CHECK(d.column == r.column);
  }
}

TEST_CASE("vtt timestamps follow the digit and range rules", "[vtt]") {
  // Source: WebVTT §6.3 "collect a WebVTT timestamp" (CHECKS.md, read).
  auto first_start = [](std::string_view stamp) -> std::optional<time_ns> {
    const std::string text = "WEBVTT\n\n" + std::string(stamp) + " --> 999:00:00.000\nx\n";
    const read_result r = read_document(text, *find_format("vtt"), {}, "t");
    if (r.value.tiers.empty() || r.value.tiers[0].annotations.empty()) return std::nullopt;
    return r.value.tiers[0].annotations[0].start;
  };
  CHECK(first_start("60:00:00.000") == 216000 * ns_per_second);
  CHECK(first_start("000:00:00.000") == 0);
  CHECK(first_start("59:59.999") == 3599'999'000'000);
  CHECK(first_start("01:02:03.004") == 3723'004'000'000);
  for (std::string_view bad :
       {"00:00.0000", "00:000.000", "00::00.000", "00:60.000", "00:00:60.000", "00:60:00.000",
        "100:00.000", "0:00.000", "00:00.00", "00:00", "-00:00.000", "00:00,000"}) {
    INFO(bad);
    CHECK_FALSE(first_start(bad));
  }
}

TEST_CASE("vtt timestamps beyond the model's range stop the read", "[vtt]") {
  // A well-formed timestamp the parser would keep, but time_ns cannot hold: refusing it is
  // better than skipping the cue as if its timing line were malformed.
  const diagnostic d = first_error("vtt", "WEBVTT\n\n00:00.000 --> 99999999999:00:00.000\nx\n");
  CHECK(d.code == "time.range");
  CHECK(d.line == 3);
  CHECK(d.column == 15);
}

TEST_CASE("vtt reads CR, LF and CRLF alike and replaces NUL with U+FFFD", "[vtt]") {
  // Source: WebVTT §6.1 step 1.
  const std::string lf = "WEBVTT\n\nid\n00:01.000 --> 00:02.000\nline one\nline two\n";
  std::string cr = lf, crlf;
  std::replace(cr.begin(), cr.end(), '\n', '\r');
  for (char c : lf)
    crlf += c == '\n' ? std::string("\r\n") : std::string(1, c);
  const document a = read_as("vtt", lf), b = read_as("vtt", cr), c = read_as("vtt", crlf);
  CHECK(a == b);
  CHECK(a == c);
  CHECK(cue(a, 0).text == "line one\nline two");
  CHECK(cue(a, 0).id == "id");
  static constexpr char with_nul[] = "WEBVTT\n\n00:01.000 --> 00:02.000\na\0b\n";
  const document nul = read_as("vtt", std::string(with_nul, sizeof with_nul - 1));
  CHECK(cue(nul, 0).text ==
        "a\xEF\xBF\xBD"
        "b");
}

TEST_CASE("vtt cue text: voices, tags and character references", "[vtt]") {
  // The voice example of the specification's introduction (§1, "Other caption and subtitling
  // features"), with invented names.
  const document doc =
      read_as("vtt",
              "WEBVTT\n\n"
              "00:00.000 --> 00:02.000\n<v.first.loud Ana>It's a blue apple tree!\n\n"
              "00:02.000 --> 00:04.000\n<v Bo>No way!\n\n"
              "00:04.000 --> 00:06.000\n<v Ana>Hee!</v> <i>laughter</i>\n\n"
              "00:06.000 --> 00:08.000\nfish &amp; chips &lt;3 &gt; &nbsp;&lrm;"
              "&#39;&#x26;&bogus; &amp &#128;&#0; <ruby>漢<rt>kan</rt></ruby>\n");
  CHECK(cue(doc, 0).text == "It's a blue apple tree!");
  CHECK(cue(doc, 0).attributes.at("speaker") == "Ana");
  CHECK(cue(doc, 0).markup == "<v.first.loud Ana>It's a blue apple tree!");
  CHECK(cue(doc, 1).attributes.at("speaker") == "Bo");
  // Two children at the top (the voice span and the rest): not one voice span.
  CHECK(cue(doc, 2).text == "Hee! laughter");
  CHECK(cue(doc, 2).attributes.count("speaker") == 0);
  // HTML character references (the HTML standard's table): named, legacy without ';',
  // numeric, the C1 replacement of &#128; by U+20AC, and &#0; by U+FFFD.
  CHECK(cue(doc, 3).text ==
        "fish & chips <3 > \xC2\xA0\xE2\x80\x8E'&&bogus; & \xE2\x82\xAC\xEF\xBF\xBD 漢kan");
  CHECK_FALSE(cue(doc, 3).attributes.count("speaker"));
  // Plain text without tags or references has no separate markup.
  CHECK_FALSE(
      read_as("vtt", "WEBVTT\n\n00:00.000 --> 00:01.000\nplain\n").tiers[0].annotations[0].markup);
}

TEST_CASE("vtt cue settings: valid ones kept, invalid ones dropped with a warning", "[vtt]") {
  const std::string text =
      "WEBVTT\n\nREGION\nid:r1 width:40%\n\n"
      "00:00.000 --> 00:01.000 vertical:rl line:-1,end position:10%,line-left size:50% "
      "align:start\na\n\n"
      "00:01.000 --> 00:02.000 align:middle vertical:x line:abc position:101% size:-1% "
      "region:nowhere colour:red x\nb\n\n"
      "00:02.000 --> 00:03.000 line:0 region:r1\nc\n\n"
      "00:03.000 --> 00:04.000 region:r1 line:0\nd\n";
  const document doc = read_as("vtt", text);
  const attribute_map first = {{"vtt:align", "start"},
                               {"vtt:line", "-1,end"},
                               {"vtt:position", "10%,line-left"},
                               {"vtt:size", "50%"},
                               {"vtt:vertical", "rl"}};
  CHECK(cue(doc, 0).attributes == first);
  CHECK(cue(doc, 1).attributes.empty());
  // §6.3: a line setting takes the cue out of a region given before it, not after it.
  CHECK(cue(doc, 2).attributes == attribute_map{{"vtt:line", "0"}, {"vtt:region", "r1"}});
  CHECK(cue(doc, 3).attributes == attribute_map{{"vtt:line", "0"}});
  const auto ds = warnings_of(text);
  CHECK(std::count_if(ds.begin(), ds.end(),
                      [](const diagnostic& d) { return d.code == "vtt.setting"; }) == 9);
  CHECK_FALSE(has_errors(ds));
}

TEST_CASE("vtt blocks: styles and regions only before the first cue, comments kept", "[vtt]") {
  const std::string text =
      "WEBVTT header text\nKind: captions\n\n"
      "STYLE\n::cue { color: lime }\n\nNOTE first\ncomment\n\nREGION\nid:r\n\n"
      "c1\n00:00.000 --> 00:01.000\none\n\n"
      "NOTE between\n\nSTYLE\n::cue { color: red }\n\n"
      "00:01.000 --> 00:02.000\ntwo\n\nNOTE last\n";
  const document doc = read_as("vtt", text);
  CHECK(doc.metadata.at("vtt:header") == " header text\nKind: captions");
  CHECK(doc.metadata.at("vtt:prelude") ==
        "STYLE\n::cue { color: lime }\n\nNOTE first\ncomment\n\nREGION\nid:r");
  CHECK(cue(doc, 1).attributes.at("vtt:note") == "NOTE between");
  CHECK(doc.metadata.at("vtt:trailer") == "NOTE last");
  const auto ds = warnings_of(text);
  REQUIRE(ds.size() == 1);
  CHECK(ds[0].code == "vtt.block");
  CHECK(ds[0].line == 19);
  CHECK(ds[0].column == 1);
  // vtt -> json -> vtt keeps all of it (timestamps are written with hours).
  read_options o;
  o.tier_name = "tier";
  CHECK(read_as("vtt", write_as("vtt", doc), o) == doc);
}

TEST_CASE("vtt cues with invalid timing lines are skipped with a located warning",
          "[vtt][bad-input]") {
  const std::string text =
      "WEBVTT\n\n00:00.000 --> 00:01.00\nskipped\n\n00:01.000 --> 00:0x.000\nskipped too\n";
  const read_result r = read_document(text, *find_format("vtt"), {}, "t");
  CHECK(r.ok());
  REQUIRE(r.value.tiers.size() == 1);
  CHECK(r.value.tiers[0].annotations.empty());
  REQUIRE(r.diagnostics.size() == 2);
  CHECK(r.diagnostics[0].code == "vtt.timing");
  CHECK(r.diagnostics[0].line == 3);
  CHECK(r.diagnostics[0].column == 15);
  CHECK(r.diagnostics[1].line == 6);
  CHECK(r.diagnostics[1].column == 15);
}

TEST_CASE("vtt authoring rules warn by default and are errors with strict", "[vtt]") {
  const std::string text =
      "WEBVTT\n\na\n00:05.000 --> 00:06.000\nx\n\na\n00:01.000 --> 00:01.000\ny\n\n"
      "00:07.000 --> 00:09.000\n<00:08.000>b <00:07.500>c <00:09.500>d\n";
  const auto lenient = warnings_of(text);
  CHECK_FALSE(has_errors(lenient));
  for (std::string_view code : {"vtt.order", "vtt.empty", "vtt.id", "vtt.timestamp"}) {
    INFO(code);
    CHECK(has_code(lenient, code, severity::warning));
    CHECK(has_code(warnings_of(text, true), code, severity::error));
  }
}

TEST_CASE("vtt inline timestamps become a word tier within the cue tier", "[vtt]") {
  read_options o;
  o.tier_name = "captions";
  const document doc =
      read_as("vtt",
              "WEBVTT\n\n00:01.000 --> 00:04.000\n"
              "<c>Never</c> <00:01.500>drink <00:02.250>liquid <00:03.000>nitrogen.\n",
              o);
  REQUIRE(doc.tiers.size() == 2);
  const tier& w = doc.tiers[1];
  CHECK(w.name == "captions.words");
  CHECK(w.parent == parent_link{"captions", relation::within});
  REQUIRE(w.annotations.size() == 4);
  CHECK(w.annotations[0].text == "Never");
  CHECK(w.annotations[0].start == 1 * ns_per_second);
  CHECK(w.annotations[0].end == 1'500'000'000);
  CHECK(w.annotations[3].text == "nitrogen.");
  CHECK(w.annotations[3].start == 3 * ns_per_second);
  CHECK(w.annotations[3].end == 4 * ns_per_second);
}

TEST_CASE("vtt writer: karaoke timestamps from a word tier, speakers as voices", "[vtt][writer]") {
  document doc;
  tier& c = doc.tiers.emplace_back();
  c.name = "cap";
  annotation a;
  a.start = 1 * ns_per_second;
  a.end = 3 * ns_per_second;
  a.text = "fish & chips";
  a.attributes = {{"speaker", "Cook <2>"}};
  c.annotations = {a};
  tier& w = doc.tiers.emplace_back();
  w.name = "cap.words";
  w.parent = parent_link{"cap", relation::within};
  using word = std::tuple<time_ns, time_ns, const char*>;  // milliseconds
  for (auto [s, e, t] :
       {word{1000, 1500, "fish"}, word{1500, 2000, "&"}, word{2000, 3000, "chips"}}) {
    annotation x;
    x.start = s * 1'000'000;
    x.end = e * 1'000'000;
    x.text = t;
    w.annotations.push_back(x);
  }
  CHECK(find_losses(doc, *find_format("vtt")).empty());
  const std::string text = write_as("vtt", doc);
  CHECK(text ==
        "WEBVTT\n\n00:00:01.000 --> 00:00:03.000\n"
        "<v Cook &lt;2&gt;>fish <00:00:01.500>&amp; <00:00:02.000>chips\n");
  read_options o;
  o.tier_name = "cap";
  const document back = read_as("vtt", text, o);
  CHECK(back.tiers[0].annotations[0].text == a.text);
  CHECK(back.tiers[0].annotations[0].attributes.at("speaker") == "Cook <2>");
  CHECK(back.tiers[1].annotations == doc.tiers[1].annotations);
}

TEST_CASE("vtt writer sorts cues, escapes text and reports what it cannot keep",
          "[vtt][writer][loss]") {
  document doc;
  tier& c = doc.tiers.emplace_back();
  c.name = "cap";
  auto add = [&](time_ns s, time_ns e, std::string text, std::optional<std::string> id) {
    annotation a;
    a.start = s;
    a.end = e;
    a.text = std::move(text);
    a.id = std::move(id);
    c.annotations.push_back(a);
  };
  add(5 * ns_per_second, 6 * ns_per_second, "later --> <b>", "x");
  add(1 * ns_per_second, 2 * ns_per_second, "first", "x");
  add(7 * ns_per_second, 8 * ns_per_second + 1, "two\n\nparagraphs", std::nullopt);
  const std::string text = write_as("vtt", doc);
  CHECK(text ==
        "WEBVTT\n\nx\n00:00:01.000 --> 00:00:02.000\nfirst\n\n"
        "00:00:05.000 --> 00:00:06.000\nlater --&gt; &lt;b>\n\n"
        "00:00:07.000 --> 00:00:08.000\ntwo\nparagraphs\n");
  const std::vector<std::string> losses = find_losses(doc, *find_format("vtt"));
  const std::vector<std::string> expected = {
      "repeated ids (WebVTT identifiers are unique) (1 annotation in tier 'cap')",
      "text with blank lines, carriage returns or NUL, which WebVTT cannot hold (1 annotation in "
      "tier 'cap')",
      "the order of cues that are not in start-time order (written sorted) (1 annotation in tier "
      "'cap')",
      "times finer than a millisecond (written to the nearest millisecond) (1 annotation in "
      "tier 'cap')"};
  CHECK(losses == expected);
}

TEST_CASE("vtt writer rounds a time between milliseconds to the nearest, and lists it",
          "[vtt][writer][loss]") {
  document doc;
  tier& c = doc.tiers.emplace_back();
  c.name = "cap";
  annotation a;
  a.start = 1'000'600'000;  // 1.0006 s: 1.001, not 1.000
  a.end = 2'999'600'000;    // 2.9996 s: 3.000, not 2.999
  a.text = "near";
  c.annotations = {a};
  CHECK(write_as("vtt", doc) == "WEBVTT\n\n00:00:01.001 --> 00:00:03.000\nnear\n");
  const std::vector<std::string> losses = find_losses(doc, *find_format("vtt"));
  REQUIRE(losses.size() == 1);
  CHECK(losses[0] ==
        "times finer than a millisecond (written to the nearest millisecond) (1 annotation in "
        "tier 'cap')");
}

TEST_CASE("vtt writer: a re-timed cue's inline timestamps follow its moved words",
          "[vtt][writer]") {
  // The words of a cue's timestamps (§4.2.2) are its word tier; a cue moved 2 s earlier with
  // its words keeps its markup, with the timestamps the words now have.
  read_options o;
  o.tier_name = "cap";
  document doc = read_as("vtt",
                         "WEBVTT\n\n00:00:03.000 --> 00:00:05.000\n"
                         "<i>one</i> <00:00:03.500>two <00:00:04.250>three\n",
                         o);
  REQUIRE(doc.tiers.size() == 2);
  for (annotation& x : doc.tiers[0].annotations)
    x.start -= 2 * ns_per_second, x.end -= 2 * ns_per_second;
  for (annotation& x : doc.tiers[1].annotations)
    x.start -= 2 * ns_per_second, x.end -= 2 * ns_per_second;
  CHECK(find_losses(doc, *find_format("vtt")).empty());
  const std::string text = write_as("vtt", doc);
  CHECK(text ==
        "WEBVTT\n\n00:00:01.000 --> 00:00:03.000\n"
        "<i>one</i> <00:00:01.500>two <00:00:02.250>three\n");
  const document back = read_as("vtt", text, o);
  CHECK(back.tiers[1].annotations == doc.tiers[1].annotations);
}

TEST_CASE("vtt writer: '>' is escaped only where a line would hold '-->'", "[vtt][writer]") {
  // WebVTT §4.2.2: cue text may not contain "-->"; a raw '>' elsewhere is plain text, and is
  // read without markup, so the writer leaves it raw and the text reads back as it was.
  document doc;
  tier& c = doc.tiers.emplace_back();
  c.name = "cap";
  annotation a;
  a.start = 0;
  a.end = ns_per_second;
  a.text = "a > b, x --> y";
  a.attributes = {{"speaker", "Ana --"}};
  c.annotations.push_back(a);
  const std::string text = write_as("vtt", doc);
  CHECK(text == "WEBVTT\n\n00:00:00.000 --> 00:00:01.000\n<v Ana -- >a > b, x --&gt; y\n");
  const read_result back = read_document(text, *find_format("vtt"), {}, "cap");
  REQUIRE(back.ok());
  REQUIRE(back.value.tiers.size() == 1);
  REQUIRE(back.value.tiers[0].annotations.size() == 1);
  CHECK(back.value.tiers[0].annotations[0].text == "a > b, x --> y");
  CHECK(back.value.tiers[0].annotations[0].attributes.at("speaker") == "Ana --");
}

TEST_CASE("vtt writer: markup whose inline timestamps left the cue is not written",
          "[vtt][writer]") {
  // WebVTT §4.2.2: a cue's timestamps lie strictly between its start and end. A cue moved
  // after its markup was written (say, re-timed) cannot keep that markup as it is.
  document doc;
  tier& c = doc.tiers.emplace_back();
  c.name = "cap";
  annotation a;
  a.start = 10 * ns_per_second;
  a.end = 12 * ns_per_second;
  a.text = "one two";
  a.markup = "one <00:00:01.500>two";
  c.annotations = {a};
  const std::vector<std::string> losses = find_losses(doc, *find_format("vtt"));
  REQUIRE(losses.size() == 1);
  CHECK(losses[0] ==
        "markup whose inline timestamps lie outside its cue (1 annotation in tier 'cap')");
  CHECK(write_as("vtt", doc) == "WEBVTT\n\n00:00:10.000 --> 00:00:12.000\none two\n");
}

TEST_CASE("vtt with invalid UTF-8 is decoded with replacement, as the specification says",
          "[vtt][utf8]") {
  const read_result r = read_document("WEBVTT\n\n00:00.000 --> 00:01.000\ncaf\xE9 \xF0\x9F\n",
                                      *find_format("vtt"), {}, "t");
  CHECK(r.ok());
  CHECK(r.value.tiers[0].annotations[0].text == "caf\xEF\xBF\xBD \xEF\xBF\xBD");
  REQUIRE_FALSE(r.diagnostics.empty());
  CHECK(r.diagnostics[0].code == "input.utf8");
  CHECK(r.diagnostics[0].level == severity::warning);
  CHECK(r.diagnostics[0].line == 4);
  CHECK(r.diagnostics[0].column == 4);
}

TEST_CASE("vtt reads the specification's style-block example", "[vtt]") {
  // Source: W3C WebVTT, index.bs, section "Styling captions" (id=styling), the example of
  // style blocks in a file, verbatim.
  const std::string example =
      "WEBVTT\n\nSTYLE\n::cue {\n  background-image: linear-gradient(to bottom, dimgray, "
      "lightgray);\n  color: papayawhip;\n}\n/* Style blocks cannot use blank lines nor \"dash "
      "dash greater than\" */\n\nNOTE comment blocks can be used between style blocks.\n\n"
      "STYLE\n::cue(b) {\n  color: peachpuff;\n}\n\nhello\n00:00:00.000 --> 00:00:10.000\nHello "
      "<b>world</b>.\n\nNOTE style blocks cannot appear after the first cue.\n";
  const document doc = read_as("vtt", example);
  REQUIRE(doc.tiers.at(0).annotations.size() == 1);
  CHECK(cue(doc, 0).id == "hello");
  CHECK(cue(doc, 0).end == 10 * ns_per_second);
  CHECK(cue(doc, 0).text == "Hello world.");
  CHECK(cue(doc, 0).markup == "Hello <b>world</b>.");
  CHECK(doc.metadata.at("vtt:prelude").find("NOTE comment blocks") != std::string::npos);
  CHECK(doc.metadata.at("vtt:trailer") == "NOTE style blocks cannot appear after the first cue.");
  CHECK(write_as("vtt", doc) == example);
}

TEST_CASE("speaker tiers join into one tier of voices", "[vtt][voices]") {
  document doc;
  for (const char* name : {"Ana", "Bo"}) {
    tier& t = doc.tiers.emplace_back();
    t.name = name;
    t.kind = std::string_view(name) == "Bo" ? tier_kind::instant : tier_kind::interval;
  }
  annotation a;
  a.start = 2 * ns_per_second;
  a.end = 3 * ns_per_second;
  a.text = "second";
  doc.tiers[0].annotations = {a};
  a.start = 1 * ns_per_second;
  a.text = "first";
  a.attributes = {{"speaker", "Bo (off screen)"}};
  doc.tiers[1].annotations = {a};
  std::vector<std::string> losses;
  const document joined = join_as_voices(doc, "dialogue", losses);
  REQUIRE(joined.tiers.size() == 1);
  CHECK(joined.tiers[0].name == "dialogue");
  CHECK(joined.tiers[0].annotations[0].text == "first");
  CHECK(joined.tiers[0].annotations[0].attributes.at("speaker") == "Bo (off screen)");
  CHECK(joined.tiers[0].annotations[1].attributes.at("speaker") == "Ana");
  CHECK(losses == std::vector<std::string>{
                      "the instant kind of tier 'Bo' (joined into the voices of 'dialogue')"});
}

TEST_CASE("mutated WebVTT that reads without loss writes and reads back the same",
          "[vtt][round-trip]") {
  // A property, not an outside reference: for 400 deterministic mutations of the sample,
  // whatever the reader accepts and the loss report passes must survive vtt -> model -> vtt.
  const std::string vtt_sample = sample("panel-discussion.vtt");
  REQUIRE_FALSE(vtt_sample.empty());
  const format& vtt = *find_format("vtt");
  std::minstd_rand rng(20261201);
  const std::string alphabet = "<>&;:.-\n\r\t #0123456789vWEBTNOabc";
  std::size_t checked = 0;
  for (int round = 0; round < 400; ++round) {
    std::string text = vtt_sample;
    for (int edits = 1 + static_cast<int>(rng() % 12); edits > 0; --edits) {
      const std::size_t at = rng() % text.size();
      const char c = alphabet[rng() % alphabet.size()];
      switch (rng() % 3) {
        case 0:
          text[at] = c;
          break;
        case 1:
          text.insert(at, 1 + rng() % 4, c);
          break;
        default:
          text.erase(at, 1 + rng() % 16);
      }
    }
    const read_result first = read_document(text, vtt, {}, "m");
    if (!first.ok() || !find_losses(first.value, vtt).empty()) continue;
    std::string written;
    {
      string_sink sink(written);
      vtt.write(first.value, sink, {});
    }
    read_result second = read_document(written, vtt, {}, "m");
    REQUIRE(second.ok());
    // The writer puts cues in start-time order, and spells a bare '&' of the file as "&amp;"
    // (§4.2.2): markup without tags is only spelling, and is left out of the comparison.
    document expected = first.value;
    for (document* d : {&expected, &second.value})
      for (tier& t : d->tiers) {
        std::stable_sort(
            t.annotations.begin(), t.annotations.end(),
            [](const annotation& a, const annotation& b) { return a.start < b.start; });
        for (annotation& a : t.annotations)
          if (a.markup && a.markup->find('<') == std::string::npos) a.markup.reset();
      }
    INFO(text);
    CHECK(second.value == expected);
    ++checked;
  }
  CHECK(checked > 200);
}
