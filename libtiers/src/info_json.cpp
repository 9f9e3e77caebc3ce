// The JSON form of a document summary, for scripts.
#include "detail/json_text.hpp"
#include "tiers/info.hpp"

namespace tiers {

void write_summary_json(const document_summary& s, std::string_view path, byte_sink& out) {
  detail::json_writer j(out);
  j.begin_object();
  j.string("path", path);
  detail::write_json_media(j.key("media"), s.media);
  if (s.start) {
    j.seconds("start", *s.start);
    j.seconds("end", *s.end);
  }
  j.string("coverage_of", s.reference_is_media ? "media" : "span");
  j.key("tiers").begin_array(true);
  for (const tier_summary& t : s.tiers) {
    j.begin_object();
    j.string("name", t.name);
    j.string("kind", to_string(t.kind));
    if (t.source) detail::write_json_source(j.key("source"), *t.source);
    j.count("annotations", t.annotations);
    if (t.start) {
      j.seconds("start", *t.start);
      j.seconds("end", *t.end);
    }
    j.seconds("annotated", t.annotated);
    if (t.coverage) j.number("coverage", *t.coverage);
    j.end_object();
  }
  j.end_array();
  j.end_object();
  out.put('\n');
}

void write_inventory_json(const dataset_inventory& inv, std::string_view path, byte_sink& out) {
  detail::json_writer j(out);
  j.begin_object(true);
  j.string("dataset", path);
  j.count("recordings", inv.recordings);
  j.seconds("length", inv.length);
  j.key("tiers").begin_array(true);
  for (const tier_inventory& t : inv.tiers) {
    j.begin_object();
    j.string("name", t.name);
    j.count("recordings", t.recordings);
    j.count("annotations", t.annotations);
    j.seconds("length", t.length);
    j.seconds("annotated", t.annotated);
    j.count("human", t.human);
    j.count("machine", t.machine);
    j.count("unmarked", t.unmarked);
    j.count("instant", t.instant);
    j.end_object();
  }
  j.end_array();
  j.end_object();
  out.put('\n');
}

}  // namespace tiers
