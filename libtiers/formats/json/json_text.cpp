// JSON strings and numbers written by hand: exact times and no dependency on a DOM.
#include "detail/json_text.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "detail/utf8.hpp"

namespace tiers::detail {

void write_json_string(byte_sink& out, std::string_view s) {
  // JSON text is UTF-8 (RFC 8259 §8.1): a string that is not (a file name, say) is written with
  // U+FFFD in place of what is not, never as bytes a JSON reader refuses.
  if (find_invalid_utf8(s) != std::string_view::npos) {
    std::size_t replaced = 0;
    const std::string fixed = repair_utf8(s, replaced);
    return write_json_string(out, fixed);
  }
  static constexpr char hex[] = "0123456789abcdef";
  out.put('"');
  std::size_t run = 0;  // start of the pending run of bytes that need no escape
  for (std::size_t i = 0; i < s.size(); ++i) {
    const auto c = static_cast<unsigned char>(s[i]);
    if (c >= 0x20 && c != '"' && c != '\\') continue;
    out.write(s.substr(run, i - run));
    run = i + 1;
    switch (c) {
      case '"':
        out.write("\\\"");
        break;
      case '\\':
        out.write("\\\\");
        break;
      case '\n':
        out.write("\\n");
        break;
      case '\r':
        out.write("\\r");
        break;
      case '\t':
        out.write("\\t");
        break;
      case '\b':
        out.write("\\b");
        break;
      case '\f':
        out.write("\\f");
        break;
      default: {
        const char esc[6] = {'\\', 'u', '0', '0', hex[c >> 4], hex[c & 15]};
        out.write(std::string_view(esc, 6));
      }
    }
  }
  out.write(s.substr(run));
  out.put('"');
}

void write_json_seconds(byte_sink& out, time_ns t) {
  char buf[32];
  out.write(std::string_view(buf, format_seconds_to(t, buf)));
}

namespace {

// A number in fmt's shortest form that reads back the same, without a string in between.
template <class Number>
void write_number(byte_sink& out, Number v) {
  char buf[32];
  const auto end = fmt::format_to_n(buf, sizeof buf, "{}", v).out;
  out.write(std::string_view(buf, static_cast<std::size_t>(end - buf)));
}

}  // namespace

void write_json_double(byte_sink& out, double v) {
  write_number(out, v);
}

void json_writer::new_line() {
  out_.put('\n');
  for (std::size_t n = 2 * static_cast<std::size_t>(broken_); n > 0;) {
    const std::size_t step = std::min(n, spaces.size());
    out_.write(spaces.substr(0, step));
    n -= step;
  }
}

void json_writer::separate(level& l) {
  if (!l.first) out_.put(',');
  if (l.broken)
    new_line();
  else if (!l.first)
    out_.put(' ');
  l.first = false;
}

void json_writer::escaped_key(std::string_view k) {
  write_json_string(out_, k);
  out_.write(": ");
}

void json_writer::open(char bracket, bool broken) {
  before_value();
  out_.put(bracket);
  open_.push_back({broken});
  broken_ += broken;
}

void json_writer::close(char bracket) {
  const level l = open_.back();
  open_.pop_back();
  if (l.broken) {
    --broken_;
    if (!l.first) new_line();
  }
  out_.put(bracket);
}

void json_writer::begin_object(bool broken) {
  open('{', broken);
}
void json_writer::end_object() {
  close('}');
}
void json_writer::begin_array(bool broken) {
  open('[', broken);
}
void json_writer::end_array() {
  close(']');
}

void json_writer::string(std::string_view v) {
  before_value();
  write_json_string(out_, v);
}

void json_writer::number(double v) {
  before_value();
  if (std::isfinite(v))
    write_json_double(out_, v);
  else
    out_.write("null");
}

void json_writer::count(std::uint64_t n) {
  before_value();
  write_number(out_, n);
}

void json_writer::integer(std::int64_t n) {
  before_value();
  write_number(out_, n);
}

void json_writer::seconds(time_ns t) {
  before_value();
  write_json_seconds(out_, t);
}

void json_writer::boolean(bool b) {
  before_value();
  out_.write(b ? "true" : "false");
}

void json_writer::null() {
  before_value();
  out_.write("null");
}

void json_writer::raw(std::string_view json) {
  before_value();
  out_.write(json);
}

void write_json_source(json_writer& j, const tier_source& source) {
  j.begin_object();
  j.string("kind", to_string(source.kind));
  if (source.agent) j.string("agent", *source.agent);
  if (source.version) j.string("version", *source.version);
  j.end_object();
}

void write_json_media(json_writer& j, const media_info& m) {
  j.begin_object();
  if (m.uri) j.string("uri", *m.uri);
  if (m.duration) j.seconds("duration", *m.duration);
  if (m.frame_rate) j.string("frame_rate", format_rational(*m.frame_rate));
  j.end_object();
}

}  // namespace tiers::detail
