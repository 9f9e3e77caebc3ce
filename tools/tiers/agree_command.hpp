// `tiers agree`: a candidate tier against a reference tier, or several annotators together.
#pragma once

#include <CLI/CLI.hpp>
#include <memory>
#include <string>
#include <vector>

#include "cli_common.hpp"
#include "tiers/agree.hpp"

namespace tiers::cli {

/// How two tiers are compared, in `tiers agree` and in `tiers report`'s agreement strip: the
/// time grid's step and how segments match.
struct comparison_options {
  std::string step = "10ms";
  std::string match = "boundaries";
  std::string collar = "200ms";
  double min_overlap = 0.5;
  bool any_label = false;
};

/// Adds --step, --match, --collar, --min-overlap and --any-label.
void add_comparison_options(CLI::App& cmd, comparison_options& options);

/// The segment matching the options ask for; a bad --collar is a usage error.
segment_options segment_matching(const comparison_options& options);

struct agree_options {
  input_options input;  ///< reading options for both files (path unused)
  std::vector<std::string> paths;
  std::string tier, ref_tier, cand_tier, tiers;
  comparison_options compare;
  double min_confidence = 0;
  bool json = false;
};

/// Adds the subcommand to `app` with its options; when it is the one given, it runs after
/// parsing and its exit status lands in `status`.
void setup_agree(CLI::App& app, int& status);
int run_agree(const agree_options& options);

}  // namespace tiers::cli
