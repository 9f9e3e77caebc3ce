// How two tiers are compared, shared by `tiers agree` and `tiers report`: the options and
// what they mean for the library.
#pragma once

#include <CLI/CLI.hpp>
#include <optional>
#include <string>
#include <vector>

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

/// The segment matching the options ask for; a bad --collar is a usage error, and a collar in
/// frames (`--collar 2f`) counts at `rate`.
segment_options segment_matching(const comparison_options& options,
                                 std::optional<rational> rate = std::nullopt);

/// The grid --step asks for over `tiers` (grid_over): a step in frames counts at `rate`.
time_grid step_grid(const comparison_options& options, std::optional<time_ns> media_duration,
                    const std::vector<const tier*>& tiers, std::optional<rational> rate);

/// Checks --step and --collar before any file is read (frames are taken on trust until the
/// rate is known).
void check_comparison_options(const comparison_options& options);

}  // namespace tiers::cli
