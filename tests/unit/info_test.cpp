// Summaries: counts, spans, the union of annotated time and coverage.
#include <catch2/catch.hpp>

#include "support.hpp"

using namespace tiers;

TEST_CASE("annotated time counts overlaps once and coverage is of the media", "[info]") {
  document doc;
  doc.media.duration = 100 * ns_per_second;
  tier& t = doc.tiers.emplace_back();
  t.name = "t";
  auto add = [&](time_ns s, time_ns e) {
    annotation a;
    a.start = s * ns_per_second;
    a.end = e * ns_per_second;
    t.annotations.push_back(a);
  };
  add(10, 20);
  add(15, 30);  // overlaps the first
  add(50, 40);  // reversed: counts from 40 to 50
  add(60, 60);  // zero length
  const document_summary s = summarize(doc);
  REQUIRE(s.tiers.size() == 1);
  CHECK(s.tiers[0].annotations == 4);
  CHECK(*s.tiers[0].start == 10 * ns_per_second);
  CHECK(*s.tiers[0].end == 60 * ns_per_second);
  CHECK(s.tiers[0].annotated == 30 * ns_per_second);
  CHECK(s.reference_is_media);
  CHECK(*s.tiers[0].coverage == Approx(0.3));
}

TEST_CASE("without a media duration, coverage is of the span of all tiers", "[info]") {
  document doc = tiers::test::rich_document();
  doc.media.duration.reset();
  const document_summary s = summarize(doc);
  CHECK_FALSE(s.reference_is_media);
  CHECK(s.reference == *s.end - *s.start);
  CHECK_FALSE(s.tiers[3].coverage);  // an instant tier has none
  CHECK_FALSE(s.tiers[4].start);     // an empty tier has no span
}

TEST_CASE("summary JSON", "[info]") {
  std::string out;
  {
    string_sink sink(out);
    write_summary_json(summarize(tiers::test::rich_document()), "x.json", sink);
  }
  CHECK_THAT(out, Catch::StartsWith(
                      "{\"path\": \"x.json\", \"media\": {\"uri\": \"recordings/panel-07.mp4\", "
                      "\"duration\": 95.04, \"frame_rate\": \"30000/1001\"}"));
  CHECK_THAT(out,
             Catch::Contains("{\"name\": \"words\", \"kind\": \"interval\", \"source\": {\"kind\": "
                             "\"machine\", \"agent\": \"aligner-demo\", \"version\": \"0.9.1\"}, "
                             "\"annotations\": 5"));
}
