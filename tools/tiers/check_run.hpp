// Checking the files (or combining the reports) a command names: what `tiers check` and
// `tiers report` share.
#pragma once

#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "cli_common.hpp"
#include "tiers/check.hpp"
#include "tiers/recordings.hpp"

namespace tiers::cli {

struct check_options {
  input_options input;  ///< reading options for every file (path unused)
  std::vector<std::string> paths;
  std::string dataset;  ///< a dataset description: its recordings are checked, not paths
  std::string profile;
  std::string captions;
  std::string words;
  std::string format = "text";
  std::string output;
  std::string html;   ///< also write the HTML report here
  unsigned jobs = 0;  ///< 0: one per core
  long max_warnings = -1;
  std::string shard;     ///< K/N: this worker's part of the files
  bool combine = false;  ///< the inputs are JSON reports of earlier runs, to join into one
  bool list_rules = false;
  bool list_profiles = false;
  std::string min_severity = "note";  ///< text output: problems below this are not listed
  std::size_t limit = 0;              ///< text output: at most this many per rule and file; 0: all
  std::string lag_table;              ///< one row per caption cue, CSV or JSON by extension
};

/// The profile named by --profile (a built-in name or a file); the defaults for none.
profile load_check_profile(const std::string& name);

/// What checking the inputs of `options` found, shared by `check` and `report`.
struct check_run {
  std::unique_ptr<words_file> words;  ///< --words FILE, which `roles` points into
  check_context roles;
  std::vector<file_report> reports;
  std::vector<std::optional<document>> documents;  ///< the first few files', for drawing
  /// With --dataset: the description opened, its recordings index for index with `reports`.
  std::shared_ptr<const opened_dataset> dataset;
};
struct report_stream;
/// Checks the files (or combines the reports) that `options` name against `p`, keeping the
/// documents of the first `keep_documents` files; with `stream`, each file's report goes
/// through it as soon as it is made (see check_files).
check_run run_checks(const check_options& options, const profile& p, std::size_t keep_documents,
                     const report_stream* stream = nullptr);

}  // namespace tiers::cli
