// FNV-1a, 64 bits (Fowler, Noll and Vo's published parameters): a digest to tell texts apart
// (a profile's settings, a recording's name for its random shifts), not a cryptographic one.
#pragma once

#include <cstdint>
#include <string_view>

namespace tiers::detail {

inline std::uint64_t fnv1a64(std::string_view text) {
  std::uint64_t h = 0xcbf29ce484222325ULL;
  for (char c : text) {
    h ^= static_cast<unsigned char>(c);
    h *= 0x100000001b3ULL;
  }
  return h;
}

}  // namespace tiers::detail
