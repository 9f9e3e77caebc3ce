// The text measures of tiers/text.hpp for pure ASCII text, without ICU. Cues and words of an
// archive are mostly ASCII, and an ICU break iterator costs more than the text it reads; the
// answers are those of ICU's root rules (UAX #29 with ICU's tailoring of the colon and the
// commercial at), which the unit tests hold them to.
#pragma once

#include <cstddef>
#include <string_view>
#include <utility>
#include <vector>

namespace tiers::detail {

/// Whether every byte of `text` is below 0x80.
bool is_ascii(std::string_view text);

/// Grapheme clusters of ASCII text: one a byte, CR LF being one (UAX #29 GB3).
std::size_t ascii_graphemes(std::string_view text);

/// Calls f(piece, is_word) for every piece of ASCII text between word boundaries, as ICU's
/// word break iterator would, with is_word for the pieces its rule status calls words.
template <class F>
void for_each_ascii_word_segment(std::string_view text, F&& f);

/// Where ICU's root rules put a word boundary before byte `i` (0 < i < size) of ASCII text.
bool ascii_word_break(std::string_view text, std::size_t i);

/// Whether an ASCII piece between word boundaries is a word in ICU's rule status.
bool ascii_is_word(std::string_view piece);

/// ICU's own answers, whatever the text: what the unit tests hold the ASCII ones to.
std::size_t icu_graphemes(std::string_view text);
std::vector<std::pair<std::string_view, bool>> icu_word_segments(std::string_view text);

template <class F>
void for_each_ascii_word_segment(std::string_view text, F&& f) {
  std::size_t from = 0;
  for (std::size_t i = 1; i <= text.size(); ++i) {
    if (i < text.size() && !ascii_word_break(text, i)) continue;
    const std::string_view piece = text.substr(from, i - from);
    f(piece, ascii_is_word(piece));
    from = i;
  }
}

}  // namespace tiers::detail
