// 128-bit arithmetic for exact time: products of times, frame counts and rates, and rounding.
#pragma once

#include <limits>
#include <optional>

#include "tiers/time.hpp"

namespace tiers::detail {

__extension__ typedef __int128 i128;  // products of frame counts and rates need 128 bits

inline constexpr i128 time_max = std::numeric_limits<time_ns>::max();

/// a + b, or nothing when the sum lies beyond what time_ns holds (a reader reports time.range).
inline std::optional<time_ns> add_times(time_ns a, time_ns b) {
  time_ns r = 0;
  if (__builtin_add_overflow(a, b, &r)) return std::nullopt;
  return r;
}

/// a + b, held at the range's ends: for bounds of a search window, never for a time kept.
inline time_ns saturating_add(time_ns a, time_ns b) {
  return add_times(a, b).value_or(b > 0 ? std::numeric_limits<time_ns>::max()
                                        : std::numeric_limits<time_ns>::min());
}

/// a − b, held within ±time_max (so that its std::abs is defined): two times far apart differ
/// by more than time_ns holds.
inline time_ns saturating_difference(time_ns a, time_ns b) {
  const i128 d = static_cast<i128>(a) - b;
  return static_cast<time_ns>(d > time_max ? time_max : d < -time_max ? -time_max : d);
}

/// n / d rounded to the nearest integer, ties away from zero; d > 0.
constexpr i128 round_div(i128 n, i128 d) {
  return n >= 0 ? (n + d / 2) / d : -((-n + d / 2) / d);
}

/// `v` as a time, when it fits (symmetrically: ±(2^63 − 1) ns).
constexpr std::optional<time_ns> to_time(i128 v) {
  if (v > time_max || v < -time_max) return std::nullopt;
  return static_cast<time_ns>(v);
}

/// n / d rounded towards minus infinity, and towards plus infinity; d > 0.
constexpr i128 floor_div(i128 n, i128 d) {
  return n >= 0 ? n / d : -((-n + d - 1) / d);
}
constexpr i128 ceil_div(i128 n, i128 d) {
  return -floor_div(-n, d);
}

enum class rounding : unsigned char { nearest, down, up };

/// `t` counted in steps of 1/`rate` seconds (frames, milliseconds), rounded as asked.
constexpr i128 to_steps(i128 t, rational rate, rounding how = rounding::nearest) {
  const i128 n = t * rate.num, d = static_cast<i128>(rate.den) * ns_per_second;
  return how == rounding::nearest ? round_div(n, d)
         : how == rounding::down  ? floor_div(n, d)
                                  : ceil_div(n, d);
}

/// The time of `steps` steps of 1/`rate` seconds, to the nearest nanosecond.
constexpr i128 from_steps(i128 steps, rational rate) {
  return round_div(steps * rate.den * ns_per_second, rate.num);
}

}  // namespace tiers::detail
