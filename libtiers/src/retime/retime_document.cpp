// A document's captions re-timed as the options say: the tiers found, the durations read, the
// profile's caption rules filled in.
#include "tiers/inputs.hpp"
#include "tiers/retime.hpp"
#include "tiers/time.hpp"

namespace tiers {
namespace {

// Names the tier that is not there and the tiers that are, and the one option that picks it.
diagnostic missing_tier(const std::string& file, const document& doc, const std::string& name,
                        const char* role, const char* option) {
  diagnostic d;
  d.file = file;
  d.code = "retime.tier";
  d.message =
      "no tier " + quote_name(name) + " for " + role + " (" +
      (doc.tiers.empty() ? std::string("the file has no tiers") : "its tiers: " + tier_names(doc)) +
      "); name " + role + " with " + option;
  return d;
}

retime_options options_of(const retime_settings& s, const profile& p,
                          std::optional<rational> rate) {
  retime_options ro;
  ro.lead_in = parse_duration_option("--lead-in", s.lead_in, duration_kind::length, rate);
  ro.hold = parse_duration_option("--hold", s.hold, duration_kind::length, rate);
  ro.min_gap = s.min_gap.empty()
                   ? p.limits.min_gap.at(rate.value_or(p.limits.frame_rate))
                   : parse_duration_option("--min-gap", s.min_gap, duration_kind::length, rate);
  ro.min_duration = s.min_duration.empty() ? p.limits.min_duration
                                           : parse_duration_option("--min-duration", s.min_duration,
                                                                   duration_kind::length, rate);
  if (s.max_cps && !(*s.max_cps >= 0))
    throw usage_error("--max-cps: " + std::to_string(*s.max_cps) + " is not 0 or more");
  ro.max_cps = s.max_cps                                   ? *s.max_cps
               : p.level("caption.cps") == rule_level::off ? 0
                                                           : p.limits.max_cps;
  ro.window = p.limits.window;
  return ro;
}

}  // namespace

result<retimed> retime_document(document& doc, const std::string& file, const profile& p,
                                const retime_settings& s, const retime_words& w, rational grid,
                                bool record) {
  result<retimed> out;
  std::string caption_name = !s.captions.empty() ? s.captions : p.captions.value_or("");
  if (caption_name.empty()) {
    if (doc.tiers.empty() ||
        (doc.tiers.size() > 1 && !is_words_tier_of(doc.tiers[1], doc.tiers[0].name)))
      throw usage_error(file + " has " + std::to_string(doc.tiers.size()) +
                        " tiers; name the captions with --captions");
    caption_name = doc.tiers.front().name;
  }
  tier* captions = find_tier(doc, caption_name);
  const document& wdoc = w.doc ? *w.doc : doc;
  const tier* words = w.tier                   ? find_tier(wdoc, *w.tier)
                      : wdoc.tiers.size() == 1 ? &wdoc.tiers.front()
                                               : find_tier(wdoc, "words");
  if (!captions)
    out.diagnostics.push_back(
        missing_tier(file, doc, caption_name, "the caption tier", "--captions TIER"));
  if (!words)
    out.diagnostics.push_back(missing_tier(w.doc ? w.file : file, wdoc, w.tier.value_or("words"),
                                           "the word tier",
                                           w.doc ? "--words FILE:TIER" : "--words TIER"));
  if (!captions || !words) return out;
  retime_options ro = options_of(s, p, frame_rate_of(doc, s.rate));
  ro.grid = grid;
  out.value = {retime_captions(*captions, *words, ro), *captions};
  // A cue that ends before it starts is a problem of the input, said where it is.
  for (const cue_move& m : out.value.result.moves)
    if (m.how == cue_move::basis::reversed) {
      diagnostic d;
      d.level = severity::warning;
      d.file = file;
      d.code = "retime.reversed";
      const optional_text& id = out.value.before.annotations[m.cue].id;
      d.message = "cue " + (id ? quote_name(*id) : std::to_string(m.cue + 1)) + " ends at " +
                  format_clock(m.old_end) + ", before it starts at " + format_clock(m.old_start) +
                  ": left as it was, not re-timed";
      out.diagnostics.push_back(std::move(d));
    }
  // The output says how it was made, where its format can carry that.
  if (record)
    record_retime(doc, caption_name, w.doc ? w.file + ":" + words->name : words->name, ro,
                  out.value.result);
  *captions = out.value.result.captions;
  move_children(doc, caption_name, out.value.result);
  return out;
}

}  // namespace tiers
