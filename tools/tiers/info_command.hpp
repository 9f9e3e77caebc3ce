// `tiers info`: what is in a file, for people or for scripts.
#pragma once

#include <CLI/CLI.hpp>
#include <memory>

#include "cli_common.hpp"

namespace tiers::cli {

struct info_options {
  input_options input;
  std::string dataset;  ///< a dataset description: the inventory of its recordings
  unsigned jobs = 0;
  bool json = false;
};

/// Adds the subcommand to `app` with its options; when it is the one given, it runs after
/// parsing and its exit status lands in `status`.
void setup_info(CLI::App& app, int& status);
int run_info(const info_options& options);

}  // namespace tiers::cli
