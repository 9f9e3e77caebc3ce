// UAX #29 word boundaries and grapheme clusters restricted to ASCII. In ASCII, Extend, Format,
// ZWJ, Katakana, Hebrew letters and pictographs do not occur, so only the rules below apply;
// the class of each byte is that of the Unicode Character Database's WordBreakProperty.txt.
#include "detail/text_ascii.hpp"

#include <array>
#include <cstdint>
#include <cstring>

namespace tiers::detail {
namespace {

enum word_class : std::uint8_t {
  other,
  cr,
  lf,
  newline,      // VT, FF
  space,        // WSegSpace
  letter,       // ALetter
  numeric,      // Numeric
  mid_num_let,  // MidNumLet (FULL STOP) and Single_Quote (APOSTROPHE): WB6/7 and WB11/12 alike
  mid_num,      // MidNum (COMMA, SEMICOLON)
  extend_num,   // ExtendNumLet (LOW LINE)
};
// ICU's root rules differ from Unicode's classes in two places, and so does this table: COLON is
// MidLetter in Unicode, but ICU takes it out (CLDR keeps it only for Swedish and Finnish), and
// ICU counts COMMERCIAL AT as ALetter, so that an e-mail address stays one word.

constexpr std::array<word_class, 128> classes = [] {
  std::array<word_class, 128> t{};
  t['\r'] = cr;
  t['\n'] = lf;
  t['\v'] = newline;
  t['\f'] = newline;
  t[' '] = space;
  for (int c = 'a'; c <= 'z'; ++c)
    t[static_cast<std::size_t>(c)] = letter;
  for (int c = 'A'; c <= 'Z'; ++c)
    t[static_cast<std::size_t>(c)] = letter;
  for (int c = '0'; c <= '9'; ++c)
    t[static_cast<std::size_t>(c)] = numeric;
  t['.'] = mid_num_let;
  t['\''] = mid_num_let;
  t[','] = mid_num;
  t[';'] = mid_num;
  t['@'] = letter;
  t['_'] = extend_num;
  return t;
}();

word_class class_at(std::string_view text, std::size_t i) {
  return classes[static_cast<unsigned char>(text[i]) & 0x7f];
}

}  // namespace

bool is_ascii(std::string_view text) {
  std::size_t i = 0;
  for (; i + 8 <= text.size(); i += 8) {
    std::uint64_t word;
    std::memcpy(&word, text.data() + i, 8);
    if (word & 0x8080808080808080ULL) return false;
  }
  for (; i < text.size(); ++i)
    if (static_cast<unsigned char>(text[i]) & 0x80) return false;
  return true;
}

std::size_t ascii_graphemes(std::string_view text) {
  std::size_t n = text.size();
  for (std::size_t i = 1; i < text.size(); ++i)
    if (text[i] == '\n' && text[i - 1] == '\r') --n;
  return n;
}

bool ascii_word_break(std::string_view text, std::size_t i) {
  const word_class before = class_at(text, i - 1), after = class_at(text, i);
  if (before == cr && after == lf) return false;  // WB3
  if (before == cr || before == lf || before == newline || after == cr || after == lf ||
      after == newline)
    return true;                                        // WB3a, WB3b
  if (before == space && after == space) return false;  // WB3d
  const bool alnum_before = before == letter || before == numeric;
  const bool alnum_after = after == letter || after == numeric;
  if (alnum_before && alnum_after) return false;  // WB5, WB8, WB9, WB10
  const word_class further = i + 1 < text.size() ? class_at(text, i + 1) : other;
  const word_class earlier = i >= 2 ? class_at(text, i - 2) : other;
  // WB6, WB7: letter (MidNumLet | Single_Quote) letter; WB11, WB12: digit (MidNum | MidNumLet |
  // Single_Quote) digit.
  if (after == mid_num_let &&
      ((before == letter && further == letter) || (before == numeric && further == numeric)))
    return false;
  if (before == mid_num_let &&
      ((earlier == letter && after == letter) || (earlier == numeric && after == numeric)))
    return false;
  if (after == mid_num && before == numeric && further == numeric) return false;
  if (before == mid_num && earlier == numeric && after == numeric) return false;
  if (after == extend_num && (alnum_before || before == extend_num)) return false;  // WB13a
  if (before == extend_num && alnum_after) return false;                            // WB13b
  return true;
}

// ICU's rule status: a piece with a letter or digit is a word, and so is a run of two or more
// underscores (rule WB13a matched), but not one underscore alone (no rule matched).
bool ascii_is_word(std::string_view piece) {
  for (char c : piece) {
    const word_class k = classes[static_cast<unsigned char>(c) & 0x7f];
    if (k == letter || k == numeric) return true;
  }
  return piece.size() >= 2 && piece[0] == '_';
}

}  // namespace tiers::detail
