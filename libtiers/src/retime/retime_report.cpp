// The JSON report of a re-timing: what became of each cue, and how many moved on what basis.
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
  }
  return "unchanged";
}

std::string retime_report_json(const retime_result& r, const tier& before) {
  std::string text;
  string_sink out(text);
  detail::json_writer j(out);
  j.begin_object(true);
  j.key("cues").begin_array(true);
  std::size_t by_words = 0, by_neighbours = 0, unchanged = 0, unfixed = 0;
  for (const cue_move& m : r.moves) {
    by_words += m.how == cue_move::basis::words;
    by_neighbours += m.how == cue_move::basis::neighbours;
    unchanged += m.how == cue_move::basis::unchanged;
    unfixed += !m.unfixed.empty();
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
  j.count("by_words", by_words);
  j.count("by_neighbours", by_neighbours);
  j.count("unchanged", unchanged);
  j.count("unfixed", unfixed);
  j.end_object();
  j.end_object();
  out.put('\n');
  out.flush();
  return text;
}

}  // namespace tiers
