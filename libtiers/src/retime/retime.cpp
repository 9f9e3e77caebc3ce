// Re-timing captions onto words (retime.hpp): alignment, borrowed shifts, then the caption
// rules with the smallest moves.
#include "tiers/retime.hpp"

#include <algorithm>
#include <numeric>

#include "tiers/detail/exact.hpp"

namespace tiers {
namespace {

using detail::rounding;

}  // namespace

retime_result retime_captions(const tier& captions, const tier& words,
                              const retime_options& options) {
  const caption_alignment al = align_captions(captions, words, options.window);
  const std::vector<annotation>& cues = captions.annotations;
  // The rules are applied in steps of the output's grid, so that every sum and split below
  // stays on it; times return to nanoseconds at the end.
  const rational grid = options.grid;
  auto steps = [&](time_ns t, rounding how = rounding::nearest) {
    return static_cast<time_ns>(detail::to_steps(t, grid, how));
  };
  auto nanoseconds = [&](time_ns s) { return static_cast<time_ns>(detail::from_steps(s, grid)); };
  auto seconds_text = [&](time_ns s) { return format_seconds(nanoseconds(s)) + " s"; };
  std::vector<std::size_t> order(cues.size());
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::stable_sort(order.begin(), order.end(),
                   [&](std::size_t a, std::size_t b) { return cues[a].start < cues[b].start; });

  std::vector<cue_move> moves;
  for (std::size_t k : order) {
    cue_move m;
    m.cue = k;
    // In steps until the end (old_* too, for the shifts neighbours borrow).
    m.old_start = m.new_start = steps(cues[k].start);
    m.old_end = m.new_end = steps(cues[k].end);
    const cue_alignment& a = al.cues[k];
    m.words = a.matched;
    if (a.first_word && a.last_word) {
      m.how = cue_move::basis::words;
      m.new_start = steps(words.annotations[*a.first_word].start - options.lead_in);
      m.new_end = std::max(steps(words.annotations[*a.last_word].end + options.hold), m.new_start);
    }
    moves.push_back(m);
  }
  // Cues without a matched word take the median shift of the nearest aligned cues around them.
  for (std::size_t i = 0; i < moves.size(); ++i) {
    if (moves[i].how != cue_move::basis::unchanged) continue;
    std::vector<time_ns> shifts;
    for (std::size_t j = i, n = 0; j-- > 0 && n < options.neighbours;)
      if (moves[j].how == cue_move::basis::words) {
        shifts.push_back(moves[j].new_start - moves[j].old_start);
        ++n;
      }
    for (std::size_t j = i + 1, n = 0; j < moves.size() && n < options.neighbours; ++j)
      if (moves[j].how == cue_move::basis::words) {
        shifts.push_back(moves[j].new_start - moves[j].old_start);
        ++n;
      }
    if (shifts.empty()) {
      moves[i].unfixed = "no word matched, and no neighbour was aligned to borrow a shift from";
      continue;
    }
    const time_ns shift = quantile(shifts, 0.5);
    moves[i].how = cue_move::basis::neighbours;
    moves[i].new_start += shift;
    moves[i].new_end += shift;
  }
  std::stable_sort(moves.begin(), moves.end(),
                   [](const cue_move& a, const cue_move& b) { return a.new_start < b.new_start; });

  // Minimums round up: a rule met on the grid is met in nanoseconds too.
  const time_ns gap = steps(options.min_gap, rounding::up);
  const time_ns shortest = steps(options.min_duration, rounding::up);
  auto note = [](std::string& into, const std::string& what) {
    into += (into.empty() ? "" : "; ") + what;
  };
  // Too short: grow into free time, later first, then earlier.
  for (std::size_t i = 0; i < moves.size(); ++i) {
    cue_move& m = moves[i];
    const time_ns need = shortest - (m.new_end - m.new_start);
    if (need <= 0) continue;
    const time_ns room_after =
        i + 1 < moves.size() ? moves[i + 1].new_start - gap - m.new_end : need;
    const time_ns later = std::clamp<time_ns>(room_after, 0, need);
    const time_ns room_before = i > 0 ? m.new_start - (moves[i - 1].new_end + gap) : need - later;
    const time_ns earlier = std::clamp<time_ns>(room_before, 0, need - later);
    m.new_end += later;
    m.new_start -= earlier;
    if (later + earlier > 0)
      note(m.adjusted,
           "lengthened by " + seconds_text(later + earlier) + " to the minimum duration");
    if (later + earlier < need)
      note(m.unfixed,
           "shorter than " + seconds_text(shortest) + ": its neighbours leave no more room");
  }
  // Too close: move the shared boundary, split evenly as far as minimum durations allow; what
  // remains moves the later cue as a whole (and may pass on to the next pair).
  for (std::size_t i = 0; i + 1 < moves.size(); ++i) {
    cue_move& a = moves[i];
    cue_move& b = moves[i + 1];
    const time_ns need = a.new_end + gap - b.new_start;
    if (need <= 0) continue;
    const time_ns slack_a = std::max<time_ns>(0, a.new_end - a.new_start - shortest);
    const time_ns slack_b = std::max<time_ns>(0, b.new_end - b.new_start - shortest);
    time_ns from_a = std::min(need / 2, slack_a);
    time_ns from_b = std::min(need - from_a, slack_b);
    from_a = std::min(need - from_b, slack_a);
    const time_ns rest = need - from_a - from_b;
    a.new_end -= from_a;
    b.new_start += from_b;
    b.new_start += rest;
    b.new_end += rest;
    if (from_a > 0) note(a.adjusted, "ends " + seconds_text(from_a) + " earlier to keep the gap");
    if (from_b > 0) note(b.adjusted, "starts " + seconds_text(from_b) + " later to keep the gap");
    if (rest > 0) note(b.adjusted, "moved " + seconds_text(rest) + " later to keep the gap");
  }

  retime_result out;
  out.captions = captions;
  out.captions.annotations.clear();
  for (cue_move& m : moves) {
    annotation a = cues[m.cue];
    m.old_start = a.start;
    m.old_end = a.end;
    a.start = m.new_start = nanoseconds(m.new_start);
    a.end = m.new_end = nanoseconds(m.new_end);
    out.captions.annotations.push_back(std::move(a));
  }
  out.moves = std::move(moves);
  return out;
}

void move_children(document& doc, const std::string& captions, const retime_result& r) {
  std::vector<const cue_move*> by_old(r.moves.size());
  for (std::size_t k = 0; k < r.moves.size(); ++k)
    by_old[k] = &r.moves[k];
  std::stable_sort(by_old.begin(), by_old.end(), [](const cue_move* a, const cue_move* b) {
    return a->old_start < b->old_start;
  });
  for (tier& t : doc.tiers) {
    if (!t.parent || t.parent->tier != captions || t.parent->rel != relation::within) continue;
    for (annotation& a : t.annotations) {
      auto it = std::upper_bound(by_old.begin(), by_old.end(), a.start,
                                 [](time_ns v, const cue_move* m) { return v < m->old_start; });
      if (it == by_old.begin()) continue;
      const cue_move& m = **(it - 1);
      if (a.end > m.old_end) continue;  // not inside this cue: left as it is
      // A child that began or ended with its cue still does (as the first and last of a
      // cue's inline words do); the rest move by the cue's start shift, kept inside it.
      const time_ns shift = m.new_start - m.old_start;
      const bool to_end = a.end == m.old_end;
      a.start = a.start == m.old_start ? m.new_start
                                       : std::clamp(a.start + shift, m.new_start, m.new_end);
      a.end = to_end ? m.new_end : std::clamp(a.end + shift, a.start, m.new_end);
    }
  }
}

}  // namespace tiers
