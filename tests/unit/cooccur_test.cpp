// Co-occurrence: the statistics of 2×2 tables against published values (sources named), and
// the counting of each relation on hand-built tiers.
#include <catch2/catch.hpp>
#include <cmath>

#include "support.hpp"
#include "tiers/cooccur.hpp"

using namespace tiers;
using test::seg;
using test::tier_of;

namespace {

std::uint64_t count_of(const cooccur_counts& c, const std::string& x, const std::string& y) {
  for (const pair_statistics& s : cooccur_table(c, 0))
    if (s.a == x && s.b == y) return s.count;
  return 0;
}

}  // namespace

TEST_CASE("Fisher's exact test reproduces the tea-tasting table", "[cooccur]") {
  // R. A. Fisher, The Design of Experiments (1935): [[3,1],[1,3]] one-sided 17/70, two-sided
  // 34/70; [[4,0],[0,4]] one-sided 1/70, two-sided 2/70 (../shared/CHECKS.md).
  fisher_p f = fisher_exact(3, 1, 1, 3);
  CHECK(f.greater == Approx(17.0 / 70).epsilon(1e-12));
  CHECK(f.two_sided == Approx(34.0 / 70).epsilon(1e-12));
  f = fisher_exact(4, 0, 0, 4);
  CHECK(f.greater == Approx(1.0 / 70).epsilon(1e-12));
  CHECK(f.two_sided == Approx(2.0 / 70).epsilon(1e-12));
  // Fewer than expected: attraction is not shown, the two-sided p is the same.
  f = fisher_exact(1, 3, 3, 1);
  CHECK(f.greater == Approx(69.0 / 70).epsilon(1e-12));
  CHECK(f.two_sided == Approx(34.0 / 70).epsilon(1e-12));
}

