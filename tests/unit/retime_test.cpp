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
