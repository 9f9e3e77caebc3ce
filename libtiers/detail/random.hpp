// Seeded pseudo-random numbers that are the same on every machine and library: the permutation
// test's shifts and the review sample's keys (std::uniform_int_distribution is not portable).
#pragma once

#include <cstdint>

namespace tiers::detail {

/// SplitMix64 (Steele, Lea and Flood 2014): a well-mixed 64-bit sequence from any seed.
inline std::uint64_t splitmix(std::uint64_t& state) {
  std::uint64_t z = (state += 0x9e3779b97f4a7c15ULL);
  z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
  z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
  return z ^ (z >> 31);
}

/// A uniform integer in [0, n), without modulo bias worth the name (Lemire's multiply-shift).
inline std::uint64_t uniform_below(std::uint64_t& state, std::uint64_t n) {
  __extension__ typedef unsigned __int128 u128;
  const u128 x = static_cast<u128>(splitmix(state)) * n;
  return static_cast<std::uint64_t>(x >> 64);
}

}  // namespace tiers::detail
