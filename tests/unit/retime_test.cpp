// Re-timing captions: cues onto their words, neighbours' shifts, the caption rules after.
#include <catch2/catch.hpp>
#include <limits>

#include "tiers/retime.hpp"

using namespace tiers;

namespace {

annotation ann(time_ns start, time_ns end, std::string text) {
  annotation a;
  a.start = start;
  a.end = end;
  a.text = std::move(text);
  return a;
}

constexpr time_ns ms = 1'000'000;

}  // namespace

TEST_CASE("cues move onto their words; unmatched ones follow their neighbours", "[retime]") {
  tier words, cues;
  const char* said[] = {"one", "two", "three", "four", "five", "six", "seven", "eight"};
  for (int k = 0; k < 8; ++k)
    words.annotations.push_back(ann(1000 * ms + k * 500 * ms, 1400 * ms + k * 500 * ms, said[k]));
  // Each cue shown 2.5 s late; the third says something nobody said.
  cues.annotations.push_back(ann(3500 * ms, 4400 * ms, "One two"));
  cues.annotations.push_back(ann(4500 * ms, 5400 * ms, "three four"));
  cues.annotations.push_back(ann(5500 * ms, 6400 * ms, "(applause)"));
  cues.annotations.push_back(ann(6500 * ms, 7400 * ms, "seven eight"));
  const retime_result r = retime_captions(cues, words);
  REQUIRE(r.moves.size() == 4);
  CHECK(r.captions.annotations[0].start == 1000 * ms);
  CHECK(r.captions.annotations[0].end == 1900 * ms);
  CHECK(r.moves[2].how == cue_move::basis::neighbours);
  CHECK(r.captions.annotations[2].start == 3000 * ms);  // shifted by the neighbours' −2.5 s
  CHECK(r.captions.annotations[3].start == 4000 * ms);
}

TEST_CASE("overlaps and short gaps: the shared boundary moves, split evenly", "[retime]") {
  tier words, cues;
  // Two sentences spoken without a pause: the second cue would start as the first ends.
  const char* said[] = {"we", "planted", "beans", "then", "came", "rain"};
  for (int k = 0; k < 6; ++k)
    words.annotations.push_back(ann(k * 400 * ms, (k + 1) * 400 * ms, said[k]));
  cues.annotations.push_back(ann(3000 * ms, 4000 * ms, "We planted beans."));
  cues.annotations.push_back(ann(4200 * ms, 5400 * ms, "Then came rain."));
  retime_options o;
  o.min_gap = 80 * ms;
  o.min_duration = 500 * ms;
  const retime_result r = retime_captions(cues, words, o);
  // Words end at 1.2 s and the next start at 1.2 s: 80 ms are needed, 40 ms from each side.
  CHECK(r.captions.annotations[0].end == 1160 * ms);
  CHECK(r.captions.annotations[1].start == 1240 * ms);
  CHECK(r.moves[0].adjusted == "ends 0.04 s earlier to keep the gap");
  CHECK(r.moves[1].unfixed.empty());
}

TEST_CASE("a cue too short grows into free time", "[retime]") {
  tier words, cues;
  words.annotations.push_back(ann(1000 * ms, 1200 * ms, "yes"));
  cues.annotations.push_back(ann(3000 * ms, 3300 * ms, "Yes."));
  const retime_result r = retime_captions(cues, words);
  CHECK(r.captions.annotations[0].start == 1000 * ms);
  CHECK(r.captions.annotations[0].end == 1000 * ms + 833'333'333);
}

