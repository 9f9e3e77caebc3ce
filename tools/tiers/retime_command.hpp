// `tiers retime`: caption cues moved onto their words.
#pragma once

#include <CLI/CLI.hpp>
#include <memory>
#include <optional>
#include <string>

#include "cli_common.hpp"
#include "tiers/retime.hpp"

namespace tiers::cli {

struct retime_options_cli : retime_settings {
  input_options input;
  std::string dataset, output_dir;  ///< --dataset: each recording re-timed, into -d
  unsigned jobs = 0;
  std::string shard;
  std::string output, to, words, profile;
  bool json = false;
  bool allow_loss = false;
};

/// Adds the subcommand to `app` with its options; when it is the one given, it runs after
/// parsing and its exit status lands in `status`.
void setup_retime(CLI::App& app, int& status);
int run_retime(const retime_options_cli& options);

}  // namespace tiers::cli
