// 128-bit arithmetic for exact time: products of times, frame counts and rates, and rounding.
#pragma once

#include <limits>
#include <optional>

#include "tiers/time.hpp"

namespace tiers::detail {

__extension__ typedef __int128 i128;  // products of frame counts and rates need 128 bits

inline constexpr i128 time_max = std::numeric_limits<time_ns>::max();

/// n / d rounded to the nearest integer, ties away from zero; d > 0.
constexpr i128 round_div(i128 n, i128 d) {
  return n >= 0 ? (n + d / 2) / d : -((-n + d / 2) / d);
}

/// `v` as a time, when it fits (symmetrically: ±(2^63 − 1) ns).
constexpr std::optional<time_ns> to_time(i128 v) {
  if (v > time_max || v < -time_max) return std::nullopt;
  return static_cast<time_ns>(v);
}

}  // namespace tiers::detail
