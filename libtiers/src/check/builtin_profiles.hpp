// The profiles that come with tiers, compiled in from profiles/*.json (see cmake/embed.cmake).
#pragma once

#include <span>
#include <string_view>

namespace tiers::detail {

struct builtin_profile {
  std::string_view name;  ///< the file's stem
  std::string_view text;  ///< its JSON
};

std::span<const builtin_profile> builtin_profile_table();

}  // namespace tiers::detail
