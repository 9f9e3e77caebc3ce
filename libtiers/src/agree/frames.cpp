// Frame-based agreement: labels on a time grid, the confusion matrix, Cohen's kappa and
// precision, recall and F1 per label.
#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>
#include <unordered_map>

#include "tiers/agree.hpp"

namespace tiers {
namespace {

constexpr double nan = std::numeric_limits<double>::quiet_NaN();

double ratio(std::uint64_t a, std::uint64_t b) {
  return b == 0 ? nan : static_cast<double>(a) / static_cast<double>(b);
}

double harmonic(double p, double r) {
  if (std::isnan(p) || std::isnan(r)) return nan;
  return p + r == 0 ? 0 : 2 * p * r / (p + r);
}

// The first k whose value 2·(k·step) + step, twice the frame's middle, is at least `twice`.
std::int64_t first_frame_from(time_ns twice, time_ns step) {
  const time_ns n = twice - step;  // want 2·k·step ≥ n
  const time_ns d = 2 * step;
  return n <= 0 ? -((-n) / d) : (n + d - 1) / d;
}

}  // namespace

std::size_t time_grid::frames() const {
  if (step <= 0 || end <= start) return 0;
  return static_cast<std::size_t>((end - start + step - 1) / step);
}

framed_tiers frame_labels(const std::vector<const tier*>& tiers, const time_grid& grid) {
  framed_tiers out;
  std::unordered_map<std::string, std::int32_t> index;
  const auto n = static_cast<std::int64_t>(grid.frames());
  for (const tier* t : tiers) {
    std::vector<std::int32_t>& frames = out.frames.emplace_back(static_cast<std::size_t>(n), -1);
    std::vector<const annotation*> order;
    for (const annotation& a : t->annotations)
      order.push_back(&a);
    std::stable_sort(order.begin(), order.end(),
                     [](const annotation* a, const annotation* b) { return a->start < b->start; });
    for (const annotation* a : order) {
      auto [it, added] = index.try_emplace(a->text, static_cast<std::int32_t>(out.labels.size()));
      if (added) out.labels.push_back(a->text);
      std::int64_t from = 0, to = 0;  // frames [from, to)
      if (a->end == a->start) {
        if (a->start < grid.start) continue;
        from = (a->start - grid.start) / grid.step;
        to = from + 1;
      } else {
        // Frames whose middle lies in [start, end): compare twice the times, exactly.
        from = first_frame_from(2 * (a->start - grid.start), grid.step);
        to = first_frame_from(2 * (a->end - grid.start), grid.step);
      }
      for (std::int64_t k = std::max<std::int64_t>(from, 0); k < std::min(to, n); ++k)
        frames[static_cast<std::size_t>(k)] = it->second;  // a later start wins
    }
  }
  return out;
}

double cohen_kappa(const std::vector<std::vector<std::uint64_t>>& confusion) {
  const std::size_t k = confusion.size();
  std::uint64_t total = 0, agreed = 0;
  std::vector<std::uint64_t> rows(k, 0), cols(k, 0);
  for (std::size_t i = 0; i < k; ++i)
    for (std::size_t j = 0; j < k; ++j) {
      total += confusion[i][j];
      rows[i] += confusion[i][j];
      cols[j] += confusion[i][j];
      if (i == j) agreed += confusion[i][j];
    }
  if (total == 0) return nan;
  const double n = static_cast<double>(total);
  double expected = 0;
  for (std::size_t i = 0; i < k; ++i)
    expected += static_cast<double>(rows[i]) / n * (static_cast<double>(cols[i]) / n);
  if (expected >= 1) return nan;
  return (static_cast<double>(agreed) / n - expected) / (1 - expected);
}

frame_agreement compare_frames(const tier& reference, const tier& candidate,
                               const time_grid& grid) {
  frame_agreement out;
  out.grid = grid;
  const framed_tiers f = frame_labels({&reference, &candidate}, grid);
  const std::size_t none = f.labels.size();
  out.labels = f.labels;
  out.labels.push_back("none");
  out.confusion.assign(none + 1, std::vector<std::uint64_t>(none + 1, 0));
  for (std::size_t k = 0; k < f.frames[0].size(); ++k) {
    const std::int32_t r = f.frames[0][k], c = f.frames[1][k];
    ++out.confusion[r < 0 ? none : static_cast<std::size_t>(r)]
                   [c < 0 ? none : static_cast<std::size_t>(c)];
  }
  std::uint64_t total = 0, same = 0, ref_labelled = 0, cand_labelled = 0, agreed = 0;
  std::vector<std::uint64_t> rows(none + 1, 0), cols(none + 1, 0);
  for (std::size_t i = 0; i <= none; ++i)
    for (std::size_t j = 0; j <= none; ++j) {
      const std::uint64_t v = out.confusion[i][j];
      total += v;
      rows[i] += v;
      cols[j] += v;
      if (i == j) same += v;
      if (i != none) ref_labelled += v;
      if (j != none) cand_labelled += v;
      if (i == j && i != none) agreed += v;
    }
  out.observed = ratio(same, total);
  out.expected = 0;
  for (std::size_t i = 0; i <= none && total > 0; ++i)
    out.expected += static_cast<double>(rows[i]) / static_cast<double>(total) *
                    (static_cast<double>(cols[i]) / static_cast<double>(total));
  out.kappa = cohen_kappa(out.confusion);
  out.precision = ratio(agreed, cand_labelled);
  out.recall = ratio(agreed, ref_labelled);
  out.f1 = harmonic(out.precision, out.recall);
  for (std::size_t i = 0; i < none; ++i) {
    label_scores s;
    s.label = f.labels[i];
    s.reference = rows[i];
    s.candidate = cols[i];
    s.agreed = out.confusion[i][i];
    s.precision = ratio(s.agreed, s.candidate);
    s.recall = ratio(s.agreed, s.reference);
    s.f1 = harmonic(s.precision, s.recall);
    out.scores.push_back(std::move(s));
  }
  return out;
}

}  // namespace tiers
