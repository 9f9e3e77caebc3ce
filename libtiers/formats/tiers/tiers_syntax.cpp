// Quoting and escaping of the plain-text tier format (docs/formats/tiers.md, "Escaping").
#include "tiers_syntax.hpp"

#include <array>
#include <cstdint>
#include <cstdio>

#include "detail/utf8.hpp"

namespace tiers::detail::text_format {
namespace {

// Code points written as \u{…}: C0 and C1 controls, DEL, the line and paragraph separators
// and the byte order mark, which editors show as nothing or treat as line breaks.
std::optional<char32_t> invisible_at(std::string_view s, std::size_t i, std::size_t& len) {
  const auto c = static_cast<unsigned char>(s[i]);
  len = 1;
  if (c < 0x20 || c == 0x7F) return c;
  if (c == 0xC2 && i + 1 < s.size()) {
    const auto d = static_cast<unsigned char>(s[i + 1]);
    if (d >= 0x80 && d <= 0x9F) {
      len = 2;
      return d;
    }
  }
  if (c == 0xE2 && i + 2 < s.size() && static_cast<unsigned char>(s[i + 1]) == 0x80) {
    const auto d = static_cast<unsigned char>(s[i + 2]);
    if (d == 0xA8 || d == 0xA9) {
      len = 3;
      return 0x2000 + d - 0x80;
    }
  }
  if (c == 0xEF && i + 2 < s.size() && static_cast<unsigned char>(s[i + 1]) == 0xBB &&
      static_cast<unsigned char>(s[i + 2]) == 0xBF) {
    len = 3;
    return 0xFEFF;
  }
  return std::nullopt;
}

void append_escape(std::string& out, char32_t cp) {
  switch (cp) {
    case '\n':
      out += "\\n";
      return;
    case '\t':
      out += "\\t";
      return;
    case '\r':
      out += "\\r";
      return;
    default: {
      char buf[16];
      std::snprintf(buf, sizeof buf, "\\u{%X}", static_cast<unsigned>(cp));
      out += buf;
    }
  }
}

// Reads one escape after a backslash at s[i]; appends it and advances i past it.
bool read_escape(std::string_view s, std::size_t& i, std::string& out, bool in_quotes) {
  if (i + 1 >= s.size()) return false;
  const char e = s[i + 1];
  i += 2;
  switch (e) {
    case '\\':
      out += '\\';
      return true;
    case 'n':
      out += '\n';
      return true;
    case 't':
      out += '\t';
      return true;
    case 'r':
      out += '\r';
      return true;
    case 's':
      out += ' ';
      return true;
    case '"':
      if (!in_quotes) return false;
      out += '"';
      return true;
    case 'u': {
      if (i >= s.size() || s[i] != '{') return false;
      const std::size_t close = s.find('}', i);
      if (close == std::string_view::npos || close == i + 1 || close - i > 7) return false;
      char32_t cp = 0;
      for (std::size_t k = i + 1; k < close; ++k) {
        const char h = s[k];
        const int v = h >= '0' && h <= '9'   ? h - '0'
                      : h >= 'A' && h <= 'F' ? h - 'A' + 10
                      : h >= 'a' && h <= 'f' ? h - 'a' + 10
                                             : -1;
        if (v < 0) return false;
        cp = cp * 16 + static_cast<char32_t>(v);
      }
      if (cp > 0x10FFFF || (cp >= 0xD800 && cp <= 0xDFFF)) return false;
      append_utf8(out, cp);
      i = close + 1;
      return true;
    }
    default:
      return false;
  }
}

}  // namespace

bool is_bare(std::string_view s) {
  // A bare word that starts with '@' reads as an annotation attribute (@key=value).
  if (s.empty() || s[0] == '@') return false;
  for (std::size_t i = 0; i < s.size(); ++i) {
    const char c = s[i];
    if (c == ' ' || c == '"' || c == '\\' || c == '|' || c == '=' || c == '#') return false;
    std::size_t len = 0;
    if (invisible_at(s, i, len)) return false;
  }
  return true;
}

void append_value(std::string& out, std::string_view s) {
  if (is_bare(s)) {
    out += s;
    return;
  }
  out += '"';
  for (std::size_t i = 0; i < s.size();) {
    std::size_t len = 1;
    if (auto cp = invisible_at(s, i, len)) {
      append_escape(out, *cp);
    } else if (s[i] == '"' || s[i] == '\\') {
      out += '\\';
      out += s[i];
    } else {
      out += s[i];
    }
    i += len;
  }
  out += '"';
}

void append_text(std::string& out, std::string_view s) {
  // White space at the end is escaped: editors and diff tools strip it otherwise.
  std::size_t keep = s.size();
  while (keep > 0 && (s[keep - 1] == ' ' || s[keep - 1] == '\t'))
    --keep;
  for (std::size_t i = 0; i < keep;) {
    std::size_t len = 1;
    if (auto cp = invisible_at(s, i, len)) {
      append_escape(out, *cp);
    } else if (s[i] == '\\') {
      out += "\\\\";
    } else {
      out += s[i];
    }
    i += len;
  }
  for (std::size_t i = keep; i < s.size(); ++i)
    out += s[i] == ' ' ? "\\s" : "\\t";
}

namespace {

// The bytes that end a bare word (white space, and '=' after a key) or make it wrong.
constexpr std::array<std::uint8_t, 256> word_stops(bool equals) {
  std::array<std::uint8_t, 256> t{};
  for (unsigned char c : {' ', '\t', '"', '\\', '|'})
    t[c] = 1;
  if (equals) t['='] = 1;
  return t;
}
constexpr std::array<std::uint8_t, 256> key_stops = word_stops(true),
                                        value_stops = word_stops(false);

}  // namespace

std::size_t split_line(std::string_view line, std::vector<item>& items,
                       std::optional<std::string>& text, std::string& problem) {
  items.clear();
  text.reset();
  std::size_t i = 0;
  // One bare word or quoted string at i, into `out`.
  auto part = [&](std::string& out, bool stop_at_equals) -> bool {
    out.clear();
    if (i < line.size() && line[i] == '"') {
      const std::size_t open = i++;
      while (i < line.size() && line[i] != '"') {
        if (line[i] == '\\') {
          const std::size_t at = i;
          if (!read_escape(line, i, out, true)) {
            i = at;
            problem =
                "unknown escape in a quoted string (escapes: \\\\ \\\" \\n \\t \\r \\s \\u{…})";
            return false;
          }
          continue;
        }
        out += line[i++];
      }
      if (i >= line.size()) {
        i = open;
        problem = "quoted string is not closed before the end of the line";
        return false;
      }
      ++i;
      return true;
    }
    const std::size_t begin = i;
    const std::array<std::uint8_t, 256>& stops = stop_at_equals ? key_stops : value_stops;
    while (i < line.size() && !stops[static_cast<unsigned char>(line[i])])
      ++i;
    if (i < line.size() && (line[i] == '"' || line[i] == '\\' || line[i] == '|')) {
      problem = "a word cannot hold '\"', '\\' or '|': quote it";
      return false;
    }
    out.assign(line.substr(begin, i - begin));
    return true;
  };
  for (;;) {
    while (i < line.size() && (line[i] == ' ' || line[i] == '\t'))
      ++i;
    if (i >= line.size()) return std::string_view::npos;
    if (line[i] == '|') {
      if (i + 1 < line.size() && line[i + 1] != ' ') {
        problem = "'|' starts the text and must be followed by a space";
        return i;
      }
      const std::string_view rest = i + 2 <= line.size() ? line.substr(i + 2) : std::string_view{};
      std::string t;
      t.reserve(rest.size());
      for (std::size_t k = 0; k < rest.size();) {
        // Up to the next escape in one piece.
        const std::size_t escape = std::min(rest.find('\\', k), rest.size());
        t.append(rest.substr(k, escape - k));
        k = escape;
        if (k == rest.size()) break;
        if (!read_escape(rest, k, t, false)) {
          problem = "unknown escape in the text (escapes: \\\\ \\n \\t \\r \\s \\u{…})";
          return i + 2 + escape;
        }
      }
      text = std::move(t);
      return std::string_view::npos;
    }
    item it;
    it.offset = i;
    if (line[i] == '@') {
      it.attribute = true;
      ++i;
    }
    const std::size_t start = i;
    if (!part(it.key, true)) return i;
    if (i < line.size() && line[i] == '=') {
      ++i;
      std::string value;
      if (!part(value, false)) return i;
      if (value.empty() && (i == 0 || line[i - 1] != '"')) {
        problem = "a value after '=' is missing (write \"\" for an empty one)";
        return i;
      }
      it.value = std::move(value);
    } else if (it.attribute) {
      problem = "an attribute needs a value: @key=value";
      return start;
    }
    if (i < line.size() && line[i] != ' ' && line[i] != '\t') {
      problem = "expected a space after this item";
      return i;
    }
    items.push_back(std::move(it));
  }
}

}  // namespace tiers::detail::text_format
