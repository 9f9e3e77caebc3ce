// Cross-modal co-occurrence: which labels of one tier (words, say) go with which labels of
// another (gestures) over a corpus, with the association measures of corpus linguistics —
// counts that add up over recordings, and exact statistics of each 2×2 table.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <unordered_map>
#include <vector>

#include "tiers/diagnostic.hpp"
#include "tiers/model.hpp"
#include "tiers/names.hpp"
#include "tiers/sink.hpp"

namespace tiers {

/// When an annotation of tier A co-occurs with one of tier B (B widened by the window).
enum class cooccur_relation : std::uint8_t {
  overlap,    ///< they share time (an instant of A: it falls inside B)
  within,     ///< A lies inside B
  starts_in,  ///< A starts inside B
};
inline constexpr enum_name<cooccur_relation> cooccur_relation_names[]{
    {cooccur_relation::overlap, "overlap"},
    {cooccur_relation::within, "within"},
    {cooccur_relation::starts_in, "starts-in"}};

struct cooccur_options {
  cooccur_relation relation = cooccur_relation::overlap;
  time_ns window = 0;      ///< every B annotation widened by this on both sides
  bool fold_case = false;  ///< labels compared case-folded (fold_case)
  /// Only these labels of B count (as written, or folded with fold_case); empty: every label.
  std::vector<std::string> b_labels;
};

/// What a co-occurrence analysis counts, additive over recordings: each annotation of A is one
/// observation; for each label y of B it co-occurs with y or not. Counts are exact, 64-bit.
class cooccur_counts {
 public:
  /// Counts the annotations of `a` against those of `b` (one recording).
  void add(const tier& a, const tier& b, const cooccur_options& options);
  /// Adds another analysis's counts (of other recordings).
  void add(const cooccur_counts& other);

  std::uint64_t n() const { return n_; }
  const std::vector<std::string>& a_labels() const { return a_labels_; }
  const std::vector<std::string>& b_labels() const { return b_labels_; }
  /// A annotations labelled `a_labels()[x]` (R1 of its tables).
  const std::vector<std::uint64_t>& a_totals() const { return a_totals_; }
  /// A annotations that co-occur with `b_labels()[y]` (C1 of its tables).
  const std::vector<std::uint64_t>& b_totals() const { return b_totals_; }
  /// A annotations labelled x that co-occur with y (O11), for every pair seen, keyed x·2³² + y.
  const std::unordered_map<std::uint64_t, std::uint64_t>& pairs() const { return pairs_; }

  /// Raw counts, for partial results that are combined later.
  void add_raw(const std::string& a_label, const std::string& b_label, std::uint64_t count);
  void add_a_total(const std::string& a_label, std::uint64_t count);
  void add_b_total(const std::string& b_label, std::uint64_t count);
  void add_n(std::uint64_t count) { n_ += count; }

