// `tiers merge`: tiers of several files of one recording in one file, and human and machine
// tiers combined.
#pragma once

#include <CLI/CLI.hpp>
#include <memory>
#include <string>
#include <vector>

#include "cli_common.hpp"
#include "tiers/merge.hpp"

namespace tiers::cli {

struct merge_options : merge_settings {
  input_options input;     ///< reading options for every input (path unused)
  std::string dataset;     ///< a dataset description: each recording merged on its own
  std::string output_dir;  ///< with --dataset: a file per recording
  unsigned jobs = 0;
  std::string shard;
  std::string output;
  std::string to;
  bool print_plan = false;
  bool allow_loss = false;
};

/// Adds the subcommand to `app` with its options; when it is the one given, it runs after
/// parsing and its exit status lands in `status`.
void setup_merge(CLI::App& app, int& status);
int run_merge(const merge_options& options);

}  // namespace tiers::cli
