// Time operations: exact round trips, snapping, cutting, and tier operations.
#include <catch2/catch.hpp>

#include "tiers/edit.hpp"

using namespace tiers;

namespace {

// The one problem an operation refused with, as "code: message"; empty when it did not refuse
// with exactly one.
std::string refusal(const std::vector<diagnostic>& problems) {
  return problems.size() == 1 ? problems[0].code + ": " + problems[0].message : std::string();
}

document frames_doc(rational rate, std::int64_t frames) {
  document d;
  d.media.frame_rate = rate;
  d.media.duration = frame_time(frames, rate).value;
  tier& t = d.tiers.emplace_back();
  t.name = "shots";
  for (std::int64_t f = 0; f + 1 < frames; f += 7) {
    annotation a;
    a.start = frame_time(f, rate).value;
    a.end = frame_time(f + 1, rate).value;
    a.text = "x";
    t.annotations.push_back(a);
  }
  return d;
}

}  // namespace

TEST_CASE("shift by +x then -x is the identity", "[edit]") {
  document d = frames_doc({30000, 1001}, 5000);
  const document before = d;
  REQUIRE(shift_times(d, 1'234'567'891).empty());
  CHECK(d.tiers[0].annotations[1].start == before.tiers[0].annotations[1].start + 1'234'567'891);
  REQUIRE(shift_times(d, -1'234'567'891).empty());
  CHECK(d == before);
  // A shift that leaves the range changes nothing and says why.
  document far = before;
  CHECK(refusal(shift_times(far, std::numeric_limits<time_ns>::max())) ==
        "time.range: the shift takes a time of tier 'shots' out of range (about ±292 years)");
  CHECK(far == before);
}

TEST_CASE("scaling 25 to 24000/1001 and back is exact on the frame grid", "[edit]") {
  // Every time on the 25 fps grid, an hour and more of it (90,000 frames).
  document d = frames_doc({25, 1}, 90'000);
  const document before = d;
  REQUIRE(scale_times(d, {25, 1}, {24000, 1001}).empty());
  CHECK(d.media.frame_rate == rational{24000, 1001});
  // Frame 7 at 25 fps, played at 24000/1001: 7 × 1001/24000 s = 291.958333… ms (computed).
  CHECK(d.tiers[0].annotations[1].start == 291'958'333);
  REQUIRE(scale_times(d, {24000, 1001}, {25, 1}).empty());
  CHECK(d == before);
}

TEST_CASE("snapping moves each time to the nearest frame", "[edit]") {
  document d = frames_doc({25, 1}, 10);
  d.tiers[0].annotations[0].start = 19'999'999;  // just before half a frame (20 ms)
  d.tiers[0].annotations[0].end = 20'000'000;    // half a frame: away from zero
  REQUIRE(snap_times(d, {25, 1}).empty());
  CHECK(d.tiers[0].annotations[0].start == 0);
  CHECK(d.tiers[0].annotations[0].end == 40'000'000);
  // At 30000/1001 frame 153 starts at 153 × 1001/30000 s = 5.1051 s (CHECKS.md's worked
  // example puts 00:00:05.1 in frame 153; arithmetic computed).
  document n = frames_doc({30000, 1001}, 2);
  n.tiers[0].annotations[0].start = 5'100'000'000;
  REQUIRE(snap_times(n, {30000, 1001}).empty());
  CHECK(n.tiers[0].annotations[0].start == 5'105'100'000);
}

TEST_CASE("cutting keeps what overlaps, clipped, and can start the cut from zero", "[edit]") {
  document d;
  d.media.duration = 100 * ns_per_second;
  tier& t = d.tiers.emplace_back();
  t.name = "t";
  for (auto [s, e] : {std::pair{5, 15}, {12, 13}, {18, 30}, {30, 31}, {20, 20}, {40, 40}}) {
    annotation a;
    a.start = s * ns_per_second;
    a.end = e * ns_per_second;
    t.annotations.push_back(a);
  }
  REQUIRE(cut_times(d, 10 * ns_per_second, 30 * ns_per_second, true).empty());
  std::vector<std::pair<time_ns, time_ns>> got;
  for (const annotation& a : d.tiers[0].annotations)
    got.emplace_back(a.start / ns_per_second, a.end / ns_per_second);
  CHECK(got == std::vector<std::pair<time_ns, time_ns>>{{0, 5}, {2, 3}, {8, 20}, {10, 10}});
  CHECK(d.media.duration == 20 * ns_per_second);
  CHECK(refusal(cut_times(d, 5, 5, false)) == "edit.range: the range ends before it starts");
}

TEST_CASE("selecting, dropping and renaming tiers", "[edit]") {
  document d;
  for (const char* n : {"a", "b", "c"})
    d.tiers.emplace_back().name = n;
  d.tiers[2].parent = parent_link{"b", relation::within};
  REQUIRE(rename_tier(d, "b", "bee").empty());
  CHECK(d.tiers[2].parent->tier == "bee");
  CHECK(refusal(rename_tier(d, "a", "c")) == "edit.exists: a tier 'c' exists already");
  REQUIRE(select_tiers(d, {"c", "bee"}).empty());
  CHECK(d.tiers.size() == 2);
  CHECK(d.tiers[0].name == "bee");  // document order
  CHECK(refusal(drop_tier(d, "a")) == "edit.tier: no tier 'a' (tiers: 'bee', 'c')");
  REQUIRE(drop_tier(d, "c").empty());
  CHECK(d.tiers.size() == 1);
}
