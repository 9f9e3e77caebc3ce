// UTF-8 validation (RFC 3629) with an ASCII fast path.
#include "detail/utf8.hpp"

#include "tiers/text.hpp"

#include <cstring>

namespace tiers::detail {

std::size_t find_invalid_utf8(std::string_view text) {
  const auto* s = reinterpret_cast<const unsigned char*>(text.data());
  const std::size_t n = text.size();
  std::size_t i = 0;
  while (i < n) {
    // Eight ASCII bytes at a time: most annotation text is mostly ASCII.
    if (i + 8 <= n) {
      std::uint64_t word;
      std::memcpy(&word, s + i, 8);
      if ((word & 0x8080808080808080ull) == 0) {
        i += 8;
        continue;
      }
    }
    const unsigned char c = s[i];
    if (c < 0x80) {
      ++i;
      continue;
    }
    std::size_t len = 0;
    unsigned char lo = 0x80;
    unsigned char hi = 0xBF;
    if (c >= 0xC2 && c <= 0xDF) {
      len = 2;
    } else if (c >= 0xE0 && c <= 0xEF) {
      len = 3;
      if (c == 0xE0) lo = 0xA0;  // overlong
      if (c == 0xED) hi = 0x9F;  // surrogates
    } else if (c >= 0xF0 && c <= 0xF4) {
      len = 4;
      if (c == 0xF0) lo = 0x90;  // overlong
      if (c == 0xF4) hi = 0x8F;  // above U+10FFFF
    } else {
      return i;
    }
    if (i + len > n) return i;
    if (s[i + 1] < lo || s[i + 1] > hi) return i;
    for (std::size_t k = 2; k < len; ++k)
      if ((s[i + k] & 0xC0) != 0x80) return i;
    i += len;
  }
  return std::string_view::npos;
}

std::string_view wide_encoding(std::string_view text) {
  auto starts = [&](std::string_view bom) { return text.substr(0, bom.size()) == bom; };
  using namespace std::string_view_literals;
  if (starts("\xFF\xFE\0\0"sv) || starts("\0\0\xFE\xFF"sv)) return "UTF-32";
  if (starts("\xFF\xFE"sv) || starts("\xFE\xFF"sv)) return "UTF-16";
  if (text.size() >= 2 && (text[0] == '\0') != (text[1] == '\0')) return "UTF-16";
  return {};
}

std::string repair_utf8(std::string_view text, std::size_t& replaced) {
  std::string out;
  out.reserve(text.size() + 16);
  replaced = 0;
  while (!text.empty()) {
    const std::size_t bad = find_invalid_utf8(text);
    if (bad == std::string_view::npos) {
      out.append(text);
      break;
    }
    out.append(text.substr(0, bad));
    // The maximal subpart: a valid lead byte and as many valid continuation bytes as follow.
    const auto c = static_cast<unsigned char>(text[bad]);
    std::size_t len = 1;
    std::size_t need = c >= 0xC2 && c <= 0xDF   ? 2
                       : c >= 0xE0 && c <= 0xEF ? 3
                       : c >= 0xF0 && c <= 0xF4 ? 4
                                                : 1;
    for (std::size_t k = 1; k < need && bad + k < text.size(); ++k) {
      const auto b = static_cast<unsigned char>(text[bad + k]);
      unsigned char lo = 0x80, hi = 0xBF;
      if (k == 1 && c == 0xE0) lo = 0xA0;
      if (k == 1 && c == 0xED) hi = 0x9F;
      if (k == 1 && c == 0xF0) lo = 0x90;
      if (k == 1 && c == 0xF4) hi = 0x8F;
      if (b < lo || b > hi) break;
      len = k + 1;
    }
    out.append("\xEF\xBF\xBD");
    ++replaced;
    text.remove_prefix(bad + len);
  }
  return out;
}

void append_utf8(std::string& out, char32_t cp) {
  if (cp < 0x80) {
    out += static_cast<char>(cp);
  } else if (cp < 0x800) {
    out += static_cast<char>(0xC0 | (cp >> 6));
    out += static_cast<char>(0x80 | (cp & 0x3F));
  } else if (cp < 0x10000) {
    out += static_cast<char>(0xE0 | (cp >> 12));
    out += static_cast<char>(0x80 | ((cp >> 6) & 0x3F));
    out += static_cast<char>(0x80 | (cp & 0x3F));
  } else {
    out += static_cast<char>(0xF0 | (cp >> 18));
    out += static_cast<char>(0x80 | ((cp >> 12) & 0x3F));
    out += static_cast<char>(0x80 | ((cp >> 6) & 0x3F));
    out += static_cast<char>(0x80 | (cp & 0x3F));
  }
}

}  // namespace tiers::detail

namespace tiers {

bool is_utf8(std::string_view text) {
  return detail::find_invalid_utf8(text) == std::string_view::npos;
}

}  // namespace tiers
