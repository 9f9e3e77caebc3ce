// Agreement: how far a candidate tier (a machine's, or a second annotator's) agrees with a
// reference tier, frame by frame and segment by segment, and agreement among several
// annotators (Krippendorff's alpha).
#pragma once

#include <algorithm>
#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "tiers/diagnostic.hpp"
#include "tiers/model.hpp"
#include "tiers/names.hpp"
#include "tiers/sink.hpp"
#include "tiers/time.hpp"

namespace tiers {

/// Frames of `step` from `start` to `end` (the last frame may run past `end`).
struct time_grid {
  time_ns start = 0;
  time_ns end = 0;
  time_ns step = 10'000'000;  ///< 10 ms; rounded to the nanosecond when counted in frames
  /// A step counted in video frames (`--step 1f`): `step_frames` frames at `rate`. Frame k of
  /// the grid then starts exactly k·step_frames·den/num seconds after `start`, so that a grid
  /// of 1f at 30000/1001 stays on the video's frames however long it runs.
  std::int64_t step_frames = 0;
  rational rate{};
  /// What the grid spans: the media's duration, or the union of the compared tiers' spans.
  enum class basis : std::uint8_t { media, tiers };
  static constexpr enum_name<basis> basis_names[]{{basis::media, "media"}, {basis::tiers, "tiers"}};
  basis spans = basis::tiers;

