// Reviewing a sample of a machine tier: drawing the sample (simple or stratified), the review
// sheet, and estimating the tier's precision from the reviewed sheet with honest intervals.
// See docs/review.md.
#pragma once

#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "tiers/diagnostic.hpp"
#include "tiers/model.hpp"
#include "tiers/names.hpp"
#include "tiers/sink.hpp"

namespace tiers {

// ---- Proportions ----------------------------------------------------------------------------

/// The standard normal's quantile: z with Φ(z) = p, for p in (0, 1).
double normal_quantile(double p);
/// z of a two-sided interval at `level` (0.95 → 1.95996…).
double two_sided_z(double level);

struct proportion_interval {
  double low = 0;
  double high = 1;
};

/// Wilson's score interval (Wilson 1927) for `k` successes of `n`, at `level`. n = 0: [0, 1].
proportion_interval wilson_interval(double k, double n, double level);
/// The Clopper–Pearson ("exact") interval: the beta quantiles α/2 of (k, n−k+1) and 1−α/2 of
/// (k+1, n−k); 0 below when k = 0, 1 above when k = n. n = 0: [0, 1].
proportion_interval clopper_pearson_interval(std::uint64_t k, std::uint64_t n, double level);
/// The regularized incomplete beta function I_x(a, b).
double regularized_beta(double x, double a, double b);

/// Cochran's sample size for a proportion near 1/2: n0 = z² p(1−p)/e² with p = 0.5.
double cochran_n0(double margin, double level);
/// n0 with the finite-population correction n = n0 / (1 + (n0 − 1)/N), rounded up, at most N.
std::uint64_t cochran_size(double margin, double level, std::uint64_t population);

// ---- Drawing the sample ---------------------------------------------------------------------

enum class stratify_by : std::uint8_t { none, confidence, label, file };
inline constexpr enum_name<stratify_by> stratify_by_names[]{{stratify_by::none, "none"},
                                                            {stratify_by::confidence, "confidence"},
                                                            {stratify_by::label, "label"},
                                                            {stratify_by::file, "file"}};
enum class allocation : std::uint8_t { proportional, equal };
inline constexpr enum_name<allocation> allocation_names[]{
    {allocation::proportional, "proportional"}, {allocation::equal, "equal"}};

struct sample_options {
  std::string tier;
  std::uint64_t n = 0;
  std::uint64_t seed = 1;
  stratify_by by = stratify_by::none;
  std::vector<double> bands;  ///< with `confidence`: the inner limits, ascending, in (0, 1)
  allocation share = allocation::proportional;
  time_ns context = 0;  ///< lead and tail of each clip's link
};

/// The name of the confidence band a confidence falls in: `[0.5,0.7)`, the last `[0.9,1]`;
/// an annotation without a confidence is in the stratum `no confidence`.
std::string confidence_band(const std::vector<double>& bands, std::optional<double> confidence);

/// One annotation of the sample: a row of the review sheet.
struct sample_row {
  std::uint64_t sample_id = 0;  ///< 1, 2, … in the order of review
  std::string file;             ///< as the input was named (a recording: its id)
  std::string tier;
  time_ns start = 0, end = 0;
  std::string label;
  std::optional<double> confidence;
  std::string stratum;
  std::uint64_t stratum_size = 0;  ///< N_h: the stratum's annotations over the whole input
  double weight = 0;               ///< N_h / n_h: the annotations each sampled one stands for
  std::string link;                ///< a Media Fragments URI of the clip, from the sheet
  std::string media;               ///< the same, from the review page
  std::string verdict, note;       ///< the reviewer's; empty in a new sheet
};

/// One stratum of the input: its size and how many of it are drawn.
struct stratum_count {
  std::string name;
  std::uint64_t size = 0;   ///< N_h
  std::uint64_t drawn = 0;  ///< n_h
};

/// Where a file's clips are played from: the media URI as the sheet and the page reach it.
struct media_place {
  std::string from_sheet;  ///< relative to the sheet's folder, or the absolute URI
  std::string from_page;   ///< relative to the page's folder, or the absolute URI
};

/// A media URI named in the document at `document_path`, as seen from `folder`: an absolute
/// URI (with a scheme, or starting with `/`) is kept; a relative one is resolved against the
/// document's folder and made relative to `folder`, its new segments percent-encoded.
std::string media_from(std::string_view uri, const std::string& document_path,
                       const std::string& folder);

/// `URI#t=START,END` (W3C Media Fragments URI 1.0, normal play time in seconds), widened by
/// `context` on both sides and not before 0.
std::string media_fragment(std::string_view uri, time_ns start, time_ns end, time_ns context);

/// Draws the sample one input at a time, in any order and from any thread (one sampler per
/// thread, added up with `add`): each annotation gets a random key from the seed, its file's
/// name and its place in the tier, and each stratum keeps the annotations with the smallest
/// keys — a simple random sample without replacement, the same whatever the order of reading.
class sampler {
 public:
  explicit sampler(const sample_options& options) : options_(options) {}
  sampler(sampler&&) = default;  // the strata's name pointers stay with their map's nodes
  sampler& operator=(sampler&&) = default;
  sampler(const sampler&) = delete;
  sampler& operator=(const sampler&) = delete;

