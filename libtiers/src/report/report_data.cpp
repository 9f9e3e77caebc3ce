// The HTML report's data: what its script draws, written as JSON.
#include "report_data.hpp"

#include <algorithm>
#include <limits>
#include <numeric>

#include "detail/exact.hpp"
#include "detail/json_text.hpp"

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

// `[item, item, …]`, `sep` between the items, each written by `each`.
template <class Range, class Each>
void write_array(byte_sink& out, const Range& items, std::string_view sep, Each each) {
  out.put('[');
  std::string_view between;
  for (const auto& item : items) {
    out.write(between);
    between = sep;
    each(item);
  }
  out.put(']');
}

// Two times as `a, b` (seconds), for the `[start, end, …]` tuples the script reads.
void write_two_times(byte_sink& out, time_ns a, time_ns b) {
  write_json_seconds(out, a);
  out.write(", ");
  write_json_seconds(out, b);
}

void write_tier(byte_sink& out, const tier& t) {
  out.write("{\"name\": ");
  write_json_string(out, t.name);
  out.write(", \"kind\": \"");
  out.write(to_string(t.kind));
  out.write("\", \"source\": ");
  if (t.source) {
    out.put('"');
    out.write(to_string(t.source->kind));
    out.put('"');
  } else {
    out.write("null");
  }
  out.write(", \"annotations\": ");
  // The script finds what is in view by binary search on the starts.
  std::vector<std::size_t> order(t.annotations.size());
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
    return t.annotations[a].start < t.annotations[b].start;
  });
  write_array(out, order, ",\n", [&](std::size_t k) {
    const annotation& a = t.annotations[k];
    out.put('[');
    write_two_times(out, a.start, a.end);
    out.write(", ");
    bool was_cut = false;
    const std::string_view text = cut(a.text, was_cut);
    write_json_string(out, was_cut ? std::string(text) + "…" : std::string(text));
    out.write(", ");
    if (a.confidence)
      write_json_double(out, *a.confidence);
    else
      out.write("null");
    out.put(']');
  });
  out.put('}');
}

void write_problem(byte_sink& out, const problem& p) {
  out.put('{');
  json_members m(out);
  m.string("rule", p.diag.code);
  m.string("severity", to_string(p.diag.level));
  m.string("message", p.diag.message);
  if (!p.tier.empty()) m.string("tier", p.tier);
  if (p.start) m.seconds("start", *p.start);
  if (p.end || p.start) m.seconds("end", p.end ? *p.end : *p.start);
  out.put('}');
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
    for (const lag_report::point& p : f.check->lag->points)
      hi = std::max(hi, p.at);
  if (agreement && !agreement->stretches.empty())
    hi = std::max(hi, agreement->stretches.back().end);
  return {lo, hi};
}

void write_file(byte_sink& out, const report_file& f, const agreement_view* agreement,
                const html_report_options& o) {
  out.write("{\"path\": ");
  write_json_string(out, f.check->path);
  out.write(", \"drawn\": ");
  out.write(f.doc ? "true" : "false");
  if (f.doc) {
    const auto [lo, hi] = span_of(f, agreement);
    out.write(", \"span\": [");
    write_two_times(out, lo, hi);
    out.write("],\n\"tiers\": ");
    write_array(out, f.doc->tiers, ",\n", [&](const tier& t) { write_tier(out, t); });
  }
  out.write(",\n\"problems\": ");
  write_array(out, f.check->problems, ",\n", [&](const problem& p) { write_problem(out, p); });
  out.write(",\n\"lag\": ");
  if (f.doc && f.check->lag) {
    out.write("{\"late\": ");
    write_json_seconds(out, o.max_late);
    out.write(", \"early\": ");
    write_json_seconds(out, o.max_early);
    out.write(", \"points\": ");
    write_array(out, f.check->lag->points, ", ", [&](const lag_report::point& p) {
      out.put('[');
      write_two_times(out, p.at, p.lag);
      out.put(']');
    });
    out.put('}');
  } else {
    out.write("null");
  }
  out.write(",\n\"agreement\": ");
  if (f.doc && agreement) {
    out.write("{\"stretches\": ");
    write_array(out, agreement->stretches, ",\n", [&](const agreement_view::stretch& s) {
      out.put('[');
      write_two_times(out, s.start, s.end);
      out.write(", \"");
      out.write(name_of(s.what));
      out.write("\"]");
    });
    out.put('}');
  } else {
    out.write("null");
  }
  out.put('}');
}

// Where frame k starts; the last frame may run past the grid's end, so past the model's range.
time_ns frame_start(const time_grid& grid, std::uint64_t k) {
  const i128 at = grid.start + static_cast<i128>(k) * grid.step;
  return static_cast<time_ns>(std::min(at, time_max));
}

}  // namespace

agreement_view compare_for_report(const document& doc, const tier& reference, const tier& candidate,
                                  const html_report_options& options) {
  time_grid grid;
  grid.step = options.step;
  grid.end = doc.media.duration.value_or(0);
  for (const tier* t : {&reference, &candidate})
    for (const annotation& a : t->annotations) {
      grid.start = std::min(grid.start, a.start);
      grid.end = std::max({grid.end, a.end, a.start + 1});
    }
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
        const time_ns start = frame_start(grid, from), end = frame_start(grid, to);
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
  out.write("{\"files\": [\n");
  for (std::size_t k = 0; k < files.size(); ++k) {
    if (k > 0) out.write(",\n");
    write_file(out, files[k], agreements[k] ? &*agreements[k] : nullptr, options);
  }
  out.write("\n]}");
}

}  // namespace tiers::detail
