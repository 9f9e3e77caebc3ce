// `tiers cooccur`: which labels of one tier go with which labels of another, over a corpus.
#pragma once

#include <CLI/CLI.hpp>
#include <cstdint>
#include <memory>
#include <string>
#include <vector>

#include "cli_common.hpp"
#include "table_output.hpp"
#include "tiers/cooccur.hpp"

namespace tiers::cli {

struct cooccur_options_cli : cooccur_settings {
  input_options input;             ///< reading options for every file (path unused)
  std::vector<std::string> paths;  ///< files or folders
  std::string dataset;
  unsigned jobs = 0;
  std::string shard;     ///< K/N: count part of the files or recordings, for --combine
  bool combine = false;  ///< the inputs are the counts of shards, to add up
  std::string pairs;     ///< with --shard and --permutations: the pairs to shift (a combined table)
  std::string concordance;  ///< every co-occurrence of the pairs shown, as CSV
  std::size_t context = 3;  ///< A's annotations before and after, in the concordance
  report_output out;
};

/// Adds the subcommand to `app` with its options; when it is the one given, it runs after
/// parsing and its exit status lands in `status`.
void setup_cooccur(CLI::App& app, int& status);
int run_cooccur(const cooccur_options_cli& options);

}  // namespace tiers::cli
