// `tiers agree`: a candidate tier against a reference tier, or several annotators together.
#pragma once

#include <CLI/CLI.hpp>
#include <memory>
#include <string>
#include <vector>

#include "cli_common.hpp"
#include "comparison.hpp"
#include "table_output.hpp"
#include "tiers/agree.hpp"

namespace tiers::cli {

struct agree_options {
  input_options input;  ///< reading options for both files (path unused)
  std::vector<std::string> paths;
  std::string dataset;  ///< a dataset description: each recording, and all pooled
  unsigned jobs = 0;
  std::string shard;     ///< with --dataset: part K of N of the recordings
  bool combine = false;  ///< the files are JSON reports of shards, to pool
  std::string tier, ref_tier, cand_tier, tiers;
  comparison_options compare;
  double min_confidence = 0;
  std::string empty = "missing";     ///< --empty: what a frame without annotation is to alpha
  std::optional<std::string> sweep;  ///< --sweep [STEP]: "" for every distinct confidence
  std::optional<double> target_precision;
  report_output out;
};

/// Adds the subcommand to `app` with its options; when it is the one given, it runs after
/// parsing and its exit status lands in `status`.
void setup_agree(CLI::App& app, int& status);
int run_agree(const agree_options& options);

}  // namespace tiers::cli
