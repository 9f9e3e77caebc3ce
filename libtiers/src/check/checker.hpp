// The checker of one document: shared state and the emitting of problems; the rules live in
// check_*.cpp by group.
#pragma once

#include <string>
#include <vector>

#include "tiers/check.hpp"

namespace tiers::detail {

inline constexpr std::size_t no_index = static_cast<std::size_t>(-1);

class checker {
 public:
  checker(const document& doc, const source_map& positions, const std::string& file,
          const profile& p, const check_context& context, file_report& out);

  void run();

  // The groups of rules, one file each.
  void check_time(std::size_t t);        // check_time.cpp
  void check_tier_spans(std::size_t t);  // check_time.cpp: overlaps and gaps
  void check_names();                    // check_time.cpp
  void check_structure(std::size_t t);   // check_structure.cpp
  void check_text(std::size_t t);        // check_text.cpp
  void check_captions(std::size_t t);    // check_text.cpp
  void check_lag(std::size_t t);         // check.cpp
  void check_profile();                  // check.cpp

  bool on(std::string_view rule) const { return profile_.level(rule) != rule_level::off; }
  /// Reports `rule` about annotation `a` of tier `t` (a == no_index: the tier; t == no_index:
  /// the file).
  problem* emit(std::string_view rule, std::size_t t, std::size_t a, std::string message);
  /// Where an annotation or tier is, as "line 12" for messages, or empty.
  std::string where(std::size_t t, std::size_t a) const;

  const document& doc_;
  const source_map& positions_;
  const std::string& file_;
  const profile& profile_;
  const check_context& context_;
  file_report& out_;
  std::size_t captions_ = no_index;  ///< the caption tier
  time_ns min_gap_ = 0;              ///< caption.gap at the media's frame rate
};

/// Problems in the order of the file: those without a line (about the file) first.
void sort_problems(std::vector<problem>& problems);

/// `00:01:02.500`: times in messages, to the millisecond.
std::string clock(time_ns t);
/// `1.5 s`, `0.04 s`: durations in messages, as few decimals as needed (up to ms).
std::string seconds(time_ns t);
/// `23.4`: a measured number with one decimal, or none when it is whole.
std::string number(double v);

}  // namespace tiers::detail
