// The scanners' shared pieces: word-at-a-time byte tests, the index of string views, and the
// readers' fast paths, each held to the plain byte-by-byte or node-based way it replaces.
#include <catch2/catch.hpp>

#include <random>
#include <string>
#include <unordered_map>

#include "detail/swar.hpp"
#include "detail/view_index.hpp"
#include "formats/ttml/ttml_format.hpp"
#include "support.hpp"

using namespace tiers;
namespace swar = tiers::detail::swar;

TEST_CASE("word tests flag exactly the lowest matching byte, and count every one", "[scan]") {
  // Every byte value at every place of a word, alone and after an earlier match (a borrow
  // flags bytes after the first, never before it).
  for (int place = 0; place < 8; ++place)
    for (int value = 0; value < 256; ++value) {
      std::string bytes(8, 'x');
      bytes[static_cast<std::size_t>(place)] = static_cast<char>(value);
      const std::uint64_t w = swar::load(bytes.data());
      const std::uint64_t eq = swar::equal(w, 0x0A), lo = swar::below(w, 0x20);
      CHECK((eq != 0) == (value == 0x0A));
      CHECK((lo != 0) == (value < 0x20));
      if constexpr (swar::fast) {
        if (eq) CHECK(swar::first_flag(eq) == static_cast<std::size_t>(place));
        if (lo) CHECK(swar::first_flag(lo) == static_cast<std::size_t>(place));
      }
      bytes[0] = '\n';
      if (swar::fast && place > 0)
        CHECK(swar::first_flag(swar::equal(swar::load(bytes.data()), '\n')) == 0);
    }
  std::mt19937 random(7);
  for (int round = 0; round < 200; ++round) {
    std::string s(random() % 100, ' ');
    for (char& c : s)
      c = static_cast<char>(random() % 4 == 0 ? '\n' : random() % 256);
    std::size_t expected = 0;
    for (char c : s)
      expected += c == '\n';
    CHECK(swar::count(s, '\n') == expected);
  }
}

TEST_CASE("the index of string views finds what std::unordered_map finds", "[scan]") {
  std::mt19937 random(11);
  std::vector<std::string> keys;
  for (int k = 0; k < 5000; ++k)
    keys.push_back(random() % 10 == 0 ? std::string() : "id" + std::to_string(random() % 3000));
  detail::view_index index;  // from the smallest size: grows many times
  std::unordered_map<std::string_view, std::size_t> reference;
  for (std::size_t k = 0; k < keys.size(); ++k) {
    const auto [value, added] = index.emplace(keys[k], k);
    const auto [it, ref_added] = reference.emplace(keys[k], k);
    CHECK(added == ref_added);
    CHECK(value == it->second);
  }
  CHECK(index.size() == reference.size());
  for (const auto& [key, value] : reference) {
    REQUIRE(index.find(key));
    CHECK(*index.find(key) == value);
  }
  CHECK_FALSE(index.contains("never"));
  CHECK_FALSE(index.contains("id3000"));
}

TEST_CASE("a character XML forbids is found at every place of a word", "[scan][ttml]") {
  using detail::ttml::first_forbidden;
  for (std::size_t at = 0; at < 24; ++at)
    for (const std::string& bad : {std::string(1, '\x01'), std::string("\xEF\xBF\xBE")}) {
      std::string text(24, 'a');
      text.replace(at, 1, bad);
      const auto f = first_forbidden(text);
      REQUIRE(f);
      CHECK(f->offset == at);
    }
  CHECK_FALSE(first_forbidden(std::string(40, 'a') + "\t\n\r\xEF\xBF\xBD" + "a"));  // allowed
  // A reference counts outside comments, CDATA and processing instructions, wherever it is.
  CHECK(first_forbidden("<p>a &#0; b</p>")->offset == 5);
  CHECK_FALSE(first_forbidden("<p><!-- &#0; --></p><![CDATA[&#1;]]><?pi &#2;?>"));
  CHECK(first_forbidden("<!-- c --><p>&#x1;</p>")->offset == 13);
  CHECK(first_forbidden("<p><x/>&#65;&#8;</p>")->offset == 12);
  CHECK_FALSE(first_forbidden("<!-- not closed &#0;"));
}

TEST_CASE("TTML white space collapses alike with and without its shortcut", "[scan][ttml]") {
  // The reader's rule (xml:space="default", as docs/formats/ttml.md has it) said another way:
  // each line (a br is '\n') is its words, split at space, tab and CR, joined by one space.
  auto by_words = [](std::string_view text) {
    std::string out;
    std::size_t from = 0;
    for (;;) {
      const std::size_t nl = std::min(text.find('\n', from), text.size());
      std::string line;
      for (std::size_t k = from; k < nl;) {
        while (k < nl && (text[k] == ' ' || text[k] == '\t' || text[k] == '\r'))
          ++k;
        const std::size_t word = k;
        while (k < nl && text[k] != ' ' && text[k] != '\t' && text[k] != '\r')
          ++k;
        if (k > word) line += (line.empty() ? "" : " ") + std::string(text.substr(word, k - word));
      }
      out += line;
      if (nl == text.size()) return out;
      out += '\n';
      from = nl + 1;
    }
  };
  std::mt19937 random(5);
  for (int round = 0; round < 3000; ++round) {
    std::string s(random() % 12, 'a');
    for (char& c : s)
      c = " \t\n\rab"[random() % 6];
    INFO(s);
    CHECK(detail::ttml::collapse_space(s) == by_words(s));
  }
}