TEST_CASE("children inside a cue move with it", "[retime]") {
  document d;
  tier& cues = d.tiers.emplace_back();
  cues.name = "captions";
  cues.annotations.push_back(ann(3000 * ms, 5000 * ms, "Good evening"));
  tier& inline_words = d.tiers.emplace_back();
  inline_words.name = "captions.words";
  inline_words.parent = parent_link{"captions", relation::within};
  inline_words.annotations.push_back(ann(3000 * ms, 3800 * ms, "Good"));
  inline_words.annotations.push_back(ann(3800 * ms, 5000 * ms, "evening"));
  tier words;
  words.annotations.push_back(ann(1000 * ms, 1300 * ms, "good"));
  words.annotations.push_back(ann(1350 * ms, 1900 * ms, "evening"));
  const retime_result r = retime_captions(d.tiers[0], words);
  d.tiers[0] = r.captions;
  move_children(d, "captions", r);
  // Shifted by the cue's −2 s, and kept inside its new span (1 s to 1.9 s).
  CHECK(d.tiers[1].annotations[0].start == 1000 * ms);
  CHECK(d.tiers[1].annotations[0].end == 1800 * ms);
  CHECK(d.tiers[1].annotations[1].end == 1900 * ms);
}

TEST_CASE("a cue with no room to grow is not said to be lengthened", "[retime]") {
  tier words, cues;
  // Three words 80 ms apart (the minimum gap): the middle cue can grow neither way.
  words.annotations.push_back(ann(1000 * ms, 1100 * ms, "ay"));
  words.annotations.push_back(ann(1180 * ms, 1280 * ms, "bee"));
  words.annotations.push_back(ann(1360 * ms, 1460 * ms, "sea"));
  cues.annotations.push_back(ann(3000 * ms, 3100 * ms, "Ay."));
  cues.annotations.push_back(ann(3180 * ms, 3280 * ms, "Bee."));
  cues.annotations.push_back(ann(3360 * ms, 3460 * ms, "Sea."));
  const retime_result r = retime_captions(cues, words);
  REQUIRE(r.moves.size() == 3);
  CHECK(r.moves[1].adjusted.find("lengthened") == std::string::npos);
  CHECK_FALSE(r.moves[1].unfixed.empty());
}

TEST_CASE("on a millisecond grid, minimums round up and word times to the nearest", "[retime]") {
  tier words, cues;
  words.annotations.push_back(ann(1'000'400'000, 1'200'600'000, "yes"));
  cues.annotations.push_back(ann(3000 * ms, 3300 * ms, "Yes."));
  retime_options o;
  o.grid = {1000, 1};
  const retime_result r = retime_captions(cues, words, o);
  CHECK(r.captions.annotations[0].start == 1000 * ms);  // 1.0004 s to 1.000
  CHECK(r.captions.annotations[0].end - r.captions.annotations[0].start == 834 * ms);  // ≥ 5/6 s
  // At 25 frames a second, every time is a whole frame (40 ms).
  o.grid = {25, 1};
  const retime_result f = retime_captions(cues, words, o);
  CHECK(f.captions.annotations[0].start % (40 * ms) == 0);
  CHECK(f.captions.annotations[0].end % (40 * ms) == 0);
  CHECK(f.captions.annotations[0].end - f.captions.annotations[0].start == 840 * ms);
}

TEST_CASE("a cue whose new times would lie beyond the range keeps its times, said", "[retime]") {
  // Words near the largest time there is, and a hold that pushes the cue's end past it: the
  // sum wrapped to a negative end before retime worked in 128 bits.
  constexpr time_ns top = std::numeric_limits<time_ns>::max();
  tier words, cues;
  words.annotations.push_back(ann(top - 2000 * ms, top - 1500 * ms, "hello"));
  words.annotations.push_back(ann(top - 1000 * ms, top - 400 * ms, "there"));
  cues.annotations.push_back(ann(top - 2500 * ms, top - 2000 * ms, "hello there"));
  retime_options o;
  o.hold = 2000 * ms;
  const retime_result r = retime_captions(cues, words, o);
  REQUIRE(r.moves.size() == 1);
  CHECK(r.captions.annotations[0].start == top - 2500 * ms);
  CHECK(r.captions.annotations[0].end == top - 2000 * ms);
  CHECK(r.moves[0].how == cue_move::basis::unchanged);
  CHECK_THAT(r.moves[0].unfixed, Catch::Contains("time.range"));
  // Without the hold, the same cue moves onto its words.
  const retime_result fits = retime_captions(cues, words);
  CHECK(fits.moves[0].how == cue_move::basis::words);
  CHECK(fits.captions.annotations[0].end == top - 400 * ms);
}

