// TTML2 time expressions (§10.3.1 "<time-expression>") and timing parameters, exactly.
#pragma once

#include <cstdint>
#include <optional>
#include <string_view>

#include "tiers/time.hpp"

namespace tiers::detail::ttml {

/// The timing parameters of a document (TTML2 §7.2): frame rate 30, multiplier 1:1, sub-frame
/// rate 1; tick rate the effective frame rate × sub-frame rate when a frame rate is given,
/// else 1.
struct timing_parameters {
  rational frame_rate{30, 1};  ///< the effective frame rate: ttp:frameRate × multiplier
  bool frame_rate_given = false;
  std::int64_t sub_frame_rate = 1;
  rational tick_rate{1, 1};
};

/// Reads ttp:frameRate, ttp:frameRateMultiplier ("1000 1001"), ttp:subFrameRate and
/// ttp:tickRate; an empty view means the attribute is absent. Returns the problem, if any.
std::optional<std::string_view> read_parameters(std::string_view frame_rate,
                                                std::string_view multiplier,
                                                std::string_view sub_frame_rate,
                                                std::string_view tick_rate, timing_parameters& out);

/// A clock-time (`hh:mm:ss.fraction`, `hh:mm:ss:frames.subframes`) or an offset-time
/// (`count[.fraction](h|m|s|ms|f|t)`), to the nearest nanosecond. Media time per TTML2 §10.3:
/// 3600h + 60m + s + (frames + subFrames / subFrameRate) / effective frame rate.
std::optional<time_ns> parse_time_expression(std::string_view text, const timing_parameters& p);

}  // namespace tiers::detail::ttml
