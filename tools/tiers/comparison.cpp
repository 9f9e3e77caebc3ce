// The comparison options of `tiers agree` and `tiers report`, as command-line options.
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

}  // namespace tiers::cli
