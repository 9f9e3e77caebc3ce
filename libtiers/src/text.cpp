// Unicode text measures through ICU: break iterators over UTF-8 (no conversion to UTF-16),
// one iterator per thread since ICU's iterators are not thread-safe.
#include "tiers/text.hpp"

#include <unicode/brkiter.h>
#include <unicode/normalizer2.h>
#include <unicode/uchar.h>
#include <unicode/utext.h>
#include <unicode/utf8.h>

#include <memory>

#include "detail/text_ascii.hpp"

namespace tiers {
namespace {

enum class breaks { character, word };

// A break iterator over `text` for this thread, made once per thread and kind.
icu::BreakIterator* iterator_over(std::string_view text, breaks kind, UText*& utext) {
  thread_local std::unique_ptr<icu::BreakIterator> characters, words;
  std::unique_ptr<icu::BreakIterator>& it = kind == breaks::character ? characters : words;
  UErrorCode status = U_ZERO_ERROR;
  if (!it) {
    it.reset(kind == breaks::character
                 ? icu::BreakIterator::createCharacterInstance(icu::Locale::getRoot(), status)
                 : icu::BreakIterator::createWordInstance(icu::Locale::getRoot(), status));
    if (U_FAILURE(status)) {
      it.reset();
      return nullptr;
    }
  }
  utext = utext_openUTF8(utext, text.data(), static_cast<std::int64_t>(text.size()), &status);
  if (U_FAILURE(status)) return nullptr;
  it->setText(utext, status);
  return U_SUCCESS(status) ? it.get() : nullptr;
}

// Closes the UText when the measure is done.
struct utext_holder {
  UText* text = nullptr;
  ~utext_holder() {
    if (text) utext_close(text);
  }
};

const icu::Normalizer2* normalizer(bool casefold) {
  UErrorCode status = U_ZERO_ERROR;
  const icu::Normalizer2* n = casefold ? icu::Normalizer2::getNFKCCasefoldInstance(status)
                                       : icu::Normalizer2::getNFCInstance(status);
  return U_SUCCESS(status) ? n : nullptr;
}

std::string normalize(std::string_view text, bool casefold) {
  std::string out;
  const icu::Normalizer2* n = normalizer(casefold);
  if (!n) return std::string(text);
  icu::StringByteSink<std::string> sink(&out, static_cast<std::int32_t>(text.size()));
  UErrorCode status = U_ZERO_ERROR;
  n->normalizeUTF8(0, icu::StringPiece(text.data(), static_cast<std::int32_t>(text.size())), sink,
                   nullptr, status);
  return U_SUCCESS(status) ? out : std::string(text);
}

// Calls f(code point, byte offset) for every code point; ill-formed bytes come as U+FFFD.
template <class F>
void for_each_code_point(std::string_view text, F&& f) {
  const auto* s = reinterpret_cast<const std::uint8_t*>(text.data());
  const auto length = static_cast<std::int32_t>(text.size());
  std::int32_t i = 0;
  while (i < length) {
    const std::int32_t at = i;
    UChar32 c = 0;
    U8_NEXT_OR_FFFD(s, i, length, c);
    f(c, static_cast<std::size_t>(at));
  }
}

// Calls f(piece, is_word) for every piece between word boundaries (UAX #29); the rule status
// tells words (letters, numbers, kana, ideographs) from spaces and punctuation.
template <class F>
void for_each_icu_word_segment(std::string_view text, F&& f) {
  if (text.empty()) return;
  utext_holder holder;
  icu::BreakIterator* it = iterator_over(text, breaks::word, holder.text);
  if (!it) return f(text, true);
  std::int32_t from = it->first();
  for (std::int32_t to = it->next(); to != icu::BreakIterator::DONE; to = it->next()) {
    f(text.substr(static_cast<std::size_t>(from), static_cast<std::size_t>(to - from)),
      it->getRuleStatus() >= UBRK_WORD_NONE_LIMIT);
    from = to;
  }
}

template <class F>
void for_each_word_segment(std::string_view text, F&& f) {
  if (detail::is_ascii(text))
    detail::for_each_ascii_word_segment(text, f);
  else
    for_each_icu_word_segment(text, f);
}

// NFKC_Casefold of ASCII folds A-Z and changes nothing else.
void ascii_casefold(std::string_view text, std::string& out) {
  out.assign(text);
  for (char& c : out)
    if (c >= 'A' && c <= 'Z') c = static_cast<char>(c - 'A' + 'a');
}

}  // namespace

namespace detail {

std::size_t icu_graphemes(std::string_view text) {
  if (text.empty()) return 0;
  utext_holder holder;
  icu::BreakIterator* it = iterator_over(text, breaks::character, holder.text);
  if (!it) return text.size();
  std::size_t n = 0;
  for (std::int32_t b = it->next(); b != icu::BreakIterator::DONE; b = it->next())
    ++n;
  return n;
}

std::vector<std::pair<std::string_view, bool>> icu_word_segments(std::string_view text) {
  std::vector<std::pair<std::string_view, bool>> out;
  for_each_icu_word_segment(
      text, [&](std::string_view piece, bool word) { out.emplace_back(piece, word); });
  return out;
}

}  // namespace detail

std::size_t count_graphemes(std::string_view text) {
  return detail::is_ascii(text) ? detail::ascii_graphemes(text) : detail::icu_graphemes(text);
}

std::vector<std::string_view> word_segments(std::string_view text) {
  std::vector<std::string_view> out;
  for_each_word_segment(text, [&](std::string_view piece, bool) { out.push_back(piece); });
  return out;
}

void for_each_word_token(std::string_view text, const std::function<void(std::string_view)>& f) {
  std::string folded;
  for_each_word_segment(text, [&](std::string_view piece, bool word) {
    if (!word) return;
    if (detail::is_ascii(piece))
      ascii_casefold(piece, folded);
    else
      folded = normalize(piece, true);
    f(folded);
  });
}

std::vector<std::string> word_tokens(std::string_view text) {
  std::vector<std::string> out;
  for_each_word_token(text, [&](std::string_view token) { out.emplace_back(token); });
  return out;
}

bool is_nfc(std::string_view text) {
  if (detail::is_ascii(text)) return true;  // no ASCII character decomposes
  const icu::Normalizer2* n = normalizer(false);
  if (!n) return true;
  UErrorCode status = U_ZERO_ERROR;
  const bool yes = n->isNormalizedUTF8(
      icu::StringPiece(text.data(), static_cast<std::int32_t>(text.size())), status);
  return U_FAILURE(status) || yes;
}

std::string to_nfc(std::string_view text) {
  return normalize(text, false);
}

std::string fold_case(std::string_view text) {
  std::string out;
  if (detail::is_ascii(text))
    ascii_casefold(text, out);
  else
    out = normalize(text, true);
  return out;
}

case_counts count_case(std::string_view text) {
  case_counts counts;
  if (detail::is_ascii(text)) {
    for (char c : text) {
      counts.upper += c >= 'A' && c <= 'Z';
      counts.lower += c >= 'a' && c <= 'z';
    }
    return counts;
  }
  for_each_code_point(text, [&](UChar32 c, std::size_t) {
    if (u_hasBinaryProperty(c, UCHAR_UPPERCASE))
      ++counts.upper;
    else if (u_hasBinaryProperty(c, UCHAR_LOWERCASE))
      ++counts.lower;
  });
  return counts;
}

std::size_t find_control(std::string_view text) {
  if (detail::is_ascii(text)) {  // Cc in ASCII: U+0000..U+001F and U+007F
    for (std::size_t i = 0; i < text.size(); ++i)
      if ((text[i] < 0x20 && text[i] != '\n') || text[i] == 0x7f) return i;
    return std::string_view::npos;
  }
  std::size_t found = std::string_view::npos;
  for_each_code_point(text, [&](UChar32 c, std::size_t at) {
    if (found == std::string_view::npos && c != '\n' && u_charType(c) == U_CONTROL_CHAR) found = at;
  });
  return found;
}

bool is_space_at(std::string_view text, std::size_t offset) {
  if (offset >= text.size()) return false;
  const auto* s = reinterpret_cast<const std::uint8_t*>(text.data());
  auto i = static_cast<std::int32_t>(offset);
  UChar32 c = 0;
  U8_NEXT_OR_FFFD(s, i, static_cast<std::int32_t>(text.size()), c);
  return u_isUWhiteSpace(c);
}

bool is_space_before(std::string_view text, std::size_t offset) {
  if (offset == 0 || offset > text.size()) return false;
  const auto* s = reinterpret_cast<const std::uint8_t*>(text.data());
  auto i = static_cast<std::int32_t>(offset);
  UChar32 c = 0;
  U8_PREV_OR_FFFD(s, 0, i, c);
  return u_isUWhiteSpace(c);
}

}  // namespace tiers
