// `tiers check`: validate files or whole folders against the rules and a profile.
#pragma once

#include <CLI/CLI.hpp>
#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "check_run.hpp"

namespace tiers::cli {

/// Adds the subcommand to `app` with its options; when it is the one given, it runs after
/// parsing and its exit status lands in `status`.
void setup_check(CLI::App& app, int& status);
int run_check(const check_options& options);

}  // namespace tiers::cli
