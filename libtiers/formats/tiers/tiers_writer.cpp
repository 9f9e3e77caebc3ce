// Writes the plain-text tier format: a signature line, the media and metadata, then each tier
// with its properties and one line per annotation.
#include "detail/json_text.hpp"
#include "tiers_format.hpp"
#include "tiers_syntax.hpp"

namespace tiers::detail {
namespace {

using text_format::append_text;
using text_format::append_value;

// Clock time with at least millisecond digits, so that columns of times line up, and more
// when the time needs them.
std::string time_text(time_ns t) {
  std::string s = format_clock_exact(t);
  const std::size_t dot = s.find('.');
  const std::size_t digits = dot == std::string::npos ? 0 : s.size() - dot - 1;
  if (dot == std::string::npos) s += '.';
  if (digits < 3) s.append(3 - digits, '0');
  return s;
}

// " key=value", or " @key=value" for an annotation attribute.
void pair(std::string& line, std::string_view key, std::string_view value, bool attribute = false) {
  line += attribute ? " @" : " ";
  append_value(line, key);
  line += '=';
  append_value(line, value);
}

void write_annotation(std::string& line, const annotation& a, bool instant) {
  line = "  ";
  line += time_text(a.start);
  if (!instant || a.end != a.start) {
    line += ' ';
    line += time_text(a.end);
  }
  if (a.id) pair(line, "id", *a.id);
  if (a.parent) pair(line, "parent", *a.parent);
  if (a.confidence) {
    std::string conf;
    string_sink sink(conf);
    write_json_double(sink, *a.confidence);
    sink.flush();
    pair(line, "conf", conf);
  }
  if (a.markup) pair(line, "markup", *a.markup);
  for (const auto& [k, v] : a.attributes)
    pair(line, k, v, true);
  line += a.text.empty() ? " |" : " | ";
  append_text(line, a.text);
  line += '\n';
}

}  // namespace

void write_tiers_text(const document& doc, byte_sink& out, const write_options&) {
  std::string line = "tiers 1\n";
  const media_info& m = doc.media;
  if (m.uri || m.duration || m.frame_rate) {
    line += "media";
    if (m.uri) pair(line, "uri", *m.uri);
    if (m.duration) pair(line, "duration", time_text(*m.duration));
    if (m.frame_rate) pair(line, "rate", format_rational(*m.frame_rate));
    line += '\n';
  }
  for (const auto& [k, v] : doc.metadata) {
    line += "meta";
    pair(line, k, v);
    line += '\n';
  }
  out.write(line);
  for (const tier& t : doc.tiers) {
    line = "\ntier ";
    append_value(line, t.name);
    line += ' ';
    line += to_string(t.kind);
    line += '\n';
    if (t.source) {
      line += "  source ";
      line += to_string(t.source->kind);
      if (t.source->agent) pair(line, "agent", *t.source->agent);
      if (t.source->version) pair(line, "version", *t.source->version);
      line += '\n';
    }
    if (t.parent) {
      line += "  parent ";
      append_value(line, t.parent->tier);
      line += ' ';
      line += to_string(t.parent->rel);
      line += '\n';
    }
    if (t.vocabulary) {
      line += "  vocabulary";
      for (const std::string& label : *t.vocabulary) {
        line += ' ';
        append_value(line, label);
      }
      line += '\n';
    }
    for (const auto& [k, v] : t.attributes) {
      line += "  attr";
      pair(line, k, v);
      line += '\n';
    }
    out.write(line);
    const bool instant = t.kind == tier_kind::instant;
    for (const annotation& a : t.annotations) {
      write_annotation(line, a, instant);
      out.write(line);
    }
  }
}

}  // namespace tiers::detail
