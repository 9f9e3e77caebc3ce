// How two tiers are compared, from the options as given.
#include "tiers/agree.hpp"
#include "tiers/inputs.hpp"

namespace tiers {

segment_options segment_matching(const comparison_settings& o, std::optional<rational> rate) {
  segment_options matching;
  if (!o.match.empty()) {
    const auto by = value_named(segment_options::criterion_names, o.match);
    if (!by)
      throw usage_error("--match: '" + o.match + "' is not " +
                        quoted_names(segment_options::criterion_names));
    matching.by = *by;
  }
  matching.collar = parse_duration_option("--collar", o.collar, duration_kind::positive, rate);
  if (!(o.min_overlap >= 0 && o.min_overlap <= 1))
    throw usage_error("--min-overlap: " + std::to_string(o.min_overlap) + " is not from 0 to 1");
  matching.min_overlap = o.min_overlap;
  matching.same_label = !o.any_label;
  return matching;
}

time_grid step_grid(const comparison_settings& o, std::optional<time_ns> media_duration,
                    const std::vector<const tier*>& tiers, std::optional<rational> rate) {
  const duration_arg step = parse_duration_arg("--step", o.step, duration_kind::positive);
  return grid_over(media_duration, tiers, step.at(rate), step.frames(), rate.value_or(rational{}));
}

void check_comparison_settings(const comparison_settings& o) {
  parse_duration_arg("--step", o.step, duration_kind::positive);
  if (parse_duration_arg("--collar", o.collar, duration_kind::positive).in_frames()) return;
  segment_matching(o);
}

comparison_frame comparison_for(const comparison_settings& o,
                                const std::vector<const document*>& docs,
                                const std::vector<const tier*>& tiers,
                                const std::string& rate_setting) {
  std::optional<time_ns> media;
  std::optional<rational> rate;
  for (const document* d : docs) {
    if (d->media.duration) media = std::max(media.value_or(0), *d->media.duration);
    if (!rate) rate = frame_rate_of(*d, rate_setting);
  }
  return {step_grid(o, media, tiers, rate), segment_matching(o, rate)};
}

tier at_least_confident(const tier& t, double least) {
  tier kept = t;
  std::erase_if(kept.annotations,
                [&](const annotation& a) { return a.confidence && *a.confidence < least; });
  return kept;
}

}  // namespace tiers
