// `tiers derive`: per-frame detector scores to interval tiers.
#pragma once

#include <CLI/CLI.hpp>
#include <memory>
#include <string>

#include "cli_common.hpp"
#include "tiers/derive.hpp"

namespace tiers::cli {

struct derive_options_cli : derive_settings {
  std::string path, output, to;
  bool allow_loss = false;
  std::string dataset, output_dir;  ///< --dataset: each recording's signal sources derived
  unsigned jobs = 0;
  std::string shard;
};

/// Adds the subcommand to `app` with its options; when it is the one given, it runs after
/// parsing and its exit status lands in `status`.
void setup_derive(CLI::App& app, int& status);
int run_derive(const derive_options_cli& options);

}  // namespace tiers::cli
