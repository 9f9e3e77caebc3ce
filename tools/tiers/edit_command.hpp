// `tiers edit`: time and tier operations, in the order given.
#pragma once

#include <CLI/CLI.hpp>
#include <memory>
#include <string>
#include <vector>

#include "cli_common.hpp"

namespace tiers::cli {

struct edit_options {
  input_options input;
  std::string dataset;     ///< a dataset description: each recording edited alike
  std::string output_dir;  ///< with --dataset: a file per recording
  unsigned jobs = 0;
  std::string shard;
  std::string output, to;
  std::vector<std::string> shifts, scales, snaps, cuts, selects, drops, renames;
  bool from_zero = false;
  bool allow_loss = false;
  const CLI::App* command = nullptr;  ///< for the order the operations were given in
};

/// Adds the subcommand to `app` with its options; when it is the one given, it runs after
/// parsing and its exit status lands in `status`.
void setup_edit(CLI::App& app, int& status);
int run_edit(const edit_options& options);

}  // namespace tiers::cli
