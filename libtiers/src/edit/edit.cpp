// Time and tier operations (edit.hpp): exact integer arithmetic, all-or-nothing.
#include "tiers/edit.hpp"

#include <algorithm>
#include <functional>

#include "detail/exact.hpp"
#include "detail/report.hpp"

namespace tiers {
namespace {

using detail::i128;
using detail::quote_name;
using detail::round_div;

std::vector<diagnostic> refuse(std::string_view code, std::string message) {
  diagnostic d;
  d.code = code;
  d.message = std::move(message);
  return {std::move(d)};
}

std::vector<diagnostic> no_tier(const document& doc, std::string_view name) {
  return refuse("edit.tier", "no tier " + quote_name(name) + " (tiers: " + tier_names(doc) + ")");
}

// Applies `f` to every time of a copy; the document changes only when every time fits.
std::vector<diagnostic> map_times(document& doc,
                                  const std::function<std::optional<time_ns>(time_ns)>& f,
                                  bool duration_too, std::string_view what) {
  document out = doc;
  auto apply = [&](time_ns& t) {
    const auto v = f(t);
    if (!v) return false;
    t = *v;
    return true;
  };
  for (tier& t : out.tiers)
    for (annotation& a : t.annotations)
      if (!apply(a.start) || !apply(a.end))
        return refuse("time.range", std::string(what) + " takes a time of tier " +
                                        quote_name(t.name) + " out of range (about ±292 years)");
  if (duration_too && out.media.duration && !apply(*out.media.duration))
    return refuse("time.range", std::string(what) + " takes the media's duration out of range");
  doc = std::move(out);
  return {};
}

}  // namespace

std::vector<diagnostic> shift_times(document& doc, time_ns offset) {
  return map_times(
      doc, [&](time_ns t) { return detail::to_time(static_cast<i128>(t) + offset); }, false,
      "the shift");
}

std::vector<diagnostic> scale_times(document& doc, rational from, rational to) {
  const i128 num = static_cast<i128>(from.num) * to.den, den = static_cast<i128>(from.den) * to.num;
  auto r = map_times(
      doc, [&](time_ns t) { return detail::to_time(round_div(static_cast<i128>(t) * num, den)); },
      true, "scaling");
  if (r.empty() && doc.media.frame_rate == from) doc.media.frame_rate = to;
  return r;
}

std::vector<diagnostic> snap_times(document& doc, rational rate) {
  // Frame n starts at n × den / num seconds.
  const i128 per_frame_den = rate.num, per_frame_num = static_cast<i128>(rate.den) * ns_per_second;
  return map_times(
      doc,
      [&](time_ns t) {
        const i128 frame = round_div(static_cast<i128>(t) * per_frame_den, per_frame_num);
        return detail::to_time(round_div(frame * per_frame_num, per_frame_den));
      },
      false, "snapping");
}

std::vector<diagnostic> cut_times(document& doc, time_ns start, time_ns end, bool from_zero) {
  if (end <= start) return refuse("edit.range", "the range ends before it starts");
  for (tier& t : doc.tiers) {
    std::vector<annotation> kept;
    for (annotation& a : t.annotations) {
      const bool point = a.start == a.end;
      if (point ? (a.start < start || a.start >= end) : (a.end <= start || a.start >= end))
        continue;
      a.start = std::clamp(a.start, start, end);
      a.end = std::clamp(a.end, start, end);
      if (from_zero) {
        a.start -= start;
        a.end -= start;
      }
      kept.push_back(std::move(a));
    }
    t.annotations = std::move(kept);
  }
  if (from_zero) {
    const time_ns length = end - start;
    doc.media.duration =
        doc.media.duration ? std::clamp<time_ns>(*doc.media.duration - start, 0, length) : length;
  }
  return {};
}

std::vector<diagnostic> select_tiers(document& doc, const std::vector<std::string>& names) {
  for (const std::string& n : names)
    if (!find_tier(doc, n)) return no_tier(doc, n);
  std::erase_if(doc.tiers, [&](const tier& t) {
    return std::find(names.begin(), names.end(), t.name) == names.end();
  });
  return {};
}

std::vector<diagnostic> drop_tier(document& doc, const std::string& name) {
  if (!find_tier(doc, name)) return no_tier(doc, name);
  std::erase_if(doc.tiers, [&](const tier& t) { return t.name == name; });
  return {};
}

std::vector<diagnostic> rename_tier(document& doc, const std::string& from, const std::string& to) {
  if (!find_tier(doc, from)) return no_tier(doc, from);
  if (from != to && find_tier(doc, to))
    return refuse("edit.exists", "a tier " + quote_name(to) + " exists already");
  for (tier& t : doc.tiers) {
    if (t.name == from) t.name = to;
    if (t.parent && t.parent->tier == from) t.parent->tier = to;
  }
  return {};
}

}  // namespace tiers
