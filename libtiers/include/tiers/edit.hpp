// Time operations on a whole document, exact in nanoseconds: shift, scale between frame rates,
// snap to a frame grid, cut a range; and selecting, dropping and renaming tiers.
#pragma once

#include <string>
#include <vector>

#include "tiers/diagnostic.hpp"
#include "tiers/model.hpp"

namespace tiers {

/// Each operation changes `doc` in place and returns no diagnostics, or the error that stopped
/// it (and then leaves `doc` as it was): `time.range` when a time would leave the range of
/// time_ns, `edit.range` for an empty cut, `edit.tier` for a tier that is not there (the message
/// lists the tiers that are) and `edit.exists` for a new name that is taken. Diagnostics carry
/// no file: the caller knows which document it edited.

/// Adds `offset` to every time. The media's duration stays: the recording is the same.
[[nodiscard]] std::vector<diagnostic> shift_times(document& doc, time_ns offset);

/// Material timed at frame rate `from` played at `to`: every time t becomes t × from / to,
/// rounded to the nearest nanosecond (ties away from zero); so does the media's duration, and a
/// media frame rate equal to `from` becomes `to`. From 25 to 24000/1001 and back, times on the
/// 25 fps frame grid come back exactly.
[[nodiscard]] std::vector<diagnostic> scale_times(document& doc, rational from, rational to);

/// Moves every time to the nearest frame boundary at `rate` (halfway rounds away from zero).
[[nodiscard]] std::vector<diagnostic> snap_times(document& doc, rational rate);

/// Keeps what lies in [start, end): intervals that overlap it, clipped to it; instants inside it.
/// With `from_zero`, `start` becomes zero and the media's duration end − start (at most what is
/// left of it).
[[nodiscard]] std::vector<diagnostic> cut_times(document& doc, time_ns start, time_ns end,
                                                bool from_zero);

/// Tier operations: keep only `names` (in document order); drop `name`; rename `from` to `to`
/// (parents that name it follow).
[[nodiscard]] std::vector<diagnostic> select_tiers(document& doc,
                                                   const std::vector<std::string>& names);
[[nodiscard]] std::vector<diagnostic> drop_tier(document& doc, const std::string& name);
[[nodiscard]] std::vector<diagnostic> rename_tier(document& doc, const std::string& from,
                                                  const std::string& to);

/// One operation as options give it (`tiers edit --shift -0.48s`, Python's tiers.edit):
/// `shift` (an offset: `-0.48s`, `2f`), `scale` (`FROM:TO` frame rates), `snap` (a rate),
/// `cut` (`START..END`, seconds or clock times), `drop` (a tier), `rename` (`OLD=NEW`), or
/// `select` (the tiers to keep: every value given together).
struct edit_step {
  std::string operation;
  std::vector<std::string> values;  ///< one, but for `select`
};

/// Applies `step` to `doc` as the operation above does; a frame offset counts at the
/// document's rate, else at `rate_setting`; a cut with `from_zero` starts the document at the
/// cut. Throws usage_error on a malformed value or an unknown operation.
[[nodiscard]] std::vector<diagnostic> apply_edit(document& doc, const edit_step& step,
                                                 const std::string& rate_setting = {},
                                                 bool from_zero = false);

}  // namespace tiers
