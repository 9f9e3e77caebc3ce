// Segment-based agreement: an optimal one-to-one matching of reference and candidate
// segments, by min-cost maximum flow on each group of segments that could match.
#include <algorithm>
#include <cmath>
#include <cstdint>
#include <deque>
#include <limits>
#include <numeric>

#include "detail/exact.hpp"
#include "tiers/agree.hpp"
#include "tiers/lag.hpp"

namespace tiers {
namespace {

struct edge_candidate {
  std::size_t ref, cand;
  std::int64_t cost;
};

struct union_find {
  std::vector<std::size_t> parent;
  explicit union_find(std::size_t n) : parent(n) {
    std::iota(parent.begin(), parent.end(), std::size_t{0});
  }
  std::size_t find(std::size_t x) {
    while (parent[x] != x)
      x = parent[x] = parent[parent[x]];
    return x;
  }
  void join(std::size_t a, std::size_t b) { parent[find(a)] = find(b); }
};

// Min-cost maximum flow from a source through refs and candidates to a sink, every capacity 1:
// successive shortest paths (Bellman–Ford on the residual graph, as costs stay non-negative
// only after potentials; the groups are small).
class matcher {
 public:
  matcher(std::size_t refs, std::size_t cands)
      : refs_(refs),
        nodes_(refs + cands + 2),
        source_(refs + cands),
        sink_(refs + cands + 1),
        graph_(nodes_) {
    for (std::size_t r = 0; r < refs; ++r)
      add(source_, r, 0);
    for (std::size_t c = 0; c < cands; ++c)
      add(refs + c, sink_, 0);
  }
  void link(std::size_t ref, std::size_t cand, std::int64_t cost) { add(ref, refs_ + cand, cost); }

  // Pairs (ref, cand) of the optimal matching.
  std::vector<std::pair<std::size_t, std::size_t>> solve() {
    constexpr std::int64_t inf = std::numeric_limits<std::int64_t>::max() / 4;
    for (;;) {
      std::vector<std::int64_t> dist(nodes_, inf);
      std::vector<std::size_t> via(nodes_, SIZE_MAX);
      std::vector<bool> queued(nodes_, false);
      std::deque<std::size_t> queue{source_};
      dist[source_] = 0;
      while (!queue.empty()) {
        const std::size_t u = queue.front();
        queue.pop_front();
        queued[u] = false;
        for (std::size_t e : graph_[u]) {
          const arc& a = arcs_[e];
          if (a.capacity > 0 && dist[u] + a.cost < dist[a.to]) {
            dist[a.to] = dist[u] + a.cost;
            via[a.to] = e;
            if (!queued[a.to]) {
              queued[a.to] = true;
              queue.push_back(a.to);
            }
          }
        }
      }
      if (dist[sink_] == inf) break;
      for (std::size_t v = sink_; v != source_; v = arcs_[via[v] ^ 1].to) {
        --arcs_[via[v]].capacity;
        ++arcs_[via[v] ^ 1].capacity;
      }
    }
    std::vector<std::pair<std::size_t, std::size_t>> out;
    for (std::size_t r = 0; r < refs_; ++r)
      for (std::size_t e : graph_[r]) {
        const arc& a = arcs_[e];
        if (a.to >= refs_ && a.to < source_ && a.capacity == 0 && (e % 2) == 0)
          out.emplace_back(r, a.to - refs_);
      }
    return out;
  }

