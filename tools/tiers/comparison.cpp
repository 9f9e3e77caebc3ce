// The comparison options of `tiers agree` and `tiers report`.
#include "comparison.hpp"

#include "cli_common.hpp"

namespace tiers::cli {

void add_comparison_options(CLI::App& cmd, comparison_options& o) {
  cmd.add_option("--step", o.step,
                 "The time grid's step (default 10ms; in video frames, exactly: 1f)")
      ->type_name("DURATION");
  cmd.add_option("--match", o.match,
                 "Segments match by boundaries (default: onset and offset within --collar) or "
                 "by overlap (at least --min-overlap of their union)")
      ->check(one_of(segment_options::criterion_names))
      ->type_name("HOW");
  cmd.add_option("--collar", o.collar,
                 "Boundary tolerance for --match boundaries (200ms, or frames: 5f)")
      ->type_name("DURATION");
  cmd.add_option("--min-overlap", o.min_overlap, "Least overlap ratio for --match overlap (0.5)")
      ->check(CLI::Range(0.0, 1.0))
      ->type_name("X");
  cmd.add_flag("--any-label", o.any_label, "Segments match whatever their labels");
}

segment_options segment_matching(const comparison_options& o, std::optional<rational> rate) {
  segment_options matching;
  if (!o.match.empty()) matching.by = named(segment_options::criterion_names, o.match);
  matching.collar = parse_duration_option("--collar", o.collar, duration_kind::positive, rate);
  matching.min_overlap = o.min_overlap;
  matching.same_label = !o.any_label;
  return matching;
}

time_grid step_grid(const comparison_options& o, std::optional<time_ns> media_duration,
                    const std::vector<const tier*>& tiers, std::optional<rational> rate) {
  const duration_arg step = parse_duration_arg("--step", o.step, duration_kind::positive);
  return grid_over(media_duration, tiers, step.at(rate), step.frames(), rate.value_or(rational{}));
}

void check_comparison_options(const comparison_options& o) {
  parse_duration_arg("--step", o.step, duration_kind::positive);
  parse_duration_arg("--collar", o.collar, duration_kind::positive);
}

}  // namespace tiers::cli
