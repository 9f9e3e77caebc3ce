// Eight bytes at a time: the word tests the scanners share to skip bytes they need not look at.
#pragma once

#include <bit>
#include <cstddef>
#include <cstdint>
#include <cstring>
#include <string_view>

namespace tiers::detail::swar {

/// Whether `first_flag` may be used: on a big-endian machine the scanners go byte by byte.
inline constexpr bool fast = std::endian::native == std::endian::little;

inline constexpr std::uint64_t ones = 0x0101010101010101ULL;
inline constexpr std::uint64_t highs = 0x8080808080808080ULL;

/// The eight bytes at `p`, the first in the lowest byte on a little-endian machine.
inline std::uint64_t load(const char* p) {
  std::uint64_t w;
  std::memcpy(&w, p, 8);
  return w;
}

/// The high bit of each byte of `w` equal to `c` — the classic test for a zero byte, applied to
/// w ^ c: a borrow may also flag bytes after the first true one, never before it, so the lowest
/// flag and whether there is one are exact.
inline std::uint64_t equal(std::uint64_t w, unsigned char c) {
  const std::uint64_t x = w ^ (ones * c);
  return (x - ones) & ~x & highs;
}

/// The high bit of each byte of `w` below `c` (at most 0x80), exact in the same way.
inline std::uint64_t below(std::uint64_t w, unsigned char c) {
  return (w - ones * c) & ~w & highs;
}

/// The index in its word of the lowest flagged byte (`flags` not zero; `fast` only).
inline std::size_t first_flag(std::uint64_t flags) {
  return static_cast<std::size_t>(std::countr_zero(flags)) / 8;
}

/// How many bytes of `s` are `c`: exact flags (no borrow crosses a byte) counted a word at a time.
inline std::size_t count(std::string_view s, char c) {
  constexpr std::uint64_t lows = ~highs;
  std::size_t n = 0, k = 0;
  for (; k + 8 <= s.size(); k += 8) {
    const std::uint64_t x = load(s.data() + k) ^ (ones * static_cast<unsigned char>(c));
    n += static_cast<std::size_t>(std::popcount(~(((x & lows) + lows) | x | lows)));
  }
  for (; k < s.size(); ++k)
    n += s[k] == c;
  return n;
}

}  // namespace tiers::detail::swar