TEST_CASE("Fisher's test stays finite for margins in the billions", "[cooccur]") {
  // A word said 2,000 times in a corpus of 2·10⁹ words, 1,000 times during one gesture that
  // spans 10⁸ words' time: expected 100, far more than chance.
  const fisher_p f = fisher_exact(1000, 1000, 99'999'000, 1'899'999'000 + 1000);
  CHECK(f.greater >= 0);
  CHECK(f.greater < 1e-300);
  // At chance (O11 = E11) neither tail is small.
  const fisher_p g = fisher_exact(100, 1900, 99'999'900, 1'899'998'100);
  CHECK(g.greater > 0.3);
  CHECK(g.two_sided > 0.9);
}

TEST_CASE("G² reproduces Dunning's values", "[cooccur]") {
  // Dunning (1993), "Accurate methods for the statistics of surprise and coincidence"; the
  // values as in ../shared/CHECKS.md (read in two math libraries' test suites; recomputed).
  CHECK(log_likelihood_g2(1, 0, 0, 1) == Approx(2.772589).epsilon(1e-6));
  CHECK(log_likelihood_g2(10, 0, 0, 10) == Approx(27.72589).epsilon(1e-6));
  CHECK(log_likelihood_g2(5, 1995, 0, 100000) == Approx(39.33052).epsilon(1e-6));
  CHECK(log_likelihood_g2(1000, 1995, 1000, 100000) == Approx(4730.737).epsilon(1e-6));
  CHECK(log_likelihood_g2(1000, 1000, 1000, 100000) == Approx(5734.343).epsilon(1e-6));
}

TEST_CASE("log odds with Woolf's interval, and 0.5 added where a cell is 0", "[cooccur]") {
  // [[10, 0], [5, 5]]: (10.5 · 5.5) / (0.5 · 5.5) = 21 (arithmetic); SE² = 1/10.5 + 1/0.5 +
  // 1/5.5 + 1/5.5.
  const pair_statistics s = table_statistics(10, 10, 15, 20);
  CHECK(s.log_odds == Approx(std::log(21.0)));
  const double se = std::sqrt(1 / 10.5 + 1 / 0.5 + 2 / 5.5);
  CHECK(s.log_odds_low == Approx(std::log(21.0) - 1.959963984540054 * se));
  CHECK(s.log_odds_high == Approx(std::log(21.0) + 1.959963984540054 * se));
  CHECK(s.expected == Approx(7.5));
  CHECK(s.pmi == Approx(std::log2(10 / 7.5)));
}

TEST_CASE("Benjamini–Hochberg adjusts by rank and keeps the order", "[cooccur]") {
  // m = 4: sorted 0.005, 0.01, 0.03, 0.04 → ×4/1, ×4/2, ×4/3, ×4/4 = 0.02, 0.02, 0.04, 0.04,
  // then the running minimum from the largest (arithmetic).
  const std::vector<double> adjusted = benjamini_hochberg({0.01, 0.04, 0.03, 0.005});
  CHECK(adjusted[0] == Approx(0.02));
  CHECK(adjusted[1] == Approx(0.04));
  CHECK(adjusted[2] == Approx(0.04));
  CHECK(adjusted[3] == Approx(0.02));
}

TEST_CASE("each relation, the window and case folding", "[cooccur]") {
  const tier words = tier_of({seg(0, 1, "so"), seg(1.5, 2.5, "this"), seg(2.6, 3.0, "Big"),
                              seg(5.0, 5.4, "big"), seg(7, 7, "uh")});
  const tier gestures = tier_of({seg(2, 4, "iconic"), seg(5.5, 6, "beat")});
  cooccur_options o;
  cooccur_counts c;
  c.add(words, gestures, o);
  CHECK(c.n() == 5);
  CHECK(count_of(c, "this", "iconic") == 1);  // 1.5–2.5 shares 2–2.5
  CHECK(count_of(c, "Big", "iconic") == 1);
  CHECK(count_of(c, "big", "beat") == 0);  // 5.0–5.4 ends before 5.5
  o.relation = cooccur_relation::within;
  cooccur_counts w;
  w.add(words, gestures, o);
  CHECK(count_of(w, "this", "iconic") == 0);  // starts before the gesture
  CHECK(count_of(w, "Big", "iconic") == 1);
  o.relation = cooccur_relation::starts_in;
  o.window = 200'000'000;  // ±0.2 s: "big" at 5.0 is not in 5.3–6.2; "so" not in 1.8–4.2
  cooccur_counts s;
  s.add(words, gestures, o);
  CHECK(count_of(s, "this", "iconic") == 0);
  o.window = 500'000'000;  // ±0.5 s: 1.5 is in 1.5–4.5, 5.0 in 5.0–6.5
  cooccur_counts s2;
  s2.add(words, gestures, o);
  CHECK(count_of(s2, "this", "iconic") == 1);
  CHECK(count_of(s2, "big", "beat") == 1);
  o.fold_case = true;
  cooccur_counts f;
  f.add(words, gestures, o);
  CHECK(count_of(f, "big", "iconic") == 1);  // "Big" folded into "big"
  CHECK(f.a_labels().size() == 4);           // so, this, big, uh
  o.b_labels = {"BEAT"};                     // folded too
  cooccur_counts only;
  only.add(words, gestures, o);
  CHECK(only.b_labels() == std::vector<std::string>{"beat"});
}

TEST_CASE("counts add up over recordings as over one", "[cooccur]") {
  const tier a1 = tier_of({seg(0, 1, "x"), seg(2, 3, "y")}), b1 = tier_of({seg(0, 1, "g")});
  const tier a2 = tier_of({seg(0, 1, "y"), seg(2, 3, "x")}), b2 = tier_of({seg(2, 3, "h")});
  cooccur_counts one, two, both;
  one.add(a1, b1, {});
  two.add(a2, b2, {});
  both.add(one);
  both.add(two);
  CHECK(both.n() == 4);
  CHECK(count_of(both, "x", "g") == 1);
  CHECK(count_of(both, "x", "h") == 1);
  CHECK(count_of(both, "y", "h") == 0);
  const std::vector<pair_statistics> t = cooccur_table(both, 0);
  REQUIRE(t.size() == 2);
  CHECK(t[0].a_total == 2);
  CHECK(t[0].b_total == 1);
}
