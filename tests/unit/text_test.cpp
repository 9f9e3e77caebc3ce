// Text measures against the Unicode Consortium's own conformance data (Debian's unicode-data
// package, 15.0.0): grapheme clusters and word boundaries (UAX #29).
#include <algorithm>
#include <catch2/catch.hpp>
#include <fstream>
#include <sstream>

#include "detail/text_ascii.hpp"
#include "detail/utf8.hpp"
#include "tiers/text.hpp"

using namespace tiers;

namespace {

// One line of a UAX #29 break test: the text, and the byte offsets where it breaks (÷), the
// first (0) and last (its size) included.
struct break_case {
  std::string text;
  std::vector<std::size_t> breaks;
  std::string line;
};

// Reads `÷ 0020 × 0308 ÷ 000D ÷ # ÷ [0.2] SPACE … × [9.0] …` lines. Lines with surrogate code
// points are left out: UTF-8 cannot hold them. With `colon_breaks`, the boundaries the file
// joins by rules WB6 and WB7 around a COLON are breaks: ICU's root word rules take U+003A out
// of MidLetter (CLDR keeps it there only for Swedish and Finnish), a tailoring ICU documents
// in its rule file; WB4 still attaches combining marks to the colon.
std::vector<break_case> read_break_test(const std::string& path, std::size_t& skipped,
                                        bool colon_breaks = false) {
  std::ifstream in(path);
  std::vector<break_case> out;
  std::string line;
  while (std::getline(in, line)) {
    const std::size_t hash = line.find('#');
    const std::string body = line.substr(0, hash);
    if (body.find("÷") == std::string::npos) continue;
    // The rule number of every boundary, from the comment: "[6.0]".
    std::vector<std::string> rules;
    for (std::size_t at = line.find('[', hash); at != std::string::npos;
         at = line.find('[', at + 1))
      rules.push_back(line.substr(at + 1, line.find(']', at) - at - 1));
    std::vector<char32_t> cps;
    std::vector<bool> joined;  // boundary k is before cps[k]; one more at the end
    std::istringstream words(body);
    for (std::string w; words >> w;) {
      if (w == "÷" || w == "×")
        joined.push_back(w == "×");
      else
        cps.push_back(static_cast<char32_t>(std::stoul(w, nullptr, 16)));
    }
    if (std::any_of(cps.begin(), cps.end(),
                    [](char32_t c) { return c >= 0xD800 && c <= 0xDFFF; })) {
      ++skipped;
      continue;
    }
    for (std::size_t k = 1; colon_breaks && k < cps.size() && k < rules.size(); ++k) {
      std::size_t mid = k;  // WB6: the boundary before the MidLetter
      if (rules[k] == "7.0") {
        mid = k - 1;  // WB7: the boundary after it, and after the marks WB4 attached to it
        while (mid > 0 && rules[mid] == "4.0")
          --mid;
      }
      if ((rules[k] == "6.0" || rules[k] == "7.0") && cps[mid] == U':') joined[k] = false;
    }
    break_case c;
    c.line = line;
    for (std::size_t k = 0; k <= cps.size(); ++k) {
      if (!joined[k]) c.breaks.push_back(c.text.size());
      if (k < cps.size()) detail::append_utf8(c.text, cps[k]);
    }
    out.push_back(std::move(c));
  }
  return out;
}

const std::string unicode_data = "/usr/share/unicode/auxiliary/";

}  // namespace

TEST_CASE("grapheme clusters are counted as GraphemeBreakTest.txt says", "[text]") {
  // Source: Unicode 15.0.0 GraphemeBreakTest.txt (UAX #29 conformance data), every line.
  std::size_t skipped = 0;
  const auto cases = read_break_test(unicode_data + "GraphemeBreakTest.txt", skipped);
  INFO("install Debian's unicode-data package (scripts/install-deps does)");
  REQUIRE(cases.size() > 600);
  CHECK(skipped < 20);
  for (const break_case& c : cases) {
    INFO(c.line);
    CHECK(count_graphemes(c.text) == c.breaks.size() - 1);
  }
}

