// `tiers info`: what is in a file, for people or for scripts.
#pragma once

#include <CLI/CLI.hpp>
#include <memory>

#include "cli_common.hpp"
#include "table_output.hpp"

namespace tiers::cli {

struct info_options {
  input_options input;             ///< reading options (path: the one file described)
  std::vector<std::string> paths;  ///< files or folders
  std::string dataset;             ///< a dataset description: the inventory of its recordings
  unsigned jobs = 0;
  bool labels = false;  ///< per tier and label: counts, durations, share, confidence
  report_output out;
};

/// Adds the subcommand to `app` with its options; when it is the one given, it runs after
/// parsing and its exit status lands in `status`.
void setup_info(CLI::App& app, int& status);
int run_info(const info_options& options);

}  // namespace tiers::cli
