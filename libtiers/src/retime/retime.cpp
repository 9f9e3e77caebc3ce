// Re-timing captions onto words (retime.hpp): alignment, borrowed shifts, then the caption
// rules with the smallest moves.
#include "tiers/retime.hpp"

#include <algorithm>
#include <cmath>
#include <numeric>

#include "detail/exact.hpp"
#include "tiers/text.hpp"

namespace tiers {
namespace {

using detail::i128;
using detail::rounding;

// A cue's move while the rules are applied: in steps of the output's grid, and in 128 bits, so
// that no sum of times wraps; whether the result is a time at all is decided at the end.
struct working {
  cue_move move;
  i128 old_start = 0, new_start = 0, new_end = 0;
  i128 least = 0;         // the least duration, in steps: the minimum, or longer to be read in time
  bool by_speed = false;  // the reading speed sets `least`, not the minimum duration
};

// The characters a reader reads, as caption.cps counts them: grapheme clusters, line by line.
std::size_t reading_characters(std::string_view text) {
  std::size_t chars = 0;
  for (std::size_t from = 0; from <= text.size();) {
    const std::size_t end = std::min(text.find('\n', from), text.size());
    chars += count_graphemes(text.substr(from, end - from));
    from = end + 1;
  }
  return chars;
}

time_ns saturated(i128 v) {
  return static_cast<time_ns>(std::clamp(v, -detail::time_max - 1, detail::time_max));
}

void note(std::string& into, const std::string& what) {
  into += (into.empty() ? "" : "; ") + what;
}

// The rules are applied in steps of the output's grid, so that every sum and split stays on
// it; times return to nanoseconds at the end. One step of the re-timing per function.
struct retimer {
  const retime_options& options;
  i128 gap = 0, shortest = 0;  // the minimums, in steps

  explicit retimer(const retime_options& o) : options(o) {
    // Minimums round up: a rule met on the grid is met in nanoseconds too.
    gap = steps(options.min_gap, rounding::up);
    shortest = steps(options.min_duration, rounding::up);
  }
  // t is a time or a time plus a lead or hold: within twice the range, so the product fits.
  i128 steps(i128 t, rounding how = rounding::nearest) const {
    return detail::to_steps(t, options.grid, how);
  }
  i128 nanoseconds(i128 s) const { return detail::from_steps(s, options.grid); }
  std::string seconds_text(i128 s) const {
    return format_seconds(saturated(nanoseconds(s))) + " s";
  }

  // Cues in start order, each moved onto its first and last matched word where it has them.
  std::vector<working> onto_words(const tier& captions, const tier& words) const {
    const caption_alignment al = align_captions(captions, words, options.window);
    const std::vector<annotation>& cues = captions.annotations;
    std::vector<std::size_t> order(cues.size());
    std::iota(order.begin(), order.end(), std::size_t{0});
    std::stable_sort(order.begin(), order.end(),
                     [&](std::size_t a, std::size_t b) { return cues[a].start < cues[b].start; });
    std::vector<working> moves;
    for (std::size_t k : order) {
      working w;
      cue_move& m = w.move;
      m.cue = k;
      w.old_start = w.new_start = steps(cues[k].start);
      w.new_end = steps(cues[k].end);
      const cue_alignment& a = al.cues[k];
      m.words = a.matched;
      w.least = shortest;
      if (options.max_cps > 0) {
        // At most max_cps characters a second: at least chars / max_cps seconds, rounded up.
        const double ns = std::ceil(static_cast<double>(reading_characters(cues[k].text)) * 1e9 /
                                    options.max_cps);
        const i128 needed = steps(static_cast<i128>(ns), rounding::up);
        if (needed > w.least) {
          w.least = needed;
          w.by_speed = true;
        }
      }
      if (cues[k].end < cues[k].start) {
        m.how = cue_move::basis::reversed;
        m.unfixed =
            "it ends before it starts (time.reversed): left as it was; its times need "
            "fixing first";
      } else if (a.first_word && a.last_word) {
        m.how = cue_move::basis::words;
        w.new_start =
            steps(static_cast<i128>(words.annotations[*a.first_word].start) - options.lead_in);
        w.new_end =
            std::max(steps(static_cast<i128>(words.annotations[*a.last_word].end) + options.hold),
                     w.new_start);
      }
      moves.push_back(w);
    }
    return moves;
  }

  // Cues without a matched word take the median shift of the nearest aligned cues around them.
  void borrow_shifts(std::vector<working>& moves) const {
    for (std::size_t i = 0; i < moves.size(); ++i) {
      if (moves[i].move.how != cue_move::basis::unchanged) continue;
      std::vector<time_ns> shifts;
      auto borrow = [&](const working& w) {
        if (w.move.how != cue_move::basis::words) return false;
        shifts.push_back(saturated(w.new_start - w.old_start));
        return true;
      };
      for (std::size_t j = i, n = 0; j-- > 0 && n < options.neighbours;)
        n += borrow(moves[j]);
      for (std::size_t j = i + 1, n = 0; j < moves.size() && n < options.neighbours; ++j)
        n += borrow(moves[j]);
      if (shifts.empty()) {
        moves[i].move.unfixed =
            "no word matched, and no neighbour was aligned to borrow a shift from";
        continue;
      }
      const time_ns shift = quantile(shifts, 0.5);  // added in 128 bits
      moves[i].move.how = cue_move::basis::neighbours;
      moves[i].new_start += shift;
      moves[i].new_end += shift;
    }
  }

