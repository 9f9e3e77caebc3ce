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

// The document as it is handed over: the same bytes whether it comes whole or streamed.
class text_stream final : public document_handler {
 public:
  explicit text_stream(byte_sink& out) : out_(out) {}

  bool begin_document(const document& doc) override {
    line_ = "tiers 1\n";
    const media_info& m = doc.media;
    if (m.uri || m.duration || m.frame_rate) {
      line_ += "media";
      if (m.uri) pair(line_, "uri", *m.uri);
      if (m.duration) pair(line_, "duration", time_text(*m.duration));
      if (m.frame_rate) pair(line_, "rate", format_rational(*m.frame_rate));
      line_ += '\n';
    }
    for (const auto& [k, v] : doc.metadata) {
      line_ += "meta";
      pair(line_, k, v);
      line_ += '\n';
    }
    out_.write(line_);
    return true;
  }
  bool begin_tier(const tier& t) override {
    line_ = "\ntier ";
    append_value(line_, t.name);
    line_ += ' ';
    line_ += to_string(t.kind);
    line_ += '\n';
    if (t.source) {
      line_ += "  source ";
      line_ += to_string(t.source->kind);
      if (t.source->agent) pair(line_, "agent", *t.source->agent);
      if (t.source->version) pair(line_, "version", *t.source->version);
      line_ += '\n';
    }
    if (t.parent) {
      line_ += "  parent ";
      append_value(line_, t.parent->tier);
      line_ += ' ';
      line_ += to_string(t.parent->rel);
      line_ += '\n';
    }
    if (t.vocabulary) {
      line_ += "  vocabulary";
      for (const std::string& label : *t.vocabulary) {
        line_ += ' ';
        append_value(line_, label);
      }
      line_ += '\n';
    }
    for (const auto& [k, v] : t.attributes) {
      line_ += "  attr";
      pair(line_, k, v);
      line_ += '\n';
    }
    out_.write(line_);
    instant_ = t.kind == tier_kind::instant;
    return true;
  }
  bool add(const annotation& a) override {
    write_annotation(line_, a, instant_);
    out_.write(line_);
    return true;
  }
  bool end_tier() override { return true; }
  bool end_document() override { return true; }

 private:
  byte_sink& out_;
  std::string line_;
  bool instant_ = false;
};

}  // namespace

void write_tiers_text(const document& doc, byte_sink& out, const write_options&) {
  text_stream writer(out);
  hand_over(doc, writer);
}

std::unique_ptr<document_handler> tiers_text_stream_writer(byte_sink& out) {
  return std::make_unique<text_stream>(out);
}

}  // namespace tiers::detail
