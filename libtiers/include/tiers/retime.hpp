// Re-timing caption cues onto word timings: each cue moves onto its words, cues without a
// matched word follow their neighbours, then the caption rules are restored with the smallest
// moves.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "tiers/diagnostic.hpp"
#include "tiers/lag.hpp"
#include "tiers/model.hpp"
#include "tiers/profile.hpp"

namespace tiers {

struct retime_options {
  time_ns lead_in = 0;                 ///< a re-timed cue starts this long before its first word
  time_ns hold = 0;                    ///< and ends this long after its last word
  time_ns min_gap = 80'000'000;        ///< between consecutive cues (2 frames at 25 fps)
  time_ns min_duration = 833'333'333;  ///< of a cue (5/6 s)
  /// caption.cps: a cue lasts at least its characters (grapheme clusters, line breaks left
  /// out, as the check counts them) over this many a second; 0 for no limit.
  double max_cps = 20;
  lag_window window;           ///< where a cue looks for its words
  std::size_t neighbours = 3;  ///< cues on each side whose shift an unmatched cue borrows
  /// The time grid of the output, in steps per second (WebVTT: 1000, milliseconds; the
  /// nanosecond by default). New times are placed on it: word times to the nearest step, the
  /// minimum gap and duration rounded up to whole steps, so that a writer that holds only
  /// this grid neither rounds a time nor undoes a rule the re-timing met.
  rational grid{ns_per_second, 1};
};

/// What happened to one cue.
struct cue_move {
  std::size_t cue = 0;  ///< index in the caption tier
  time_ns old_start = 0, old_end = 0, new_start = 0, new_end = 0;
  enum class basis : std::uint8_t {
    words,       ///< onto its matched words
    neighbours,  ///< no word matched: shifted by the median shift of its neighbours
    unchanged,   ///< no word matched and no neighbour to follow
    reversed,    ///< it ended before it started (time.reversed): left as it was, a problem
  } how = basis::unchanged;
  std::size_t words = 0;  ///< caption words matched
  std::string adjusted;   ///< how the caption rules moved it further, if they did
  std::string unfixed;    ///< why a rule could not be met, if one could not
};

struct retime_result {
  tier captions;                ///< the re-timed tier, in start-time order
  std::vector<cue_move> moves;  ///< one per cue, in the new order
};

/// Re-times `captions` onto `words` (aligned as align_captions does). The caption rules are then
/// applied in start-time order: a cue shorter than `min_duration`, or too short to be read at
/// `max_cps`, grows into free time (later, then earlier); where consecutive cues overlap or
/// come closer than `min_gap`, the boundary between them moves, split evenly between the two
/// as far as their least durations allow, and only what remains moves the later cue as a
/// whole. Every new time lies on `grid`. A cue that ends before it starts is not re-timed or
/// "repaired" — its times are wrong, and so is any guess at them: it stays as it was, is
/// reported (`reversed`, with why in `unfixed`) and takes no part in the rules.
retime_result retime_captions(const tier& captions, const tier& words,
                              const retime_options& options = {});

/// "words", "neighbours", "unchanged", "reversed".
std::string_view to_string(cue_move::basis basis);

/// How many cues moved on what basis, and how many are left with a problem (`unfixed`).
struct retime_counts {
  std::size_t by_words = 0, by_neighbours = 0, unchanged = 0, reversed = 0, unfixed = 0;
};
retime_counts count_moves(const retime_result& r);

/// The re-timing as JSON: one object per cue (`before` is the caption tier as it was, for the
/// cues' ids) and a summary of how many moved on what basis (docs/retime.md).
std::string retime_report_json(const retime_result& r, const tier& before);

/// Records in `doc`'s metadata that and how its caption tier was re-timed: `retime:captions`,
/// `retime:words` (the tier, and its file when another), `retime:lead-in`, `retime:hold`,
/// `retime:min-gap`, `retime:min-duration` (durations as `0.12s`), `retime:max-cps`, and
/// `retime:cues` (how many moved on what basis, and how many are left with a problem).
void record_retime(document& doc, const std::string& captions, const std::string& words,
                   const retime_options& options, const retime_result& r);

/// Carries the child tiers of `captions` (relation `within`, such as WebVTT inline word
/// timestamps) along with their cues: an annotation inside a cue's old span moves by the cue's
/// start shift, kept inside the cue's new span.
void move_children(document& doc, const std::string& captions, const retime_result& r);

/// How a document's captions are re-timed, as options give them (`tiers retime`, Python's
/// tiers.retime): durations as `0.5s`, `250ms` or `2f`; what is not given comes from the
/// profile's caption rules.
struct retime_settings {
  std::string captions;  ///< the caption tier; empty: the profile's, else the first tier
  std::string lead_in = "0", hold = "0";
  std::string min_gap, min_duration;  ///< empty: the profile's
  std::optional<double> max_cps;      ///< empty: the profile's (0 when it turns caption.cps off)
  std::string rate;  ///< frames count at the document's rate, else at this one (--rate)
};

/// Where the word timings are: a tier of the document itself (`doc` null; `tier` its name,
/// else the only tier, else "words"), or a tier of another document read from `file`.
struct retime_words {
  const document* doc = nullptr;
  std::string file;
  std::optional<std::string> tier;
};

/// A re-timing done: what moved, and the caption tier as it was (for the cues' ids).
struct retimed {
  retime_result result;
  tier before;
};

/// Re-times the caption tier of `doc` (read from `file`) in place onto the words, as
/// retime_captions does with the settings and the profile's rules; its child tiers move along
/// (move_children). New times lie on `grid` (the output format's); with `record`, the document's
/// metadata says how it was re-timed (record_retime). A tier that is not there is an error
/// (`retime.tier`, naming the tiers there are); a cue that ends before it starts a warning
/// (`retime.reversed`). Throws usage_error on bad settings.
result<retimed> retime_document(document& doc, const std::string& file, const profile& p,
                                const retime_settings& settings, const retime_words& words,
                                rational grid = {ns_per_second, 1}, bool record = true);

}  // namespace tiers
