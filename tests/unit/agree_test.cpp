// Agreement measures against worked examples from outside the project (sources named), and
// segment matching on hand-built cases.
#include <catch2/catch.hpp>
#include <cmath>

#include "support.hpp"
#include "tiers/agree.hpp"

using namespace tiers;
using test::seg;
using test::tier_of;

namespace {

// Two raters' yes/no judgements of n units as one-second annotations, from a 2×2 table.
std::pair<tier, tier> from_table(int yy, int yn, int ny, int nn) {
  tier a, b;
  double t = 0;
  auto add = [&](int count, const char* x, const char* y) {
    for (int k = 0; k < count; ++k, t += 1) {
      a.annotations.push_back(seg(t, t + 1, x));
      b.annotations.push_back(seg(t, t + 1, y));
    }
  };
  add(yy, "yes", "yes");
  add(yn, "yes", "no");
  add(ny, "no", "yes");
  add(nn, "no", "no");
  return {a, b};
}

double kappa_of_table(int yy, int yn, int ny, int nn) {
  const auto [a, b] = from_table(yy, yn, ny, nn);
  const time_grid grid{0, static_cast<time_ns>(yy + yn + ny + nn) * ns_per_second, ns_per_second};
  return compare_frames(a, b, grid).kappa;
}

}  // namespace

TEST_CASE("Cohen's kappa reproduces the worked examples", "[agree]") {
  // A tutorial's worked example (CHECKS.md, read): 20/5/10/15 of 50 → p_o 0.7, p_e 0.5, κ 0.4.
  const auto [a, b] = from_table(20, 5, 10, 15);
  const frame_agreement f = compare_frames(a, b, {0, 50 * ns_per_second, ns_per_second});
  CHECK(f.observed == Approx(0.7).margin(1e-12));
  CHECK(f.expected == Approx(0.5).margin(1e-12));
  CHECK(f.kappa == Approx(0.4).margin(1e-12));
  // The kappa paradox tables (CHECKS.md, memory; arithmetic verified): 45/15/25/15 → 3/23,
  // 25/35/5/35 → 7/27.
  CHECK(kappa_of_table(45, 15, 25, 15) == Approx(3.0 / 23).margin(1e-12));
  CHECK(kappa_of_table(25, 35, 5, 35) == Approx(7.0 / 27).margin(1e-12));
  // Perfect agreement on one label only: p_e = 1, kappa undefined.
  CHECK(std::isnan(kappa_of_table(10, 0, 0, 0)));
}

TEST_CASE("Krippendorff's alpha reproduces the 2011 paper's reliability data", "[agree]") {
  // K. Krippendorff, "Computing Krippendorff's Alpha-Reliability" (2011): 4 coders × 12 units
  // (CHECKS.md): nominal 0.743, interval 0.849 (the paper's values, from memory; recomputed
  // 0.7434, 0.8491).
  const std::optional<double> _;
  const std::vector<std::vector<std::optional<double>>> coders{
      {1, 2, 3, 3, 2, 1, 4, 1, 2, _, _, _},
      {1, 2, 3, 3, 2, 2, 4, 1, 2, 5, _, 3},
      {_, 3, 3, 3, 2, 3, 4, 2, 2, 5, 1, _},
      {1, 2, 3, 3, 2, 4, 4, 1, 2, 5, 1, _},
  };
  std::vector<std::vector<std::optional<double>>> units(12);
  for (std::size_t u = 0; u < 12; ++u)
    for (const auto& c : coders)
      units[u].push_back(c[u]);
  CHECK(krippendorff_alpha(units, alpha_metric::nominal) == Approx(0.7434).margin(5e-5));
  CHECK(krippendorff_alpha(units, alpha_metric::interval) == Approx(0.8491).margin(5e-5));
  CHECK(std::isnan(krippendorff_alpha({{1.0, {}}, {{}, 2.0}}, alpha_metric::nominal)));
}

TEST_CASE("frames take the label of the annotation over their middle", "[agree]") {
  const tier t = tier_of({seg(0.004, 0.016, "a"), seg(0.03, 0.03, "p")});
  const framed_tiers f = frame_labels({&t}, {0, 40'000'000, 10'000'000});
  // Frame middles at 5, 15, 25, 35 ms: [4, 16) covers the first two; the point at 30 ms falls
  // in the fourth frame.
  CHECK(f.frames == 4);
  CHECK(f.runs[0] == std::vector<frame_run>{{0, 2, 0}, {3, 4, 1}});
}

