// The document model: media, tiers and annotations, shared by every format.
#pragma once

#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "tiers/time.hpp"

namespace tiers {

/// Name/value pairs, ordered by name. Keys a format cannot map to a field of its own are kept
/// here with the format's prefix (`vtt:line`), so that a round trip through json keeps them.
using attribute_map = std::map<std::string, std::string, std::less<>>;

/// What an annotation stands for in time.
enum class tier_kind : std::uint8_t {
  interval,  ///< each annotation spans [start, end)
  point,     ///< each annotation is an instant: start == end
};

/// Who made a tier.
enum class source_kind : std::uint8_t { human, machine };

/// The origin of a tier: a person or a program, with the program's name and version.
struct tier_source {
  source_kind kind = source_kind::human;
  std::optional<std::string> agent;    ///< e.g. the aligner or detector, or the annotator
  std::optional<std::string> version;  ///< of the agent
  friend bool operator==(const tier_source&, const tier_source&) = default;
};

/// How a child tier's annotations relate to its parent tier's.
enum class relation : std::uint8_t {
  within,     ///< each child lies inside some parent annotation
  partition,  ///< the children of a parent annotation cover it exactly, without gaps or overlaps
  refers,     ///< each child names one parent annotation by id (annotation::parent)
};

/// A child tier's link to its parent tier.
struct parent_link {
  std::string tier;  ///< the parent tier's name
  relation rel = relation::within;
  friend bool operator==(const parent_link&, const parent_link&) = default;
};

/// One labelled span or instant.
struct annotation {
  time_ns start = 0;
  time_ns end = 0;                    ///< equal to start in a point tier
  std::string text;                   ///< plain text
  std::optional<std::string> markup;  ///< the original formatted text, e.g. a cue's tags
  std::optional<double> confidence;   ///< in [0, 1]
  std::optional<std::string> id;
  std::optional<std::string> parent;  ///< id of the parent annotation, for relation::refers
  attribute_map attributes;
  friend bool operator==(const annotation&, const annotation&) = default;
};

/// A named layer of annotations of one kind.
struct tier {
  std::string name;
  tier_kind kind = tier_kind::interval;
  std::optional<parent_link> parent;
  std::optional<tier_source> source;
  std::optional<std::vector<std::string>> vocabulary;  ///< the allowed labels, when declared
  attribute_map attributes;
  std::vector<annotation> annotations;
  friend bool operator==(const tier&, const tier&) = default;
};

/// The recording the tiers describe.
struct media_info {
  std::optional<std::string> uri;
  std::optional<time_ns> duration;
  std::optional<rational> frame_rate;
  friend bool operator==(const media_info&, const media_info&) = default;
};

/// A set of tiers over one recording.
///
/// The model holds whatever a reader found. It guarantees only what its types guarantee
/// (times are representable, kinds and relations are from their lists); readers also reject
/// a confidence outside [0, 1]. Everything else — annotation order, overlaps, start after end,
/// unique tier names, parents that exist — is left to validation, so that `tiers check` can
/// report it rather than a reader refusing the file. See docs/model.md.
struct document {
  media_info media;
  attribute_map metadata;
  std::vector<tier> tiers;
  friend bool operator==(const document&, const document&) = default;
};

/// The first tier named `name`, or null.
const tier* find_tier(const document& doc, std::string_view name);
tier* find_tier(document& doc, std::string_view name);

std::string_view to_string(tier_kind kind);
std::string_view to_string(source_kind kind);
std::string_view to_string(relation rel);
std::optional<tier_kind> parse_tier_kind(std::string_view text);
std::optional<source_kind> parse_source_kind(std::string_view text);
std::optional<relation> parse_relation(std::string_view text);

}  // namespace tiers
