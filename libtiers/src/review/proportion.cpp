// Intervals for a proportion and Cochran's sample sizes (docs/review.md).
#include <cmath>
#include <limits>
#include <stdexcept>

#include "tiers/review.hpp"

namespace tiers {
namespace {

constexpr double nan = std::numeric_limits<double>::quiet_NaN();

// The continued fraction of I_x(a, b) (DLMF 8.17.22), evaluated by the modified Lentz method;
// it converges quickly for x < (a + 1)/(a + b + 2).
double beta_fraction(double x, double a, double b) {
  constexpr double tiny = 1e-300;
  double c = 1, d = 1 - (a + b) * x / (a + 1);
  if (std::fabs(d) < tiny) d = tiny;
  d = 1 / d;
  double f = d;
  for (int m = 1; m <= 10'000; ++m) {
    for (int half = 0; half < 2; ++half) {
      const double coefficient = half == 0
                                     ? m * (b - m) * x / ((a + 2 * m - 1) * (a + 2 * m))
                                     : -(a + m) * (a + b + m) * x / ((a + 2 * m) * (a + 2 * m + 1));
      d = 1 + coefficient * d;
      if (std::fabs(d) < tiny) d = tiny;
      c = 1 + coefficient / c;
      if (std::fabs(c) < tiny) c = tiny;
      d = 1 / d;
      f *= d * c;
      if (half == 1 && std::fabs(d * c - 1) < 1e-16) return f;
    }
  }
  return f;
}

// x with I_x(a, b) = q, by bisection: I_x is increasing in x, and 200 halvings reach the
// spacing of doubles.
double beta_quantile(double q, double a, double b) {
  double low = 0, high = 1;
  for (int k = 0; k < 200 && high - low > 0; ++k) {
    const double mid = low + (high - low) / 2;
    if (mid <= low || mid >= high) break;
    (regularized_beta(mid, a, b) < q ? low : high) = mid;
  }
  return low + (high - low) / 2;
}

}  // namespace

double regularized_beta(double x, double a, double b) {
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  const double log_front =
      std::lgamma(a + b) - std::lgamma(a) - std::lgamma(b) + a * std::log(x) + b * std::log1p(-x);
  if (x < (a + 1) / (a + b + 2)) return std::exp(log_front) * beta_fraction(x, a, b) / a;
  return 1 - std::exp(log_front) * beta_fraction(1 - x, b, a) / b;
}

// Acklam's rational approximation (relative error below 1.15e-9), then one step of Halley's
// method on erfc, which brings it to the precision of doubles.
double normal_quantile(double p) {
  if (!(p > 0 && p < 1)) return nan;
  static constexpr double a[] = {-3.969683028665376e+01, 2.209460984245205e+02,
                                 -2.759285104469687e+02, 1.383577518672690e+02,
                                 -3.066479806614716e+01, 2.506628277459239e+00};
  static constexpr double b[] = {-5.447609879822406e+01, 1.615858368580409e+02,
                                 -1.556989798598866e+02, 6.680131188771972e+01,
                                 -1.328068155288572e+01};
  static constexpr double c[] = {-7.784894002430293e-03, -3.223964580411365e-01,
                                 -2.400758277161838e+00, -2.549732539343734e+00,
                                 4.374664141464968e+00,  2.938163982698783e+00};
  static constexpr double d[] = {7.784695709041462e-03, 3.224671290700398e-01,
                                 2.445134137142996e+00, 3.754408661907416e+00};
  constexpr double p_low = 0.02425;
  double x;
  if (p < p_low || p > 1 - p_low) {
    const double q = std::sqrt(-2 * std::log(p < p_low ? p : 1 - p));
    x = (((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) /
        ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1);
    if (p > 1 - p_low) x = -x;
  } else {
    const double q = p - 0.5, r = q * q;
    x = (((((a[0] * r + a[1]) * r + a[2]) * r + a[3]) * r + a[4]) * r + a[5]) * q /
        (((((b[0] * r + b[1]) * r + b[2]) * r + b[3]) * r + b[4]) * r + 1);
  }
  const double e = 0.5 * std::erfc(-x / std::sqrt(2.0)) - p;
  const double u = e * std::sqrt(2 * M_PI) * std::exp(x * x / 2);
  return x - u / (1 + x * u / 2);
}

double two_sided_z(double level) {
  return normal_quantile(1 - (1 - level) / 2);
}

proportion_interval wilson_interval(double k, double n, double level) {
  if (!(n > 0)) return {};
  const double z = two_sided_z(level), z2 = z * z;
  const double p = k / n;
  const double centre = (p + z2 / (2 * n)) / (1 + z2 / n);
  const double half = z / (1 + z2 / n) * std::sqrt(p * (1 - p) / n + z2 / (4 * n * n));
  // At k = 0 and k = n the bound on that side is exactly 0 or 1; computed, it may miss by an ulp.
  return {k <= 0 ? 0.0 : std::max(0.0, centre - half), k >= n ? 1.0 : std::min(1.0, centre + half)};
}

proportion_interval clopper_pearson_interval(std::uint64_t k, std::uint64_t n, double level) {
  if (n == 0 || k > n) return {};
  const double alpha = 1 - level;
  const double kd = static_cast<double>(k), nd = static_cast<double>(n);
  proportion_interval out;
  out.low = k == 0 ? 0 : beta_quantile(alpha / 2, kd, nd - kd + 1);
  out.high = k == n ? 1 : beta_quantile(1 - alpha / 2, kd + 1, nd - kd);
  return out;
}

double cochran_n0(double margin, double level) {
  const double z = two_sided_z(level);
  return z * z * 0.25 / (margin * margin);
}

std::uint64_t cochran_size(double margin, double level, std::uint64_t population) {
  const double n0 = cochran_n0(margin, level);
  const double n = population == 0 ? 0 : n0 / (1 + (n0 - 1) / static_cast<double>(population));
  // Rounded up, but not past a whole that floating point misses by a hair (384.0000000001).
  const auto up = static_cast<std::uint64_t>(std::ceil(n - 1e-9));
  return std::min(up, population);
}

}  // namespace tiers
