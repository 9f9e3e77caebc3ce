// Timestamps (§6.3), cue settings (§6.3), region identifiers (§6.2), and the cue text
// tokenizer and parser (§6.4) with HTML character references, of the W3C WebVTT spec.
#include "vtt_syntax.hpp"

#include <algorithm>
#include <array>
#include <cstdio>

#include <limits>
#include "detail/utf8.hpp"

namespace tiers::detail::vtt {
namespace {

bool is_digit(char c) {
  return c >= '0' && c <= '9';
}

struct entity {
  const char* name;
  const char* value;
};
constexpr entity entities[] = {
#include "html_entities.inc"
};
constexpr std::size_t longest_entity = 32;

// HTML "consume a character reference", called with `pos` just after the '&'. Appends the
// characters and advances `pos` when there is a reference; otherwise leaves both alone.
bool consume_reference(std::string_view in, std::size_t& pos, char additional, std::string& out) {
  if (pos >= in.size()) return false;
  const char c = in[pos];
  if (c == '\t' || c == '\n' || c == '\f' || c == ' ' || c == '<' || c == '&' ||
      (additional && c == additional))
    return false;
  if (c == '#') {
    std::size_t p = pos + 1;
    const bool hex = p < in.size() && (in[p] == 'x' || in[p] == 'X');
    if (hex) ++p;
    const std::size_t digits = p;
    std::uint32_t value = 0;
    for (; p < in.size(); ++p) {
      const char d = in[p];
      int v = -1;
      if (is_digit(d)) v = d - '0';
      if (hex && d >= 'a' && d <= 'f') v = d - 'a' + 10;
      if (hex && d >= 'A' && d <= 'F') v = d - 'A' + 10;
      if (v < 0) break;
      value = std::min<std::uint32_t>(value * (hex ? 16 : 10) + static_cast<std::uint32_t>(v),
                                      0x110000);
    }
    if (p == digits) return false;  // "&#" or "&#x" without digits is not a reference
    if (p < in.size() && in[p] == ';') ++p;
    // The HTML table of replacements for numbers in the C1 range (windows-1252).
    static constexpr std::array<char32_t, 32> c1 = {
        0x20AC, 0x81,   0x201A, 0x0192, 0x201E, 0x2026, 0x2020, 0x2021, 0x02C6, 0x2030, 0x0160,
        0x2039, 0x0152, 0x8D,   0x017D, 0x8F,   0x90,   0x2018, 0x2019, 0x201C, 0x201D, 0x2022,
        0x2013, 0x2014, 0x02DC, 0x2122, 0x0161, 0x203A, 0x0153, 0x9D,   0x017E, 0x0178};
    char32_t cp = value;
    if (value >= 0x80 && value <= 0x9F) cp = c1[value - 0x80];
    if (value == 0 || (value >= 0xD800 && value <= 0xDFFF) || value > 0x10FFFF) cp = 0xFFFD;
    append_utf8(out, cp);
    pos = p;
    return true;
  }
  // Named: the longest name in the table that the input starts with.
  for (std::size_t len = std::min(longest_entity, in.size() - pos); len > 0; --len) {
    const std::string_view candidate = in.substr(pos, len);
    const entity* it = std::lower_bound(
        std::begin(entities), std::end(entities), candidate,
        [](const entity& e, std::string_view key) { return std::string_view(e.name) < key; });
    if (it != std::end(entities) && candidate == it->name) {
      out += it->value;
      pos += len;
      return true;
    }
  }
  return false;
}

// Percentages (§6.2 "parse a percentage string"): digits[.digits]% with a value in 0–100.
bool is_percentage(std::string_view s) {
  if (s.size() < 2 || s.back() != '%') return false;
  s.remove_suffix(1);
  std::size_t i = 0;
  while (i < s.size() && is_digit(s[i]))
    ++i;
  if (i == 0) return false;
  if (i < s.size()) {
    if (s[i] != '.') return false;
    const std::size_t frac = ++i;
    while (i < s.size() && is_digit(s[i]))
      ++i;
    if (i == frac || i != s.size()) return false;
  }
  // Compare with 100 exactly: the integer part must be below 100, or 100 with a zero fraction.
  const std::size_t dot = s.find('.');
  std::string_view whole = s.substr(0, dot);
  while (whole.size() > 1 && whole.front() == '0')
    whole.remove_prefix(1);
  if (whole.size() < 3) return true;
  if (whole != "100") return false;
  const std::string_view fraction = dot == std::string_view::npos ? "" : s.substr(dot + 1);
  return fraction.find_first_not_of('0') == std::string_view::npos;
}

// A valid percentage (0–100) that equals 100.
bool is_hundred_percent(std::string_view s) {
  std::string_view whole = s.substr(0, s.find_first_of(".%"));
  while (whole.size() > 1 && whole.front() == '0')
    whole.remove_prefix(1);
  return whole == "100";
}

// "line" values that are not percentages (§6.3): [-]digits[.digits], at least one digit.
bool is_line_number(std::string_view s) {
  if (s.empty()) return false;
  std::size_t i = s[0] == '-' ? 1 : 0;
  const std::size_t begin = i;
  while (i < s.size() && is_digit(s[i]))
    ++i;
  if (i == begin) return false;
  if (i == s.size()) return true;
  if (s[i] != '.') return false;
  const std::size_t frac = ++i;
  while (i < s.size() && is_digit(s[i]))
    ++i;
  return i > frac && i == s.size();
}

}  // namespace

std::string_view line_reader::next(bool& ended) {
  const std::size_t begin = pos;
  std::size_t end = begin;
  while (end < in.size() && in[end] != '\n' && in[end] != '\r')
    ++end;
  pos = end;
  ended = pos < in.size();
  if (ended) pos += (in[pos] == '\r' && pos + 1 < in.size() && in[pos + 1] == '\n') ? 2 : 1;
  return in.substr(begin, end - begin);
}

std::optional<time_ns> collect_timestamp(std::string_view in, std::size_t& pos,
                                         bool* out_of_range) {
  auto digits = [&](std::int64_t& value, std::size_t& count) {
    value = 0;
    count = 0;
    while (pos < in.size() && is_digit(in[pos])) {
      if (value < 1'000'000'000'000) value = value * 10 + (in[pos] - '0');
      ++pos;
      ++count;
    }
  };
  if (pos >= in.size() || !is_digit(in[pos])) return std::nullopt;
  std::int64_t v1 = 0, v2 = 0, v3 = 0, v4 = 0;
  std::size_t n = 0;
  digits(v1, n);
  const bool hours = n != 2 || v1 > 59;
  if (pos >= in.size() || in[pos] != ':') return std::nullopt;
  ++pos;
  digits(v2, n);
  if (n != 2) return std::nullopt;
  if (hours || (pos < in.size() && in[pos] == ':')) {
    if (pos >= in.size() || in[pos] != ':') return std::nullopt;
    ++pos;
    digits(v3, n);
    if (n != 2) return std::nullopt;
  } else {
    v3 = v2;
    v2 = v1;
    v1 = 0;
  }
  if (pos >= in.size() || in[pos] != '.') return std::nullopt;
  ++pos;
  digits(v4, n);
  if (n != 3) return std::nullopt;
  if (v2 > 59 || v3 > 59) return std::nullopt;
  // Hours are capped at 10^12 while reading: far beyond time_ns, so check the range here.
  constexpr std::int64_t max_hours =
      std::numeric_limits<time_ns>::max() / (3600 * ns_per_second) - 1;
  if (v1 > max_hours) {
    if (out_of_range) *out_of_range = true;
    return std::nullopt;
  }
  return ((v1 * 3600 + v2 * 60 + v3) * 1000 + v4) * 1'000'000;
}

std::string format_timestamp(time_ns t) {
  // To the nearest millisecond, the finest time WebVTT holds (the loss report lists it).
  const std::int64_t ms = t / 1'000'000 + (t % 1'000'000 >= 500'000);
  char buf[40];
  const int n = std::snprintf(
      buf, sizeof buf, "%02lld:%02lld:%02lld.%03lld", static_cast<long long>(ms / 3'600'000),
      static_cast<long long>(ms / 60'000 % 60), static_cast<long long>(ms / 1000 % 60),
      static_cast<long long>(ms % 1000));
  return std::string(buf, static_cast<std::size_t>(n));
}

// The rules for parsing the WebVTT cue settings (W3C WebVTT §6.3), one setting after another
// in the specification's order; kept whole to be read against it.
settings_result parse_settings(std::string_view text, const std::vector<std::string>& regions) {
  settings_result out;
  // The cue's state while the settings are read in order, as §6.3 describes it.
  std::optional<std::string_view> region;
  std::vector<setting> accepted;
  auto keep = [&](std::string_view name, std::string_view value) {
    for (setting& s : accepted)
      if (s.name == name) {
        out.repeated.push_back(name);
        s.value = value;
        return;
      }
    accepted.push_back({name, value});
  };
  std::size_t i = 0;
  while (i < text.size()) {
    while (i < text.size() && is_space(text[i]))
      ++i;
    const std::size_t begin = i;
    while (i < text.size() && !is_space(text[i]))
      ++i;
    if (i == begin) break;
    const std::string_view token = text.substr(begin, i - begin);
    const std::size_t colon = token.find(':');
    auto reject = [&](std::string reason) {
      out.rejected.emplace_back(begin, "cue setting '" + std::string(token) + "' " + reason);
    };
    if (colon == std::string_view::npos || colon == 0 || colon + 1 == token.size()) {
      reject("is not of the form name:value");
      continue;
    }
    const std::string_view name = token.substr(0, colon);
    const std::string_view value = token.substr(colon + 1);
    if (name == "region") {
      if (std::find(regions.begin(), regions.end(), value) == regions.end()) {
        reject("names no region defined before the first cue");
        continue;
      }
      region = value;
      keep(name, value);
    } else if (name == "vertical") {
      if (value != "rl" && value != "lr") {
        reject("has a value other than rl or lr");
        continue;
      }
      region.reset();  // there are no vertical regions
      keep(name, value);
    } else if (name == "line") {
      const std::size_t comma = value.find(',');
      const std::string_view pos = value.substr(0, comma);
      const std::string_view align =
          comma == std::string_view::npos ? std::string_view{} : value.substr(comma + 1);
      const bool number = pos.find_first_of("0123456789") != std::string_view::npos &&
                          (pos.back() == '%' ? is_percentage(pos) : is_line_number(pos));
      const bool aligned = comma == std::string_view::npos || align == "start" ||
                           align == "center" || align == "end";
      if (!number || !aligned) {
        reject("is not a line number or percentage with an optional start, center or end");
        continue;
      }
      region.reset();  // a cue placed on a line leaves its region
      keep(name, value);
    } else if (name == "position") {
      const std::size_t comma = value.find(',');
      const std::string_view align =
          comma == std::string_view::npos ? std::string_view{} : value.substr(comma + 1);
      const bool aligned = comma == std::string_view::npos || align == "line-left" ||
                           align == "center" || align == "line-right";
      if (!is_percentage(value.substr(0, comma)) || !aligned) {
        reject("is not a percentage with an optional line-left, center or line-right");
        continue;
      }
      keep(name, value);
    } else if (name == "size") {
      if (!is_percentage(value)) {
        reject("is not a percentage from 0 to 100");
        continue;
      }
      if (!is_hundred_percent(value)) region.reset();  // a sized cue leaves its region
      keep(name, value);
    } else if (name == "align") {
      if (value != "start" && value != "center" && value != "end" && value != "left" &&
          value != "right") {
        reject("has a value other than start, center, end, left or right");
        continue;
      }
      keep(name, value);
    } else {
      reject("is not a WebVTT cue setting");
    }
  }
  for (const setting& s : accepted) {
    if (s.name == "region" && !region) {
      out.rejected.emplace_back(
          0, "cue setting 'region:" + std::string(s.value) +
                 "' has no effect: a vertical, line or size setting takes the cue out of it");
      continue;
    }
    out.accepted.push_back(s);
  }
  return out;
}

std::optional<std::string> region_identifier(std::string_view settings) {
  std::optional<std::string> id;
  std::size_t i = 0;
  while (i < settings.size()) {
    while (i < settings.size() && is_space(settings[i]))
      ++i;
    const std::size_t begin = i;
    while (i < settings.size() && !is_space(settings[i]))
      ++i;
    const std::string_view token = settings.substr(begin, i - begin);
    const std::size_t colon = token.find(':');
    if (colon == std::string_view::npos || colon == 0 || colon + 1 == token.size()) continue;
    if (token.substr(0, colon) == "id") id = std::string(token.substr(colon + 1));
  }
  return id;
}

// The WebVTT cue text parsing rules (W3C WebVTT §6.4) step by step, with the tokenizer's states
// as the specification names them; long because the algorithm is, and kept whole so that it
// can be read against the text.
cue_text parse_cue_text(std::string_view in) {
  cue_text out;
  // The node tree matters only for "is the cue one voice span": track the kinds of open
  // nodes and what the root holds.
  enum node : std::uint8_t { other, voice, ruby, ruby_text, lang };
  std::vector<std::pair<node, std::string_view>> open;  // kind and tag name
  std::size_t root_children = 0;
  bool root_is_voice = false;
  std::string annotation, name;
  std::size_t pos = 0;
  auto attach = [&](node kind, std::string_view tag) {
    if (open.empty()) {
      ++root_children;
      root_is_voice = kind == voice;
      if (kind == voice) out.voice = annotation;
    }
    open.emplace_back(kind, tag);
  };
  while (pos < in.size()) {
    if (in[pos] != '<') {
      // A string token: up to the next '<', decoding references.
      if (open.empty()) ++root_children, root_is_voice = false;
      while (pos < in.size() && in[pos] != '<') {
        if (in[pos] == '&') {
          ++pos;
          if (!consume_reference(in, pos, '\0', out.plain)) out.plain += '&';
          continue;
        }
        const std::size_t next = in.find_first_of("&<", pos);
        const std::size_t end = next == std::string_view::npos ? in.size() : next;
        out.plain.append(in.substr(pos, end - pos));
        pos = end;
      }
      continue;
    }
    // A tag: '<' then the tag state machine of §6.4.
    ++pos;
    if (pos >= in.size()) {
      break;  // "<" at the end: a start tag with an empty name, ignored
    }
    const char c = in[pos];
    if (c == '/') {
      const std::size_t end = in.find('>', pos);
      const std::string_view tag =
          in.substr(pos + 1, (end == std::string_view::npos ? in.size() : end) - pos - 1);
      pos = end == std::string_view::npos ? in.size() : end + 1;
      if (open.empty()) continue;
      const auto [kind, current] = open.back();
      if (tag == current && kind != lang) {
        open.pop_back();
      } else if (tag == "lang" && kind == lang) {
        open.pop_back();
      } else if (tag == "ruby" && kind == ruby_text) {
        open.pop_back();
        if (!open.empty()) open.pop_back();
      }
      continue;
    }
    if (is_digit(c)) {
      const std::size_t end = in.find('>', pos);
      const std::string_view value =
          in.substr(pos, (end == std::string_view::npos ? in.size() : end) - pos);
      pos = end == std::string_view::npos ? in.size() : end + 1;
      std::size_t at = 0;
      if (auto t = collect_timestamp(value, at); t && at == value.size())
        out.stamps.push_back({*t, out.plain.size()});
      continue;
    }
    // Start tag: name, classes, annotation.
    name.clear();
    annotation.clear();
    enum state_t { tag_name, classes, annotation_state } state = tag_name;
    if (c == '\t' || c == '\n' || c == '\f' || c == ' ') {
      state = annotation_state;
      ++pos;
    } else if (c == '.') {
      state = classes;
      ++pos;
    } else if (c == '>') {
      ++pos;
      continue;  // "<>": a start tag with an empty name, ignored
    }
    bool closed = false;
    while (pos < in.size() && !closed) {
      const char d = in[pos];
      switch (state) {
        case tag_name:
          if (d == '\t' || d == '\f' || d == ' ') {
            state = annotation_state;
          } else if (d == '\n') {
            state = annotation_state;
            annotation += d;
          } else if (d == '.') {
            state = classes;
          } else if (d == '>') {
            closed = true;
          } else {
            name += d;
          }
          ++pos;
          break;
        case classes:
          if (d == '\t' || d == '\f' || d == ' ') {
            state = annotation_state;
          } else if (d == '\n') {
            state = annotation_state;
            annotation += d;
          } else if (d == '>') {
            closed = true;
          }
          ++pos;
          break;
        case annotation_state:
          if (d == '&') {
            ++pos;
            if (!consume_reference(in, pos, '>', annotation)) annotation += '&';
            continue;
          }
          if (d == '>')
            closed = true;
          else
            annotation += d;
          ++pos;
          break;
      }
    }
    // Collapse white space in the annotation (§6.4, start tag annotation state).
    std::string collapsed;
    for (char d : annotation) {
      if (is_space(d)) {
        if (!collapsed.empty() && collapsed.back() != ' ') collapsed += ' ';
      } else {
        collapsed += d;
      }
    }
    if (!collapsed.empty() && collapsed.back() == ' ') collapsed.pop_back();
    annotation = collapsed;
    if (name == "c" || name == "i" || name == "b" || name == "u") {
      attach(other, name == "c" ? "c" : name == "i" ? "i" : name == "b" ? "b" : "u");
    } else if (name == "ruby") {
      attach(ruby, "ruby");
    } else if (name == "rt") {
      if (!open.empty() && open.back().first == ruby) attach(ruby_text, "rt");
    } else if (name == "v") {
      attach(voice, "v");
    } else if (name == "lang") {
      attach(lang, "lang");
    }
  }
  if (!(root_children == 1 && root_is_voice)) out.voice.reset();
  return out;
}

std::vector<annotation> timed_words(const cue_text& parsed, time_ns cue_start, time_ns cue_end) {
  std::vector<annotation> out;
  if (parsed.stamps.empty()) return out;
  const std::string_view text = parsed.plain;
  auto piece = [&](std::size_t from, std::size_t to, time_ns start, time_ns end) {
    std::string_view words = text.substr(from, to - from);
    while (!words.empty() && is_space(words.front()))
      words.remove_prefix(1);
    while (!words.empty() && is_space(words.back()))
      words.remove_suffix(1);
    if (words.empty()) return;
    annotation w;
    w.start = start;
    w.end = end;
    w.text = words;
    out.push_back(std::move(w));
  };
  piece(0, parsed.stamps.front().at, cue_start, parsed.stamps.front().time);
  for (std::size_t k = 0; k < parsed.stamps.size(); ++k) {
    const bool last = k + 1 == parsed.stamps.size();
    piece(parsed.stamps[k].at, last ? text.size() : parsed.stamps[k + 1].at, parsed.stamps[k].time,
          last ? cue_end : parsed.stamps[k + 1].time);
  }
  return out;
}

}  // namespace tiers::detail::vtt
