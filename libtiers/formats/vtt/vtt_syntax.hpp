// WebVTT syntax shared by the reader and the writer: timestamps, cue settings, cue text and
// character references, each as the W3C WebVTT specification defines it (sections cited).
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "detail/markup.hpp"
#include "tiers/model.hpp"
#include "tiers/time.hpp"

namespace tiers::detail::vtt {

/// Lines end at LF, CR or CRLF (§6.1 step 1 normalises them all to LF).
struct line_reader {
  std::string_view in;
  std::size_t pos = 0;
  bool at_end() const { return pos >= in.size(); }
  /// The line at `pos` without its terminator; moves past the terminator. `ended` tells
  /// whether a terminator was there (false: the input ended).
  std::string_view next(bool& ended);
};

/// "Collect a WebVTT timestamp" (§6.3): `[h…:]mm:ss.ttt`, reading from `pos` in `in` and
/// advancing it. The first field is hours when it is not two digits or is above 59. A timestamp
/// that is well-formed but beyond what time_ns holds sets `*out_of_range` when given.
std::optional<time_ns> collect_timestamp(std::string_view in, std::size_t& pos,
                                         bool* out_of_range = nullptr);

/// `hh:mm:ss.ttt`; `t` must be a whole number of milliseconds, zero or more.
std::string format_timestamp(time_ns t);

/// ASCII whitespace as HTML defines it: tab, LF, FF, CR, space.
inline bool is_space(char c) {
  return c == ' ' || c == '\t' || c == '\n' || c == '\f' || c == '\r';
}

/// The names a cue setting may have, in the order the writer puts them (region last: an
/// earlier vertical, line or size setting takes a cue out of its region, §6.3).
inline constexpr std::string_view setting_names[] = {"vertical", "line",  "position",
                                                     "size",     "align", "region"};

/// One cue setting the parser accepted (§6.3 "parse the WebVTT cue settings").
struct setting {
  std::string_view name;
  std::string_view value;
};

/// The outcome of parsing a settings string: the settings that take effect, the tokens that
/// do not (with their offsets in the string), and repeated names.
struct settings_result {
  std::vector<setting> accepted;  ///< the last value of each name that takes effect
  std::vector<std::pair<std::size_t, std::string>> rejected;  ///< offset, reason
  std::vector<std::string_view> repeated;
};

/// Parses cue settings as §6.3 does, with `regions` the identifiers of the regions defined so
/// far. A region setting is kept only when the cue ends up in that region.
settings_result parse_settings(std::string_view text, const std::vector<std::string>& regions);

/// The identifier of a REGION block's settings (§6.2), if it has one.
std::optional<std::string> region_identifier(std::string_view settings);

/// What the cue text parsing rules (§6.4) make of a cue's text.
struct cue_text {
  std::string plain;  ///< the text objects, concatenated: tags removed, references decoded
  std::optional<std::string> voice;  ///< set when the cue is exactly one voice span
  struct stamp {
    time_ns time;
    std::size_t at;  ///< offset into `plain`
  };
  std::vector<stamp> stamps;  ///< timestamp objects, in order
};

cue_text parse_cue_text(std::string_view text);

/// The word timings that a cue's timestamp objects mark (§4.2.2): each timestamp starts a
/// piece of the plain text lasting until the next timestamp or the cue's end; the text before
/// the first timestamp starts with the cue. Pieces with no text but white space are left out.
std::vector<annotation> timed_words(const cue_text& parsed, time_ns cue_start, time_ns cue_end);

using detail::append_escaped;  ///< escapes `&`, `<` and `>` (tiers/detail/markup.hpp)
using detail::greater_than;

/// Appends plain text as cue text (§4.2.2): `&` and `<` as references, `>` only where it would
/// close a `-->` that cue text may not hold. A raw `>` elsewhere is how such text is read, so
/// the text is written as a reader would have found it and reads back without markup.
inline void append_cue_text(std::string& out, std::string_view text) {
  append_escaped(out, text, greater_than::after_two_hyphens);
}

}  // namespace tiers::detail::vtt
