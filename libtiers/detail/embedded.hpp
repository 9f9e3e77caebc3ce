// Files compiled into the library by cmake/embed.cmake: the built-in check profiles, and the
// style and script of the HTML report and of the review page.
#pragma once

#include <span>
#include <string_view>

namespace tiers::detail {

struct embedded_file {
  std::string_view name;  ///< the file's stem (profiles) or name (report assets)
  std::string_view text;
};

/// The text of the file called `name` in `table`; empty when there is none.
inline std::string_view embedded_text(std::span<const embedded_file> table, std::string_view name) {
  for (const embedded_file& f : table)
    if (f.name == name) return f.text;
  return {};
}

/// profiles/*.json, by stem.
std::span<const embedded_file> builtin_profile_table();

/// libtiers/src/report/report.{css,js}, by name.
std::span<const embedded_file> report_asset_table();

/// libtiers/src/review/review.{css,js}, by name.
std::span<const embedded_file> review_asset_table();

}  // namespace tiers::detail
