// A JSON scanner (RFC 8259) that calls a handler for every value, each with its byte offset:
// the parser behind the native format's reader and the JSON trees of profiles and plans.
// Iterative (an explicit stack), so that nesting depth costs no recursion; no value is built
// beyond the strings themselves, and numbers are handed over as their text, to be read
// exactly by whoever needs them.
#pragma once

#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "detail/swar.hpp"
#include "detail/utf8.hpp"

namespace tiers::detail {

/// Where and why the text is not JSON (the handler's own errors are the handler's to keep).
struct json_scan_error {
  std::size_t offset;
  std::string message;
};

/// The events, each returning false to stop the scan:
///   on_null(at), on_bool(value, at), on_number(text, at), on_string(value, at),
///   on_key(name, at), on_start_object(at), on_end_object(at), on_start_array(at),
///   on_end_array(at)
/// where `at` is the offset of the value's (or key's, or bracket's) first byte and strings
/// arrive decoded, as std::string& the handler may move from. The input must be valid UTF-8.
/// Returns an error for text that is not JSON, or nesting deeper than `max_depth`; nothing
/// when the document is well-formed or the handler stopped the scan.
template <class Handler>
std::optional<json_scan_error> scan_json(std::string_view in, Handler& h,
                                         std::size_t max_depth = 1u << 20);

namespace json_scan {

inline bool is_space(char c) {
  return c == ' ' || c == '\n' || c == '\r' || c == '\t';
}
inline bool is_digit(char c) {
  return c >= '0' && c <= '9';
}
inline int hex(char c) {
  if (c >= '0' && c <= '9') return c - '0';
  if (c >= 'a' && c <= 'f') return c - 'a' + 10;
  if (c >= 'A' && c <= 'F') return c - 'A' + 10;
  return -1;
}

/// What a byte is, when a value was expected: for messages.
inline std::string describe(std::string_view in, std::size_t at) {
  if (at >= in.size()) return "end of input";
  const char c = in[at];
  if (static_cast<unsigned char>(c) < 0x20) return "a control character";
  return "'" + std::string(1, c) + "'";
}

/// The end of the run of bytes from `pos` that a string holds as they are: up to the first
/// quote, backslash or control character (or the end), eight bytes at a time.
inline std::size_t plain_run(std::string_view in, std::size_t pos) {
  const std::size_t n = in.size();
  if constexpr (swar::fast)
    for (; pos + 8 <= n; pos += 8) {
      const std::uint64_t w = swar::load(in.data() + pos);
      if (const std::uint64_t flags =
              swar::equal(w, '"') | swar::equal(w, '\\') | swar::below(w, 0x20))
        return pos + swar::first_flag(flags);
    }
  while (pos < n && in[pos] != '"' && in[pos] != '\\' &&
         static_cast<unsigned char>(in[pos]) >= 0x20)
    ++pos;
  return pos;
}

/// Reads the string whose opening quote is at `pos` into `out`; `pos` ends after the closing
/// quote. Returns the error, if any. RFC 8259 §7 (escapes, surrogate pairs) and §8.1 (UTF-8),
/// each case as the RFC lists it.
inline std::optional<json_scan_error> read_string(std::string_view in, std::size_t& pos,
                                                  std::string& out) {
  const std::size_t n = in.size(), open = pos;
  ++pos;
  out.clear();
  for (;;) {
    // Copy the run of plain characters at once.
    const std::size_t run = plain_run(in, pos);
    out.append(in.data() + pos, run - pos);
    pos = run;
    // An unclosed string is shown where it opens: the end of the input says little.
    if (pos >= n) return json_scan_error{open, "invalid string: missing closing quote"};
    const char c = in[pos];
    if (c == '"') {
      ++pos;
      return std::nullopt;
    }
    if (c != '\\') {
      char hex_code[8];
      static constexpr char digits[] = "0123456789ABCDEF";
      const auto u = static_cast<unsigned char>(c);
      hex_code[0] = digits[u >> 4];
      hex_code[1] = digits[u & 15];
      hex_code[2] = 0;
      return json_scan_error{pos, std::string("invalid string: control character U+00") + hex_code +
                                      " must be escaped"};
    }
    if (pos + 1 >= n) return json_scan_error{open, "invalid string: missing closing quote"};
    const char e = in[pos + 1];
    const std::size_t escape_at = pos;
    pos += 2;
    switch (e) {
      case '"':
        out += '"';
        break;
      case '\\':
        out += '\\';
        break;
      case '/':
        out += '/';
        break;
      case 'b':
        out += '\b';
        break;
      case 'f':
        out += '\f';
        break;
      case 'n':
        out += '\n';
        break;
      case 'r':
        out += '\r';
        break;
      case 't':
        out += '\t';
        break;
      case 'u': {
        auto unit = [&](std::size_t at) -> long {
          if (at + 4 > n) return -1;
          long v = 0;
          for (std::size_t k = 0; k < 4; ++k) {
            const int d = hex(in[at + k]);
            if (d < 0) return -1;
            v = v * 16 + d;
          }
          return v;
        };
        const long first = unit(pos);
        if (first < 0)
          return json_scan_error{escape_at,
                                 "invalid string: '\\u' must be followed by 4 hex digits"};
        pos += 4;
        char32_t cp = static_cast<char32_t>(first);
        if (first >= 0xD800 && first <= 0xDBFF) {
          const long second =
              pos + 1 < n && in[pos] == '\\' && in[pos + 1] == 'u' ? unit(pos + 2) : -1;
          if (second < 0xDC00 || second > 0xDFFF)
            return json_scan_error{escape_at,
                                   "invalid string: a high surrogate must be followed by a low "
                                   "surrogate"};
          pos += 6;
          cp = 0x10000 + ((static_cast<char32_t>(first) - 0xD800) << 10) +
               (static_cast<char32_t>(second) - 0xDC00);
        } else if (first >= 0xDC00 && first <= 0xDFFF) {
          return json_scan_error{escape_at, "invalid string: a low surrogate alone"};
        }
        append_utf8(out, cp);
        break;
      }
      default:
        return json_scan_error{escape_at,
                               "invalid string: forbidden escape '\\" + std::string(1, e) + "'"};
    }
  }
}

/// The length of the number at `pos` (RFC 8259 §6), or 0 when there is none.
inline std::size_t number_length(std::string_view in, std::size_t pos) {
  const std::size_t n = in.size(), start = pos;
  if (pos < n && in[pos] == '-') ++pos;
  if (pos >= n || !is_digit(in[pos])) return 0;
  if (in[pos] == '0')
    ++pos;
  else
    while (pos < n && is_digit(in[pos]))
      ++pos;
  if (pos < n && in[pos] == '.') {
    ++pos;
    if (pos >= n || !is_digit(in[pos])) return 0;
    while (pos < n && is_digit(in[pos]))
      ++pos;
  }
  if (pos < n && (in[pos] == 'e' || in[pos] == 'E')) {
    ++pos;
    if (pos < n && (in[pos] == '+' || in[pos] == '-')) ++pos;
    if (pos >= n || !is_digit(in[pos])) return 0;
    while (pos < n && is_digit(in[pos]))
      ++pos;
  }
  return pos - start;
}

}  // namespace json_scan

// The JSON grammar of RFC 8259 (§2 values, §4 objects, §5 arrays) as one loop over an explicit
// stack, so that depth costs no native stack; kept whole, as the grammar is one.
template <class Handler>
std::optional<json_scan_error> scan_json(std::string_view in, Handler& h, std::size_t max_depth) {
  using namespace json_scan;
  const std::size_t n = in.size();
  std::size_t pos = in.substr(0, 3) == "\xEF\xBB\xBF" ? 3 : 0;  // RFC 8259 §8.1 allows a BOM
  std::vector<char> stack;                                      // '{' or '['
  std::string text;
  auto skip = [&] {
    while (pos < n && is_space(in[pos]))
      ++pos;
  };
  auto unexpected = [&](std::string_view wanted) {
    return json_scan_error{std::min(pos, n),
                           "unexpected " + describe(in, pos) + "; expected " + std::string(wanted)};
  };
  // After a value: a comma, the container's end, or (at the top) the end of the document.
  enum class state : std::uint8_t { value, first_value, first_key, key, after_value };
  state s = state::value;
  for (;;) {
    skip();
    if (s == state::after_value) {
      if (stack.empty()) {
        if (pos < n) return json_scan_error{pos, "unexpected text after the document"};
        return std::nullopt;
      }
      if (pos < n && in[pos] == ',') {
        ++pos;
        s = stack.back() == '{' ? state::key : state::value;
        continue;
      }
      const char close = stack.back() == '{' ? '}' : ']';
      if (pos < n && in[pos] == close) {
        stack.pop_back();
        const bool go = close == '}' ? h.on_end_object(pos) : h.on_end_array(pos);
        if (!go) return std::nullopt;
        ++pos;
        continue;
      }
      return unexpected(close == '}' ? "',' or '}'" : "',' or ']'");
    }
    if (s == state::first_key || s == state::key) {
      if (s == state::first_key && pos < n && in[pos] == '}') {
        stack.pop_back();
        if (!h.on_end_object(pos)) return std::nullopt;
        ++pos;
        s = state::after_value;
        continue;
      }
      if (pos >= n || in[pos] != '"') return unexpected("a member name in quotes");
      const std::size_t at = pos;
      if (auto e = read_string(in, pos, text)) return e;
      skip();
      if (pos >= n || in[pos] != ':') return unexpected("':' after the member name");
      ++pos;
      if (!h.on_key(text, at)) return std::nullopt;
      s = state::value;
      continue;
    }
    // A value.
    if (s == state::first_value && pos < n && in[pos] == ']') {
      stack.pop_back();
      if (!h.on_end_array(pos)) return std::nullopt;
      ++pos;
      s = state::after_value;
      continue;
    }
    if (pos >= n) return json_scan_error{n, "unexpected end of input"};
    const std::size_t at = pos;
    const char c = in[pos];
    bool go = true;
    if (c == '{' || c == '[') {
      if (stack.size() >= max_depth)
        return json_scan_error{at,
                               "values nest deeper than " + std::to_string(max_depth) + " levels"};
      stack.push_back(c);
      ++pos;
      go = c == '{' ? h.on_start_object(at) : h.on_start_array(at);
      s = c == '{' ? state::first_key : state::first_value;
      if (!go) return std::nullopt;
      continue;
    }
    if (c == '"') {
      if (auto e = read_string(in, pos, text)) return e;
      go = h.on_string(text, at);
    } else if (c == '-' || is_digit(c)) {
      const std::size_t len = number_length(in, pos);
      if (len == 0) return json_scan_error{at, "invalid number"};
      pos += len;
      go = h.on_number(in.substr(at, len), at);
    } else if (in.substr(pos, 4) == "true" || in.substr(pos, 5) == "false") {
      const bool v = c == 't';
      pos += v ? 4 : 5;
      go = h.on_bool(v, at);
    } else if (in.substr(pos, 4) == "null") {
      pos += 4;
      go = h.on_null(at);
    } else if (c == 't' || c == 'f' || c == 'n') {
      return json_scan_error{at, "invalid literal (true, false and null are the JSON literals)"};
    } else {
      return unexpected("a value");
    }
    if (!go) return std::nullopt;
    s = state::after_value;
  }
}

}  // namespace tiers::detail
