// What every SAX reader of JSON in libtiers shares: counting consumed bytes, so that events can
// be located, and nlohmann's parse errors as short messages. Private: nlohmann stays inside.
#pragma once

#include <cstddef>
#include <iterator>
#include <nlohmann/json.hpp>
#include <string>
#include <string_view>

namespace tiers::detail {

/// An input iterator over a buffer that counts the bytes the parser has consumed.
struct counting_iterator {
  using iterator_category = std::input_iterator_tag;
  using value_type = char;
  using difference_type = std::ptrdiff_t;
  using pointer = const char*;
  using reference = const char&;

  const char* p = nullptr;
  std::size_t* consumed = nullptr;

  reference operator*() const { return *p; }
  counting_iterator& operator++() {
    ++p;
    ++*consumed;
    return *this;
  }
  counting_iterator operator++(int) {
    counting_iterator old = *this;
    ++*this;
    return old;
  }
  bool operator==(const counting_iterator& o) const { return p == o.p; }
};

/// nlohmann's "[json.exception.parse_error.101] parse error at line 1, column 7: syntax error
/// while parsing value - unexpected end of input; …" as "unexpected end of input", without the
/// location (ours is computed from the byte offset) and the echo of what was read.
inline std::string parse_error_text(const nlohmann::detail::exception& ex) {
  std::string what = ex.what();
  if (auto at = what.find(": "); at != std::string::npos) what = what.substr(at + 2);
  if (auto dash = what.find(" - "); what.rfind("syntax error", 0) == 0 && dash != std::string::npos)
    what = what.substr(dash + 3);
  if (auto last = what.find("; last read:"); last != std::string::npos) {
    const std::size_t close = what.find("'; ", last + 14);
    what.erase(last, close == std::string::npos ? std::string::npos : close + 1 - last);
  }
  return what;
}

/// Where a parse error is: the byte the parser stopped on, or the end of the input when the
/// error is that the input ended. `consumed` counts the bytes read.
inline std::size_t parse_error_offset(const std::string& text, std::size_t consumed,
                                      std::size_t input_size) {
  const bool at_end = consumed >= input_size && text.find("end of input") != std::string::npos;
  const std::size_t where = at_end ? input_size : (consumed > 0 ? consumed - 1 : 0);
  return where < input_size ? where : input_size;
}

/// The offset of the opening quote of the string whose closing quote is at `close` (escaped
/// quotes inside it skipped): where a key or string value starts.
inline std::size_t opening_quote(std::string_view input, std::size_t close) {
  std::size_t q = close;
  while (q > 0) {
    --q;
    if (input[q] != '"') continue;
    std::size_t backslashes = 0;
    while (q >= backslashes + 1 && input[q - backslashes - 1] == '\\')
      ++backslashes;
    if (backslashes % 2 == 0) break;
  }
  return q;
}

}  // namespace tiers::detail
