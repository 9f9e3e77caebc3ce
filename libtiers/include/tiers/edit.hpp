// Time operations on a whole document, exact in nanoseconds: shift, scale between frame rates,
// snap to a frame grid, cut a range; and selecting, dropping and renaming tiers.
#pragma once

#include <optional>
#include <string>
#include <vector>

#include "tiers/model.hpp"

namespace tiers {

/// Each operation changes `doc` in place and returns nothing, or the reason it could not be
/// done (and then leaves `doc` as it was).

/// Adds `offset` to every time. The media's duration stays: the recording is the same.
std::optional<std::string> shift_times(document& doc, time_ns offset);

/// Material timed at frame rate `from` played at `to`: every time t becomes t × from / to,
/// rounded to the nearest nanosecond (ties away from zero); so does the media's duration, and a
/// media frame rate equal to `from` becomes `to`. From 25 to 24000/1001 and back, times on the
/// 25 fps frame grid come back exactly.
std::optional<std::string> scale_times(document& doc, rational from, rational to);

/// Moves every time to the nearest frame boundary at `rate` (halfway rounds away from zero).
std::optional<std::string> snap_times(document& doc, rational rate);

/// Keeps what lies in [start, end): intervals that overlap it, clipped to it; instants inside it.
/// With `from_zero`, `start` becomes zero and the media's duration end − start (at most what is
/// left of it).
std::optional<std::string> cut_times(document& doc, time_ns start, time_ns end, bool from_zero);

/// Tier operations: keep only `names` (in document order); drop `name`; rename `from` to `to`
/// (parents that name it follow).
std::optional<std::string> select_tiers(document& doc, const std::vector<std::string>& names);
std::optional<std::string> drop_tier(document& doc, const std::string& name);
std::optional<std::string> rename_tier(document& doc, const std::string& from,
                                       const std::string& to);

}  // namespace tiers
