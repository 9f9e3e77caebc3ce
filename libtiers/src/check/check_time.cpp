// Rules on times and tiers as wholes: times of single annotations, order, duplicates, kinds,
// overlaps and gaps, and tier names.
#include <algorithm>
#include <numeric>
#include <unordered_map>

#include "checker.hpp"
#include "detail/exact.hpp"
#include "detail/report.hpp"

namespace tiers::detail {
namespace {

struct span_key {
  time_ns start, end;
  std::string_view text;
  bool operator==(const span_key&) const = default;
};

struct span_hash {
  std::size_t operator()(const span_key& k) const {
    const std::size_t h = std::hash<std::string_view>()(k.text);
    return h ^ (std::hash<time_ns>()(k.start) * 31 + std::hash<time_ns>()(k.end));
  }
};

}  // namespace

void checker::check_names() {
  if (!on("tier.duplicate-name")) return;
  std::unordered_map<std::string_view, std::size_t> first;
  for (std::size_t t = 0; t < doc_.tiers.size(); ++t) {
    auto [it, added] = first.emplace(doc_.tiers[t].name, t);
    if (added) continue;
    const std::string there = where(it->second, no_index);
    emit("tier.duplicate-name", t, no_index,
         "a second tier named " + quote_name(doc_.tiers[t].name) +
             (there.empty() ? "" : " (the first is at " + there + ")"));
  }
}

void checker::check_time(std::size_t t) {
  const tier& tr = doc_.tiers[t];
  const auto& as = tr.annotations;
  const std::optional<time_ns> media_end = doc_.media.duration;
  std::size_t out_of_order = 0, first_out = no_index;
  std::size_t instants = 0;
  std::unordered_map<span_key, std::size_t, span_hash> seen;
  const bool find_duplicates = on("time.duplicate");
  if (find_duplicates) seen.reserve(as.size());
  for (std::size_t a = 0; a < as.size(); ++a) {
    const annotation& x = as[a];
    if (x.start < 0 || x.end < 0)
      emit("time.negative", t, a,
           std::string(x.start < 0 ? "starts" : "ends") + " at " +
               clock(x.start < 0 ? x.start : x.end) + ", before zero");
    if (x.end < x.start)
      emit("time.reversed", t, a,
           "ends at " + clock(x.end) + ", before it starts at " + clock(x.start));
    if (media_end && std::max(x.start, x.end) > *media_end)
      emit("time.beyond-media", t, a,
           "ends at " + clock(std::max(x.start, x.end)) + ", after the media's end at " +
               clock(*media_end));
    if (a > 0 && x.start < as[a - 1].start) {
      if (out_of_order++ == 0) first_out = a;
    }
    if (tr.kind == tier_kind::instant && x.end != x.start)
      emit("tier.kind", t, a,
           "an instant tier holds an interval (" + clock(x.start) + " to " + clock(x.end) + ")");
    if (x.start == x.end) ++instants;
    if (find_duplicates) {
      auto [it, added] = seen.emplace(span_key{x.start, x.end, x.text}, a);
      if (!added) {
        const std::string there = where(t, it->second);
        emit("time.duplicate", t, a,
             "repeats the annotation " + (there.empty() ? "before" : "at " + there) +
                 ": same start, end and text");
      }
    }
  }
  if (first_out != no_index)
    emit("time.order", t, first_out,
         "starts at " + clock(as[first_out].start) + ", before the annotation before it (" +
             clock(as[first_out - 1].start) + ")" +
             (out_of_order > 1 ? "; " + std::to_string(out_of_order) +
                                     " annotations of this tier start before the one before them"
                               : ""));
  if (tr.kind != tier_kind::interval || instants == 0) return;
  if (instants == as.size() && !context_.instant_tiers) return;  // an instant tier, as far as known
  if (instants == as.size() && as.size() > 1) {
    emit("tier.kind", t, no_index,
         "every annotation of interval tier " + quote_name(tr.name) +
             " is an instant: it is an instant tier");
    return;
  }
  for (std::size_t a = 0; a < as.size(); ++a)
    if (as[a].start == as[a].end)
      emit("time.zero-length", t, a, "has zero length, at " + clock(as[a].start));
}

void checker::check_tier_spans(std::size_t t) {
  const tier& tr = doc_.tiers[t];
  if (tr.kind != tier_kind::interval || t == captions_) return;  // captions: caption.overlap
  const tier_spec* spec = profile_.find_tier(tr.name);
  const bool overlaps = on("tier.overlap") && !(spec && spec->overlaps);
  const bool gaps = on("tier.gap") && spec && spec->contiguous;
  if (!overlaps && !gaps) return;
  const auto& as = tr.annotations;
  std::vector<std::size_t> order(as.size());
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::stable_sort(order.begin(), order.end(),
                   [&](std::size_t a, std::size_t b) { return as[a].start < as[b].start; });
  std::size_t reach = no_index;  // the annotation that ends last so far
  for (std::size_t a : order) {
    if (as[a].end < as[a].start) continue;  // reported by time.reversed
    if (reach != no_index) {
      const annotation& r = as[reach];
      if (overlaps && as[a].start < r.end) {
        const std::string there = where(t, reach);
        emit("tier.overlap", t, a,
             "overlaps the annotation " + (there.empty() ? "" : "at " + there + " ") + "(" +
                 clock(r.start) + " to " + clock(r.end) + ") by " +
                 seconds(detail::saturating_difference(std::min(r.end, as[a].end), as[a].start)));
      } else if (gaps && as[a].start > r.end) {
        if (problem* p = emit("tier.gap", t, a,
                              "leaves a gap of " +
                                  seconds(detail::saturating_difference(as[a].start, r.end)) +
                                  " (" + clock(r.end) + " to " + clock(as[a].start) +
                                  ") in a tier that must be contiguous")) {
          p->start = r.end;
          p->end = as[a].start;
        }
      }
    }
    if (reach == no_index || as[a].end > as[reach].end) reach = a;
  }
}

}  // namespace tiers::detail
