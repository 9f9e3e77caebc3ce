// `tiers check`: validate files or whole folders against the rules and a profile.
#pragma once

#include <CLI/CLI.hpp>
#include <string>
#include <vector>

#include "cli_common.hpp"

namespace tiers::cli {

struct check_options {
  input_options input;  ///< reading options for every file (path unused)
  std::vector<std::string> paths;
  std::string profile;
  std::string captions;
  std::string words;
  std::string format = "text";
  std::string output;
  unsigned jobs = 0;  ///< 0: one per core
  long max_warnings = -1;
  std::string shard;     ///< K/N: this worker's part of the files
  bool combine = false;  ///< the inputs are JSON reports of earlier runs, to join into one
  bool list_rules = false;
  bool list_profiles = false;
};

/// Adds the subcommand to `app`; its options land in `options`.
CLI::App* setup_check(CLI::App& app, check_options& options);
int run_check(const check_options& options);

}  // namespace tiers::cli
