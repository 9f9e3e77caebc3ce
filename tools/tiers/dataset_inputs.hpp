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
#include "tiers/recordings.hpp"

namespace tiers::cli {

/// Adds --dataset, -d/--output-dir, --jobs and --shard to a command that writes a file per
/// recording of a dataset; `done` says what it does to each, for the help ("merged").
void add_dataset_options(CLI::App& cmd, std::string& dataset, std::string& dir, unsigned& jobs,
                         std::string& shard, const std::string& done);

/// The library's open_dataset, its problems printed (throws rejected on errors).
opened_dataset open_dataset(const std::string& path, const input_options& base,
                            const std::string& shard = {});

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
