// Frame-based agreement: labels on a time grid, the confusion matrix, Cohen's kappa and
// precision, recall and F1 per label.
#include <algorithm>
#include <cmath>
#include <limits>
#include <map>
#include <numeric>
#include <unordered_map>

#include "detail/exact.hpp"
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

// A grid's step as an exact fraction p/q of a nanosecond: a step in frames is
// n·den·10⁹/num ns, rarely a whole number.
struct exact_step {
  detail::i128 p, q;
};
exact_step exact(const time_grid& g) {
  if (g.step_frames > 0)
    return {static_cast<detail::i128>(g.step_frames) * g.rate.den * 1'000'000'000, g.rate.num};
  return {g.step, 1};
}

// The first k whose frame middle, at (k + ½)·p/q after the grid's start, is at or after
// `since` (ns after the start): (2k + 1)·p ≥ 2·since·q. Wide arithmetic throughout.
detail::i128 first_frame_from(detail::i128 since, exact_step s) {
  const detail::i128 n = 2 * since * s.q - s.p;  // want 2·k·p ≥ n
  const detail::i128 d = 2 * s.p;
  return n <= 0 ? -((-n) / d) : (n + d - 1) / d;
}

// Labels painted over runs of frames, a later painting over an earlier one; each painting
// splits at most two runs and removes those it covers, so n paintings cost O(n log n).
class run_painter {
 public:
  void paint(std::uint64_t from, std::uint64_t to, std::int32_t label) {
    auto it = runs_.upper_bound(from);
    if (it != runs_.begin() && std::prev(it)->second.to > from) --it;
    std::vector<frame_run> kept;  // the parts of covered runs outside [from, to)
    while (it != runs_.end() && it->first < to) {
      const frame_run r = it->second;
      if (r.from < from) kept.push_back({r.from, from, r.label});
      if (r.to > to) kept.push_back({to, r.to, r.label});
      it = runs_.erase(it);
    }
    for (const frame_run& r : kept)
      runs_.emplace(r.from, r);
    runs_.emplace(from, frame_run{from, to, label});
  }
  // In order, neighbours with one label joined.
  std::vector<frame_run> runs() const {
    std::vector<frame_run> out;
    for (const auto& [from, r] : runs_)
      if (!out.empty() && out.back().to == r.from && out.back().label == r.label)
        out.back().to = r.to;
      else
        out.push_back(r);
    return out;
  }

 private:
  std::map<std::uint64_t, frame_run> runs_;
};

// Everything frame_agreement says, from its labels and confusion matrix ("none" last).
void score_frames(frame_agreement& out) {
  const std::size_t none = out.labels.size() - 1;
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
    s.label = out.labels[i];
    s.reference = rows[i];
    s.candidate = cols[i];
    s.agreed = out.confusion[i][i];
    s.precision = ratio(s.agreed, s.candidate);
    s.recall = ratio(s.agreed, s.reference);
    s.f1 = harmonic(s.precision, s.recall);
    out.scores.push_back(std::move(s));
  }
}

}  // namespace

std::uint64_t time_grid::frames() const {
  const exact_step s = exact(*this);
  if (s.p <= 0 || s.q <= 0 || end <= start) return 0;
  const detail::i128 span = (static_cast<detail::i128>(end) - start) * s.q;
  return static_cast<std::uint64_t>((span + s.p - 1) / s.p);
}

time_ns time_grid::frame_start(std::uint64_t k) const {
  const exact_step s = exact(*this);
  // Rounded to the nearest nanosecond, as frame_time rounds a frame's start.
  const detail::i128 at = start + (static_cast<detail::i128>(k) * s.p * 2 + s.q) / (2 * s.q);
  return static_cast<time_ns>(std::min(at, detail::time_max));
}

