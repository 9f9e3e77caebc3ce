// Check profiles: what a dataset requires of every file, and how strictly each rule applies.
#pragma once

#include <cstddef>
#include <cstdint>
#include <map>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "tiers/diagnostic.hpp"
#include "tiers/lag.hpp"
#include "tiers/model.hpp"
#include "tiers/rules.hpp"
#include "tiers/time.hpp"

namespace tiers {

/// The thresholds of the rules that measure something. The defaults are common practice in
/// broadcasters' published guidelines, or the trade's rule of thumb; docs/rules.md gives each
/// one's source.
struct check_limits {
  double max_cps = 20;                       ///< caption.cps: characters per second
  double max_wpm = 160;                      ///< caption.wpm: words per minute
  std::size_t max_line_length = 42;          ///< caption.line-length: characters
  std::size_t max_lines = 2;                 ///< caption.lines
  time_ns min_duration = 833'333'333;        ///< caption.min-duration: 5/6 s
  time_ns max_duration = 7 * ns_per_second;  ///< caption.max-duration
  duration_value min_gap{0, 2};              ///< caption.gap: two frames
  time_ns max_late = 3 * ns_per_second;      ///< lag.late
  time_ns max_early = 1'500'000'000;         ///< lag.early
  double min_coverage = 0.9;                 ///< lag.coverage
  double caps_share = 0.98;                  ///< text.all-caps: share of upper-case letters
  std::size_t caps_min_letters = 20;         ///< text.all-caps: letters needed to judge
  lag_window window;                         ///< where a cue looks for its words
  rational frame_rate{25, 1};                ///< for thresholds in frames, when the media has none
};

/// How a threshold is written in a profile, and what values it takes.
enum class threshold_kind : std::uint8_t {
  number,    ///< a number above 0
  share,     ///< a number above 0 and at most 1
  count,     ///< a whole number, 1 or more
  duration,  ///< a duration (`1.5s`, `250ms`, `2f`), in time once read
  frames,    ///< a duration kept as written, so that `2f` follows each file's frame rate
};

/// One threshold of a rule: the key a profile sets it with, what it measures, and the member
/// of check_limits it sets (the one of the kind's type). This table is the only place a
/// threshold is named: profiles are read by it, `--list-rules`, SARIF reports and profile
/// digests give thresholds by it, and a unit test holds it against the profile schema.
struct rule_threshold {
  std::string_view rule;
  std::string_view key;
  std::string_view meaning;
  threshold_kind kind;
  double check_limits::*number = nullptr;          ///< number, share
  std::size_t check_limits::*count = nullptr;      ///< count
  time_ns check_limits::*time = nullptr;           ///< duration
  duration_value check_limits::*frames = nullptr;  ///< frames
};

/// Every threshold, in the catalogue's order of rules.
std::span<const rule_threshold> rule_thresholds();

/// A tier the profile declares, and what it must be like.
struct tier_spec {
  std::string name;
  bool required = true;
  std::optional<tier_kind> kind;
  std::optional<parent_link> parent;
  std::optional<std::vector<std::string>> vocabulary;
  bool overlaps = false;    ///< its annotations may overlap one another
  bool contiguous = false;  ///< its annotations must follow one another without gaps
};

/// A check profile. Default-constructed, it checks with the catalogue's defaults.
struct profile {
  std::string name;  ///< the built-in name or the file it was read from
  std::string description;
  std::vector<tier_spec> tiers;
  std::optional<std::string> captions;                      ///< the caption tier's name
  std::optional<std::string> words;                         ///< the word-timing tier's name
  std::map<std::string, rule_level, std::less<>> levels;    ///< severities set by the profile
  std::map<std::string, std::string, std::less<>> sources;  ///< rule id -> source of its values
  check_limits limits;

  /// The severity of `rule`: the profile's, else the catalogue's default.
  rule_level level(std::string_view rule) const;
  const tier_spec* find_tier(std::string_view tier_name) const;
};

/// A threshold of a rule as a profile sets it: `max` 20, `min` "2f". `json` is the value as a
/// JSON literal (a number, or a string for durations), `text` as people read it.
struct rule_parameter {
  std::string name;
  std::string json;
  std::string text;
};

/// The thresholds of `rule` under `limits` (none for rules without one).
std::vector<rule_parameter> rule_parameters(std::string_view rule, const check_limits& limits);

/// What a report records of the profile it was checked with: its name and a digest of what it
/// sets (every rule's level and thresholds, the tiers it declares, its roles and windows), so
/// that reports made with different profiles, or the same name changed, are told apart.
struct profile_identity {
  std::string name;
  std::string digest;  ///< "fnv1a64:" and 16 hex digits, of the profile's effective settings
  friend bool operator==(const profile_identity&, const profile_identity&) = default;
};
profile_identity identify(const profile& p);

/// The profiles that come with tiers (profiles/ in the source tree), by name.
std::vector<std::string_view> builtin_profiles();

/// Reads a profile: a built-in name, else a file. `extends` in a file names a built-in profile
/// or a file in the same folder or below (never outside it). Problems are located in the file
/// they are in; when one is an error the profile must not be used.
using profile_result = result<profile>;
profile_result load_profile(const std::string& name_or_path);

/// Reads a profile from JSON text (`file` names it in messages and resolves `extends`).
profile_result read_profile(std::string_view text, const std::string& file);

}  // namespace tiers
