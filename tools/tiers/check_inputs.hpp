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

/// Checks every file on `jobs` threads (a progress bar on standard error when it is a
/// terminal) and returns the reports in the order of `files`, dataset rules applied.
std::vector<file_report> check_files(const std::vector<std::string>& files, const check_options& o,
                                     const profile& p, const check_context& roles);

}  // namespace tiers::cli
