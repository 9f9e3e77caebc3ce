// Checking many files on a pool of threads.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "check_run.hpp"
#include "tiers/check.hpp"

namespace tiers::cli {

/// Checks every file on `jobs` threads (a progress bar on standard error when it is a
/// terminal) and returns the reports in the order of `files`; the files are compared with one
/// another (dataset rules) when `whole_dataset`. With `docs`, the documents of the first
/// `keep` files are kept there too (index for index; none for a file that could not be read),
/// for drawing them.
std::vector<file_report> check_files(const std::vector<std::string>& files, const check_options& o,
                                     const profile& p, const check_context& roles,
                                     bool whole_dataset,
                                     std::vector<std::optional<document>>* docs = nullptr,
                                     std::size_t keep = 0);

}  // namespace tiers::cli
