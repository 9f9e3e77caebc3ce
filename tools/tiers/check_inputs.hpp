// What `tiers check` reads: the files named and those in folders named, and checking each one
// on a pool of threads.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "check_command.hpp"
#include "tiers/check.hpp"

namespace tiers::cli {

/// The files to check, in a stable order: each argument as given; a folder's files (those with
/// a registered extension, hidden ones left out) sorted by path, recursively.
std::vector<std::string> expand_inputs(const std::vector<std::string>& paths);

/// A word-timing tier in another file, loaded once for every check.
struct words_file {
  std::string path;
  std::optional<std::string> tier;
  document doc;
};

/// Splits `--words`: a file that exists, or FILE:TIER with a file that exists, is a words file,
/// read with the same reading options as the checked files; anything else names a tier of each
/// checked document.
std::optional<words_file> words_file_of(const std::string& spec, const input_options& reading,
                                        std::optional<std::string>& tier);

/// Checks every file on `jobs` threads (a progress bar on standard error when it is a
/// terminal) and returns the reports in the order of `files`, dataset rules applied.
std::vector<file_report> check_files(const std::vector<std::string>& files, const check_options& o,
                                     const profile& p, const check_context& roles);

}  // namespace tiers::cli
