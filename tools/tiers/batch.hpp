// Work on many files on a pool of threads with a progress bar, shared by the commands that
// take many files (the files themselves are found by the library's expand_inputs).
#pragma once

#include <functional>
#include <string>
#include <vector>

#include "cli_common.hpp"

namespace tiers::cli {

/// The library's run_parallel, with a progress bar ("VERB [###…] k/count UNITS") drawn on
/// standard error while it runs, when that is a terminal and there is more than one.
void run_parallel(std::size_t count, unsigned jobs, const std::function<void(std::size_t)>& work,
                  const char* verb, const char* units = "files");

/// Reads each of `files` with `base`'s reading options on `jobs` threads and calls `work(k,
/// document)`; a file that cannot be read, or whose work is rejected, is reported and the others
/// go on. Returns exit status 1 when any failed, else 0.
int for_each_document(const std::vector<input_file>& files, const input_options& base,
                      unsigned jobs, const char* verb,
                      const std::function<void(std::size_t, document&&)>& work);

}  // namespace tiers::cli
