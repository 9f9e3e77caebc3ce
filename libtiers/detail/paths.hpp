// Telling a file's kind from its name: the one case-insensitive extension test of the library.
#pragma once

#include <algorithm>
#include <span>
#include <string_view>

namespace tiers::detail {

/// Whether `path` ends with one of `extensions` (each with its dot, lower case), ignoring the
/// case of ASCII letters.
inline bool has_extension(std::string_view path, std::span<const std::string_view> extensions) {
  auto lower = [](char c) { return c >= 'A' && c <= 'Z' ? static_cast<char>(c + 32) : c; };
  return std::any_of(extensions.begin(), extensions.end(), [&](std::string_view ext) {
    return path.size() >= ext.size() &&
           std::equal(ext.begin(), ext.end(), path.end() - static_cast<long>(ext.size()),
                      [&](char e, char p) { return e == lower(p); });
  });
}

}  // namespace tiers::detail