  /// The tier's annotations of one file; `media` is where its clips are played from.
  void add(const std::string& file, const tier& t, const media_place& media);
  void add(sampler&& other);

  /// The strata with their sizes and shares of `options.n` (largest remainder; every stratum
  /// gets at least two when n allows, so that its variance can be estimated; none more than it
  /// has), and the sample in review order: the strata interleaved at random.
  std::vector<stratum_count> strata() const;
  std::vector<sample_row> draw() const;
  std::uint64_t population() const;

 private:
  // Only what a candidate needs to be ranked and, once drawn, to become a row: the file's
  // name, tier and media links are its source's, built once a file.
  struct kept {
    std::uint64_t key;
    std::uint32_t source;
    time_ns start, end;
    std::string label;
    std::optional<double> confidence;
  };
  struct source {
    std::string file, tier;
    media_place media;
    time_ns context;  ///< the options' when the file was added (frames count at its rate)
  };
  struct stratum {
    const std::string* name = nullptr;  ///< its key's, in strata_
    std::uint64_t size = 0;
    std::vector<kept> smallest;  ///< a max-heap on key, at most options.n
  };
  bool before(const kept& a, const kept& b) const;
  void keep(stratum& s, kept&& k) const;
  stratum& stratum_named(std::size_t rank, std::string name);

