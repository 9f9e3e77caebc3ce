// Files compiled into the library by cmake/embed.cmake: the built-in check profiles, and the
// style and script of the HTML report.
#pragma once

#include <span>
#include <string_view>

namespace tiers::detail {

struct embedded_file {
  std::string_view name;  ///< the file's stem (profiles) or name (report assets)
  std::string_view text;
};

/// profiles/*.json, by stem.
std::span<const embedded_file> builtin_profile_table();

/// libtiers/src/report/report.{css,js}, by name.
std::span<const embedded_file> report_asset_table();

}  // namespace tiers::detail
