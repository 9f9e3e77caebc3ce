// UTF-8 validation (RFC 3629 §4 syntax) and the refusal of other encodings at read time.
#include <catch2/catch.hpp>

#include "detail/utf8.hpp"
#include "support.hpp"

using namespace tiers;
using tiers::detail::find_invalid_utf8;

TEST_CASE("valid UTF-8 passes and each kind of invalid sequence is found at its first byte",
          "[utf8]") {
  constexpr auto npos = std::string_view::npos;
  CHECK(find_invalid_utf8("plain ascii, long enough for the fast path") == npos);
  CHECK(find_invalid_utf8("\xC3\xA9\xE2\x82\xAC\xF0\x9F\x98\x80\xF4\x8F\xBF\xBF") == npos);
  CHECK(find_invalid_utf8("abc\x80") == 3);            // lone continuation byte
  CHECK(find_invalid_utf8("abcdefgh\xC0\x80") == 8);   // overlong NUL
  CHECK(find_invalid_utf8("\xE0\x80\xAF") == 0);       // overlong three-byte form
  CHECK(find_invalid_utf8("ab\xED\xA0\x80") == 2);     // surrogate U+D800
  CHECK(find_invalid_utf8("\xF4\x90\x80\x80") == 0);   // above U+10FFFF
  CHECK(find_invalid_utf8("x\xF5\x80\x80\x80") == 1);  // never a lead byte
  CHECK(find_invalid_utf8("xy\xE2\x82") == 2);         // truncated at the end
  CHECK(find_invalid_utf8("\xE2\x82z") == 0);          // truncated in the middle
}

TEST_CASE("UTF-16 input is named as such instead of failing later", "[utf8]") {
  for (std::string_view text :
       {std::string_view("\xFF\xFEt\0i\0", 6), std::string_view("\xFE\xFF\0t", 4),
        std::string_view("{\0\"\0", 4)}) {
    const diagnostic d = tiers::test::first_error("json", text);
    CHECK(d.code == "input.encoding");
    CHECK_THAT(d.message, Catch::Contains("UTF-16, not UTF-8"));
  }
}