TEST_CASE("word segments break where WordBreakTest.txt says", "[text]") {
  // Source: Unicode 15.0.0 WordBreakTest.txt (UAX #29 conformance data), every line, with
  // ICU's one tailoring (a colon always breaks; see read_break_test).
  std::size_t skipped = 0;
  const auto cases = read_break_test(unicode_data + "WordBreakTest.txt", skipped, true);
  REQUIRE(cases.size() > 1800);
  CHECK(skipped < 20);
  for (const break_case& c : cases) {
    INFO(c.line);
    std::vector<std::size_t> got{0};
    for (std::string_view piece : word_segments(c.text))
      got.push_back(static_cast<std::size_t>(piece.data() + piece.size() - c.text.data()));
    CHECK(got == c.breaks);
  }
  CHECK(word_segments("a:b").size() == 3);
}

TEST_CASE("word tokens drop punctuation and fold case", "[text]") {
  CHECK(word_tokens("Good evening, and welcome!") ==
        std::vector<std::string>{"good", "evening", "and", "welcome"});
  // UAX #29 keeps an apostrophe between letters (MidNumLet) and a decimal point in a number.
  CHECK(word_tokens("DON'T pay 3.50") == std::vector<std::string>{"don't", "pay", "3.50"});
  // Full case folding (CaseFolding.txt: U+00DF folds to "ss").
  CHECK(word_tokens("Straße") == word_tokens("STRASSE"));
  CHECK(word_tokens(" -- ... ").empty());
}

TEST_CASE("normalisation, case, controls and white space", "[text]") {
  CHECK(is_nfc("caf\xC3\xA9"));         // é precomposed
  CHECK_FALSE(is_nfc("cafe\xCC\x81"));  // e + combining acute
  CHECK(to_nfc("cafe\xCC\x81") == "caf\xC3\xA9");
  const case_counts caps = count_case("GOOD EVENING, 123");
  CHECK(caps.upper == 11);
  CHECK(caps.lower == 0);
  CHECK(count_case("\xC3\x89t\xC3\xA9").upper == 1);  // Été
  CHECK(find_control("two\nlines") == std::string_view::npos);
  CHECK(find_control("tab\there") == 3);
  CHECK(find_control("c1 \xC2\x85") == 3);     // U+0085 NEXT LINE is Cc
  CHECK(is_space_at("\xC2\xA0x", 0));          // no-break space
  CHECK(is_space_before("x\xE2\x80\x83", 4));  // em space
  CHECK_FALSE(is_space_before("x", 1));
}

TEST_CASE("ASCII text is measured as ICU measures it", "[text]") {
  // Reference: ICU's own break iterators (root locale), which the ASCII fast path stands in
  // for. Every byte below 0x80 between two of a set of neighbours standing for each word-break
  // class, then every string of up to four of those neighbours.
  const std::string neighbours = "aZ09 .',;:_\"-\r\n\v\t!";
  std::vector<std::string> texts;
  for (int c = 0; c < 128; ++c)
    for (char l : neighbours)
      for (char r : neighbours)
        texts.push_back(std::string{l, static_cast<char>(c), r});
  std::vector<std::string> level{""};
  for (int length = 1; length <= 4; ++length) {
    std::vector<std::string> next;
    for (const std::string& t : level)
      for (char c : neighbours)
        next.push_back(t + c);
    texts.insert(texts.end(), next.begin(), next.end());
    level = std::move(next);
  }
  texts.push_back("Don't pay 3.50, or 1,000.25; see a_b__c and __ x.y.z 12:30\r\n\r\r\n");
  std::size_t differences = 0;
  for (const std::string& t : texts) {
    std::vector<std::pair<std::string_view, bool>> fast;
    detail::for_each_ascii_word_segment(
        t, [&](std::string_view piece, bool word) { fast.emplace_back(piece, word); });
    if (fast != detail::icu_word_segments(t) ||
        detail::ascii_graphemes(t) != detail::icu_graphemes(t)) {
      if (++differences <= 20) {
        std::string shown;
        for (char c : t)
          shown += c >= 0x20 && c < 0x7f ? std::string(1, c) : "\\x" + std::to_string(c);
        UNSCOPED_INFO("differs: \"" << shown << "\"");
      }
    }
  }
  CHECK(differences == 0);
  CHECK(texts.size() > 100000);
}
