// XML rules the reader and the writer apply alike: characters XML 1.0 does not allow (the
// reader refuses them, the writer never writes them), and IDREFS lists.
#include <cstdint>
#include <cstdio>
#include "detail/swar.hpp"
#include "ttml_format.hpp"

namespace tiers::detail::ttml {
namespace {

// XML 1.0 §2.2, production [2] Char: what a document may hold, raw or by reference.
bool xml_char(std::uint32_t c) {
  return c == 0x9 || c == 0xA || c == 0xD || (c >= 0x20 && c <= 0xD7FF) ||
         (c >= 0xE000 && c <= 0xFFFD) || (c >= 0x10000 && c <= 0x10FFFF);
}

}  // namespace

// The first character XML does not allow: raw (a C0 control, U+FFFE, U+FFFF) anywhere, or by
// a character reference (§4.1 [66], well-formedness constraint "Legal Character") outside
// comments, CDATA sections and processing instructions, where `&#` is plain text. pugixml
// would decode `&#0;` into a NUL that ends every string it is in: everything after it in a
// text, id or tier name would be lost without a word.
std::optional<forbidden> first_forbidden(std::string_view in, bool references) {
  auto hex = [](std::uint32_t c) {
    char buf[16];
    std::snprintf(buf, sizeof buf, "U+%04X", c);
    return std::string(buf);
  };
  // Raw characters, everywhere (comments and CDATA included): eight bytes at a time while
  // none is below 0x20 or 0xEF (the lead byte of U+FFFE and U+FFFF).
  for (std::size_t k = 0; k < in.size();) {
    if (swar::fast && k + 8 <= in.size()) {
      const std::uint64_t w = swar::load(in.data() + k);
      if (!(swar::below(w, 0x20) | swar::equal(w, 0xEF))) {
        k += 8;
        continue;
      }
    }
    for (const std::size_t stop = std::min(in.size(), k + 8); k < stop; ++k) {
      const auto u = static_cast<unsigned char>(in[k]);
      if (u < 0x20 && u != 0x9 && u != 0xA && u != 0xD)
        return forbidden{k, "the control character " + hex(u) + ", which XML 1.0 does not allow"};
      if (u == 0xEF && k + 2 < in.size() && static_cast<unsigned char>(in[k + 1]) == 0xBF &&
          (static_cast<unsigned char>(in[k + 2]) == 0xBE ||
           static_cast<unsigned char>(in[k + 2]) == 0xBF))
        return forbidden{k, "the noncharacter " + hex(0xFFFE + (in[k + 2] & 1)) +
                                ", which XML 1.0 does not allow"};
    }
  }
  // Character references, outside the regions where '&#' is text: from one '&#' to the next,
  // skipping the comments, CDATA sections and processing instructions that open before it.
  std::size_t k = 0;
  for (std::size_t amp = references ? in.find("&#") : in.npos; amp != in.npos;
       amp = in.find("&#", k)) {
    if (const std::size_t lt = in.find('<', k); lt < amp) {
      std::string_view close;
      if (in.substr(lt, 4) == "<!--")
        close = "-->";
      else if (in.substr(lt, 9) == "<![CDATA[")
        close = "]]>";
      else if (in.substr(lt, 2) == "<?")
        close = "?>";
      const std::size_t end = close.empty() ? lt : in.find(close, lt + 2);
      k = close.empty() ? lt + 1 : end == in.npos ? in.size() : end + close.size();
      continue;
    }
    k = amp + 2;
    const bool is_hex = amp + 2 < in.size() && in[amp + 2] == 'x';
    std::size_t j = amp + (is_hex ? 3 : 2);
    std::uint64_t c = 0;
    std::size_t digits = 0;
    for (; j < in.size() && digits < 12; ++j, ++digits) {
      const char d = in[j];
      int v = -1;
      if (d >= '0' && d <= '9') v = d - '0';
      if (is_hex && d >= 'a' && d <= 'f') v = d - 'a' + 10;
      if (is_hex && d >= 'A' && d <= 'F') v = d - 'A' + 10;
      if (v < 0) break;
      c = c * (is_hex ? 16 : 10) + static_cast<std::uint64_t>(v);
    }
    if (j >= in.size() || in[j] != ';' || digits == 0) continue;  // pugixml reports the syntax
    if (c > 0x10FFFF || !xml_char(static_cast<std::uint32_t>(c)))
      return forbidden{
          amp,
          "the character reference '" + std::string(in.substr(amp, j + 1 - amp)) + "' names " +
              (c > 0x10FFFF ? std::string("no character") : hex(static_cast<std::uint32_t>(c))) +
              ", which XML 1.0 does not allow (§2.2)"};
  }
  return std::nullopt;
}

std::string_view next_idref(std::string_view& refs) {
  const std::size_t from = std::min(refs.find_first_not_of(" \t\n\r"), refs.size());
  refs.remove_prefix(from);
  const std::size_t to = std::min(refs.find_first_of(" \t\n\r"), refs.size());
  const std::string_view id = refs.substr(0, to);
  refs.remove_prefix(to);
  return id;
}

}  // namespace tiers::detail::ttml
