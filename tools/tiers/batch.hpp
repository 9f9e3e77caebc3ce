// Work on many files: the files named (folders searched), and a pool of threads with a progress
// bar, shared by check and convert.
#pragma once

#include <functional>
#include <string>
#include <vector>

#include "cli_common.hpp"

namespace tiers::cli {

/// A file to work on, and its path below the folder it was found in (its name, when it was
/// named itself), so that outputs can mirror the inputs' layout.
struct input_file {
  std::string path;
  std::string relative;
};

/// The files to work on, in a stable order: each argument as given; a folder's files (those
/// with a registered extension, hidden ones left out) sorted by path, recursively. A file named
/// twice is taken once.
std::vector<input_file> expand_inputs(const std::vector<std::string>& paths);

/// Calls `work(k)` for k in [0, count) on `jobs` threads (0: one per core); a progress bar
/// ("VERB [###…] k/count UNITS") is drawn on standard error while it runs, when that is a
/// terminal and there is more than one.
void run_parallel(std::size_t count, unsigned jobs, const std::function<void(std::size_t)>& work,
                  const char* verb, const char* units = "files");

/// Reads each of `files` with `base`'s reading options on `jobs` threads and calls `work(k,
/// document)`; a file that cannot be read, or whose work is rejected, is reported and the others
/// go on. Returns exit status 1 when any failed, else 0.
int for_each_document(const std::vector<input_file>& files, const input_options& base,
                      unsigned jobs, const char* verb,
                      const std::function<void(std::size_t, document&&)>& work);

}  // namespace tiers::cli
