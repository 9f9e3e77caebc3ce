// Per-tier counts, spans and covered time.
#include "tiers/info.hpp"

#include <algorithm>
#include <iterator>
#include <limits>
#include <utility>

namespace tiers {
namespace {

__extension__ typedef __int128 wide;  // sums of spans of ±292 years need more than 64 bits

time_ns saturate(wide v) {
  constexpr time_ns top = std::numeric_limits<time_ns>::max();
  return v > top ? top : static_cast<time_ns>(v);
}

// Length of the union of intervals; each interval counts from its smaller to its larger time.
// Saturates at the largest time rather than overflowing on hostile input.
time_ns union_length(const tier& t) {
  std::vector<std::pair<time_ns, time_ns>> spans;
  spans.reserve(t.annotations.size());
  for (const annotation& a : t.annotations)
    if (a.start != a.end) spans.emplace_back(std::min(a.start, a.end), std::max(a.start, a.end));
  std::sort(spans.begin(), spans.end());
  wide total = 0;
  std::optional<std::pair<time_ns, time_ns>> open;
  for (const auto& s : spans) {
    if (open && s.first <= open->second) {
      open->second = std::max(open->second, s.second);
      continue;
    }
    if (open) total += static_cast<wide>(open->second) - open->first;
    open = s;
  }
  if (open) total += static_cast<wide>(open->second) - open->first;
  return saturate(total);
}

}  // namespace

document_summary summarize(const document& doc) {
  document_summary out;
  out.media = doc.media;
  for (const tier& t : doc.tiers) {
    tier_summary s;
    s.name = t.name;
    s.kind = t.kind;
    s.source = t.source;
    s.annotations = t.annotations.size();
    for (const annotation& a : t.annotations) {
      const time_ns lo = std::min(a.start, a.end);
      const time_ns hi = std::max(a.start, a.end);
      s.start = s.start ? std::min(*s.start, lo) : lo;
      s.end = s.end ? std::max(*s.end, hi) : hi;
    }
    s.annotated = union_length(t);
    if (s.start) {
      out.start = out.start ? std::min(*out.start, *s.start) : *s.start;
      out.end = out.end ? std::max(*out.end, *s.end) : *s.end;
    }
    out.tiers.push_back(std::move(s));
  }
  if (doc.media.duration && *doc.media.duration > 0) {
    out.reference = *doc.media.duration;
    out.reference_is_media = true;
  } else if (out.start) {
    out.reference = saturate(static_cast<wide>(*out.end) - *out.start);
  }
  if (out.reference > 0) {
    for (tier_summary& s : out.tiers)
      if (s.kind == tier_kind::interval)
        s.coverage = static_cast<double>(s.annotated) / static_cast<double>(out.reference);
  }
  return out;
}

time_ns duration_of(const document_summary& s) {
  return s.media.duration.value_or(s.end.value_or(0));
}

void dataset_inventory::add(const document_summary& recording) {
  ++recordings;
  length += duration_of(recording);
  for (const tier_summary& t : recording.tiers) {
    auto it = std::find_if(tiers.begin(), tiers.end(),
                           [&](const tier_inventory& i) { return i.name == t.name; });
    if (it == tiers.end()) {
      tiers.push_back({});
      tiers.back().name = t.name;
      it = std::prev(tiers.end());
    }
    ++it->recordings;
    it->annotations += t.annotations;
    it->length += duration_of(recording);
    it->annotated += t.annotated;
    if (!t.source)
      ++it->unmarked;
    else if (t.source->kind == source_kind::human)
      ++it->human;
    else
      ++it->machine;
    if (t.kind == tier_kind::instant) ++it->instant;
  }
}

}  // namespace tiers
