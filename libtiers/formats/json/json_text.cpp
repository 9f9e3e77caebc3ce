// JSON strings and numbers written by hand: exact times and no dependency on a DOM.
#include "detail/json_text.hpp"

#include <fmt/format.h>

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

void write_json_double(byte_sink& out, double v) {
  char buf[32];
  const auto end = fmt::format_to_n(buf, sizeof buf, "{}", v).out;
  out.write(std::string_view(buf, static_cast<std::size_t>(end - buf)));
}

void write_json_source(byte_sink& out, const tier_source& source) {
  out.write("{\"kind\": \"");
  out.write(to_string(source.kind));
  out.put('"');
  if (source.agent) {
    out.write(", \"agent\": ");
    write_json_string(out, *source.agent);
  }
  if (source.version) {
    out.write(", \"version\": ");
    write_json_string(out, *source.version);
  }
  out.put('}');
}

void write_json_media(byte_sink& out, const media_info& m) {
  out.put('{');
  const char* sep = "";
  if (m.uri) {
    out.write("\"uri\": ");
    write_json_string(out, *m.uri);
    sep = ", ";
  }
  if (m.duration) {
    out.write(sep);
    out.write("\"duration\": ");
    write_json_seconds(out, *m.duration);
    sep = ", ";
  }
  if (m.frame_rate) {
    out.write(sep);
    out.write("\"frame_rate\": ");
    write_json_string(out, format_rational(*m.frame_rate));
  }
  out.put('}');
}

byte_sink& json_members::key(std::string_view k) {
  if (!first_) out_.write(", ");
  first_ = false;
  write_json_string(out_, k);
  out_.write(": ");
  return out_;
}

void json_members::string(std::string_view k, std::string_view v) {
  write_json_string(key(k), v);
}

void json_members::number(std::string_view k, double v) {
  if (v != v)
    key(k).write("null");
  else
    write_json_double(key(k), v);
}

void json_members::count(std::string_view k, std::uint64_t n) {
  key(k).write(std::to_string(n));
}

void json_members::seconds(std::string_view k, time_ns t) {
  write_json_seconds(key(k), t);
}

}  // namespace tiers::detail