TEST_CASE("a cue too fast to read grows after, then before it, else is reported", "[retime]") {
  tier words, cues;
  // 40 characters spoken in 1 s: at 20 characters a second (caption.cps's default, common
  // practice for adult viewers) the cue needs 2 s on screen.
  const char* said[] = {"gardeners", "share", "their", "tools", "happily"};
  for (int k = 0; k < 5; ++k)
    words.annotations.push_back(
        ann(10'000 * ms + k * 200 * ms, 10'200 * ms + k * 200 * ms, said[k]));
  cues.annotations.push_back(ann(12'000 * ms, 13'000 * ms, "Gardeners share their tools happily."));
  retime_options o;
  o.min_gap = 80 * ms;
  o.min_duration = 500 * ms;
  o.max_cps = 20;
  retime_result r = retime_captions(cues, words, o);
  // 36 characters: 1.8 s; the words span 1 s, so the cue grows by 0.8 s into the free time after.
  CHECK(r.captions.annotations[0].start == 10'000 * ms);
  CHECK(r.captions.annotations[0].end == 11'800 * ms);
  CHECK(r.moves[0].adjusted == "lengthened by 0.8 s to be read at the reading speed (caption.cps)");
  CHECK(r.moves[0].unfixed.empty());

  // Cues right before and right after leave it no room: what is still missing is reported.
  words.annotations.push_back(ann(11'100 * ms, 11'500 * ms, "yes"));
  cues.annotations.push_back(ann(13'100 * ms, 13'500 * ms, "Yes."));
  words.annotations.insert(words.annotations.begin(), ann(9'500 * ms, 9'900 * ms, "well"));
  cues.annotations.insert(cues.annotations.begin(), ann(11'500 * ms, 11'900 * ms, "Well."));
  r = retime_captions(cues, words, o);
  REQUIRE(r.moves.size() == 3);
  CHECK(r.moves[1].unfixed.find("too fast to read (caption.cps)") == 0);
  o.max_cps = 0;  // no reading speed: only the minimum duration applies
  r = retime_captions(cues, words, o);
  CHECK(r.moves[1].unfixed.empty());
}

TEST_CASE("a cue that ends before it starts is left as it was and reported", "[retime]") {
  tier words, cues;
  words.annotations.push_back(ann(1000 * ms, 1400 * ms, "one"));
  words.annotations.push_back(ann(3000 * ms, 3400 * ms, "two"));
  cues.annotations.push_back(ann(3500 * ms, 4400 * ms, "One"));
  cues.annotations.push_back(ann(6000 * ms, 5200 * ms, "Two"));  // reversed
  retime_options o;
  o.grid = {1000, 1};  // a millisecond grid: the reversed cue's times stay even so
  const retime_result r = retime_captions(cues, words, o);
  REQUIRE(r.moves.size() == 2);
  const cue_move& m = r.moves[1];
  CHECK(m.how == cue_move::basis::reversed);
  CHECK(m.unfixed.find("ends before it starts") != std::string::npos);
  CHECK(r.captions.annotations[1].start == 6000 * ms);
  CHECK(r.captions.annotations[1].end == 5200 * ms);
  CHECK(count_moves(r).reversed == 1);
  // The other cue still moves onto its word, and borrows nothing from the reversed one.
  CHECK(r.captions.annotations[0].start == 1000 * ms);
}

TEST_CASE("the output records how it was re-timed", "[retime]") {
  tier words, cues;
  words.annotations.push_back(ann(1000 * ms, 1400 * ms, "one"));
  cues.annotations.push_back(ann(3500 * ms, 4400 * ms, "One"));
  retime_options o;
  o.lead_in = 120 * ms;
  const retime_result r = retime_captions(cues, words, o);
  document doc;
  record_retime(doc, "captions", "words", o, r);
  CHECK(doc.metadata.at("retime:lead-in") == "0.12s");
  CHECK(doc.metadata.at("retime:words") == "words");
  CHECK(doc.metadata.at("retime:max-cps") == "20");
  CHECK(doc.metadata.at("retime:cues") ==
        "1 by words, 0 by neighbours, 0 unchanged, 0 reversed; 0 unfixed");
}
