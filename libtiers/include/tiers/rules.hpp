// The rule catalogue of `tiers check`: every kind of problem a check reports, each with a stable
// id, a group, a default severity and a one-line summary (docs/rules.md has the reasons).
#pragma once

#include <cstdint>
#include <optional>
#include <span>
#include <string_view>

#include "tiers/diagnostic.hpp"

namespace tiers {

/// How seriously a rule is taken: a severity, or not checked at all.
enum class rule_level : std::uint8_t { off, note, warning, error };

std::string_view to_string(rule_level level);
/// `off`, `note`, `warning` or `error`.
std::optional<rule_level> parse_rule_level(std::string_view text);
/// The severity of a level other than off.
severity severity_of(rule_level level);

struct rule_info {
  std::string_view id;       ///< lower-case words joined by `.` or `-`; stable once released
  std::string_view group;    ///< time, tier, structure, text, caption, lag, dataset, read
  rule_level level;          ///< the default
  std::string_view summary;  ///< one line, lower case (thresholds: rule_thresholds())
};

/// Every rule, grouped, in a fixed order. Rules of group `read` are the readers' own
/// diagnostics, listed so that reports can describe every id they contain.
std::span<const rule_info> rules();
const rule_info* find_rule(std::string_view id);

}  // namespace tiers
