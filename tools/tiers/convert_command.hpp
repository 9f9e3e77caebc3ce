// `tiers convert`: from one format to another, refusing silent loss.
#pragma once

#include <CLI/CLI.hpp>
#include <memory>
#include <string>
#include <vector>

#include "cli_common.hpp"

namespace tiers::cli {

struct convert_options {
  input_options input;              ///< reading options (path: the one input, when only one)
  std::vector<std::string> inputs;  ///< files or folders
  std::string dataset;              ///< or a dataset description: a file per recording
  std::string output_dir;           ///< many inputs: where their outputs go
  unsigned jobs = 0;
  std::string shard;
  bool resume = false;
  bool in_place = false;  ///< -d: outputs may replace their inputs, when lossless
  std::string output;
  std::string to;
  std::vector<std::string> tiers;
  bool allow_loss = false;
  bool voices = false;
};

/// Adds the subcommand to `app` with its options; when it is the one given, it runs after
/// parsing and its exit status lands in `status`.
void setup_convert(CLI::App& app, int& status);
int run_convert(const convert_options& options);

}  // namespace tiers::cli
