// The statistics of a 2×2 co-occurrence table: Fisher's exact test in log space, Dunning's G²,
// the log odds ratio with Woolf's interval, PMI, and Benjamini–Hochberg adjustment.
#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>

#include "tiers/cooccur.hpp"

namespace tiers {
namespace {

using real = long double;  // 64 bits of mantissa: log-probabilities of tables in the billions

// The hypergeometric distribution of O11 given the margins: R1 of N rows are x, C1 columns y.
struct hypergeometric {
  real r1, c1, n;
  std::uint64_t lo, hi;  // the support of O11

  hypergeometric(std::uint64_t r1_, std::uint64_t c1_, std::uint64_t n_)
      : r1(static_cast<real>(r1_)),
        c1(static_cast<real>(c1_)),
        n(static_cast<real>(n_)),
        lo(c1_ + r1_ > n_ ? c1_ + r1_ - n_ : 0),
        hi(std::min(r1_, c1_)) {}

  static real log_choose(real a, real b) {
    return std::lgamma(a + 1) - std::lgamma(b + 1) - std::lgamma(a - b + 1);
  }
  // ln P(O11 = k), from the log-gamma function.
  real log_p(std::uint64_t k) const {
    const real kk = static_cast<real>(k);
    return log_choose(r1, kk) + log_choose(n - r1, c1 - kk) - log_choose(n, c1);
  }
  // ln P(k + 1) − ln P(k): exact ratios, so that sums relative to one term stay precise.
  real log_step_up(std::uint64_t k) const {
    const real kk = static_cast<real>(k);
    return std::log((r1 - kk) * (c1 - kk)) - std::log((kk + 1) * (n - r1 - c1 + kk + 1));
  }
  std::uint64_t mode() const {
    const real m = std::floor((r1 + 1) * (c1 + 1) / (n + 2));
    return std::clamp(static_cast<std::uint64_t>(m), lo, hi);
  }

  // ln Σ P(k) from `from` outward (`up`: k = from, from + 1, …; else down), where the terms
  // fall away from the mode: each term relative to the first, until the rest cannot matter.
  real log_tail(std::uint64_t from, bool up, real log_first) const {
    real sum = 1, term = 1;  // relative to the first term
    for (std::uint64_t k = from;;) {
      if (up ? k >= hi : k <= lo) break;
      const real step = up ? log_step_up(k) : -log_step_up(k - 1);
      k = up ? k + 1 : k - 1;
      term *= std::exp(step);
      sum += term;
      if (term < sum * 1e-20L) break;
    }
    return log_first + std::log(sum);
  }

