// Sampling for review and estimating precision (docs/review.md).
#include <catch2/catch.hpp>

#include <algorithm>
#include <cmath>
#include <map>
#include <random>
#include <set>

#include "support.hpp"
#include "tiers/review.hpp"

using namespace tiers;

namespace {

// Within half a unit of the fourth decimal: the published values are rounded to four.
void near4(double got, double published) {
  CHECK(got == Approx(published).margin(0.00005 + 1e-9));
}

tier scored(std::size_t n, std::uint64_t seed, const std::vector<double>& confidences = {}) {
  std::mt19937_64 rng(seed);
  tier t;
  t.name = "nods";
  for (std::size_t k = 0; k < n; ++k) {
    annotation a = test::seg(static_cast<double>(k), static_cast<double>(k) + 0.5, "nod");
    a.confidence = confidences.empty() ? static_cast<double>(rng() % 1000) / 1000.0
                                       : confidences[k % confidences.size()];
    t.annotations.push_back(std::move(a));
  }
  return t;
}

std::string sheet_text(const std::vector<sample_row>& rows) {
  std::string s;
  string_sink out(s);
  write_review_sheet(rows, out);
  out.flush();
  return s;
}

}  // namespace

TEST_CASE("Wilson and Clopper-Pearson intervals match Newcombe's table", "[review]") {
  // Newcombe (1998), "Two-sided confidence intervals for the single proportion: comparison of
  // seven methods", Statistics in Medicine 17, table I (methods 3 and 5), 95 %. Values from
  // memory, recomputed with statsmodels' proportion_confint (tests/scripts/review_reference.py
  // checks 200+ more cases against it).
  struct row {
    std::uint64_t k, n;
    double wl, wh, cl, ch;
  };
  for (const row& r :
       {row{81, 263, 0.2553, 0.3662, 0.2527, 0.3676}, row{15, 148, 0.0624, 0.1605, 0.0578, 0.1617},
        row{0, 20, 0.0, 0.1611, 0.0, 0.1684}, row{1, 29, 0.0061, 0.1718, 0.0009, 0.1776}}) {
    INFO(r.k << "/" << r.n);
    const proportion_interval w =
        wilson_interval(static_cast<double>(r.k), static_cast<double>(r.n), 0.95);
    const proportion_interval c = clopper_pearson_interval(r.k, r.n, 0.95);
    near4(w.low, r.wl);
    near4(w.high, r.wh);
    near4(c.low, r.cl);
    near4(c.high, r.ch);
  }
}

TEST_CASE("Intervals at the edges: none reviewed, all right, all wrong", "[review]") {
  CHECK(wilson_interval(0, 0, 0.95).low == 0);
  CHECK(wilson_interval(0, 0, 0.95).high == 1);
  CHECK(clopper_pearson_interval(5, 5, 0.95).high == 1);
  // (α/2)^(1/n) is the exact lower limit when k = n (Clopper and Pearson 1934).
  CHECK(clopper_pearson_interval(5, 5, 0.95).low == Approx(std::pow(0.025, 1.0 / 5)).epsilon(1e-9));
  CHECK(clopper_pearson_interval(0, 5, 0.95).high ==
        Approx(1 - std::pow(0.025, 1.0 / 5)).epsilon(1e-9));
}

TEST_CASE("The normal quantile gives the familiar critical values", "[review]") {
  // Standard normal table values (common practice; any statistics text).
  CHECK(two_sided_z(0.95) == Approx(1.959963984540054).epsilon(1e-13));
  CHECK(two_sided_z(0.99) == Approx(2.5758293035489).epsilon(1e-12));
  CHECK(two_sided_z(0.90) == Approx(1.6448536269514722).epsilon(1e-13));
  CHECK(normal_quantile(0.5) == Approx(0).margin(1e-15));
  CHECK(normal_quantile(1e-10) == Approx(-6.361340902404056).epsilon(1e-10));
}

