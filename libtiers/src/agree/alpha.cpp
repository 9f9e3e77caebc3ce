// Krippendorff's alpha from the coincidence matrix (K. Krippendorff, "Computing
// Krippendorff's Alpha-Reliability", 2011): alpha = 1 − (n − 1) · Σ o_ck δ²_ck / Σ n_c n_k δ²_ck.
#include <algorithm>
#include <cmath>
#include <limits>
#include <map>

#include "tiers/agree.hpp"

namespace tiers {

double krippendorff_alpha(const std::vector<std::vector<std::optional<double>>>& units,
                          alpha_metric metric) {
  return krippendorff_alpha(units, std::vector<std::uint64_t>(units.size(), 1), metric);
}

double krippendorff_alpha(const std::vector<std::vector<std::optional<double>>>& units,
                          const std::vector<std::uint64_t>& weights, alpha_metric metric) {
  // The distinct values, and the coincidences o_ck: every ordered pair of values within a
  // unit of m values counts 1/(m − 1).
  std::map<double, std::size_t> index;
  for (const auto& u : units)
    for (const auto& v : u)
      if (v) index.emplace(*v, 0);
  std::vector<double> values;
  for (auto& [v, k] : index) {
    k = values.size();
    values.push_back(v);
  }
  const std::size_t n_values = values.size();
  std::vector<double> o(n_values * n_values, 0.0);
  for (std::size_t k = 0; k < units.size(); ++k) {
    const auto& u = units[k];
    const double weight = static_cast<double>(weights[k]);
    std::vector<std::size_t> present;
    for (const auto& v : u)
      if (v) present.push_back(index.at(*v));
    const std::size_t m = present.size();
    if (m < 2) continue;
    for (std::size_t i = 0; i < m; ++i)
      for (std::size_t j = 0; j < m; ++j)
        if (i != j) o[present[i] * n_values + present[j]] += weight / static_cast<double>(m - 1);
  }
  std::vector<double> n_c(n_values, 0.0);
  double n = 0;
  for (std::size_t c = 0; c < n_values; ++c)
    for (std::size_t k = 0; k < n_values; ++k) {
      n_c[c] += o[c * n_values + k];
      n += o[c * n_values + k];
    }
  auto delta2 = [&](std::size_t c, std::size_t k) {
    if (metric == alpha_metric::nominal) return c == k ? 0.0 : 1.0;
    const double d = values[c] - values[k];
    return d * d;
  };
  double observed = 0, expected = 0;
  for (std::size_t c = 0; c < n_values; ++c)
    for (std::size_t k = 0; k < n_values; ++k) {
      observed += o[c * n_values + k] * delta2(c, k);
      expected += n_c[c] * n_c[k] * delta2(c, k);
    }
  if (n < 2 || expected == 0) return std::numeric_limits<double>::quiet_NaN();
  return 1.0 - (n - 1) * observed / expected;
}

}  // namespace tiers
