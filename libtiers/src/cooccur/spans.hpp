// What counting and the permutation test share: annotations reduced to times and label ids,
// and the sweep that finds, for each annotation of A, the distinct labels of B it co-occurs with.
#pragma once

#include <algorithm>
#include <cstdint>
#include <string>
#include <vector>

#include "detail/exact.hpp"
#include "tiers/cooccur.hpp"

namespace tiers::detail {

struct a_item {
  time_ns start, end;
  std::uint32_t label;
};
struct b_span {
  time_ns from, to;  ///< widened by the window; an instant is one nanosecond wide
  std::uint32_t label;
  std::size_t index = 0;  ///< the annotation's place in its tier
};

/// The labels of B to count (`b_labels`, folded as the options fold), sorted; empty: all.
std::vector<std::string> counted_labels(const cooccur_options& o);

/// Whether `a` stands in relation `r` to the span [from, to).
inline bool related(time_ns start, time_ns end, time_ns from, time_ns to, cooccur_relation r) {
  switch (r) {
    case cooccur_relation::overlap:
      // Intervals share time; an instant falls inside.
      return start == end ? from <= start && start < to : start < to && from < end;
    case cooccur_relation::within:
      return from <= start && end <= to;
    case cooccur_relation::starts_in:
      return from <= start && start < to;
  }
  return false;
}

/// Calls `f(k, span)` for every item k of `as` and every span of `bs` it stands in relation
/// to, in the order of `as`. `bs` is sorted here by start.
template <class F>
void each_related(const std::vector<a_item>& as, std::vector<b_span>& bs, cooccur_relation r,
                  F&& f) {
  std::sort(bs.begin(), bs.end(), [](const b_span& p, const b_span& q) { return p.from < q.from; });
  time_ns longest = 0;
  std::vector<time_ns> starts(bs.size());
  for (std::size_t k = 0; k < bs.size(); ++k) {
    starts[k] = bs[k].from;
    longest = std::max(longest, saturating_difference(bs[k].to, bs[k].from));
  }
  for (std::size_t k = 0; k < as.size(); ++k) {
    const a_item& x = as[k];
    // Every span that could relate starts after x.start − longest and at or before x's end.
    const time_ns lowest = saturating_difference(x.start, longest);
    for (auto it = std::lower_bound(starts.begin(), starts.end(), lowest);
         it != starts.end() && *it <= x.end; ++it) {
      const b_span& s = bs[static_cast<std::size_t>(it - starts.begin())];
      if (related(x.start, x.end, s.from, s.to, r)) f(k, s);
    }
  }
}

/// Calls `f(k, labels)` for every item k of `as`, with the distinct labels of `bs` it stands in
/// relation to (sorted).
template <class F>
void each_cooccurrence(const std::vector<a_item>& as, std::vector<b_span>& bs, cooccur_relation r,
                       F&& f) {
  std::vector<std::uint32_t> found;
  std::size_t current = 0;
  auto flush = [&](std::size_t upto) {
    // Items before `upto` whose spans have all been seen; those without any get none.
    for (; current < upto; ++current) {
      std::sort(found.begin(), found.end());
      found.erase(std::unique(found.begin(), found.end()), found.end());
      f(current, static_cast<const std::vector<std::uint32_t>&>(found));
      found.clear();
    }
  };
  each_related(as, bs, r, [&](std::size_t k, const b_span& s) {
    flush(k);
    found.push_back(s.label);
  });
  flush(as.size());
}

/// B's annotations as spans, widened by the window, with labels from `label_of` (which
/// returns false for a label that is not counted); reversed annotations are left out.
template <class L>
std::vector<b_span> b_spans(const tier& b, time_ns window, L&& label_of) {
  std::vector<b_span> out;
  for (std::size_t k = 0; k < b.annotations.size(); ++k) {
    const annotation& x = b.annotations[k];
    if (x.end < x.start) continue;  // reversed: no time to share
    std::uint32_t id = 0;
    if (!label_of(x.text, id)) continue;
    b_span s{saturating_difference(x.start, window), saturating_add(x.end, window), id, k};
    if (s.to == s.from) s.to = saturating_add(s.to, 1);
    out.push_back(s);
  }
  return out;
}

}  // namespace tiers::detail
