// TTML (W3C TTML2, IMSC 1.1 Text Profile): time containment, the mapping onto tiers, safety
// limits, and a writer whose output reads back the same.
#include <catch2/catch.hpp>

#include "support.hpp"

using namespace tiers;
using namespace tiers::test;

namespace {

std::string tt(std::string_view attributes, std::string_view body, std::string_view head = "") {
  return "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<tt xmlns=\"http://www.w3.org/ns/ttml\" "
         "xmlns:ttp=\"http://www.w3.org/ns/ttml#parameter\" "
         "xmlns:ttm=\"http://www.w3.org/ns/ttml#metadata\" "
         "xmlns:tts=\"http://www.w3.org/ns/ttml#styling\" xml:lang=\"en\" " +
         std::string(attributes) + "><head>" + std::string(head) + "</head><body>" +
         std::string(body) + "</body></tt>\n";
}

}  // namespace

TEST_CASE("ttml: par and seq time containment resolve to media times", "[ttml]") {
  // TTML2 §10.4 (SMIL subset): in par, begin and end count from the parent's begin; in seq,
  // from the previous sibling's end; dur from the element's begin; the parent clips.
  const document doc = read_as("ttml", tt("", R"(
    <div xml:id="a" begin="10s">
      <p begin="1s" end="2s">one</p>
      <p begin="1.5s" dur="3s">two</p>
      <p end="25s">clipped by the div</p>
    </div>
    <div xml:id="b" timeContainer="seq" begin="100s" end="120s">
      <p dur="2s">first</p>
      <p begin="1s" dur="2s">second</p>
      <p dur="60s">clipped</p>
    </div>)"));
  REQUIRE(doc.tiers.size() == 2);
  const auto& a = doc.tiers[0].annotations;
  CHECK(a[0].start == 11 * ns_per_second);
  CHECK(a[0].end == 12 * ns_per_second);
  CHECK(a[1].start == 11'500'000'000);
  CHECK(a[1].end == 14'500'000'000);
  const auto& b = doc.tiers[1].annotations;
  CHECK(b[0].start == 100 * ns_per_second);
  CHECK(b[0].end == 102 * ns_per_second);
  CHECK(b[1].start == 103 * ns_per_second);
  CHECK(b[1].end == 105 * ns_per_second);
  CHECK(b[2].end == 120 * ns_per_second);
}

TEST_CASE("ttml: frames at 30000/1001, ticks, and timed spans as a word tier", "[ttml]") {
  const document doc = read_as(
      "ttml",
      tt(R"(ttp:frameRate="30" ttp:frameRateMultiplier="1000 1001" ttp:tickRate="10000000")", R"(
    <div xml:id="cues">
      <p begin="00:00:01:15" end="30000000t">frames and ticks</p>
      <p begin="5s" end="9s"><span begin="0s" end="1s">Never</span> <span begin="1s" end="2.5s">drink</span><br/>liquid</p>
    </div>)"));
  REQUIRE(doc.tiers.size() == 2);
  // 00:00:01:15 = 1 + 15 × 1001/30000 s (TTML2 media time, CHECKS.md; computed).
  CHECK(doc.tiers[0].annotations[0].start == 1'500'500'000);
  CHECK(doc.tiers[0].annotations[0].end == 3 * ns_per_second);
  CHECK(doc.media.frame_rate == rational{30000, 1001});
  const annotation& p = doc.tiers[0].annotations[1];
  CHECK(p.text == "Never drink\nliquid");
  REQUIRE(p.markup);
  const tier& w = doc.tiers[1];
  CHECK(w.name == "cues.words");
  CHECK(w.parent == parent_link{"cues", relation::within});
  REQUIRE(w.annotations.size() == 2);
  CHECK(w.annotations[1].text == "drink");
  CHECK(w.annotations[1].start == 6 * ns_per_second);
  CHECK(w.annotations[1].end == 7'500'000'000);
}

TEST_CASE("ttml: agents become speakers, white space collapses, br breaks lines", "[ttml]") {
  const document doc = read_as(
      "ttml",
      tt("", R"(
    <div>
      <p xml:id="p1" begin="0s" end="1s" ttm:agent="ana" tts:color="yellow">
        Hello,
        <br/>   world
      </p>
      <p begin="1s" end="2s" xml:space="preserve">  two  spaces</p>
    </div>)",
         R"(<metadata><ttm:agent xml:id="ana" type="person"><ttm:name type="full">Ana</ttm:name></ttm:agent></metadata>)"));
  const annotation& a = doc.tiers.at(0).annotations.at(0);
  CHECK(doc.tiers[0].name == "div-1");
  CHECK(a.text == "Hello,\nworld");
  CHECK(a.id == "p1");
  CHECK(a.attributes.at("speaker") == "Ana");
  CHECK(a.attributes.at("ttml:tts:color") == "yellow");
  CHECK(doc.tiers[0].annotations[1].text == "  two  spaces");
  CHECK(doc.metadata.at("ttml:lang") == "en");
}

TEST_CASE("ttml: an empty ttm:agent names no speaker, and an agent without an id is no speaker",
          "[ttml]") {
  const document doc = read_as(
      "ttml",
      tt("", R"(<div><p begin="0s" end="1s" ttm:agent="">a</p></div>)",
         R"(<metadata><ttm:agent type="person"><ttm:name>Nobody</ttm:name></ttm:agent></metadata>)"));
  const annotation& a = doc.tiers.at(0).annotations.at(0);
  CHECK(a.attributes.count("speaker") == 0);
  CHECK(a.attributes.at("ttml:ttm:agent").empty());
}

TEST_CASE("ttml writer: IMSC 1.1 text document that reads back the same", "[ttml][writer]") {
  document doc;
  doc.media.frame_rate = rational{30000, 1001};
  tier& t = doc.tiers.emplace_back();
  t.name = "captions";
  annotation a;
  a.start = frame_time(45, {30000, 1001}).value;
  a.end = 3 * ns_per_second + 1;
  a.text = "fish & <chips>\n  second line";
  a.id = "c1";
  a.attributes = {{"speaker", "Cook"}};
  t.annotations = {a};
  CHECK(find_losses(doc, *find_format("ttml")).empty());
  const std::string text = write_as("ttml", doc);
  CHECK(text.find("ttp:contentProfiles=\"http://www.w3.org/ns/ttml/profile/imsc1.1/text\"") !=
        std::string::npos);
  CHECK(text.find("ttp:timeBase=\"media\"") != std::string::npos);
  CHECK(text.find("ttp:frameRate=\"30\" ttp:frameRateMultiplier=\"1000 1001\"") !=
        std::string::npos);
  CHECK(text.find("begin=\"45f\" end=\"00:00:03.000000001\"") != std::string::npos);
  CHECK(text.find("fish &amp; &lt;chips&gt;<br/>  second line") != std::string::npos);
  CHECK(read_as("ttml", text) == doc);
}

TEST_CASE("ttml: every frame rate the model holds is written as parameters that read back",
          "[ttml][writer]") {
  // TTML2 §7.2.4–7.2.5: the effective rate is ttp:frameRate × ttp:frameRateMultiplier, neither
  // bounded by the standard. The model holds rates whose parts are below 2^32 (time.cpp), so
  // the reader takes any parameters that give such a rate (2147483647 × 2 = 2^32 − 2 here, the
  // rate whose ttp:frameRate the writer spells above 2^31), and refuses one beyond it.
  for (const rational rate : {rational{4294967294, 1}, rational{4294967295, 2147483648},
                              rational{1, 4294967295}, rational{30000, 1001}}) {
    document doc;
    doc.media.frame_rate = rate;
    doc.tiers.emplace_back().name = "t";
    INFO(rate.num << "/" << rate.den);
    CHECK(read_as("ttml", write_as("ttml", doc)).media.frame_rate == rate);
  }
  CHECK(read_as("ttml", tt(R"(ttp:frameRate="2147483647" ttp:frameRateMultiplier="2 1")",
                           R"(<div><p begin="0s" end="1s">a</p></div>)"))
            .media.frame_rate == rational{4294967294, 1});
  const read_result r =
      read_document(tt(R"(ttp:frameRate="65536" ttp:frameRateMultiplier="65536 1")", ""),
                    *find_format("ttml"), {}, "big.ttml");
  REQUIRE_FALSE(r.ok());
  CHECK(r.diagnostics.front().code == "ttml.parameter");
  CHECK(r.diagnostics.front().message.find("below 2^32") != std::string::npos);
}

TEST_CASE("ttml writer: ids and tier names that xml:id cannot hold are dropped as reported",
          "[ttml][writer][loss]") {
  // xml:id (W3C xml:id 1.0 §4) holds an NCName (Namespaces in XML 1.0, production [4]), unique
  // in the document: '1' and '2 words' are not NCNames, and a second 'c1' repeats one.
  document doc;
  tier& t = doc.tiers.emplace_back();
  t.name = "2 words";
  for (const char* id : {"1", "c1", "c1"}) {
    annotation a;
    a.start = static_cast<time_ns>(t.annotations.size() + 1) * ns_per_second;
    a.end = a.start + ns_per_second / 2;
    a.text = "x";
    a.id = id;
    t.annotations.push_back(a);
  }
  const std::vector<std::string> losses = find_losses(doc, *find_format("ttml"));
  REQUIRE(losses.size() == 2);
  const std::string text = write_as("ttml", doc);
  // What the report says is dropped is not written; what is written is a valid id.
  CHECK(text.find("xml:id=\"1\"") == std::string::npos);
  CHECK(text.find("xml:id=\"2 words\"") == std::string::npos);
  CHECK(text.find("xml:id=\"c1\"") != std::string::npos);
  CHECK(text.find("xml:id=\"c1\"", text.find("xml:id=\"c1\"") + 1) == std::string::npos);
  const document back = read_as("ttml", text);
  REQUIRE(back.tiers.size() == 1);
  CHECK_FALSE(back.tiers[0].annotations[0].id);
  CHECK(back.tiers[0].annotations[1].id == "c1");
  CHECK_FALSE(back.tiers[0].annotations[2].id);
}

TEST_CASE("ttml: DTDs, entity bombs, deep nesting and broken XML are refused",
          "[ttml][bad-input]") {
  std::string bomb = "<?xml version=\"1.0\"?>\n<!DOCTYPE tt [<!ENTITY a \"aaaaaaaaaa\">";
  for (int k = 1; k < 10; ++k)
    bomb += "<!ENTITY " + std::string(1, static_cast<char>('a' + k)) + " \"" +
            std::string(10, '&') + "\">";
  bomb +=
      "]>\n<tt xmlns=\"http://www.w3.org/ns/ttml\"><body><div><p begin=\"0s\" "
      "end=\"1s\">&j;</p></div></body></tt>";
  CHECK(first_error("ttml", bomb).code == "ttml.dtd");
  std::string deep = "<tt xmlns=\"http://www.w3.org/ns/ttml\"><body>";
  for (int k = 0; k < 200'000; ++k)
    deep += "<span>";
  const diagnostic d =
      first_error("ttml", deep + "x" + std::string(200'000 * 7, ' ') + "</body></tt>");
  CHECK((d.code == "ttml.depth" || d.code == "ttml.xml"));
  std::string nested = "<tt xmlns=\"http://www.w3.org/ns/ttml\"><body>";
  for (int k = 0; k < 200'000; ++k)
    nested += "<div>";
  for (int k = 0; k < 200'000; ++k)
    nested += "</div>";
  nested += "</body></tt>";
  CHECK(first_error("ttml", nested).code == "ttml.depth");
  const diagnostic broken =
      first_error("ttml", "<tt xmlns=\"http://www.w3.org/ns/ttml\">\n<body><div></body></tt>");
  CHECK(broken.code == "ttml.xml");
  CHECK(broken.line == 2);
  CHECK(first_error("ttml", "<tt xmlns=\"urn:other\"/>").code == "ttml.root");
  // XML 1.0 §3.1 (Unique Att Spec) and Namespaces in XML 1.0 §6.3: an attribute once per
  // element, also under two prefixes of one namespace; pugixml alone accepts both.
  const diagnostic twice =
      first_error("ttml", tt("", "<div>\n<p begin=\"1s\" end=\"2s\" end=\"3s\">x</p></div>"));
  CHECK(twice.code == "ttml.xml");
  CHECK(twice.line == 3);
  CHECK(first_error("ttml", tt("xmlns:s=\"http://www.w3.org/ns/ttml#styling\"",
                               "<div><p begin=\"1s\" end=\"2s\" tts:color=\"red\" "
                               "s:color=\"blue\">x</p></div>"))
            .code == "ttml.xml");
  // tiers keeps tts:, ttm: and ttp: for TTML's own namespaces (its writer declares them so).
  CHECK(first_error("ttml", "<tt xmlns=\"http://www.w3.org/ns/ttml\" xmlns:ttp=\"urn:other\"/>")
            .code == "ttml.namespace");
  CHECK(first_error("ttml", "<tt xmlns=\"http://www.w3.org/ns/ttml\" xmlns:ttm=\"\"/>").code ==
        "ttml.namespace");
  CHECK(first_error("ttml", tt("", "<div><p begin=\"1x\" end=\"2s\">x</p></div>")).code ==
        "ttml.time");
  CHECK(first_error("ttml", tt("ttp:frameRate=\"0\"", "")).code == "ttml.parameter");
}

TEST_CASE("ttml: styles, regions, agents and foreign attributes survive ttml -> model -> ttml",
          "[ttml][round-trip]") {
  const std::string source = R"TTML(<?xml version="1.0" encoding="UTF-8"?>
<tt xmlns="http://www.w3.org/ns/ttml" xmlns:tts="http://www.w3.org/ns/ttml#styling" xmlns:ttp="http://www.w3.org/ns/ttml#parameter" xmlns:ttm="http://www.w3.org/ns/ttml#metadata" xmlns:ex="urn:example:extension" xml:lang="fr" ttp:timeBase="media" ex:note="kept">
  <head>
    <styling><style xml:id="s1" tts:color="yellow"/></styling>
    <layout><region xml:id="bottom" tts:origin="10% 80%" tts:extent="80% 15%"/></layout>
    <metadata><ttm:agent xml:id="ana" type="person"><ttm:name type="full">Ana</ttm:name></ttm:agent></metadata>
  </head>
  <body>
    <div xml:id="fr" region="bottom">
      <p xml:id="p1" begin="1s" end="2s" style="s1" ttm:agent="ana" ex:mood="calm">Bonjour <span tts:fontStyle="italic">à tous</span></p>
      <p xml:id="p2" begin="2s" end="3s" region="bottom">Deuxième<br/>ligne</p>
    </div>
  </body>
</tt>
)TTML";
  const document first = read_as("ttml", source);
  CHECK(find_losses(first, *find_format("ttml")).empty());
  const document second = read_as("ttml", write_as("ttml", first));
  CHECK(second == first);
  const annotation& p1 = first.tiers.at(0).annotations.at(0);
  CHECK(p1.text == "Bonjour \u00e0 tous");
  CHECK(p1.attributes.at("ttml:ex:mood") == "calm");
  CHECK(first.metadata.at("ttml:xmlns:ex") == "urn:example:extension");
}

TEST_CASE("ttml: characters XML forbids, raw or by reference, are located errors",
          "[ttml][bad-input]") {
  // XML 1.0 §2.2 production [2] Char and §4.1 "Legal Character": no NUL, no C0 control but
  // tab, LF and CR, no surrogate, nothing beyond U+10FFFF — not even by a character reference.
  for (const char* bad : {"c&#0;1", "c&#x1F;", "c&#xD800;", "c&#x110000;", "c&#1114112;"}) {
    const std::string text =
        tt("", std::string("<div><p xml:id=\"x\" begin=\"1s\" end=\"2s\">") + bad + "</p></div>");
    const diagnostic d = first_error("ttml", text);
    INFO(bad);
    CHECK(d.code == "ttml.xml");
    CHECK(d.offset == text.find(bad) + 1);  // at the '&'
  }
  CHECK(first_error("ttml", tt("", "<div><p begin=\"1s\" end=\"2s\">a\x01</p></div>")).code ==
        "ttml.xml");
  // Where '&#' is no reference (a comment, CDATA) it is text; a tab by reference is a character.
  const document ok = read_as(
      "ttml",
      tt("", "<!-- &#0; --><div><p begin=\"1s\" end=\"2s\">a&#x9;b<![CDATA[&#0;]]></p></div>"));
  REQUIRE(ok.tiers.size() == 1);
  CHECK(ok.tiers[0].annotations[0].text.find("&#0;") != std::string::npos);
}

TEST_CASE("ttml: offsets that add up beyond the range of times are time.range", "[ttml]") {
  // Each begin (5·10^9 s) is in range; their sum along the containers is not, and wrapped to
  // a negative time before the sums were checked.
  const diagnostic nested = first_error(
      "ttml",
      tt("", R"(<div begin="5000000000s"><p begin="5000000000s" end="5000000001s">x</p></div>)"));
  CHECK(nested.code == "time.range");
  CHECK(nested.line == 2);
  // In a seq container, each child begins where the one before ended.
  const diagnostic seq = first_error(
      "ttml",
      tt("",
         R"(<div timeContainer="seq"><p dur="5000000000s">a</p><p dur="5000000000s">b</p></div>)"));
  CHECK(seq.code == "time.range");
}

TEST_CASE("ttml writer: every value is escaped or listed lost; XML never repeats an attribute",
          "[ttml][writer]") {
  // Each of these made a document that was not well-formed XML, or changed a value silently.
  document doc;
  doc.metadata = {{"ttml:tt:tts:extent", "1\x01px"},
                  {"ttml:tt:ttp:frameRate", "25"},
                  {"ttml:tt:bad name", "x"},
                  {"ttml:xmlns:ttm", "http://example.org/other"}};
  tier& t = doc.tiers.emplace_back();
  t.name = "captions";
  t.attributes = {{"ttml:begin", "5s"}, {"ttml:style", "s1"}};
  auto cue = [](time_ns start, std::string text, attribute_map attributes) {
    annotation a;
    a.start = start * ns_per_second;
    a.end = a.start + ns_per_second;
    a.text = std::move(text);
    a.attributes = std::move(attributes);
    return a;
  };
  t.annotations = {
      cue(0, "control in the speaker", {{"speaker", "Ann\x07"}}),
      cue(2, "a begin of its own", {{"ttml:begin", "7s"}, {"ttml:end", "9s"}}),
      cue(4, "an agent naming someone else", {{"speaker", "Ann"}, {"ttml:ttm:agent", "bo"}}),
      cue(6, "white space around the speaker", {{"speaker", " Cy "}}),
      cue(8, "an attribute in an undeclared namespace", {{"ttml:foo:bar", "1"}}),
      cue(10, "kept", {{"speaker", "Di"}, {"ttml:tts:color", "red"}}),
  };
  const std::vector<std::string> losses = find_losses(doc, *find_format("ttml"));
  const auto lost = [&](std::string_view what) {
    return std::any_of(losses.begin(), losses.end(),
                       [&](const std::string& l) { return l.starts_with(what); });
  };
  CHECK(lost("document metadata 'ttml:tt:tts:extent'"));
  CHECK(lost("document metadata 'ttml:tt:ttp:frameRate'"));
  CHECK(lost("document metadata 'ttml:tt:bad name'"));
  CHECK(lost("document metadata 'ttml:xmlns:ttm'"));
  CHECK(lost("the attribute 'ttml:begin' of tier 'captions'"));
  CHECK(lost("ttml: attributes the writer cannot write, or writes itself (2 annotations)"));
  CHECK(lost("speakers other than the one the annotation's own ttm:agent names (1 annotation)"));
  CHECK(
      lost("speakers with characters XML cannot hold or white space a name loses (2 annotations)"));
  const std::string text = write_as("ttml", doc);
  CHECK(text.find('\x01') == std::string::npos);
  CHECK(text.find('\x07') == std::string::npos);
  CHECK(text.find("begin=\"7s\"") == std::string::npos);
  read_options o;
  const read_result back = read_document(text, *find_format("ttml"), o, "back.ttml");
  INFO(text);
  REQUIRE(back.ok());
  const tier& r = back.value.tiers.at(0);
  CHECK(r.attributes.at("ttml:style") == "s1");
  CHECK(r.attributes.count("ttml:begin") == 0);
  REQUIRE(r.annotations.size() == 6);
  CHECK(r.annotations[1].start == 2 * ns_per_second);        // its own times, not the attribute's
  CHECK(r.annotations[2].attributes.at("speaker") == "bo");  // what the agent names, as said
  CHECK(r.annotations[0].attributes.count("speaker") == 0);
  CHECK(r.annotations[5].attributes.at("speaker") == "Di");
  CHECK(r.annotations[5].attributes.at("ttml:tts:color") == "red");
}
