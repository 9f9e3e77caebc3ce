// Escaping shared by the markup formats (WebVTT cue text, XML): `&`, `<` and `>` as references.
#pragma once

#include <string>
#include <string_view>

namespace tiers::detail {

/// Appends `text` with `&`, `<` and `>` written as `&amp;`, `&lt;` and `&gt;`.
inline void append_escaped(std::string& out, std::string_view text) {
  for (char c : text) {
    if (c == '&')
      out += "&amp;";
    else if (c == '<')
      out += "&lt;";
    else if (c == '>')
      out += "&gt;";
    else
      out += c;
  }
}

}  // namespace tiers::detail