  // Too short: grow into free time, later first, then earlier.
  void lengthen(std::vector<working>& moves) const {
    for (std::size_t i = 0; i < moves.size(); ++i) {
      working& m = moves[i];
      const i128 need = m.least - (m.new_end - m.new_start);
      if (need <= 0) continue;
      const i128 room_after =
          i + 1 < moves.size() ? moves[i + 1].new_start - gap - m.new_end : need;
      const i128 later = std::clamp<i128>(room_after, 0, need);
      const i128 room_before = i > 0 ? m.new_start - (moves[i - 1].new_end + gap) : need - later;
      const i128 earlier = std::clamp<i128>(room_before, 0, need - later);
      m.new_end += later;
      m.new_start -= earlier;
      if (later + earlier > 0)
        note(m.move.adjusted, "lengthened by " + seconds_text(later + earlier) +
                                  (m.by_speed ? " to be read at the reading speed (caption.cps)"
                                              : " to the minimum duration"));
      if (later + earlier < need)
        note(m.move.unfixed, m.by_speed ? "too fast to read (caption.cps): it needs " +
                                              seconds_text(m.least) +
                                              ", and its neighbours leave no more room"
                                        : "shorter than " + seconds_text(shortest) +
                                              ": its neighbours leave no more room");
    }
  }

  // Too close: move the shared boundary, split evenly as far as minimum durations allow; what
  // remains moves the later cue as a whole (and may pass on to the next pair).
  void keep_gaps(std::vector<working>& moves) const {
    for (std::size_t i = 0; i + 1 < moves.size(); ++i) {
      working& a = moves[i];
      working& b = moves[i + 1];
      const i128 need = a.new_end + gap - b.new_start;
      if (need <= 0) continue;
      const i128 slack_a = std::max<i128>(0, a.new_end - a.new_start - a.least);
      const i128 slack_b = std::max<i128>(0, b.new_end - b.new_start - b.least);
      i128 from_a = std::min(need / 2, slack_a);
      i128 from_b = std::min(need - from_a, slack_b);
      from_a = std::min(need - from_b, slack_a);
      const i128 rest = need - from_a - from_b;
      a.new_end -= from_a;
      b.new_start += from_b;
      b.new_start += rest;
      b.new_end += rest;
      if (from_a > 0)
        note(a.move.adjusted, "ends " + seconds_text(from_a) + " earlier to keep the gap");
      if (from_b > 0)
        note(b.move.adjusted, "starts " + seconds_text(from_b) + " later to keep the gap");
      if (rest > 0) note(b.move.adjusted, "moved " + seconds_text(rest) + " later to keep the gap");
    }
  }

  // Back to nanoseconds: the re-timed tier and what became of each cue.
  retime_result result(const tier& captions, std::vector<working>& moves) const {
    retime_result out;
    out.captions = captions;
    out.captions.annotations.clear();
    for (working& w : moves) {
      cue_move& m = w.move;
      annotation a = captions.annotations[m.cue];
      m.old_start = a.start;
      m.old_end = a.end;
      const i128 start = nanoseconds(w.new_start), end = nanoseconds(w.new_end);
      if (m.how == cue_move::basis::reversed) {
        // Its times stay exactly as they were, off the grid or not.
      } else if (start < -detail::time_max - 1 || end > detail::time_max) {
        // A sum of times beyond the model's range (time.range): the cue keeps its times.
        m.how = cue_move::basis::unchanged;
        m.adjusted.clear();
        note(m.unfixed,
             "its new times would lie beyond the range of times (time.range): left as it was");
      } else {
        a.start = static_cast<time_ns>(start);
        a.end = static_cast<time_ns>(end);
      }
      m.new_start = a.start;
      m.new_end = a.end;
      out.captions.annotations.push_back(std::move(a));
      out.moves.push_back(std::move(m));
    }
    return out;
  }
};

}  // namespace

retime_result retime_captions(const tier& captions, const tier& words,
                              const retime_options& options) {
  const retimer r(options);
  std::vector<working> moves = r.onto_words(captions, words);
  // Reversed cues take no part: no shift is borrowed from them, no rule moves them.
  std::vector<working> reversed;
  for (const working& w : moves)
    if (w.move.how == cue_move::basis::reversed) reversed.push_back(w);
  std::erase_if(moves, [](const working& w) { return w.move.how == cue_move::basis::reversed; });
  r.borrow_shifts(moves);
  std::stable_sort(moves.begin(), moves.end(),
                   [](const working& a, const working& b) { return a.new_start < b.new_start; });
  r.lengthen(moves);
  r.keep_gaps(moves);
  // Back among the others, by start, as they were.
  for (const working& w : reversed)
    moves.insert(std::upper_bound(
                     moves.begin(), moves.end(), w,
                     [](const working& a, const working& b) { return a.new_start < b.new_start; }),
                 w);
  return r.result(captions, moves);
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
      const i128 shift = static_cast<i128>(m.new_start) - m.old_start;
      const bool to_end = a.end == m.old_end;
      a.start =
          a.start == m.old_start
              ? m.new_start
              : static_cast<time_ns>(std::clamp<i128>(a.start + shift, m.new_start, m.new_end));
      a.end = to_end ? m.new_end
                     : static_cast<time_ns>(std::clamp<i128>(a.end + shift, a.start, m.new_end));
    }
  }
}

}  // namespace tiers
