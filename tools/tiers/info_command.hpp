// `tiers info`: what is in a file, for people or for scripts.
#pragma once

#include <CLI/CLI.hpp>

#include "cli_common.hpp"

namespace tiers::cli {

struct info_options {
  input_options input;
  bool json = false;
};

/// Adds the subcommand to `app`; its options land in `options`.
CLI::App* setup_info(CLI::App& app, info_options& options);
int run_info(const info_options& options);

}  // namespace tiers::cli
