// The HTML report's data: what its script draws, written as JSON.
#include "report_data.hpp"

#include <algorithm>
#include <limits>
#include <numeric>

#include "detail/exact.hpp"
#include "detail/json_text.hpp"
#include "detail/problem_json.hpp"

namespace tiers::detail {
namespace {

// Labels show a few dozen characters and tooltips a few lines: longer texts are cut (at a
// character boundary) so that a file of long transcripts does not make a heavy page.
constexpr std::size_t label_bytes = 300;

std::string_view cut(std::string_view text, bool& was_cut) {
  was_cut = text.size() > label_bytes;
  if (!was_cut) return text;
  std::size_t n = label_bytes;
  while (n > 0 && (static_cast<unsigned char>(text[n]) & 0xC0) == 0x80)
    --n;
  return text.substr(0, n);
}

std::string_view name_of(agreement_view::verdict v) {
  switch (v) {
    case agreement_view::verdict::agree:
      return "agree";
    case agreement_view::verdict::differ:
      return "differ";
    case agreement_view::verdict::only_reference:
      return "only-reference";
    case agreement_view::verdict::only_candidate:
      return "only-candidate";
  }
  return "";
}

// `[start, end, …]`: the tuples the script reads, times in seconds.
void begin_span(json_writer& j, time_ns a, time_ns b) {
  j.begin_array();
  j.seconds(a);
  j.seconds(b);
}

void write_tier(json_writer& j, const tier& t) {
  j.begin_object(true);
  j.string("name", t.name);
  j.string("kind", to_string(t.kind));
  if (t.source)
    j.string("source", to_string(t.source->kind));
  else
    j.key("source").null();
  // The script finds what is in view by binary search on the starts.
  std::vector<std::size_t> order(t.annotations.size());
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
    return t.annotations[a].start < t.annotations[b].start;
  });
  j.key("annotations").begin_array(true);
  for (const std::size_t k : order) {
    const annotation& a = t.annotations[k];
    begin_span(j, a.start, a.end);
    bool was_cut = false;
    const std::string_view text = cut(a.text, was_cut);
    j.string(was_cut ? std::string(text) + "…" : std::string(text));
    if (a.confidence)
      j.number(*a.confidence);
    else
      j.null();
    j.end_array();
  }
  j.end_array();
  j.end_object();
}

void write_problem(json_writer& j, const problem& p) {
  j.begin_object();
  detail::write_problem_head(j, p);
  // The script draws a problem from start to end: a moment is a span of none.
  if (p.end || p.start) j.seconds("end", p.end ? *p.end : *p.start);
  j.end_object();
}

// The time the lanes show when zoomed out: the media's, widened to whatever is drawn.
std::pair<time_ns, time_ns> span_of(const report_file& f, const agreement_view* agreement) {
  time_ns lo = 0, hi = f.doc->media.duration.value_or(0);
  for (const tier& t : f.doc->tiers)
    for (const annotation& a : t.annotations) {
      lo = std::min(lo, std::min(a.start, a.end));
      hi = std::max(hi, std::max(a.start, a.end));
    }
  if (f.check->lag)
    for (const lag_report::cue& c : f.check->lag->cues)
      hi = std::max(hi, c.start);
  if (agreement && !agreement->stretches.empty())
    hi = std::max(hi, agreement->stretches.back().end);
  return {lo, hi};
}

void write_file(json_writer& j, const report_file& f, const agreement_view* agreement,
                const html_report_options& o) {
  j.begin_object(true);
  j.string("path", f.check->path);
  j.boolean("drawn", f.doc != nullptr);
  if (f.doc) {
    const auto [lo, hi] = span_of(f, agreement);
    begin_span(j.key("span"), lo, hi);
    j.end_array();
    j.key("tiers").begin_array(true);
    for (const tier& t : f.doc->tiers)
      write_tier(j, t);
    j.end_array();
  }
  j.key("problems").begin_array(true);
  for (const problem& p : f.check->problems)
    write_problem(j, p);
  j.end_array();
  j.key("lag");
  if (f.doc && f.check->lag) {
    j.begin_object();
    j.seconds("late", o.max_late);
    j.seconds("early", o.max_early);
    j.key("points").begin_array();
    for (const lag_report::cue& c : f.check->lag->cues) {
      if (!c.lag) continue;
      begin_span(j, c.start, *c.lag);
      if (c.id) j.string(*c.id);
      j.end_array();
    }
    j.end_array();
    j.end_object();
  } else {
    j.null();
  }
  j.key("agreement");
  if (f.doc && agreement) {
    j.begin_object();
    j.key("stretches").begin_array(true);
    for (const agreement_view::stretch& s : agreement->stretches) {
      begin_span(j, s.start, s.end);
      j.string(name_of(s.what));
      j.end_array();
    }
    j.end_array();
    j.end_object();
  } else {
    j.null();
  }
  j.end_object();
}

}  // namespace

agreement_view compare_for_report(const document& doc, const tier& reference, const tier& candidate,
                                  const html_report_options& options) {
  const time_grid grid = grid_over(doc.media.duration, {&reference, &candidate}, options.step,
                                   options.step_frames, options.rate);
  agreement_view view;
  view.figures = compare_tiers(reference, candidate, grid, options.matching);
  const framed_tiers framed = frame_labels({&reference, &candidate}, grid);
  using verdict = agreement_view::verdict;
  framed.each_stretch(
      [&](std::uint64_t from, std::uint64_t to, const std::vector<std::int32_t>& l) {
        const std::int32_t ref = l[0], cand = l[1];
        if (ref < 0 && cand < 0) return;
        const verdict what = ref < 0       ? verdict::only_candidate
                             : cand < 0    ? verdict::only_reference
                             : ref == cand ? verdict::agree
                                           : verdict::differ;
        const time_ns start = grid.frame_start(from), end = grid.frame_start(to);
        if (!view.stretches.empty() && view.stretches.back().what == what &&
            view.stretches.back().end == start)
          view.stretches.back().end = end;
        else
          view.stretches.push_back({start, end, what});
      });
  return view;
}

void write_report_data(std::span<const report_file> files,
                       std::span<const std::optional<agreement_view>> agreements,
                       const html_report_options& options, byte_sink& out) {
  json_writer j(out);
  j.begin_object(true);
  j.key("files").begin_array(true);
  for (std::size_t k = 0; k < files.size(); ++k)
    write_file(j, files[k], agreements[k] ? &*agreements[k] : nullptr, options);
  j.end_array();
  j.end_object();
}

}  // namespace tiers::detail