TEST_CASE("Cochran's sample sizes", "[review]") {
  // Cochran, Sampling Techniques (3rd ed., 1977), ch. 4: n0 = z² p q / e² = 384.15 for e = 0.05
  // at 95 %, so 385; with N = 2000 the correction n0 / (1 + (n0 − 1)/N) gives 323.
  CHECK(cochran_n0(0.05, 0.95) == Approx(384.15).margin(0.005));
  CHECK(cochran_size(0.05, 0.95, 1'000'000'000) == 385);
  CHECK(cochran_size(0.05, 0.95, 2000) == 323);
  CHECK(cochran_size(0.05, 0.95, 50) == 45);  // never more than the stratum holds
  CHECK(cochran_size(0.05, 0.95, 3) == 3);
  CHECK(cochran_size(0.05, 0.95, 0) == 0);
}

TEST_CASE("Allocation shares n proportionally, at least two each, none past its size", "[review]") {
  const std::vector<std::uint64_t> sizes{1000, 300, 5, 1};
  auto proportional = [&](std::uint64_t n) {
    std::vector<double> w(sizes.begin(), sizes.end());
    return allocate(n, sizes, w, 2);
  };
  const std::vector<std::uint64_t> a = proportional(100);
  CHECK(a == std::vector<std::uint64_t>{75, 22, 2, 1});
  CHECK(proportional(2000) == sizes);  // more than there is: everything
  const std::vector<std::uint64_t> equal = allocate(40, sizes, {1, 1, 1, 1}, 2);
  CHECK(equal == std::vector<std::uint64_t>{17, 17, 5, 1});  // the small ones' rest shared
  // Too few for two each: plain proportional shares.
  CHECK(allocate(3, {10, 10, 10, 10}, {10, 10, 10, 10}, 2) ==
        std::vector<std::uint64_t>{1, 1, 1, 0});
}

TEST_CASE("Confidence bands are named by their limits", "[review]") {
  const std::vector<double> bands{0.5, 0.7, 0.9};
  CHECK(confidence_band(bands, 0.0) == "[0,0.5)");
  CHECK(confidence_band(bands, 0.5) == "[0.5,0.7)");
  CHECK(confidence_band(bands, 0.95) == "[0.9,1]");
  CHECK(confidence_band(bands, 1.0) == "[0.9,1]");
  CHECK(confidence_band(bands, std::nullopt) == "no confidence");
}

TEST_CASE("The sample is the same whatever order the files are read in", "[review]") {
  sample_options o;
  o.n = 60;
  o.seed = 7;
  o.by = stratify_by::confidence;
  o.bands = {0.5, 0.9};
  const tier a = scored(500, 1), b = scored(300, 2), c = scored(40, 3);
  sampler forward(o), backward(o), split(o);
  forward.add("a.json", a, {});
  forward.add("b.json", b, {});
  forward.add("c.json", c, {});
  backward.add("c.json", c, {});
  backward.add("b.json", b, {});
  backward.add("a.json", a, {});
  sampler left(o), right(o);  // two threads' parts, added up
  left.add("b.json", b, {});
  right.add("c.json", c, {});
  right.add("a.json", a, {});
  split.add(std::move(right));
  split.add(std::move(left));
  const std::string expected = sheet_text(forward.draw());
  CHECK(sheet_text(backward.draw()) == expected);
  CHECK(sheet_text(split.draw()) == expected);
  CHECK(forward.draw().size() == 60);
  o.seed = 8;
  sampler other(o);
  other.add("a.json", a, {});
  other.add("b.json", b, {});
  other.add("c.json", c, {});
  CHECK(sheet_text(other.draw()) != expected);
}

TEST_CASE("Each annotation is drawn with the probability its stratum's share gives it",
          "[review]") {
  // A simple random sample of 10 from 40 includes each one with probability 1/4. Over 4000
  // seeds an annotation is drawn about 1000 times (binomial sd ≈ 27): ±5 sd is a fixed-seed
  // check that fails only if the draw favours some annotations.
  const tier t = scored(40, 5);
  sample_options o;
  o.n = 10;
  std::vector<int> drawn(40, 0);
  for (std::uint64_t seed = 1; seed <= 4000; ++seed) {
    o.seed = seed;
    sampler s(o);
    s.add("one.json", t, {});
    for (const sample_row& r : s.draw())
      ++drawn[static_cast<std::size_t>(r.start / ns_per_second)];
  }
  for (int d : drawn)
    CHECK(std::abs(d - 1000) < 5 * 27);
}

TEST_CASE("Clip links are Media Fragments URIs relative to the sheet", "[review]") {
  // W3C Media Fragments URI 1.0, §4.2.1: t=start,end in normal play time (seconds).
  CHECK(media_fragment("talk.webm", 12'300'000'000, 14'100'000'000, 0) == "talk.webm#t=12.3,14.1");
  CHECK(media_fragment("talk.webm", 500'000'000, 1'000'000'000, ns_per_second) ==
        "talk.webm#t=0,2");
  CHECK(media_fragment("talk.webm#t=5", 1'000'000'000, 2'000'000'000, 0) == "talk.webm#t=1,2");
  CHECK(media_from("talk.webm", "corpus/day one/a.json", "corpus") == "day%20one/talk.webm");
  CHECK(media_from("talk.webm", "a.json", "out") == "../talk.webm");
  CHECK(media_from("https://media.example/talk.webm", "a.json", "out") ==
        "https://media.example/talk.webm");
  CHECK(media_from("/srv/talk.webm", "a.json", "out") == "/srv/talk.webm");
}

TEST_CASE("Verdicts are read in their usual spellings", "[review]") {
  for (const char* yes : {"yes", "Y", "1", "TRUE", " yes "})
    CHECK(parse_verdict(yes) == verdict::yes);
  for (const char* no : {"no", "n", "0", "False"})
    CHECK(parse_verdict(no) == verdict::no);
  CHECK(parse_verdict("Unsure") == verdict::unsure);
  CHECK(parse_verdict("") == verdict::none);
  CHECK_FALSE(parse_verdict("maybe"));
}

TEST_CASE("A sheet with a bad verdict or inconsistent sizes is refused at the cell", "[review]") {
  const std::string header = "sample_id,stratum,stratum_size,verdict\n";
  auto bad = read_review_sheet(header + "1,a,10,yes\n2,a,10,perhaps\n", "s.csv");
  REQUIRE_FALSE(bad.ok());
  CHECK(bad.diagnostics[0].line == 3);
  CHECK(bad.diagnostics[0].column == 8);
  CHECK(bad.diagnostics[0].message.find("'perhaps' is not a verdict") == 0);
  auto sizes = read_review_sheet(header + "1,a,10,yes\n2,a,12,no\n", "s.csv");
  REQUIRE_FALSE(sizes.ok());
  CHECK(sizes.diagnostics[0].line == 3);
  auto more = read_review_sheet(header + "1,a,1,yes\n2,a,1,no\n", "s.csv");
  REQUIRE_FALSE(more.ok());
  CHECK(more.diagnostics[0].message.find("has 2 rows but size 1") != std::string::npos);
  auto lacking = read_review_sheet("sample_id,verdict\n1,yes\n", "s.csv");
  REQUIRE_FALSE(lacking.ok());
  CHECK(lacking.diagnostics[0].message.find("'stratum'") != std::string::npos);
  auto good = read_review_sheet("\xEF\xBB\xBF" + header + "1,a,10,Y\n2,b,5,\n", "s.csv");
  REQUIRE(good.ok());
  CHECK(good.value.size() == 2);
}

TEST_CASE("The stratified estimate is Cochran's, and the threshold the lowest that reaches",
          "[review]") {
  // Two strata: N = 100 with 10 reviewed (8 right), N = 900 with 20 reviewed (10 right).
  std::vector<sample_row> rows;
  auto add = [&](const char* stratum, std::uint64_t size, int right, int wrong, double conf) {
    for (int k = 0; k < right + wrong; ++k) {
      sample_row r;
      r.stratum = stratum;
      r.stratum_size = size;
      r.label = "nod";
      r.confidence = conf;
      r.verdict = k < right ? "yes" : "no";
      rows.push_back(r);
    }
  };
  add("high", 100, 8, 2, 0.9);
  add("low", 900, 10, 10, 0.3);
  sample_row unsure = rows.back();
  unsure.verdict = "unsure";
  rows.push_back(unsure);
  estimate_options o;
  o.target_precision = 0.45;
  const precision_estimate e = estimate_precision(rows, o);
  // Cochran (1977), ch. 5, worked by hand: p = 0.1·0.8 + 0.9·0.5 = 0.53;
  // v = 0.01·(1 − 10/100)·0.16/9 + 0.81·(1 − 20/900)·0.25/19.
  CHECK(e.overall.precision == Approx(0.53).epsilon(1e-12));
  const double v = 0.01 * 0.9 * 0.16 / 9 + 0.81 * (1 - 20.0 / 900) * 0.25 / 19;
  CHECK(e.overall.se == Approx(std::sqrt(v)).epsilon(1e-12));
  CHECK(e.overall.reviewed == 30);
  CHECK(e.strata[1].unsure == 1);
  // Wilson at the effective size p q / v.
  const double eff = 0.53 * 0.47 / v;
  const proportion_interval w = wilson_interval(0.53 * eff, eff, 0.95);
  CHECK(e.overall.interval.low == Approx(w.low).epsilon(1e-12));
  CHECK(e.overall.interval.high == Approx(w.high).epsilon(1e-12));
  // Everything (confidence ≥ 0.3) reaches 0.45 by the estimate, not by the lower bound (about
  // 0.34); the high stratum alone (≥ 0.9) does: 8/10 right, Wilson's lower bound 0.49.
  REQUIRE(e.threshold);
  REQUIRE(e.threshold->confidence);
  CHECK(*e.threshold->confidence == 0.9);
  CHECK(e.threshold->kept.precision == Approx(0.8));
  CHECK(e.threshold->kept.annotations == Approx(100));
  o.target_precision = 0.99;
  CHECK_FALSE(estimate_precision(rows, o).threshold->confidence);
}

TEST_CASE("All right is not certainty: the interval stays open below", "[review]") {
  std::vector<sample_row> rows(20);
  for (sample_row& r : rows) {
    r.stratum = "all";
    r.stratum_size = 1000;
    r.verdict = "yes";
  }
  const precision_estimate e = estimate_precision(rows, {});
  CHECK(e.overall.precision == 1);
  CHECK(e.overall.interval.high == 1);
  CHECK(e.overall.interval.low < 0.9);
  for (sample_row& r : rows)
    r.stratum_size = 20;  // a census: nothing left to guess
  CHECK(estimate_precision(rows, {}).overall.interval.low == 1);
}

TEST_CASE("The 95 % interval covers the true precision in about 95 % of samples", "[review]") {
  // Invented data with a known precision per confidence band (0.35, 0.6, 0.8, 0.95): the
  // population's true precision is known exactly, and 1,000 seeded stratified samples of 200
  // are estimated. Coverage of a correct 95 % interval over 1,000 repetitions falls within
  // 0.95 ± 0.02 (about three binomial standard deviations) — a fixed seed, so not flaky.
  const std::vector<double> limits{0.5, 0.7, 0.9};
  const double precision[] = {0.35, 0.6, 0.8, 0.95};
  std::mt19937_64 rng(2026);
  std::uniform_real_distribution<double> unit(0, 1);
  tier t;
  t.name = "nods";
  std::map<std::pair<time_ns, time_ns>, bool> truth;
  std::size_t right = 0;
  for (std::size_t k = 0; k < 6000; ++k) {
    annotation a = test::seg(static_cast<double>(k), static_cast<double>(k) + 0.5, "nod");
    const double c = std::pow(unit(rng), 0.7);
    a.confidence = c;
    const auto band = static_cast<std::size_t>(std::upper_bound(limits.begin(), limits.end(), c) -
                                               limits.begin());
    const bool ok = unit(rng) < precision[band];
    truth[{a.start, a.end}] = ok;
    right += ok;
    t.annotations.push_back(std::move(a));
  }
  const double true_precision = static_cast<double>(right) / 6000.0;
  for (const allocation share : {allocation::proportional, allocation::equal}) {
    int covered = 0;
    for (std::uint64_t seed = 1; seed <= 1000; ++seed) {
      sample_options o;
      o.n = 200;
      o.seed = seed;
      o.by = stratify_by::confidence;
      o.bands = limits;
      o.share = share;
      sampler s(o);
      s.add("seminar.json", t, {});
      std::vector<sample_row> rows = s.draw();
      for (sample_row& r : rows)
        r.verdict = truth[{r.start, r.end}] ? "yes" : "no";
      const precision_estimate e = estimate_precision(rows, {});
      covered +=
          e.overall.interval.low <= true_precision && true_precision <= e.overall.interval.high;
    }
    INFO(name_of(allocation_names, share) << ": " << covered << " of 1000 covered");
    CHECK(covered >= 930);
    CHECK(covered <= 970);
  }
}