TEST_CASE("a grid of one frame at 30000/1001 stays on the video's frames for an hour", "[agree]") {
  // NTSC video: frame k starts at k·1001/30000 s (SMPTE ST 12-1's rate, common practice).
  time_grid g;
  g.step = 33'366'667;  // rounded; the exact step is 100100000/3 ns
  g.step_frames = 1;
  g.rate = {30000, 1001};
  g.end = 3600 * ns_per_second;
  CHECK(g.frames() == 107'893);  // ⌈3600 · 30000/1001⌉ = ⌈107892.1…⌉
  CHECK(g.frame_start(107'892) == 3'599'996'400'000);  // 107892·1001/30000 s, exactly
  CHECK(g.frame_start(3) == 100'100'000);
  // A 10 ms grid summed in rounded steps would be 36 µs off after an hour; this one is not: an
  // annotation from frame 107890 to 107892 labels exactly those two frames.
  const tier t = tier_of({});
  tier u = t;
  annotation a;
  a.start = g.frame_start(107'890);
  a.end = g.frame_start(107'892);
  a.text = "x";
  u.annotations.push_back(a);
  const framed_tiers f = frame_labels({&u}, g);
  CHECK(f.runs[0] == std::vector<frame_run>{{107'890, 107'892, 0}});
}

TEST_CASE("the grid spans the media, else the union of the tiers' spans", "[agree]") {
  const tier a = tier_of({seg(2, 3, "x")}), b = tier_of({seg(5, 7, "y"), seg(9, 9, "p")});
  const time_grid g = grid_over(std::nullopt, {&a, &b}, ns_per_second);
  CHECK(g.start == 2 * ns_per_second);
  CHECK(g.end == 9 * ns_per_second + 1);  // an instant at the end still gets its frame
  CHECK(g.spans == time_grid::basis::tiers);
  const time_grid m = grid_over(60 * ns_per_second, {&a, &b}, ns_per_second);
  CHECK(m.start == 0);
  CHECK(m.end == 60 * ns_per_second);
  CHECK(m.spans == time_grid::basis::media);
}

TEST_CASE("a sweep keeps annotations at or above each threshold", "[agree]") {
  tier ref = tier_of({seg(0, 10, "x")});
  tier cand = tier_of({seg(0, 4, "x"), seg(6, 8, "x"), seg(12, 14, "x")});
  cand.annotations[0].confidence = 0.9;
  cand.annotations[1].confidence = 0.5;
  cand.annotations[2].confidence = 0.2;
  const time_grid g = grid_over(std::nullopt, {&ref, &cand}, ns_per_second);
  const threshold_sweep s =
      sweep_thresholds({{&ref, &cand, g}}, segment_options{}, std::nullopt, 1.0);
  REQUIRE(s.points.size() == 3);
  CHECK(s.points[0].threshold == 0.2);
  CHECK(s.points[0].precision == Approx(6.0 / 8));
  CHECK(s.points[1].precision == 1.0);
  CHECK(s.points[1].recall == Approx(6.0 / 10));
  CHECK(s.points[2].kept == 1);
  CHECK(s.frames_threshold == 0.5);  // the lowest threshold at precision 1
}

TEST_CASE("a sweep over several recordings pools them at each threshold", "[agree]") {
  tier ref_a = tier_of({seg(0, 10, "x")}), ref_b = tier_of({seg(0, 4, "x")});
  tier cand_a = tier_of({seg(0, 4, "x"), seg(12, 14, "x")});
  tier cand_b = tier_of({seg(0, 4, "x")});
  cand_a.annotations[0].confidence = 0.9;
  cand_a.annotations[1].confidence = 0.2;
  cand_b.annotations[0].confidence = 0.6;
  const time_grid ga = grid_over(std::nullopt, {&ref_a, &cand_a}, ns_per_second);
  const time_grid gb = grid_over(std::nullopt, {&ref_b, &cand_b}, ns_per_second);
  const threshold_sweep s = sweep_thresholds({{&ref_a, &cand_a, ga}, {&ref_b, &cand_b, gb}},
                                             segment_options{}, std::nullopt, std::nullopt);
  REQUIRE(s.points.size() == 3);  // 0.2, 0.6, 0.9 from both recordings
  CHECK(s.candidates == 3);
  // At 0.2 everything: 8 agreed frames of 10 candidate-labelled, of 14 reference-labelled.
  CHECK(s.points[0].precision == Approx(8.0 / 10));
  CHECK(s.points[0].recall == Approx(8.0 / 14));
  // At 0.9 only recording a's first annotation: 4 of 4, of 14.
  CHECK(s.points[2].precision == 1.0);
  CHECK(s.points[2].recall == Approx(4.0 / 14));
  CHECK(s.points[2].kept_share == Approx(1.0 / 3));
}

TEST_CASE("a later start paints over an earlier one, splitting it", "[agree]") {
  const tier t = tier_of({seg(0, 10, "a"), seg(2, 4, "b"), seg(3, 3, "p"), seg(8, 12, "c")});
  const framed_tiers f = frame_labels({&t}, {0, 12 * ns_per_second, ns_per_second});
  CHECK(f.runs[0] ==
        std::vector<frame_run>{{0, 2, 0}, {2, 3, 1}, {3, 4, 2}, {4, 8, 0}, {8, 12, 3}});
}

TEST_CASE("agreement over a long span costs what the annotations cost", "[agree][hostile]") {
  // Two annotations nine billion seconds apart (near the end of the range of times): 9·10^11
  // frames of 10 ms, which a grid held in memory could not be allocated for (3.6 TB); runs
  // take a few bytes. (At two million seconds apart, the grid took 1.5 GB.)
  constexpr double far = 9e9;
  const tier a = tier_of({seg(0, 1, "x"), seg(far, far + 1, "x")});
  const tier b = tier_of({seg(0, 1, "x"), seg(far, far + 0.5, "y")});
  const time_grid grid{0, a.annotations[1].end, 10'000'000};
  constexpr std::uint64_t frames = 900'000'000'100;
  CHECK(grid.frames() == frames);
  const frame_agreement f = compare_frames(a, b, grid);
  REQUIRE(f.labels == std::vector<std::string>{"x", "y", "none"});
  CHECK(f.confusion[0][0] == 100);  // the first second
  CHECK(f.confusion[0][1] == 50);   // x judged y
  CHECK(f.confusion[0][2] == 50);   // x judged none
  CHECK(f.confusion[2][2] == frames - 200);
  const annotators_report r = compare_annotators({&a, &b}, grid);
  CHECK(r.pairable == 150);
  // Krippendorff's alpha by the coincidence formula (alpha.cpp): 100 units (x, x) and 50
  // (x, y) give o_xx = 200, o_xy = o_yx = 50, n = 300, n_x = 250, n_y = 50, so
  // alpha = 1 − 299 · 100 / (2 · 250 · 50) = −0.196.
  CHECK(r.alpha == Approx(-0.196));
}

TEST_CASE("precision, recall and F1 over labelled frames, per label", "[agree]") {
  const tier ref = tier_of({seg(0, 4, "stroke"), seg(6, 8, "hold")});
  const tier cand = tier_of({seg(1, 4, "stroke"), seg(6, 7, "stroke")});
  const frame_agreement f = compare_frames(ref, cand, {0, 10 * ns_per_second, ns_per_second});
  // Reference labels 6 frames, the candidate 4; 3 agree.
  CHECK(f.precision == Approx(0.75));
  CHECK(f.recall == Approx(0.5));
  CHECK(f.f1 == Approx(0.6));
  REQUIRE(f.scores.size() == 2);
  CHECK(f.scores[0].label == "stroke");
  CHECK(f.scores[0].precision == Approx(0.75));
  CHECK(f.scores[0].recall == Approx(0.75));
  CHECK(f.scores[1].label == "hold");
  CHECK(std::isnan(f.scores[1].precision));  // the candidate never says "hold"
  CHECK(f.labels.back() == "none");
  CHECK(f.confusion[1][0] == 1);  // hold judged stroke
  CHECK(f.confusion[1][2] == 1);  // hold judged none
}

TEST_CASE("segments match one to one, optimally rather than greedily", "[agree]") {
  // Greedy matching of the reference in order would give ref 0 its closest candidate (1.10),
  // leaving ref 1 with nothing within the collar; the optimal matching pairs both.
  const tier ref = tier_of({seg(1.00, 2.00, "beat"), seg(1.25, 2.25, "beat")});
  const tier cand = tier_of({seg(0.85, 1.85, "beat"), seg(1.10, 2.10, "beat")});
  const segment_agreement s = compare_segments(ref, cand);
  REQUIRE(s.matches.size() == 2);
  CHECK(s.matches[0].candidate == 0);
  CHECK(s.matches[1].candidate == 1);
  CHECK(s.precision == 1.0);
  CHECK(s.recall == 1.0);
  CHECK(s.onset_median == 150'000'000);
}

TEST_CASE("segment matching by collar, by overlap, and by label", "[agree]") {
  const tier ref = tier_of({seg(1, 2, "beat"), seg(5, 6, "beat"), seg(9, 10, "point")});
  const tier cand = tier_of(
      {seg(1.1, 2.15, "beat"), seg(5.3, 6.0, "beat"), seg(9, 10, "beat"), seg(12, 13, "x")});
  segment_agreement s = compare_segments(ref, cand);
  // Within 200 ms: only the first; the second starts 300 ms late; the third has another label.
  CHECK(s.matches.size() == 1);
  CHECK(s.precision == Approx(0.25));
  CHECK(s.recall == Approx(1.0 / 3));
  CHECK(s.f1 == Approx(2 * 0.25 / 3 / (0.25 + 1.0 / 3)));
  CHECK(s.onset_median == 100'000'000);
  CHECK(s.offset_median == 150'000'000);

  segment_options by_overlap;
  by_overlap.by = segment_options::criterion::overlap;
  s = compare_segments(ref, cand, by_overlap);
  CHECK(s.matches.size() == 2);  // IoU 0.9/1.15 and 0.7
  by_overlap.same_label = false;
  s = compare_segments(ref, cand, by_overlap);
  CHECK(s.matches.size() == 3);
}

TEST_CASE("segments spanning most of the range of times compare without wrapping", "[agree]") {
  // Their length (1.8·10^19 ns) is more than a time holds: lengths, overlaps and windows are
  // held at the range's ends instead of wrapping to negative values.
  const tier a = tier_of({seg(-9e9, 9e9, "x")});
  const tier b = tier_of({seg(-9e9, 9e9, "x")});
  segment_options by_overlap;
  by_overlap.by = segment_options::criterion::overlap;
  CHECK(compare_segments(a, b, by_overlap).matches.size() == 1);
  CHECK(compare_segments(a, b).matches.size() == 1);
}
