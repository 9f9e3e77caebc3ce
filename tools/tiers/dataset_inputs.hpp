// The recordings of a dataset description as inputs of every command: the description read
// and checked, its recordings found, and each recording's files read and joined.
#pragma once

#include <CLI/CLI.hpp>
#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "cli_common.hpp"
#include "tiers/dataset.hpp"
#include "tiers/format.hpp"
#include "tiers/info.hpp"

namespace tiers::cli {

/// Adds --dataset, -d/--output-dir, --jobs and --shard to a command that writes a file per
/// recording of a dataset; `done` says what it does to each, for the help ("merged").
void add_dataset_options(CLI::App& cmd, std::string& dataset, std::string& dir, unsigned& jobs,
                         std::string& shard, const std::string& done);

/// A description opened for a run.
struct opened_dataset {
  std::string file;  ///< the description, as named
  std::string root;  ///< its folder, from which its patterns start
  dataset_description description;
  std::vector<input_options> reading;  ///< per source: the command's options, then its `read`
  std::vector<recording> recordings;   ///< sorted by id
  /// With a shard: each recording's place among all the description's, for combined reports.
  std::vector<std::size_t> places;
  /// A recording's file as messages name it: below the description's folder.
  std::string path_of(const std::string& relative) const;
};

/// Reads and checks the description (its reading options too) and finds its recordings;
/// prints what is wrong and throws rejected, or usage_error when the patterns find nothing. `base`
/// holds the command's own reading options, which each source's `read`, `source` and `kind`
/// override. With `shard` (K/N), only that part of the recordings (by id) is kept.
opened_dataset open_dataset(const std::string& path, const input_options& base,
                            const std::string& shard = {});

/// A recording's files read, each with its source's options, its tiers given what the source
/// says (signal sources left out: they are derive's); not joined. `ok` is false after an error in
/// any of them.
struct recording_parts {
  std::vector<merge_input> parts;
  source_map positions;  ///< with `positions`: the parts' tiers, in order
  std::vector<diagnostic> diagnostics;
  bool ok = false;
  /// The first tier of its first file of a caption format (WebVTT, TTML): the caption tier
  /// when nothing names one, as for a caption file checked alone.
  std::optional<std::string> caption_tier;
  bool instant_tiers = true;  ///< every file's format tells instant tiers from intervals
};
recording_parts read_parts(const opened_dataset& d, const recording& r, bool positions = false);

/// A recording read: its parts (read_parts) joined (join_recording), the parts themselves
/// moved into `doc`. `ok` is false after an error; `diagnostics` name the files they are about.
/// With `positions`, where each tier and annotation was read.
struct recording_read : recording_parts {
  document doc;
  std::vector<std::string> tier_files;  ///< each tier's file, as messages name it
};
recording_read read_recording(const opened_dataset& d, const recording& r, bool positions = false);

/// The error (`dataset.missing-source`, naming the description) for source `k`, which the
/// recording lacks.
diagnostic lacking_source(const opened_dataset& d, const recording& r, std::size_t k);

/// That error for each source the recording lacks.
std::vector<diagnostic> lacking_sources(const opened_dataset& d, const recording& r);

/// The output format of a command that writes a file per recording (`command` --dataset):
/// throws usage_error unless `-d DIR` and `--to` are given and no input (`named_input`) or -o.
const format& per_recording_format(const char* command, bool named_input, const std::string& output,
                                   const std::string& dir, const std::string& to);

/// Reads the recording, printing its diagnostics (lacking sources first); throws rejected on
/// errors. For the commands that need a whole recording to work on. `tier_files`, when given,
/// gets each tier's file.
document load_recording(const opened_dataset& d, const recording& r,
                        std::vector<std::string>* tier_files = nullptr);

/// Each recording read and summarized (on `jobs` threads), index for index; none for one that
/// could not be read, whose errors are printed. Lacking sources are not errors here.
std::vector<std::optional<document_summary>> summarize_recordings(const opened_dataset& d,
                                                                  unsigned jobs);

/// Runs `work` over the recordings on `jobs` threads with a progress bar; a recording whose
/// work throws (rejected, or anything else) fails alone, said on standard error. Prints how
/// many failed and returns the exit status: 1 when any did.
int for_each_recording(const opened_dataset& d, unsigned jobs, const char* verb,
                       const std::function<void(const recording&)>& work);

/// for_each_recording for the commands that write a file per recording: `work(r, output)`
/// with the output `DIR/ID.EXT` (EXT: `to`'s first extension); the folder is made first.
int for_each_output(const opened_dataset& d, const std::string& dir, const format& to,
                    unsigned jobs, const char* verb,
                    const std::function<void(const recording&, const std::string&)>& work);

}  // namespace tiers::cli
