// Deriving intervals from per-frame scores: thresholds, smoothing, bridging, minimum duration,
// missing and repeated frames, exact frame times.
#include <catch2/catch.hpp>

#include "tiers/derive.hpp"

using namespace tiers;

namespace {

signal_result read_csv_signal(const std::string& text, rational rate = {25, 1}) {
  signal_options o;
  o.rate = rate;
  return read_signal(text, signal_format::csv, o);
}

std::string frames_csv(const std::vector<double>& scores) {
  std::string s = "frame,score\n";
  for (std::size_t k = 0; k < scores.size(); ++k)
    s += std::to_string(k) + "," + std::to_string(scores[k]) + "\n";
  return s;
}

std::vector<std::pair<time_ns, time_ns>> spans(const document& d) {
  std::vector<std::pair<time_ns, time_ns>> out;
  for (const annotation& a : d.tiers.at(0).annotations)
    out.emplace_back(a.start, a.end);
  return out;
}

constexpr time_ns frame = 40'000'000;  // at 25 fps

}  // namespace

TEST_CASE("hysteresis: enter at on, leave below off", "[derive]") {
  const auto r = read_csv_signal(frames_csv({0.1, 0.7, 0.5, 0.45, 0.3, 0.6, 0.2}));
  REQUIRE(r.ok());
  derive_options o;
  o.on = 0.6;
  o.off = 0.4;
  const document d = derive_tiers(r.value, o);
  // Frames 1–3 (0.7, 0.5, 0.45 ≥ 0.4), then 5.
  CHECK(spans(d) ==
        std::vector<std::pair<time_ns, time_ns>>{{frame, 4 * frame}, {5 * frame, 6 * frame}});
  CHECK(d.tiers[0].annotations[0].confidence == Approx((0.7 + 0.5 + 0.45) / 3));
  CHECK(d.tiers[0].annotations[0].text == "score");
  CHECK(d.tiers[0].source->kind == source_kind::machine);
  o.max_confidence = true;
  CHECK(derive_tiers(r.value, o).tiers[0].annotations[0].confidence == 0.7);
}

TEST_CASE("bridging joins short dropouts, then short blips are dropped", "[derive]") {
  std::vector<double> s(100, 0.1);
  for (int k = 20; k < 60; ++k)
    s[k] = 0.9;
  s[35] = s[36] = 0.1;  // a 2-frame dropout inside the truth
  s[80] = 0.95;         // a 1-frame blip outside it
  const auto r = read_csv_signal(frames_csv(s));
  derive_options o;
  o.bridge = 3 * frame;
  o.min_duration = 4 * frame;
  CHECK(spans(derive_tiers(r.value, o)) ==
        std::vector<std::pair<time_ns, time_ns>>{{20 * frame, 60 * frame}});
  o.bridge = 0;
  CHECK(spans(derive_tiers(r.value, o)).size() == 2);
  o.smooth = 5;  // a median over 5 frames removes both without bridging
  CHECK(spans(derive_tiers(r.value, o)) ==
        std::vector<std::pair<time_ns, time_ns>>{{20 * frame, 60 * frame}});
}

TEST_CASE("frame numbers at 30000/1001 are exact to the nanosecond", "[derive]") {
  const auto r = read_csv_signal("frame,s\n152,0.1\n153,0.9\n154,0.9\n155,0.1\n", {30000, 1001});
  REQUIRE(r.ok());
  const document d = derive_tiers(r.value, {});
  // Frame 153 starts at 153 × 1001/30000 s = 5.1051 s; frame 155 at 5.171833… s (computed).
  CHECK(spans(d) == std::vector<std::pair<time_ns, time_ns>>{{5'105'100'000, 5'171'833'333}});
  CHECK(d.media.frame_rate == rational{30000, 1001});
}

TEST_CASE("missing frames are reported and never bridged or filled", "[derive]") {
  const auto r = read_csv_signal("frame,s\n0,0.9\n1,0.9\n4,0.9\n5,0.9\n");
  REQUIRE(r.ok());
  REQUIRE(r.diagnostics.size() == 1);
  CHECK(r.diagnostics[0].code == "derive.missing");
  CHECK(r.diagnostics[0].message ==
        "frames 2 to 3 are missing: no interval spans them, and no score is made up");
  derive_options o;
  o.bridge = 10 * frame;
  CHECK(spans(derive_tiers(r.value, o)) ==
        std::vector<std::pair<time_ns, time_ns>>{{0, 2 * frame}, {4 * frame, 6 * frame}});
}

TEST_CASE("bad signals are located errors", "[derive]") {
  struct row {
    const char* text;
    const char* code;
    std::size_t offset;
  };
  for (const row& x :
       {row{"frame,s\n0,0.5\n1,high\n", "derive.score", 16},
        row{"frame,s\n0,0.5\n0,0.6\n", "derive.duplicate", 14},
        row{"frame,s\n0,0.5\n-1,0.6\n", "derive.frame", 14},
        row{"when,s\n0,1\n", "derive.header", 0}, row{"frame,s\n0,nan\n", "derive.score", 10}}) {
    INFO(x.text);
    const auto r = read_csv_signal(x.text);
    REQUIRE_FALSE(r.ok());
    CHECK(r.diagnostics.back().code == x.code);
    CHECK(r.diagnostics.back().offset == x.offset);
  }
  signal_options no_rate;
  CHECK_FALSE(read_signal("frame,s\n0,1\n", signal_format::csv, no_rate).ok());
}

TEST_CASE("time columns and JSON Lines", "[derive]") {
  signal_options o;
  const auto r = read_signal(
      "{\"time\": 0.5, \"a\": 0.9}\n{\"time\": 1.0, \"a\": 0.9}\n"
      "{\"time\": 1.5, \"a\": 0.1}\n",
      signal_format::jsonl, o);
  REQUIRE(r.ok());
  CHECK(spans(derive_tiers(r.value, {})) ==
        std::vector<std::pair<time_ns, time_ns>>{{500'000'000, 1'500'000'000}});
  const auto bad = read_signal("{\"time\": 0.5, \"a\": 0.9}\n{\"time\": 1.0, \"a\": \"x\"}\n",
                               signal_format::jsonl, o);
  REQUIRE_FALSE(bad.ok());
  CHECK(bad.diagnostics.back().offset == 43);  // the value "x" on the second line
}
