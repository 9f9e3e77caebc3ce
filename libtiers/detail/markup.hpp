// Escaping shared by the markup formats (WebVTT cue text, XML): `&`, `<` and `>` as references.
#pragma once

#include <string>
#include <string_view>

namespace tiers::detail {

/// Where `>` becomes `&gt;`: everywhere, or only where it would close a `-->` (WebVTT cue text,
/// whose readers take any other raw `>` as text).
enum class greater_than { always, after_two_hyphens };

/// Appends `text` with `&` and `<` written as `&amp;` and `&lt;`, and `>` as `&gt;` where
/// `gt` says.
inline void append_escaped(std::string& out, std::string_view text,
                           greater_than gt = greater_than::always) {
  for (char c : text) {
    if (c == '&')
      out += "&amp;";
    else if (c == '<')
      out += "&lt;";
    else if (c == '>' && (gt == greater_than::always || out.ends_with("--")))
      out += "&gt;";
    else
      out += c;
  }
}

/// `text` escaped for an element's content (`&`, `<`, `>`).
inline std::string escaped(std::string_view text) {
  std::string out;
  append_escaped(out, text);
  return out;
}

}  // namespace tiers::detail
