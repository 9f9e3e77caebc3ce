// The JSON report of a re-timing: what became of each cue, and how many moved on what basis.
#include <cstdio>

#include "detail/json_text.hpp"
#include "tiers/retime.hpp"
#include "tiers/sink.hpp"

namespace tiers {

std::string_view to_string(cue_move::basis basis) {
  switch (basis) {
    case cue_move::basis::words:
      return "words";
    case cue_move::basis::neighbours:
      return "neighbours";
    case cue_move::basis::unchanged:
      return "unchanged";
    case cue_move::basis::reversed:
      return "reversed";
  }
  return "unchanged";
}

retime_counts count_moves(const retime_result& r) {
  retime_counts c;
  for (const cue_move& m : r.moves) {
    c.by_words += m.how == cue_move::basis::words;
    c.by_neighbours += m.how == cue_move::basis::neighbours;
    c.unchanged += m.how == cue_move::basis::unchanged;
    c.reversed += m.how == cue_move::basis::reversed;
    c.unfixed += !m.unfixed.empty();
  }
  return c;
}

void record_retime(document& doc, const std::string& captions, const std::string& words,
                   const retime_options& o, const retime_result& r) {
  auto duration = [](time_ns t) { return format_seconds(t) + "s"; };
  char cps[32];
  std::snprintf(cps, sizeof cps, "%g", o.max_cps);
  const retime_counts c = count_moves(r);
  doc.metadata["retime:captions"] = captions;
  doc.metadata["retime:words"] = words;
  doc.metadata["retime:lead-in"] = duration(o.lead_in);
  doc.metadata["retime:hold"] = duration(o.hold);
  doc.metadata["retime:min-gap"] = duration(o.min_gap);
  doc.metadata["retime:min-duration"] = duration(o.min_duration);
  doc.metadata["retime:max-cps"] = o.max_cps > 0 ? cps : "none";
  doc.metadata["retime:cues"] =
      std::to_string(c.by_words) + " by words, " + std::to_string(c.by_neighbours) +
      " by neighbours, " + std::to_string(c.unchanged) + " unchanged, " +
      std::to_string(c.reversed) + " reversed; " + std::to_string(c.unfixed) + " unfixed";
}

std::string retime_report_json(const retime_result& r, const tier& before) {
  std::string text;
  string_sink out(text);
  detail::json_writer j(out);
  j.begin_object(true);
  j.key("cues").begin_array(true);
  const retime_counts c = count_moves(r);
  for (const cue_move& m : r.moves) {
    j.begin_object();
    j.count("cue", m.cue);
    if (const auto& id = before.annotations[m.cue].id) j.string("id", *id);
    j.seconds("old_start", m.old_start);
    j.seconds("old_end", m.old_end);
    j.seconds("new_start", m.new_start);
    j.seconds("new_end", m.new_end);
    j.seconds("start_moved", m.new_start - m.old_start);
    j.seconds("end_moved", m.new_end - m.old_end);
    j.string("basis", to_string(m.how));
    j.count("words", m.words);
    if (!m.adjusted.empty()) j.string("adjusted", m.adjusted);
    if (!m.unfixed.empty()) j.string("unfixed", m.unfixed);
    j.end_object();
  }
  j.end_array();
  j.key("summary").begin_object();
  j.count("cues", r.moves.size());
  j.count("by_words", c.by_words);
  j.count("by_neighbours", c.by_neighbours);
  j.count("unchanged", c.unchanged);
  j.count("reversed", c.reversed);
  j.count("unfixed", c.unfixed);
  j.end_object();
  j.end_object();
  out.put('\n');
  out.flush();
  return text;
}

}  // namespace tiers