 private:
  // Labels looked up by view: counting a label already met copies nothing.
  struct text_hash {
    using is_transparent = void;
    std::size_t operator()(std::string_view s) const { return std::hash<std::string_view>{}(s); }
  };
  using label_index = std::unordered_map<std::string, std::uint32_t, text_hash, std::equal_to<>>;
  static std::uint32_t id_in(label_index& index, std::vector<std::string>& labels,
                             std::vector<std::uint64_t>& totals, std::string_view label);
  std::uint32_t a_id(std::string_view label) {
    return id_in(a_index_, a_labels_, a_totals_, label);
  }
  std::uint32_t b_id(std::string_view label) {
    return id_in(b_index_, b_labels_, b_totals_, label);
  }
  std::uint64_t n_ = 0;
  std::vector<std::string> a_labels_, b_labels_;
  label_index a_index_, b_index_;
  std::vector<std::uint64_t> a_totals_, b_totals_;
  std::unordered_map<std::uint64_t, std::uint64_t> pairs_;
};

/// Fisher's exact test of a 2×2 table [[o11, o12], [o21, o22]]: the two-sided p (the summed
/// probability of every table with the same margins no more likely than this one, with R's
/// relative tolerance of 1e-7) and the one-sided p for attraction, P(X ≥ o11). Computed in log
/// space from the hypergeometric distribution, summing outward from where the terms matter
/// until the rest is negligible, so that margins in the billions take as long as the
/// distribution is wide, not as long as it is long; a p below the double range reads 0.
struct fisher_p {
  double two_sided = 1, greater = 1;
};
fisher_p fisher_exact(std::uint64_t o11, std::uint64_t o12, std::uint64_t o21, std::uint64_t o22);

/// Dunning's log-likelihood G² = 2 Σ O ln(O/E) over the four cells (0 ln 0 = 0).
double log_likelihood_g2(std::uint64_t o11, std::uint64_t o12, std::uint64_t o21,
                         std::uint64_t o22);

/// Everything said of one pair (x of A, y of B).
struct pair_statistics {
  std::string a, b;
  std::uint64_t count = 0, a_total = 0, b_total = 0;  ///< O11, R1, C1
  double expected = 0;                                ///< E11 = R1·C1/N
  double ratio = 0;                                   ///< O11 / E11
  double g2 = 0;                                      ///< Dunning's G²
  double fisher_p = 1;                                ///< two-sided
  double fisher_p_greater = 1;                        ///< one-sided, for attraction
  /// ln of the odds ratio (O11·O22)/(O12·O21) and its 95 % Woolf interval; 0.5 is added to
  /// every cell when one of them is 0 (Haldane–Anscombe).
  double log_odds = 0, log_odds_low = 0, log_odds_high = 0;
  double pmi = 0;                ///< log2(O11/E11); −∞ (null in JSON) when O11 is 0
  double p_adjusted = 1;         ///< Benjamini–Hochberg over every pair shown
  std::optional<double> perm_p;  ///< the permutation test's, when one was run
};

/// The statistics of one table: O11 of N observations, R1 of them labelled x, C1 with y.
pair_statistics table_statistics(std::uint64_t o11, std::uint64_t r1, std::uint64_t c1,
                                 std::uint64_t n);

/// Benjamini–Hochberg adjusted p-values (the false discovery rate), index for index.
std::vector<double> benjamini_hochberg(const std::vector<double>& p);

/// How a table is sorted: by count, G² (default), Fisher's p, log odds or PMI; the strongest
/// first, then by the labels.
enum class cooccur_sort : std::uint8_t { count, g2, fisher, log_odds, pmi };
inline constexpr enum_name<cooccur_sort> cooccur_sort_names[]{{cooccur_sort::count, "count"},
                                                              {cooccur_sort::g2, "g2"},
                                                              {cooccur_sort::fisher, "fisher"},
                                                              {cooccur_sort::log_odds, "log-odds"},
                                                              {cooccur_sort::pmi, "pmi"}};

/// Every pair that co-occurs at least `min_count` times (at least once), with its statistics
/// and the adjusted p over those pairs, sorted.
std::vector<pair_statistics> cooccur_table(const cooccur_counts& counts, std::uint64_t min_count,
                                           cooccur_sort sort = cooccur_sort::g2);

/// One recording for the permutation test: its two tiers, how long it is, and its options (a
/// window in frames counts at its own rate).
struct cooccur_recording {
  std::string name;    ///< seeds its shifts, so that they depend neither on order nor on threads
  time_ns length = 0;  ///< the media's duration, else the latest end of the two tiers
  std::string media;   ///< the media's URI, for the concordance's links; may be empty
  const tier* a = nullptr;
  const tier* b = nullptr;
  cooccur_options options;
};

/// The latest end among the annotations of `a` and `b` (a recording's length when its media's
/// duration is not known).
time_ns latest_end(const tier& a, const tier& b);

/// A null model that keeps time's structure (a torus translation): `permutations` times, tier B
/// of every recording is shifted circularly by an offset drawn uniformly from [0, length)
/// (what passes the end wraps to the start), which keeps B's durations, order and clustering
/// and breaks only its alignment with A, and A is counted against it. Sets each pair's
/// `perm_p` = (1 + #{shifts whose O11 ≥ the observed}) / (permutations + 1). The offsets come
/// from `seed` and each recording's name alone: the same for a seed, whatever the order of the
/// recordings or the number of threads.
void permutation_test(std::vector<pair_statistics>& table,
                      const std::vector<cooccur_recording>& recordings, std::uint32_t permutations,
                      std::uint64_t seed);

/// A pair of labels (x of A, y of B).
using label_pair = std::pair<std::string, std::string>;

/// The permutation test's counts, additive over recordings: for each of `pairs`, its O11 under
/// each of the `permutations` shifts (`[pair][shift]`), for the recordings given.
struct permutation_counts {
  std::uint32_t permutations = 0;
  std::uint64_t seed = 0;
  std::vector<label_pair> pairs;
  std::vector<std::vector<std::uint64_t>> counts;
  void add(const permutation_counts& other);  ///< the same pairs and shifts, other recordings
};
permutation_counts count_permutations(const std::vector<label_pair>& pairs,
                                      const std::vector<cooccur_recording>& recordings,
                                      std::uint32_t permutations, std::uint64_t seed);

/// Sets `perm_p` of every pair of `table` that `counts` has.
void set_permutation_p(std::vector<pair_statistics>& table, const permutation_counts& counts);

/// The pairs of a table that `cooccur --json` printed (its `pairs`' `a` and `b`), for the
/// permutation counts of shards; problems located in `file`.
result<std::vector<label_pair>> read_cooccur_pairs(std::string_view text, const std::string& file);

/// Every co-occurrence of the pairs in `table`, so that the evidence can be read, as CSV
/// (RFC 4180): `file, a, a_start, a_end, a_text, b, b_start, b_end, before, after, link` — the
/// recording, A's label (as counted) and times and its text, B's label and times, the texts of
/// up to `context` annotations of A before and after it, and a W3C Media Fragments URI 1.0
/// temporal link to both (`media.mp4#t=12.3,14.1`, NPT seconds; empty when the recording names
/// no media). Rows in the order of the recordings, then of A.
void write_concordance_csv(const std::vector<pair_statistics>& table,
                           const std::vector<cooccur_recording>& recordings, std::size_t context,
                           byte_sink& out);

/// The counts of part of a corpus (`cooccur --shard K/N`), with what they were counted by, so
/// that parts can be added up (`--combine`) into exactly the table of one run.
struct cooccur_part {
  std::string a_tier, b_tier;
  std::string window;  ///< as given (`0.5s`, `12f`): parts counted alike say the same
  cooccur_options options;
  std::string shard;                    ///< K/N
  std::vector<std::string> recordings;  ///< the files or recordings counted
  cooccur_counts counts;
  std::optional<permutation_counts> shifted;  ///< with --permutations and --pairs
};

/// `{"format": "tiers-cooccur-counts", "version": 1, "shard", "a_tier", "b_tier", "relation",
/// "window", "fold_case", "b_labels", "recordings", "n", "a": [[label, total]…], "b": […],
/// "pairs": [[a, b, count]…], "permutations": {"count", "seed", "pairs": [[a, b, [counts…]]…]}}`
/// (schemas/cooccur-counts.schema.json; `permutations` only when counted); labels in sorted
/// order, so that the same counts give the same bytes.
void write_cooccur_counts_json(const cooccur_part& part, byte_sink& out);

/// Such a document read back; problems (`cooccur.value`, `cooccur.member`, `json.*`) located
/// in `file`.
result<cooccur_part> read_cooccur_counts(std::string_view text, const std::string& file);

/// The table as JSON (docs/cooccur.md): `{"n", "a_tier", "b_tier", "relation", "window",
/// "pairs": [{"a", "b", "count", "a_total", "b_total", "expected", "ratio", "g2", "fisher_p",
/// "fisher_p_greater", "log_odds", "log_odds_low", "log_odds_high", "pmi", "p_adjusted",
/// "perm_p"}]}`.
void write_cooccur_json(const std::vector<pair_statistics>& table, std::uint64_t n,
                        const std::string& a_tier, const std::string& b_tier,
                        const cooccur_options& options, byte_sink& out);

/// A co-occurrence analysis as options give it (`tiers cooccur`, Python's tiers.cooccur).
struct cooccur_settings {
  std::string a, b;  ///< the tiers
  std::string relation = "overlap";
  std::string window = "0";  ///< `0.5s`, `250ms`, or `12f` at each document's rate
  bool fold_case = false;
  std::string b_labels;  ///< the labels of B that count, comma-separated; empty: all
  std::uint64_t min_count = 1;
  std::string sort = "g2";
  std::uint32_t permutations = 0;  ///< the permutation test's shifts; 0: none
  std::uint64_t seed = 1;
};

/// The library's options for the settings, but the window, which each document reads at its
/// own frame rate; throws usage_error on a bad value.
cooccur_options cooccur_options_of(const cooccur_settings& settings);

/// One document counted (called `name`): its counts, and with `keep` its two tiers for a
/// second look (the permutation test, the concordance) in `recording`, whose tier pointers
/// are set when the run gathers the documents.
struct counted_document {
  cooccur_counts counts;
  std::optional<tier> a, b;
  cooccur_recording recording;
};
/// A tier that is not there is an error (`cooccur.tier`, naming the tiers there are). The
/// window counts frames at the document's rate, else at `rate_setting`.
result<counted_document> count_document(const document& doc, const std::string& name,
                                        const cooccur_settings& settings,
                                        const std::string& rate_setting = {}, bool keep = false);

/// The documents' counts added up into `all`; `recordings` get the documents' kept tiers,
/// which they point into.
void gather_counts(std::vector<counted_document>& each, cooccur_counts& all,
                   std::vector<cooccur_recording>& recordings);

/// gather_counts, then the table of pairs, permutation-tested when the settings ask.
std::vector<pair_statistics> cooccur_run(std::vector<counted_document>& each,
                                         const cooccur_settings& settings, cooccur_counts& all,
                                         std::vector<cooccur_recording>& recordings);

}  // namespace tiers
