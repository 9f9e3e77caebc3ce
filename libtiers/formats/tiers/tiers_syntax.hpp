// Words, quoted strings and escaped text of the plain-text tier format, both directions.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

namespace tiers::detail::text_format {

/// True when `s` can stand unquoted: not empty, and no space, quote, backslash, '|', '=',
/// '#', control or invisible separator character.
bool is_bare(std::string_view s);

/// `s` as it is when bare, else as a quoted string with escapes.
void append_value(std::string& out, std::string_view s);

/// Annotation text after "| ": backslashes, control and invisible separator characters
/// escaped, and white space at the end written as escapes, so editors cannot strip it.
void append_text(std::string& out, std::string_view s);

/// One item of a line: a word, a quoted string, or `[@]key=value` with either part quoted.
struct item {
  std::string key;                   ///< the word or string; for key=value, the key
  std::optional<std::string> value;  ///< set for key=value
  bool attribute = false;            ///< written with a leading '@'
  std::size_t offset = 0;            ///< in the line
};

/// Splits a line (without its terminator) into items up to a lone `|`; `text` receives the
/// unescaped rest after "| " when there is one. Returns the offset of the first problem and
/// its description through `problem`, or npos.
std::size_t split_line(std::string_view line, std::vector<item>& items,
                       std::optional<std::string>& text, std::string& problem);

}  // namespace tiers::detail::text_format
