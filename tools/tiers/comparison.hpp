// How two tiers are compared, shared by `tiers agree` and `tiers report`: the options (the
// library's comparison_settings say what they mean).
#pragma once

#include <CLI/CLI.hpp>

#include "tiers/agree.hpp"

namespace tiers::cli {

using comparison_options = comparison_settings;

/// Adds --step, --match, --collar, --min-overlap and --any-label.
void add_comparison_options(CLI::App& cmd, comparison_options& options);

}  // namespace tiers::cli
