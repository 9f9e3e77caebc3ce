// Summaries of a document: what `tiers info` reports.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "tiers/model.hpp"
#include "tiers/sink.hpp"

namespace tiers {

struct tier_summary {
  std::string name;
  tier_kind kind = tier_kind::interval;
  std::optional<tier_source> source;
  std::size_t annotations = 0;
  std::optional<time_ns> start;    ///< earliest start, when there are annotations
  std::optional<time_ns> end;      ///< latest end
  time_ns annotated = 0;           ///< length of the union of all intervals (overlaps once)
  std::optional<double> coverage;  ///< annotated / reference length, when that is positive
};

struct document_summary {
  media_info media;
  std::optional<time_ns> start;  ///< over all tiers
  std::optional<time_ns> end;
  /// What coverage is relative to: the media duration, else the span of all tiers.
  time_ns reference = 0;
  bool reference_is_media = false;
  std::vector<tier_summary> tiers;
};

document_summary summarize(const document& doc);

/// The summary as one JSON object (docs/cli.md, "info"): times in exact seconds, coverage as a
/// fraction. `path` names the file it describes.
void write_summary_json(const document_summary& summary, std::string_view path, byte_sink& out);

}  // namespace tiers
