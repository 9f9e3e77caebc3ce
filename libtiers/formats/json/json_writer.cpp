// Writes the native JSON format: one annotation per line, so that diffs stay readable.
#include "detail/json_text.hpp"
#include "json_format.hpp"

namespace tiers::detail {
namespace {

void write_annotation(json_writer& j, const annotation& a, bool instant) {
  j.begin_object();
  j.seconds("start", a.start);
  if (!instant || a.end != a.start) j.seconds("end", a.end);
  j.string("text", a.text);
  if (a.markup) j.string("markup", *a.markup);
  if (a.confidence) j.number("confidence", *a.confidence);
  if (a.id) j.string("id", *a.id);
  if (a.parent) j.string("parent", *a.parent);
  if (!a.attributes.empty()) j.key("attributes").string_map(a.attributes);
  j.end_object();
}

// The document as it is handed over: the same bytes whether it comes whole or streamed.
class json_stream final : public document_handler {
 public:
  explicit json_stream(byte_sink& out) : out_(out), j_(out) {}

  bool begin_document(const document& doc) override {
    j_.begin_object(true);
    j_.string("format", "tiers");
    j_.count("version", 1);
    const media_info& m = doc.media;
    if (m.uri || m.duration || m.frame_rate) write_json_media(j_.key("media"), m);
    if (!doc.metadata.empty()) j_.key("metadata").string_map(doc.metadata);
    j_.key("tiers").begin_array(true);
    return true;
  }
  bool begin_tier(const tier& t) override {
    j_.begin_object(true);
    j_.string("name", t.name);
    j_.string("kind", to_string(t.kind));
    if (t.source) write_json_source(j_.key("source"), *t.source);
    if (t.parent) {
      j_.key("parent").begin_object();
      j_.string("tier", t.parent->tier);
      j_.string("relation", to_string(t.parent->rel));
      j_.end_object();
    }
    if (t.vocabulary) j_.key("vocabulary").string_array(*t.vocabulary);
    if (!t.attributes.empty()) j_.key("attributes").string_map(t.attributes);
    j_.key("annotations").begin_array(true);
    instant_ = t.kind == tier_kind::instant;
    return true;
  }
  bool add(const annotation& a) override {
    write_annotation(j_, a, instant_);
    return true;
  }
  bool end_tier() override {
    j_.end_array();
    j_.end_object();
    return true;
  }
  bool end_document() override {
    j_.end_array();
    j_.end_object();
    out_.put('\n');
    return true;
  }

 private:
  byte_sink& out_;
  json_writer j_;
  bool instant_ = false;
};

}  // namespace

void write_json(const document& doc, byte_sink& out, const write_options&) {
  json_stream writer(out);
  hand_over(doc, writer);
}

std::unique_ptr<document_handler> json_stream_writer(byte_sink& out) {
  return std::make_unique<json_stream>(out);
}

}  // namespace tiers::detail
