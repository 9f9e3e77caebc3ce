// `tiers dataset FILE.json [--json]`: the recordings a description finds, what each has and
// lacks; `tiers dataset --source PATTERN… -o FILE.json`: a description from patterns.
#pragma once

#include <CLI/CLI.hpp>
#include <string>
#include <vector>

#include "cli_common.hpp"

namespace tiers::cli {

struct dataset_options {
  std::string description;
  std::vector<std::string> patterns;  ///< --source: write a description with these
  std::string output;
  std::string format = "text";
  bool json = false;
  unsigned jobs = 0;
};

/// Adds the subcommand to `app` with its options; when it is the one given, it runs after
/// parsing and its exit status lands in `status`.
void setup_dataset(CLI::App& app, int& status);
int run_dataset(const dataset_options& options);

}  // namespace tiers::cli
