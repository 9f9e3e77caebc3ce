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

void write_tier(json_writer& j, const tier& t) {
  j.begin_object(true);
  j.string("name", t.name);
  j.string("kind", to_string(t.kind));
  if (t.source) write_json_source(j.key("source"), *t.source);
  if (t.parent) {
    j.key("parent").begin_object();
    j.string("tier", t.parent->tier);
    j.string("relation", to_string(t.parent->rel));
    j.end_object();
  }
  if (t.vocabulary) j.key("vocabulary").string_array(*t.vocabulary);
  if (!t.attributes.empty()) j.key("attributes").string_map(t.attributes);
  j.key("annotations").begin_array(true);
  const bool instant = t.kind == tier_kind::instant;
  for (const annotation& a : t.annotations)
    write_annotation(j, a, instant);
  j.end_array();
  j.end_object();
}

}  // namespace

void write_json(const document& doc, byte_sink& out, const write_options&) {
  json_writer j(out);
  j.begin_object(true);
  j.string("format", "tiers");
  j.count("version", 1);
  const media_info& m = doc.media;
  if (m.uri || m.duration || m.frame_rate) write_json_media(j.key("media"), m);
  if (!doc.metadata.empty()) j.key("metadata").string_map(doc.metadata);
  j.key("tiers").begin_array(true);
  for (const tier& t : doc.tiers)
    write_tier(j, t);
  j.end_array();
  j.end_object();
  out.put('\n');
}

}  // namespace tiers::detail