  // The first k going outward from the mode (`up`: above it) whose ln P is at most `bound`;
  // nothing when none is. ln P falls monotonically on each side of the mode.
  std::optional<std::uint64_t> first_at_most(real bound, bool up) const {
    const std::uint64_t m = mode();
    std::uint64_t a = up ? m + 1 : lo, b = up ? hi : (m == 0 ? 0 : m - 1);
    if (up ? m >= hi : m <= lo) return std::nullopt;
    if (up ? log_p(b) > bound : log_p(a) > bound) return std::nullopt;
    // Up: the smallest k in [a, b] with ln P(k) ≤ bound; down: the largest.
    while (a < b) {
      if (up) {
        const std::uint64_t mid = a + (b - a) / 2;
        if (log_p(mid) <= bound)
          b = mid;
        else
          a = mid + 1;
      } else {
        const std::uint64_t mid = a + (b - a + 1) / 2;
        if (log_p(mid) <= bound)
          a = mid;
        else
          b = mid - 1;
      }
    }
    return a;
  }
};

real log_sum(real a, real b) {
  if (a == -std::numeric_limits<real>::infinity()) return b;
  if (b == -std::numeric_limits<real>::infinity()) return a;
  const real m = std::max(a, b);
  return m + std::log(std::exp(a - m) + std::exp(b - m));
}

double probability(real log_p) {
  return static_cast<double>(std::min<real>(1, std::exp(log_p)));
}

constexpr double z95 = 1.959963984540054;  // the 97.5th percentile of the standard normal

}  // namespace

fisher_p fisher_exact(std::uint64_t o11, std::uint64_t o12, std::uint64_t o21, std::uint64_t o22) {
  const std::uint64_t r1 = o11 + o12, c1 = o11 + o21, n = r1 + o21 + o22;
  fisher_p out;
  if (n == 0) return out;
  const hypergeometric h(r1, c1, n);
  if (h.lo == h.hi) return out;  // one table only
  const std::uint64_t m = h.mode();
  const real log_obs = h.log_p(o11);
  constexpr real none = -std::numeric_limits<real>::infinity();

  // One-sided, P(X ≥ o11): summed directly above the mode; below it, 1 − P(X < o11).
  if (o11 > m)
    out.greater = probability(h.log_tail(o11, true, log_obs));
  else if (o11 > h.lo)
    out.greater = static_cast<double>(
        std::max<real>(0, 1 - std::exp(h.log_tail(o11 - 1, false, h.log_p(o11 - 1)))));

  // Two-sided: every table no more likely than this one (R's tolerance), on both sides.
  if (o11 == m) return {1, out.greater};
  const real bound = log_obs + std::log1p(1e-7L);
  const bool above = o11 > m;
  real total = h.log_tail(o11, above, log_obs);
  if (const auto j = h.first_at_most(bound, !above))
    total = log_sum(total, h.log_tail(*j, !above, h.log_p(*j)));
  else
    total = log_sum(total, none);
  out.two_sided = probability(total);
  return out;
}

double log_likelihood_g2(std::uint64_t o11, std::uint64_t o12, std::uint64_t o21,
                         std::uint64_t o22) {
  const real a = static_cast<real>(o11), b = static_cast<real>(o12), c = static_cast<real>(o21),
             d = static_cast<real>(o22);
  const real n = a + b + c + d;
  if (n == 0) return 0;
  auto cell = [&](real o, real row, real col) {
    return o == 0 ? 0 : o * std::log(o * n / (row * col));
  };
  const real g = 2 * (cell(a, a + b, a + c) + cell(b, a + b, b + d) + cell(c, c + d, a + c) +
                      cell(d, c + d, b + d));
  return static_cast<double>(std::max<real>(0, g));
}

pair_statistics table_statistics(std::uint64_t o11, std::uint64_t r1, std::uint64_t c1,
                                 std::uint64_t n) {
  pair_statistics s;
  s.count = o11;
  s.a_total = r1;
  s.b_total = c1;
  const std::uint64_t o12 = r1 - o11, o21 = c1 - o11, o22 = n - r1 - c1 + o11;
  const real e = static_cast<real>(r1) * static_cast<real>(c1) / static_cast<real>(n);
  s.expected = static_cast<double>(e);
  s.ratio = static_cast<double>(static_cast<real>(o11) / e);
  s.g2 = log_likelihood_g2(o11, o12, o21, o22);
  const fisher_p f = fisher_exact(o11, o12, o21, o22);
  s.fisher_p = f.two_sided;
  s.fisher_p_greater = f.greater;
  const bool zero = o11 == 0 || o12 == 0 || o21 == 0 || o22 == 0;
  const real add = zero ? 0.5L : 0;
  const real a = o11 + add, b = o12 + add, c = o21 + add, d = o22 + add;
  const real lor = std::log(a) + std::log(d) - std::log(b) - std::log(c);
  const real se = std::sqrt(1 / a + 1 / b + 1 / c + 1 / d);
  s.log_odds = static_cast<double>(lor);
  s.log_odds_low = static_cast<double>(lor - z95 * se);
  s.log_odds_high = static_cast<double>(lor + z95 * se);
  s.pmi = o11 == 0 ? -std::numeric_limits<double>::infinity()
                   : static_cast<double>(std::log2(static_cast<real>(o11) / e));
  return s;
}

std::vector<double> benjamini_hochberg(const std::vector<double>& p) {
  const std::size_t m = p.size();
  std::vector<std::size_t> order(m);
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::stable_sort(order.begin(), order.end(),
                   [&](std::size_t a, std::size_t b) { return p[a] < p[b]; });
  std::vector<double> out(m);
  double running = 1;
  for (std::size_t r = m; r-- > 0;) {
    const std::size_t k = order[r];
    running = std::min(running, p[k] * static_cast<double>(m) / static_cast<double>(r + 1));
    out[k] = std::min(1.0, running);
  }
  return out;
}

}  // namespace tiers
