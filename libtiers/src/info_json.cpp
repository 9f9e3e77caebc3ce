// The JSON form of a document summary, for scripts.
#include "detail/json_text.hpp"
#include "tiers/info.hpp"

namespace tiers {

using detail::write_json_double;
using detail::write_json_seconds;
using detail::write_json_string;

void write_summary_json(const document_summary& s, std::string_view path, byte_sink& out) {
  out.write("{\"path\": ");
  write_json_string(out, path);
  out.write(", \"media\": ");
  detail::write_json_media(out, s.media);
  if (s.start) {
    out.write(", \"start\": ");
    write_json_seconds(out, *s.start);
    out.write(", \"end\": ");
    write_json_seconds(out, *s.end);
  }
  out.write(", \"coverage_of\": ");
  out.write(s.reference_is_media ? "\"media\"" : "\"span\"");
  out.write(", \"tiers\": [");
  for (std::size_t k = 0; k < s.tiers.size(); ++k) {
    const tier_summary& t = s.tiers[k];
    out.write(k == 0 ? "\n  {" : ",\n  {");
    out.write("\"name\": ");
    write_json_string(out, t.name);
    out.write(", \"kind\": \"");
    out.write(to_string(t.kind));
    out.put('"');
    if (t.source) {
      out.write(", \"source\": ");
      detail::write_json_source(out, *t.source);
    }
    out.write(", \"annotations\": ");
    out.write(std::to_string(t.annotations));
    if (t.start) {
      out.write(", \"start\": ");
      write_json_seconds(out, *t.start);
      out.write(", \"end\": ");
      write_json_seconds(out, *t.end);
    }
    out.write(", \"annotated\": ");
    write_json_seconds(out, t.annotated);
    if (t.coverage) {
      out.write(", \"coverage\": ");
      write_json_double(out, *t.coverage);
    }
    out.put('}');
  }
  out.write(s.tiers.empty() ? "]}\n" : "\n]}\n");
}

}  // namespace tiers
