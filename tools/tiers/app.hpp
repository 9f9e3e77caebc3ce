// The whole command line of `tiers` as one CLI11 definition: what `main` parses, and what the
// manual pages and the shell completion are generated from, so that none of them can drift.
#pragma once

#include <CLI/CLI.hpp>

namespace tiers::cli {

/// Sets up `app` as `tiers`: its description, --version, and every subcommand (in the order
/// `tiers --help` lists them). A command that runs sets `status`.
void define_app(CLI::App& app, int& status);

}  // namespace tiers::cli