  sample_options options_;
  std::vector<source> sources_;
  /// By (rank, name): confidence bands in their order, other strata by name.
  std::map<std::pair<std::size_t, std::string>, stratum> strata_;
};

/// How many to review for a margin of error: per stratum, Cochran's size with its finite-
/// population correction, and the hours at `review_rate` clips an hour.
struct plan_row {
  std::string name;
  std::uint64_t annotations = 0, sample = 0;
  double hours = 0;
};
struct sample_plan {
  double margin = 0.05, level = 0.95, review_rate = 250;
  double n0 = 0;                 ///< before the correction
  std::vector<plan_row> strata;  ///< each estimated to ±margin
  plan_row total;                ///< their sum
  plan_row simple;               ///< one simple random sample of everything, to ±margin overall
};
sample_plan plan_sample(const std::vector<stratum_count>& strata, double margin, double level,
                        double review_rate);
/// `{"format": "tiers-sample-plan", "version": 1, "margin", "level", "review_rate", "n0",
/// "strata": [{"name", "annotations", "sample", "hours"}], "total": {…}, "simple": {…}}`.
void write_sample_plan_json(const sample_plan& plan, byte_sink& out);

/// Shares `n` among strata of the given sizes: proportional to `weights`, at least
/// min(floor, size) each when n allows, at most `sizes[h]` each (largest remainder).
std::vector<std::uint64_t> allocate(std::uint64_t n, const std::vector<std::uint64_t>& sizes,
                                    const std::vector<double>& weights, std::uint64_t floor);

/// The review sheet as CSV (RFC 4180): sample_id, file, tier, start, end, label, confidence,
/// stratum, stratum_size, weight, link, verdict, note.
void write_review_sheet(const std::vector<sample_row>& rows, byte_sink& out);
/// A reviewed sheet read back. Required columns: stratum, stratum_size, verdict; the others are
/// kept when present. Problems (`review.sheet`) located in `file`.
result<std::vector<sample_row>> read_review_sheet(std::string_view text, const std::string& file);

/// One reviewed sheet: its name (for messages) and its rows.
struct review_part {
  std::string file;
  std::vector<sample_row> rows;
};
/// The rows of several sheets, the parts of one sample reviewed apart. A stratum given two
/// sizes, or an annotation in two parts (a sample is drawn without replacement), is an error
/// (`review.sheet`) naming the part.
result<std::vector<sample_row>> join_review_sheets(std::vector<review_part> parts);

struct review_page_options {
  std::string title = "Review";
  std::string key;  ///< identifies the sample in the browser's storage (seed, sizes)
  std::string save_as = "review.csv";  ///< the name the filled sheet is saved under
};
/// The review page: the clips, a player for each clip's media fragment, verdict buttons and
/// keys, progress kept in the browser's local storage, and the filled sheet saved as CSV.
/// Self-contained: style, script and data inline.
void write_review_page(const std::vector<sample_row>& rows, const review_page_options& options,
                       byte_sink& out);

// ---- Estimating precision -------------------------------------------------------------------

enum class verdict : std::uint8_t { yes, no, unsure, none };
/// `yes`/`y`/`1`/`true`, `no`/`n`/`0`/`false` in any case, `unsure`, empty; else nullopt.
std::optional<verdict> parse_verdict(std::string_view text);

/// Reviewed counts of a group of the sample, with its precision's intervals.
struct precision_row {
  std::string name;
  std::uint64_t size = 0;  ///< N_h of a stratum; 0 for a label
  std::uint64_t reviewed = 0, correct = 0, unsure = 0, unreviewed = 0;
  double precision = 0;  ///< NaN when none is reviewed
  proportion_interval wilson, clopper_pearson;
};

/// An estimate for the whole population, or the part of it at or above a confidence.
struct population_estimate {
  double precision = 0;  ///< Σ W_h p_h (the stratified estimator)
  double se = 0;         ///< with the finite-population correction
  proportion_interval interval;
  std::uint64_t reviewed = 0, correct = 0;
  double annotations = 0;  ///< the population it stands for (estimated for a part)
};

struct threshold_choice {
  double target = 0;
  std::optional<double> confidence;  ///< the lowest that reaches the target; none: nullopt
  population_estimate kept;          ///< the annotations at or above it
};

struct precision_estimate {
  double level = 0.95;
  population_estimate overall;
  std::vector<precision_row> strata, labels;
  std::optional<threshold_choice> threshold;
  std::vector<std::string> unreviewed_strata;  ///< left out of the overall estimate
};

struct estimate_options {
  double level = 0.95;
  std::optional<double> target_precision;
};

/// The estimate from a reviewed sheet. The overall interval is Wilson's at the design's
/// effective sample size p(1−p)/se² (Kish), so that it neither collapses when every clip was
/// right nor ignores the strata; see docs/review.md.
precision_estimate estimate_precision(const std::vector<sample_row>& sheet,
                                      const estimate_options& options);

/// `{"format": "tiers-estimate", "version": 1, "level", "overall": {…}, "strata": […],
/// "labels": […], "threshold": {…} or null}`.
void write_estimate_json(const precision_estimate& e, byte_sink& out);

/// The estimate as a tier's attributes: precision, precision_low, precision_high,
/// precision_reviewed, precision_method, and with a threshold precision_threshold and
/// precision_target.
void annotate_precision(tier& t, const precision_estimate& e);

/// A review sample as options give it (`tiers sample`, Python's tiers.sample).
struct sample_settings {
  std::string tier;
  std::uint64_t n = 0;
  std::uint64_t seed = 1;
  std::string strata;  ///< confidence limits: `0.5,0.7,0.9`
  std::string by;      ///< confidence (with strata), label or file; empty: none
  std::string allocation = "proportional";
  std::string context = "0";  ///< lead and tail of each clip's link: `1s`, `12f`
};

/// A confidence level from (0, 1); throws usage_error naming `option`.
void check_level(const char* option, double level);

/// The library's options for the settings, but the context, which each document reads at its
/// own frame rate; throws usage_error.
sample_options sample_options_of(const sample_settings& settings);

/// The tier of one document (called `file` in the sheet, read from `path`) to sample from,
/// with its clips' links made from the folders of the sheet and the page. A tier that is not
/// there is an error (`sample.tier`); the context counts frames at the document's rate, else at
/// `rate_setting`.
result<sampler> sample_document(const document& doc, const std::string& file,
                                const std::string& path, const sample_settings& settings,
                                const std::string& sheet_folder, const std::string& page_folder,
                                const std::string& rate_setting = {});

/// What a sample lacks, as warnings: strata that got no clip (`sample.strata`), and inputs
/// that name no media (`sample.media`, when `without_media` of them do not).
std::vector<diagnostic> sample_warnings(const std::vector<stratum_count>& strata,
                                        std::size_t without_media);

}  // namespace tiers
