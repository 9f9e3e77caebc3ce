// The JSON listing of a dataset's recordings, for scripts.
#include "detail/json_text.hpp"
#include "tiers/dataset.hpp"

namespace tiers {

void write_dataset_listing_json(const dataset_description& d,
                                const std::vector<recording>& recordings,
                                const std::vector<std::optional<document_summary>>& summaries,
                                std::string_view path, byte_sink& out) {
  detail::json_writer j(out);
  j.begin_object(true);
  j.string("dataset", path);
  std::size_t complete = 0;
  for (const recording& r : recordings)
    complete += r.complete();
  j.count("complete", complete);
  j.key("sources").begin_array(true);
  for (std::size_t k = 0; k < d.sources.size(); ++k) {
    std::size_t have = 0;
    for (const recording& r : recordings)
      have += !r.files[k].empty();
    j.begin_object();
    j.string("pattern", d.sources[k].pattern);
    j.count("recordings", have);
    j.end_object();
  }
  j.end_array();
  j.key("recordings").begin_array(true);
  for (std::size_t k = 0; k < recordings.size(); ++k) {
    const recording& r = recordings[k];
    j.begin_object();
    j.string("id", r.id);
    j.key("files").begin_array();
    for (const std::string& f : r.files)
      if (f.empty())
        j.null();
      else
        j.string(f);
    j.end_array();
    j.key("lacks").begin_array();
    for (std::size_t s = 0; s < r.files.size(); ++s)
      if (r.files[s].empty()) j.string(d.sources[s].pattern);
    j.end_array();
    const std::optional<document_summary>* s = k < summaries.size() ? &summaries[k] : nullptr;
    j.boolean("read", s && *s);
    if (s && *s) {
      std::size_t annotations = 0;
      for (const tier_summary& t : (*s)->tiers)
        annotations += t.annotations;
      j.count("tiers", (*s)->tiers.size());
      j.count("annotations", annotations);
      j.seconds("duration", duration_of(**s));
    }
    j.end_object();
  }
  j.end_array();
  j.end_object();
  out.put('\n');
}

std::string reports_by_recording_json(
    const std::vector<std::pair<std::string, std::string>>& reports) {
  std::string text;
  string_sink out(text);
  detail::json_writer j(out);
  j.begin_object(true);
  j.key("recordings").begin_array(true);
  for (const auto& [id, report] : reports) {
    j.begin_object(true);
    j.string("id", id);
    std::string_view body = report;
    while (!body.empty() && (body.back() == '\n' || body.back() == ' '))
      body.remove_suffix(1);
    j.key("report").raw(body);
    j.end_object();
  }
  j.end_array();
  j.end_object();
  out.put('\n');
  out.flush();
  return text;
}

}  // namespace tiers
