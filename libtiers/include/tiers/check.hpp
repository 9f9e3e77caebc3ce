// Checking documents and datasets: the problems `tiers check` reports, and its reports in JSON
// and SARIF.
#pragma once

#include <cstddef>
#include <optional>
#include <span>
#include <string>
#include <vector>

#include "tiers/diagnostic.hpp"
#include "tiers/format.hpp"
#include "tiers/inputs.hpp"
#include "tiers/lag.hpp"
#include "tiers/model.hpp"
#include "tiers/profile.hpp"
#include "tiers/sink.hpp"

namespace tiers {

/// One problem found by a check: a diagnostic whose code is a rule id, plus what it is about.
struct problem {
  diagnostic diag;                     ///< rule id (code), severity, message, file, line, column
  std::string tier;                    ///< the tier it is about; empty when about the file
  std::optional<std::string> id;       ///< the annotation's id, when it has one
  std::optional<time_ns> start, end;   ///< the annotation's times, or the span's
  std::optional<double> value, limit;  ///< what was measured and its bound, for threshold rules
};

/// `FILE:LINE:COLUMN: severity: message [rule]`; without a line, the tier and time come
/// first in the message (`tier 'captions' at 00:00:03.200: …`); an annotation's id is named
/// after them (`annotation 'c3': …`).
std::string format_problem(const problem& p);

/// What a check needs to know beyond the document: which tiers play which role (unset roles
/// come from the profile), and what the file's format could not say.
struct check_context {
  std::optional<std::string> captions;  ///< the caption tier
  std::optional<std::string> words;     ///< the word timings: a tier of the same document,
  const document* words_doc = nullptr;  ///< or of this document, read from another file
  std::string words_file;
  const source_map* words_positions = nullptr;
  /// Whether the file's format tells instant tiers from intervals (format feature instant_tiers).
  /// When it cannot (tables, captions), a tier whose every annotation is an instant is taken
  /// as an instant tier rather than reported.
  bool instant_tiers = true;
};

/// How the captions compared with the words.
struct lag_report {
  std::string captions, words;  ///< the tiers compared
  lag_statistics stats;
  std::size_t tokens = 0;   ///< caption words
  std::size_t matched = 0;  ///< caption words found among the timed words
  /// Every cue, in the caption tier's order: for the lag table (`check --lag-table`) and for
  /// drawing (the HTML report); JSON reports carry only the statistics.
  struct cue {
    std::size_t position = 0;  ///< 1-based, in the caption tier
    std::optional<std::string> id;
    time_ns start = 0, end = 0;
    std::optional<time_ns> word_start;   ///< the start of its first matched word
    std::optional<time_ns> lag;          ///< start − word_start
    std::size_t words = 0, matched = 0;  ///< caption words in the cue, and of them found
  };
  std::vector<cue> cues;
};

/// One file's (or recording's) cues, for a lag table.
struct lag_rows {
  std::string file;
  std::vector<lag_report::cue> cues;
};
/// The lag table (docs/cli.md, "check --lag-table"): one row per cue of every file, as CSV
/// (`file,cue,id,start,end,word_start,lag,words,matched`; times in seconds, empty where
/// unknown) or as JSON (`{"format": "tiers-lag-table", "version": 1, "cues": [{…}]}` with the
/// same members, unknown ones null; schemas/lag-table.schema.json).
void write_lag_table_csv(const std::vector<lag_rows>& files, byte_sink& out);
void write_lag_table_json(const std::vector<lag_rows>& files, byte_sink& out);

/// What a file's tiers look like, kept to compare the files of a dataset.
struct tier_shape {
  std::string name;
  tier_kind kind = tier_kind::interval;
  std::optional<std::vector<std::string>> vocabulary;
  source_position where;
};
/// Everything a check found in one file.
struct file_report {
  std::string path;
  std::vector<problem> problems;  ///< in the order of the file (those without a line first)
  std::optional<lag_report> lag;
  /// The file's tiers, to compare files (also across reports combined later); none when the
  /// file could not be read.
  std::optional<std::vector<tier_shape>> shape;
  /// In the report of one shard: the file's place among all the files of the whole run, so
  /// that combined shards list their files as one run would.
  std::optional<std::size_t> index;
  std::size_t count(severity level) const;
};

/// What a report says of the run that made it: the profile it was checked with (--profile),
/// and which shard of the files it covers.
struct report_header {
  std::optional<profile_identity> profile;
  std::optional<std::string> shard;  ///< "K/N"
  friend bool operator==(const report_header&, const report_header&) = default;
};

/// Checks one document read from `file` against the rule catalogue and `p`. `positions` (from
/// read_options::positions, possibly empty) locates the problems; `read` are the reader's own
/// diagnostics, kept as problems (except the format's authoring rules that the model's rules
/// report as well: WebVTT cue order, empty cues and repeated ids).
file_report check_document(const document& doc, const source_map& positions,
                           const std::string& file, const profile& p,
                           const check_context& context = {},
                           const std::vector<diagnostic>& read = {});

/// A report for a file that could not be read: its diagnostics as problems.
file_report unreadable_file(const std::string& file, const std::vector<diagnostic>& read);

std::vector<tier_shape> shape_of(const document& doc, const source_map& positions);

/// The file at `path` read as `in` says (read_input_file, with positions) and checked against
/// `p`: `roles` name the caption and word tiers; a caption format's first tier is the caption
/// tier when neither they nor the profile name one. A file that cannot be read is a report of
/// its reading's errors; anything thrown (out of memory, above all) fails that file alone.
/// With `keep`, the document read is kept there.
file_report check_file(const std::string& path, const reading_settings& in, const profile& p,
                       const check_context& roles, std::optional<document>* keep = nullptr);

/// check_file for every file on `jobs` threads (0: one per core), the reports in the order of
/// `files`; then, with `compare`, the files compared with one another (check_dataset).
/// `done`, when given, counts the files checked, for a progress display.
std::vector<file_report> check_files(const std::vector<std::string>& files,
                                     const reading_settings& in, const profile& p,
                                     const check_context& roles, unsigned jobs, bool compare,
                                     std::atomic<std::size_t>* done = nullptr);

/// Compares the files of a dataset with one another: a tier that most files have but one
/// lacks, or has with another kind or vocabulary, is reported in that file
/// (dataset.inconsistent). Files without a shape (not read) are left out. Problems of this rule
/// already in the reports are replaced, so that reports combined from parts of a dataset are
/// judged as one. Needs at least three files to tell what most files do.
void check_dataset(std::span<file_report> reports, const profile& p);

/// Reads a report written by write_check_json (`--format json`), for combining the reports of
/// runs over parts of a dataset. Problems are located in `file` (codes `report.*`, `json.*`).
struct check_report {
  report_header header;
  std::vector<file_report> files;
};
using report_result = result<check_report>;
report_result read_check_report(std::string_view text, const std::string& file);

/// Totals over the reports of a check.
struct check_summary {
  std::size_t files = 0;
  std::size_t files_with_errors = 0;
  std::size_t files_with_warnings = 0;
  std::size_t errors = 0, warnings = 0, notes = 0;
  struct rule_count {
    std::string rule;
    severity level = severity::error;
    std::size_t problems = 0;
    std::size_t files = 0;
  };
  std::vector<rule_count> by_rule;  ///< most problems first
};
check_summary summarize(std::span<const file_report> reports);

/// One file's problems counted by rule and severity: all a summary needs of a file, so that a
/// run over an archive can write each file's problems and keep only this.
struct rule_tally {
  std::string rule;
  severity level = severity::error;
  std::size_t problems = 0;
  friend bool operator==(const rule_tally&, const rule_tally&) = default;
};
std::vector<rule_tally> tally(const file_report& report);
/// The problems of `report` added to `counts` (a tally of the same file made earlier).
void add_tally(std::vector<rule_tally>& counts, const file_report& report);
/// The summary of files given by their tallies: summarize(reports) is this over tally(each).
check_summary summarize(std::span<const std::vector<rule_tally>> files);

/// The report as JSON: {"files": [{"path", "problems": […], "lag": {…}}], "summary": {…}}
/// (docs/cli.md, "check").
void write_check_json(std::span<const file_report> reports, byte_sink& out,
                      const report_header& header = {});

/// The report as one SARIF 2.1.0 log: one run, the rule catalogue as the driver's rules (each
/// with its default configuration: level, enabled, thresholds), the profile's changes to them
/// as the invocation's ruleConfigurationOverrides (§3.20.5, §3.51), one result per problem.
void write_check_sarif(std::span<const file_report> reports, byte_sink& out,
                       const profile& used = {}, const report_header& header = {});

}  // namespace tiers