time_grid grid_over(std::optional<time_ns> media_duration, const std::vector<const tier*>& tiers,
                    time_ns step, std::int64_t step_frames, rational rate) {
  time_grid g;
  g.step = step;
  g.step_frames = step_frames;
  g.rate = rate;
  if (media_duration && *media_duration > 0) {
    g.end = *media_duration;
    g.spans = time_grid::basis::media;
    return g;
  }
  bool any = false;
  for (const tier* t : tiers)
    for (const annotation& a : t->annotations) {
      g.start = any ? std::min(g.start, a.start) : a.start;
      g.end = any ? std::max(g.end, a.end) : a.end;
      if (a.end == a.start) g.end = std::max(g.end, detail::saturating_add(a.start, 1));
      any = true;
    }
  return g;
}

framed_tiers frame_labels(const std::vector<const tier*>& tiers, const time_grid& grid) {
  framed_tiers out;
  out.frames = grid.frames();
  std::unordered_map<std::string, std::int32_t> index;
  const auto n = static_cast<detail::i128>(out.frames);
  const exact_step step = exact(grid);
  for (const tier* t : tiers) {
    std::vector<const annotation*> order;
    for (const annotation& a : t->annotations)
      order.push_back(&a);
    std::stable_sort(order.begin(), order.end(),
                     [](const annotation* a, const annotation* b) { return a->start < b->start; });
    run_painter painter;
    for (const annotation* a : order) {
      auto [it, added] = index.try_emplace(a->text, static_cast<std::int32_t>(out.labels.size()));
      if (added) out.labels.push_back(a->text);
      detail::i128 from = 0, to = 0;  // frames [from, to)
      const detail::i128 since = static_cast<detail::i128>(a->start) - grid.start;
      if (a->end == a->start) {
        if (since < 0) continue;
        from = since * step.q / step.p;
        to = from + 1;
      } else {
        // Frames whose middle lies in [start, end).
        from = first_frame_from(since, step);
        to = first_frame_from(static_cast<detail::i128>(a->end) - grid.start, step);
      }
      from = std::max<detail::i128>(from, 0);
      to = std::min(to, n);
      if (from < to)
        painter.paint(static_cast<std::uint64_t>(from), static_cast<std::uint64_t>(to),
                      it->second);  // a later start wins
    }
    out.runs.push_back(painter.runs());
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
  f.each_stretch([&](std::uint64_t from, std::uint64_t to, const std::vector<std::int32_t>& l) {
    out.confusion[l[0] < 0 ? none : static_cast<std::size_t>(l[0])]
                 [l[1] < 0 ? none : static_cast<std::size_t>(l[1])] += to - from;
  });
  score_frames(out);
  return out;
}

frame_agreement pool_frames(const std::vector<frame_agreement>& parts) {
  frame_agreement out;
  std::map<std::string, std::size_t> index;
  for (const frame_agreement& f : parts)
    for (std::size_t i = 0; i + 1 < f.labels.size(); ++i)
      if (index.emplace(f.labels[i], out.labels.size()).second) out.labels.push_back(f.labels[i]);
  const std::size_t none = out.labels.size();
  out.labels.push_back("none");
  out.confusion.assign(none + 1, std::vector<std::uint64_t>(none + 1, 0));
  std::uint64_t frames = 0;
  for (const frame_agreement& f : parts) {
    std::vector<std::size_t> to(f.labels.size(), none);
    for (std::size_t i = 0; i + 1 < f.labels.size(); ++i)
      to[i] = index.at(f.labels[i]);
    for (std::size_t i = 0; i < f.confusion.size(); ++i)
      for (std::size_t j = 0; j < f.confusion[i].size(); ++j) {
        out.confusion[to[i]][to[j]] += f.confusion[i][j];
        frames += f.confusion[i][j];
      }
  }
  if (!parts.empty()) {
    out.grid.step = parts.front().grid.step;
    out.grid.step_frames = parts.front().grid.step_frames;
    out.grid.rate = parts.front().grid.rate;
  }
  // The pooled grid is the parts' frames end to end: it spans media only if each part did.
  out.grid.spans = std::all_of(parts.begin(), parts.end(),
                               [](const frame_agreement& f) {
                                 return f.grid.spans == time_grid::basis::media;
                               }) &&
                           !parts.empty()
                       ? time_grid::basis::media
                       : time_grid::basis::tiers;
  out.grid.end = out.grid.frame_start(frames);
  score_frames(out);
  return out;
}

}  // namespace tiers
