// Writes the native JSON format: one annotation per line, so that diffs stay readable.
#include "detail/json_text.hpp"
#include "json_format.hpp"

namespace tiers::detail {
namespace {

void write_string_map(byte_sink& out, const attribute_map& map) {
  out.put('{');
  bool first = true;
  for (const auto& [k, v] : map) {
    if (!first) out.write(", ");
    first = false;
    write_json_string(out, k);
    out.write(": ");
    write_json_string(out, v);
  }
  out.put('}');
}

// Writes `, "key": ` before a member; the caller writes the value.
void member(byte_sink& out, std::string_view key) {
  out.write(", \"");
  out.write(key);
  out.write("\": ");
}

void write_annotation(byte_sink& out, const annotation& a, bool instant) {
  out.write("{\"start\": ");
  write_json_seconds(out, a.start);
  if (!instant || a.end != a.start) {
    member(out, "end");
    write_json_seconds(out, a.end);
  }
  member(out, "text");
  write_json_string(out, a.text);
  if (a.markup) {
    member(out, "markup");
    write_json_string(out, *a.markup);
  }
  if (a.confidence) {
    member(out, "confidence");
    write_json_double(out, *a.confidence);
  }
  if (a.id) {
    member(out, "id");
    write_json_string(out, *a.id);
  }
  if (a.parent) {
    member(out, "parent");
    write_json_string(out, *a.parent);
  }
  if (!a.attributes.empty()) {
    member(out, "attributes");
    write_string_map(out, a.attributes);
  }
  out.put('}');
}

void write_tier(byte_sink& out, const tier& t) {
  out.write("    {\n      \"name\": ");
  write_json_string(out, t.name);
  out.write(",\n      \"kind\": \"");
  out.write(to_string(t.kind));
  out.put('"');
  if (t.source) {
    out.write(",\n      \"source\": ");
    write_json_source(out, *t.source);
  }
  if (t.parent) {
    out.write(",\n      \"parent\": {\"tier\": ");
    write_json_string(out, t.parent->tier);
    out.write(", \"relation\": \"");
    out.write(to_string(t.parent->rel));
    out.write("\"}");
  }
  if (t.vocabulary) {
    out.write(",\n      \"vocabulary\": [");
    for (std::size_t k = 0; k < t.vocabulary->size(); ++k) {
      if (k > 0) out.write(", ");
      write_json_string(out, (*t.vocabulary)[k]);
    }
    out.put(']');
  }
  if (!t.attributes.empty()) {
    out.write(",\n      \"attributes\": ");
    write_string_map(out, t.attributes);
  }
  out.write(",\n      \"annotations\": [");
  const bool instant = t.kind == tier_kind::instant;
  for (std::size_t k = 0; k < t.annotations.size(); ++k) {
    out.write(k == 0 ? "\n        " : ",\n        ");
    write_annotation(out, t.annotations[k], instant);
  }
  out.write(t.annotations.empty() ? "]\n    }" : "\n      ]\n    }");
}

}  // namespace

void write_json(const document& doc, byte_sink& out, const write_options&) {
  out.write("{\n  \"format\": \"tiers\",\n  \"version\": 1");
  const media_info& m = doc.media;
  if (m.uri || m.duration || m.frame_rate) {
    out.write(",\n  \"media\": ");
    write_json_media(out, m);
  }
  if (!doc.metadata.empty()) {
    out.write(",\n  \"metadata\": ");
    write_string_map(out, doc.metadata);
  }
  out.write(",\n  \"tiers\": [");
  for (std::size_t k = 0; k < doc.tiers.size(); ++k) {
    out.write(k == 0 ? "\n" : ",\n");
    write_tier(out, doc.tiers[k]);
  }
  out.write(doc.tiers.empty() ? "]\n}\n" : "\n  ]\n}\n");
}

}  // namespace tiers::detail