  std::uint64_t frames() const;
  /// Where frame k starts (held at the end of the time range).
  time_ns frame_start(std::uint64_t k) const;
};

/// The grid a comparison of `tiers` uses: from 0 to the media's duration when it is known
/// (`media_duration`), else over the union of the tiers' spans — never over what a filter
/// left of them, so that the frame count does not move with a confidence threshold.
time_grid grid_over(std::optional<time_ns> media_duration, const std::vector<const tier*>& tiers,
                    time_ns step, std::int64_t step_frames = 0, rational rate = {});

/// The label of every frame of `grid` in each tier, as indices into `labels` (-1: no label),
/// kept as runs of frames with one label, so that memory and work follow the annotations, not
/// the time they span. A frame takes the label of the annotation that covers its middle (of
/// the one starting last, where several do); an instant annotation labels the frame it falls in.
struct frame_run {
  std::uint64_t from = 0, to = 0;  ///< frames [from, to)
  std::int32_t label = -1;
  friend bool operator==(const frame_run&, const frame_run&) = default;
};
struct framed_tiers {
  std::vector<std::string> labels;
  std::uint64_t frames = 0;                  ///< on the grid
  std::vector<std::vector<frame_run>> runs;  ///< one list per tier: labelled runs, in order
  /// Calls `f(from, to, labels)` for each stretch of frames in which no tier's label changes,
  /// in order, covering [0, frames); `labels` has one entry per tier.
  template <class F>
  void each_stretch(F&& f) const;
};
framed_tiers frame_labels(const std::vector<const tier*>& tiers, const time_grid& grid);

template <class F>
void framed_tiers::each_stretch(F&& f) const {
  std::vector<std::size_t> next(runs.size(), 0);
  std::vector<std::int32_t> now(runs.size(), -1);
  for (std::uint64_t at = 0; at < frames;) {
    std::uint64_t until = frames;
    for (std::size_t t = 0; t < runs.size(); ++t) {
      const std::vector<frame_run>& r = runs[t];
      while (next[t] < r.size() && r[next[t]].to <= at)
        ++next[t];
      const bool inside = next[t] < r.size() && r[next[t]].from <= at;
      now[t] = inside ? r[next[t]].label : -1;
      if (next[t] < r.size()) until = std::min(until, inside ? r[next[t]].to : r[next[t]].from);
    }
    f(at, until, static_cast<const std::vector<std::int32_t>&>(now));
    at = until;
  }
}

/// Per-label scores of a candidate against a reference, frame by frame.
struct label_scores {
  std::string label;
  std::uint64_t reference = 0;               ///< frames the reference gives this label
  std::uint64_t candidate = 0;               ///< frames the candidate gives it
  std::uint64_t agreed = 0;                  ///< frames both give it
  double precision = 0, recall = 0, f1 = 0;  ///< NaN where undefined (no frames)
};

/// Frame-based agreement. The confusion matrix has a row per reference label and a column
/// per candidate label, "none" last for frames without a label.
struct frame_agreement {
  time_grid grid;
  std::vector<std::string> labels;                    ///< the matrix's labels; "none" last
  std::vector<std::vector<std::uint64_t>> confusion;  ///< [reference][candidate]
  double observed = 0;  ///< p_o: share of frames with the same label (none counts)
  double expected = 0;  ///< p_e: the same by chance, from the two sides' label shares
  double kappa = 0;     ///< Cohen's kappa (p_o − p_e) / (1 − p_e); NaN when p_e is 1
  /// Over the frames with a label (micro-averaged): precision = agreed / candidate-labelled,
  /// recall = agreed / reference-labelled.
  double precision = 0, recall = 0, f1 = 0;
  std::vector<label_scores> scores;  ///< per label, without "none"
};
frame_agreement compare_frames(const tier& reference, const tier& candidate, const time_grid& grid);

/// Frame agreement over several recordings as one: the confusion matrices summed (labels
/// joined in the order they first appear, "none" last) and every measure computed from the
/// sum — the same as comparing the recordings' frames concatenated. The grid is as many frames
/// long as the parts together, from 0.
frame_agreement pool_frames(const std::vector<frame_agreement>& parts);

/// Cohen's kappa of a square confusion matrix (rows: one rater, columns: the other).
/// NaN when the expected agreement is 1 or the matrix is empty.
double cohen_kappa(const std::vector<std::vector<std::uint64_t>>& confusion);

/// How segments are matched one to one.
struct segment_options {
  enum class criterion : std::uint8_t {
    boundaries,  ///< onset and offset each within `collar` of the reference's
    overlap,     ///< intersection over union at least `min_overlap`
  };
  static constexpr enum_name<criterion> criterion_names[]{{criterion::boundaries, "boundaries"},
                                                          {criterion::overlap, "overlap"}};
  criterion by = criterion::boundaries;
  time_ns collar = 200'000'000;  ///< 200 ms
  double min_overlap = 0.5;
  bool same_label = true;  ///< only segments with the same label can match
};

struct segment_match {
  std::size_t reference, candidate;  ///< annotation indices
  time_ns onset, offset;             ///< candidate − reference
};

/// Segment-based agreement: an optimal one-to-one matching (as many matches as possible, then
/// the least total deviation: |Δonset| + |Δoffset|, or 1 − overlap), found exactly by
/// min-cost flow on each group of segments that could match one another — not greedily.
struct segment_agreement {
  std::vector<segment_match> matches;
  std::size_t reference = 0, candidate = 0;  ///< segments on each side
  double precision = 0, recall = 0, f1 = 0;  ///< NaN where undefined
  /// Median and 90th percentile of |Δonset| and |Δoffset| over the matches.
  time_ns onset_median = 0, onset_p90 = 0, offset_median = 0, offset_p90 = 0;
};
segment_agreement compare_segments(const tier& reference, const tier& candidate,
                                   const segment_options& options = {});

/// Segment agreement over several recordings: segments and matches counted together, the
/// deviations' quantiles over every match.
segment_agreement pool_segments(const std::vector<segment_agreement>& parts);

/// Krippendorff's alpha over `units` (rows) rated by several coders (columns; nothing where a
/// coder gave no value). Units with fewer than two values do not count. Nominal: any two
/// different values disagree equally; interval: disagreement is the squared difference.
/// NaN when undefined (fewer than two values in all, or a single value throughout).
enum class alpha_metric : std::uint8_t { nominal, interval };
double krippendorff_alpha(const std::vector<std::vector<std::optional<double>>>& units,
                          alpha_metric metric);
/// The same with unit u counted `weights[u]` times (a stretch of identical frames, say).
double krippendorff_alpha(const std::vector<std::vector<std::optional<double>>>& units,
                          const std::vector<std::uint64_t>& weights, alpha_metric metric);

/// Where a compared tier comes from, for reports.
struct tier_origin {
  std::string file, tier;
};

/// Everything `tiers agree` reports of a candidate against a reference.
struct agreement_report {
  tier_origin reference, candidate;
  frame_agreement frames;
  segment_options matching;
  segment_agreement segments;
};
agreement_report compare_tiers(const tier& reference, const tier& candidate, const time_grid& grid,
                               const segment_options& matching = {});

/// The reports of several recordings pooled (pool_frames, pool_segments); the origins keep
/// the tiers' names and no file.
agreement_report pool_agreements(const std::vector<agreement_report>& parts);

/// What a frame without an annotation is to Krippendorff's alpha: a missing value (a coder who
/// said nothing there; such frames count only where two coders or more gave a label), or a
/// label of its own ("none": saying nothing is a judgement, as in frame-wise kappa).
enum class empty_frames : std::uint8_t { missing, label };
inline constexpr enum_name<empty_frames> empty_frames_names[]{{empty_frames::missing, "missing"},
                                                              {empty_frames::label, "label"}};

/// Agreement among several annotators' tiers on one grid: Krippendorff's alpha (every frame a
/// unit; frames without an annotation as `empty` says), nominal, and interval too when every
/// label is a number and empty frames are missing; and Cohen's kappa of every pair.
struct annotators_report {
  std::string file;
  std::vector<std::string> tiers;
  time_grid grid;
  empty_frames empty = empty_frames::missing;
  std::uint64_t pairable = 0;  ///< frames with two values or more
  double alpha = 0;
  std::optional<double> alpha_interval;  ///< when every label is a number
  struct pair {
    std::string a, b;
    double kappa;
  };
  std::vector<pair> pairwise;
};
annotators_report compare_annotators(const std::vector<const tier*>& tiers, const time_grid& grid,
                                     empty_frames empty = empty_frames::missing);

/// The reports as JSON (docs/agreement.md): `kappa`, `precision`, `recall`, `f1` and `alpha`
/// at the top level; undefined measures as null.
void write_agreement_json(const agreement_report& r, byte_sink& out);
void write_annotators_json(const annotators_report& r, byte_sink& out);

/// One recording's report, in a dataset's.
struct recording_agreement {
  std::string id;
  agreement_report report;
};
/// `{"pooled": {…}, "recordings": [{"id": …, …}]}`: the pooled report and each recording's,
/// each with the members of write_agreement_json; a recording's segments also list every
/// match's deviations, so that reports of parts of a dataset can be pooled later.
void write_dataset_agreement_json(const agreement_report& pooled,
                                  const std::vector<recording_agreement>& recordings,
                                  byte_sink& out);

/// Such a report read back (`report.value`, `report.member`, `json.*` problems located in
/// `file`): the pooled report's origins, and each recording's report with every measure made
/// anew from its counts and deviations.
struct dataset_agreement {
  tier_origin reference, candidate;
  std::vector<recording_agreement> recordings;
};
result<dataset_agreement> read_dataset_agreement(std::string_view text, const std::string& file);

/// One recording's tiers for a threshold sweep: the reference, the whole candidate tier and
/// the grid they are compared on.
struct sweep_part {
  const tier* reference = nullptr;
  const tier* candidate = nullptr;
  time_grid grid;
};

/// The scores at one confidence threshold: the candidate annotations whose confidence is at
/// least `threshold` (and those without one) are kept, the rest left out, as `agree
/// --min-confidence` and `merge --min-confidence` leave them out.
struct sweep_point {
  double threshold = 0;
  std::uint64_t kept = 0;                               ///< candidate annotations kept
  double kept_share = 0;                                ///< of all candidate annotations
  double precision = 0, recall = 0, f1 = 0, kappa = 0;  ///< frame-wise
  double segment_precision = 0, segment_recall = 0, segment_f1 = 0;  ///< segment-wise
};

/// Scores over a range of thresholds, pooled over every part (pool_agreements), and the lowest
/// threshold whose precision reaches a target, when one is asked for.
struct threshold_sweep {
  std::uint64_t candidates = 0;     ///< candidate annotations in all parts
  std::uint64_t unscored = 0;       ///< of them, without a confidence (kept at every threshold)
  std::vector<sweep_point> points;  ///< by threshold, increasing
  std::optional<double> target;     ///< the precision asked for
  std::optional<double> frames_threshold, segments_threshold;  ///< the lowest that reach it
};

/// Sweeps the thresholds: every distinct confidence of the candidate tiers when `step` is
/// nothing, else 0, step, 2·step, … up to 1. Each threshold costs one comparison of every part.
threshold_sweep sweep_thresholds(const std::vector<sweep_part>& parts,
                                 const segment_options& matching, std::optional<double> step,
                                 std::optional<double> target_precision);

/// The sweep as JSON (docs/agreement.md): `{"candidates", "unscored", "target", "thresholds":
/// {"frames", "segments"}, "points": [{"threshold", "kept", "kept_share", "precision", …}]}`.
void write_sweep_json(const threshold_sweep& s, const tier_origin& reference,
                      const tier_origin& candidate, byte_sink& out);

/// How two tiers are compared, as options give it (`tiers agree`, `tiers report`, Python's
/// tiers.agree): the time grid's step and how segments match.
struct comparison_settings {
  std::string step = "10ms";
  std::string match = "boundaries";
  std::string collar = "200ms";
  double min_overlap = 0.5;
  bool any_label = false;
};

/// The segment matching the settings ask for; a bad collar or match is a usage_error, and a
/// collar in frames (`2f`) counts at `rate`.
segment_options segment_matching(const comparison_settings& settings,
                                 std::optional<rational> rate = std::nullopt);

/// The grid the step asks for over `tiers` (grid_over): a step in frames counts at `rate`.
time_grid step_grid(const comparison_settings& settings, std::optional<time_ns> media_duration,
                    const std::vector<const tier*>& tiers, std::optional<rational> rate);

/// Checks the step, collar and match before any file is read (frames are taken on trust until
/// the rate is known); throws usage_error.
void check_comparison_settings(const comparison_settings& settings);

/// The grid and matching for tiers of `docs`: over the longest media duration a document knows
/// (else the tiers' spans), a step or collar in frames counting at the first document's frame
/// rate, else at `rate_setting` (--rate).
struct comparison_frame {
  time_grid grid;
  segment_options matching;
};
comparison_frame comparison_for(const comparison_settings& settings,
                                const std::vector<const document*>& docs,
                                const std::vector<const tier*>& tiers,
                                const std::string& rate_setting = {});

/// `t` without the annotations whose confidence is below `least` (those without one stay).
tier at_least_confident(const tier& t, double least);

}  // namespace tiers