 private:
  struct arc {
    std::size_t to;
    int capacity;
    std::int64_t cost;
  };
  void add(std::size_t from, std::size_t to, std::int64_t cost) {
    graph_[from].push_back(arcs_.size());
    arcs_.push_back({to, 1, cost});
    graph_[to].push_back(arcs_.size());
    arcs_.push_back({from, 0, -cost});
  }
  std::size_t refs_, nodes_, source_, sink_;
  std::vector<std::vector<std::size_t>> graph_;
  std::vector<arc> arcs_;
};

std::vector<std::size_t> by_start(const std::vector<annotation>& as) {
  std::vector<std::size_t> order(as.size());
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::stable_sort(order.begin(), order.end(),
                   [&](std::size_t a, std::size_t b) { return as[a].start < as[b].start; });
  return order;
}

double ratio(std::size_t a, std::size_t b) {
  return b == 0 ? std::numeric_limits<double>::quiet_NaN()
                : static_cast<double>(a) / static_cast<double>(b);
}

// Every pair that may match, with its cost, found through the candidates in start order.
std::vector<edge_candidate> possible_matches(const std::vector<annotation>& rs,
                                             const std::vector<annotation>& cs,
                                             const segment_options& options) {
  const std::vector<std::size_t> order = by_start(cs);
  std::vector<time_ns> starts;
  time_ns longest = 0;
  for (std::size_t c : order) {
    starts.push_back(cs[c].start);
    longest = std::max(longest, detail::saturating_difference(cs[c].end, cs[c].start));
  }
  std::vector<edge_candidate> edges;
  const bool by_overlap = options.by == segment_options::criterion::overlap;
  for (std::size_t r = 0; r < rs.size(); ++r) {
    const annotation& a = rs[r];
    // A search window: its ends are held at the range's ends, never kept as times.
    const time_ns from =
        detail::saturating_difference(a.start, by_overlap ? longest : options.collar);
    const time_ns to = by_overlap ? a.end : detail::saturating_add(a.start, options.collar);
    for (auto it = std::lower_bound(starts.begin(), starts.end(), from);
         it != starts.end() && *it <= to; ++it) {
      const std::size_t c = order[static_cast<std::size_t>(it - starts.begin())];
      const annotation& b = cs[c];
      if (options.same_label && a.text != b.text) continue;
      if (by_overlap) {
        const time_ns inter =
            detail::saturating_difference(std::min(a.end, b.end), std::max(a.start, b.start));
        const time_ns uni =
            detail::saturating_difference(std::max(a.end, b.end), std::min(a.start, b.start));
        if (inter <= 0 || uni <= 0) continue;
        const double iou = static_cast<double>(inter) / static_cast<double>(uni);
        if (iou < options.min_overlap) continue;
        edges.push_back({r, c, std::llround((1 - iou) * 1e9)});
      } else {
        const time_ns on = std::abs(detail::saturating_difference(b.start, a.start)),
                      off = std::abs(detail::saturating_difference(b.end, a.end));
        if (on > options.collar || off > options.collar) continue;
        edges.push_back({r, c, on + off});
      }
    }
  }
  return edges;
}

// The optimal one-to-one matching, group by group: segments linked by possible matches are
// solved apart. Returns the matches in reference order.
std::vector<segment_match> best_matches(const std::vector<annotation>& rs,
                                        const std::vector<annotation>& cs,
                                        const std::vector<edge_candidate>& edges) {
  union_find groups(rs.size() + cs.size());
  for (const edge_candidate& e : edges)
    groups.join(e.ref, rs.size() + e.cand);
  std::vector<std::vector<const edge_candidate*>> by_group(rs.size() + cs.size());
  for (const edge_candidate& e : edges)
    by_group[groups.find(e.ref)].push_back(&e);
  std::vector<segment_match> matches;
  for (const auto& group : by_group) {
    if (group.empty()) continue;
    std::vector<std::size_t> refs, cands;
    for (const edge_candidate* e : group) {
      refs.push_back(e->ref);
      cands.push_back(e->cand);
    }
    std::sort(refs.begin(), refs.end());
    refs.erase(std::unique(refs.begin(), refs.end()), refs.end());
    std::sort(cands.begin(), cands.end());
    cands.erase(std::unique(cands.begin(), cands.end()), cands.end());
    auto local = [](const std::vector<std::size_t>& v, std::size_t x) {
      return static_cast<std::size_t>(std::lower_bound(v.begin(), v.end(), x) - v.begin());
    };
    matcher m(refs.size(), cands.size());
    for (const edge_candidate* e : group)
      m.link(local(refs, e->ref), local(cands, e->cand), e->cost);
    for (const auto& [r, c] : m.solve()) {
      const annotation& a = rs[refs[r]];
      const annotation& b = cs[cands[c]];
      matches.push_back({refs[r], cands[c], detail::saturating_difference(b.start, a.start),
                         detail::saturating_difference(b.end, a.end)});
    }
  }
  std::sort(matches.begin(), matches.end(), [](const segment_match& x, const segment_match& y) {
    return x.reference < y.reference;
  });
  return matches;
}

// Precision, recall, F1 and the deviations' quantiles, from the counts and matches.
void score_segments(segment_agreement& out) {
  out.precision = ratio(out.matches.size(), out.candidate);
  out.recall = ratio(out.matches.size(), out.reference);
  out.f1 = std::isnan(out.precision) || std::isnan(out.recall) ? std::nan("")
           : out.precision + out.recall == 0
               ? 0
               : 2 * out.precision * out.recall / (out.precision + out.recall);
  std::vector<time_ns> on, off;
  for (const segment_match& s : out.matches) {
    on.push_back(std::abs(s.onset));
    off.push_back(std::abs(s.offset));
  }
  out.onset_median = quantile(on, 0.5);
  out.onset_p90 = quantile(on, 0.9);
  out.offset_median = quantile(off, 0.5);
  out.offset_p90 = quantile(off, 0.9);
}

}  // namespace

segment_agreement compare_segments(const tier& reference, const tier& candidate,
                                   const segment_options& options) {
  const std::vector<annotation>& rs = reference.annotations;
  const std::vector<annotation>& cs = candidate.annotations;
  segment_agreement out;
  out.reference = rs.size();
  out.candidate = cs.size();
  out.matches = best_matches(rs, cs, possible_matches(rs, cs, options));
  score_segments(out);
  return out;
}

segment_agreement pool_segments(const std::vector<segment_agreement>& parts) {
  segment_agreement out;
  for (const segment_agreement& s : parts) {
    out.reference += s.reference;
    out.candidate += s.candidate;
    out.matches.insert(out.matches.end(), s.matches.begin(), s.matches.end());
  }
  score_segments(out);
  return out;
}

}  // namespace tiers
