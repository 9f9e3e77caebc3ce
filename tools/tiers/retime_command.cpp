// `tiers retime CAPTIONS --words WORDS -o OUT [--lead-in D] [--hold D] [--json]`.
#include "retime_command.hpp"

#include <fmt/format.h>

#include "dataset_inputs.hpp"
#include "text_table.hpp"
#include "tiers/io.hpp"
#include "tiers/profile.hpp"
#include "tiers/retime.hpp"

namespace tiers::cli {

void setup_retime(CLI::App& app, int& status) {
  auto options = std::make_shared<retime_options_cli>();
  retime_options_cli& o = *options;
  CLI::App* cmd = app.add_subcommand("retime", "Move caption cues onto their words' timings");
  cmd->add_option("captions", o.input.path, "The caption file, or - for standard input")
      ->type_name("FILE");
  cmd->add_option("--words", o.words, "The word timings: a tier of the file, or FILE[:TIER]")
      ->required()
      ->type_name("TIER|FILE[:TIER]");
  cmd->add_option("--captions", o.captions,
                  "The caption tier (default: the file's only tier, "
                  "or the profile's)")
      ->type_name("TIER");
  cmd->add_option("--lead-in", o.lead_in,
                  "A cue starts this long before its first word (0; 0.1s, or frames: 3f)")
      ->type_name("DURATION");
  cmd->add_option("--hold", o.hold, "and ends this long after its last word (0)")
      ->type_name("DURATION");
  cmd->add_option("--min-gap", o.min_gap,
                  "Least gap between cues (default: the profile's, else 2 frames)")
      ->type_name("DURATION");
  cmd->add_option("--min-duration", o.min_duration,
                  "Least duration of a cue (default: the profile's, else 5/6 s)")
      ->type_name("DURATION");
  cmd->add_option("--max-cps", o.max_cps,
                  "Lengthen cues to be read at most this many characters a second (default: "
                  "the profile's caption.cps, else 20; 0: no limit)")
      ->check(CLI::NonNegativeNumber)
      ->type_name("X");
  cmd->add_option("--profile", o.profile, "Take the caption rules from this check profile")
      ->type_name("PROFILE");
  cmd->add_flag("--json", o.json, "Print the report as JSON");
  add_input_options(*cmd, o.input);
  add_output_options(*cmd, o.output, o.to, o.allow_loss,
                     "Output file, or - for standard output (with --to)");
  add_dataset_options(*cmd, o.dataset, o.output_dir, o.jobs, o.shard, "re-timed");
  cmd->callback([options, &status] { status = run_retime(*options); });
}

namespace {

using tiers::quote_name;

std::string signed_seconds(time_ns t) {
  return (t < 0 ? "-" : "+") + format_seconds(t < 0 ? -t : t);
}

std::string text_report(const retime_result& r, const tier& before) {
  text_table table({">cue", "id", ">was", ">now", ">moved", "basis", ">words", "notes"});
  time_ns largest = 0;
  for (const cue_move& m : r.moves) {
    largest = std::max(largest, std::abs(m.new_start - m.old_start));
    std::string notes = m.adjusted;
    if (!m.unfixed.empty()) notes += (notes.empty() ? "" : "; ") + ("NOT FIXED: " + m.unfixed);
    table.add_row({std::to_string(m.cue + 1), before.annotations[m.cue].id.value_or("-"),
                   format_clock(m.old_start), format_clock(m.new_start),
                   signed_seconds(m.new_start - m.old_start) + " s", std::string(to_string(m.how)),
                   std::to_string(m.words), notes});
  }
  const retime_counts c = count_moves(r);
  return table.render() +
         fmt::format(
             "\n{} cues: {} onto their words, {} by their neighbours' shift, {} left as "
             "they were{}; {} not fixed; the largest move {} s\n",
             r.moves.size(), c.by_words, c.by_neighbours, c.unchanged,
             c.reversed ? fmt::format(", {} ending before they start", c.reversed) : "", c.unfixed,
             format_seconds(largest));
}

// Re-times the captions of `doc` in place onto the words (of `doc`, or of `other`, a words
// file), printing what the library says; throws rejected when a tier is not there.
retimed retime_in(const retime_options_cli& o, const profile& p, document& doc,
                  const std::string& file, const format& to, const std::optional<words_file>& other,
                  std::optional<std::string> words_tier) {
  retime_settings settings = o;
  settings.rate = o.input.rate;
  retime_words words;
  words.tier = other ? other->tier : std::move(words_tier);
  if (other) {
    words.doc = &other->doc;
    words.file = display_name(other->path);
  }
  const bool record = to.carries.has(feature::metadata);
  retimed out = take(retime_document(doc, file, p, settings, words, to.time_grid, record));
  if (!record)
    std::fprintf(stderr,
                 "tiers: note: %s cannot carry document metadata: how the captions were "
                 "re-timed is in the report only\n",
                 std::string(to.name).c_str());
  return out;
}

// Each recording of a dataset re-timed alike; the reports, recording by recording, on
// standard output.
int retime_dataset(const retime_options_cli& o, const profile& p) {
  const format& to =
      per_recording_format("retime", !o.input.path.empty(), o.output, o.output_dir, o.to);
  const opened_dataset d = open_dataset(o.dataset, o.input, o.shard);
  std::vector<std::optional<std::string>> reports(d.recordings.size());
  const int status = for_each_output(
      d, o.output_dir, to, o.jobs, "re-timing", [&](const recording& r, const std::string& out) {
        document doc = load_recording(d, r);
        const retimed t = retime_in(o, p, doc, r.id, to, std::nullopt, o.words);
        write_output(doc, to, out, o.allow_loss, r.id);
        reports[static_cast<std::size_t>(&r - d.recordings.data())] =
            o.json ? retime_report_json(t.result, t.before)
                   : r.id + "\n" + text_report(t.result, t.before) + "\n";
      });
  std::vector<std::pair<std::string, std::string>> done;
  std::string text;
  for (std::size_t k = 0; k < reports.size(); ++k)
    if (reports[k]) {
      done.emplace_back(d.recordings[k].id, *reports[k]);
      text += *reports[k];
    }
  stdout_sink sink;
  sink.write(o.json ? reports_by_recording_json(done) : escape_controls(text, true));
  sink.flush();
  return status;
}

}  // namespace

int run_retime(const retime_options_cli& o) {
  const profile p = o.profile.empty() ? profile{} : take(load_profile(o.profile));
  if (!o.dataset.empty()) return retime_dataset(o, p);
  if (o.input.path.empty()) throw usage_error("retime: name the caption file, or --dataset");
  if (o.output.empty()) throw usage_error("retime: name the output with -o");
  if (!o.output_dir.empty() || o.jobs || !o.shard.empty())
    throw usage_error("retime: -d, --jobs and --shard go with --dataset");
  const format& to = output_format(o.to, o.output);
  std::string given_name;
  document doc = load_document(o.input, &given_name);
  const std::string file = display_name(o.input.path);
  std::optional<std::string> words_tier;
  const std::optional<words_file> other = words_file_of(o.words, o.input, words_tier);
  const retimed t = retime_in(o, p, doc, file, to, other, words_tier);
  write_output(doc, to, o.output, o.allow_loss, file, {}, given_name);

  const std::string report_text = o.json ? retime_report_json(t.result, t.before)
                                         : escape_controls(text_report(t.result, t.before), true);
  // The report goes to standard output, unless the document does.
  if (o.output == "-")
    std::fputs(report_text.c_str(), stderr);
  else {
    stdout_sink out;
    out.write(report_text);
    out.flush();
  }
  return exit_ok;
}

}  // namespace tiers::cli
