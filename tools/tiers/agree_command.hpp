// `tiers agree`: a candidate tier against a reference tier, or several annotators together.
#pragma once

#include <CLI/CLI.hpp>
#include <string>
#include <vector>

#include "cli_common.hpp"

namespace tiers::cli {

struct agree_options {
  input_options input;  ///< reading options for both files (path unused)
  std::vector<std::string> paths;
  std::string tier, ref_tier, cand_tier, tiers;
  std::string step = "10ms";
  std::string match = "boundaries";
  std::string collar = "200ms";
  double min_overlap = 0.5;
  double min_confidence = 0;
  bool any_label = false;
  bool json = false;
};

/// Adds the subcommand to `app`; its options land in `options`.
CLI::App* setup_agree(CLI::App& app, agree_options& options);
int run_agree(const agree_options& options);

}  // namespace tiers::cli
