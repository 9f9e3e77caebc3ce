// Text measures the checks rely on: grapheme clusters, words, normalisation and case (Unicode,
// through ICU). Every function takes and returns UTF-8 and is safe to call from many threads.
#pragma once

#include <cstddef>
#include <functional>
#include <string>
#include <string_view>
#include <vector>

namespace tiers {

/// The number of extended grapheme clusters in `text` (UAX #29): what a reader counts as
/// characters. `count_graphemes("e\u0301")` is 1; so is a family emoji joined by ZWJs.
std::size_t count_graphemes(std::string_view text);

/// `text` cut at every word boundary (UAX #29): the pieces, in order, cover every byte once.
/// `word_segments("Hi, you")` is {"Hi", ",", " ", "you"}.
std::vector<std::string_view> word_segments(std::string_view text);

/// The words of `text` for matching one text against another: the word segments that hold a
/// letter, digit or ideograph (punctuation and spaces dropped), each NFKC-case-folded, so that
/// "Straße," and "STRASSE" give the same token "strasse".
std::vector<std::string> word_tokens(std::string_view text);

/// Calls `f` with each of word_tokens(text) in turn, without making the vector: what a caller
/// does over millions of annotations. The view is valid during the call only.
void for_each_word_token(std::string_view text, const std::function<void(std::string_view)>& f);

/// Whether `text` is in Unicode Normalization Form C (UAX #15).
bool is_nfc(std::string_view text);

/// `text` in Normalization Form C.
std::string to_nfc(std::string_view text);

/// `text` case-folded for comparing labels: Unicode's NFKC_Casefold (ICU), so that "STROKE",
/// "Stroke" and "stroke" — and compatibility forms of one letter — are one label.
std::string fold_case(std::string_view text);

/// How many letters of `text` are upper case and how many lower case (Unicode's Uppercase and
/// Lowercase properties); letters without case count in neither.
struct case_counts {
  std::size_t upper = 0;
  std::size_t lower = 0;
};
case_counts count_case(std::string_view text);

/// Whether `text` is well-formed UTF-8 (no overlong forms, surrogates or code points beyond
/// U+10FFFF).
bool is_utf8(std::string_view text);

/// The first control character (general category Cc) of `text` other than the line feed that
/// breaks caption lines, as a byte offset; npos when there is none.
std::size_t find_control(std::string_view text);

/// Whether the code point at byte `offset` of `text` (or the one ending just before it, with
/// `before`) is white space (Unicode White_Space).
bool is_space_at(std::string_view text, std::size_t offset);
bool is_space_before(std::string_view text, std::size_t offset);

}  // namespace tiers
