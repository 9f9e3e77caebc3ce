// `tiers dataset`: lists and validates a dataset description, or writes one from patterns.
#include "dataset_command.hpp"

#include <fmt/format.h>

#include <filesystem>

#include "dataset_inputs.hpp"
#include "text_table.hpp"
#include "tiers/info.hpp"
#include "tiers/io.hpp"

namespace tiers::cli {

void setup_dataset(CLI::App& app, int& status) {
  auto options = std::make_shared<dataset_options>();
  dataset_options& o = *options;
  CLI::App* cmd =
      app.add_subcommand("dataset",
                         "List the recordings a dataset description finds, and what each lacks; or "
                         "write a description from patterns");
  cmd->add_option("description", o.description, "The dataset description (JSON)")
      ->type_name("FILE");
  cmd->add_option("--source", o.patterns,
                  "Write a description with this source: a path with {id} where the recording's "
                  "name is, e.g. 'captions/{id}.vtt' (repeatable; needs -o)")
      ->allow_extra_args(false)
      ->type_name("PATTERN");
  cmd->add_option("-o,--output", o.output,
                  "With --source: the description to write (its folder is where patterns start)")
      ->type_name("FILE");
  cmd->add_option("--format", o.format, "The listing as text (default) or json")
      ->check(CLI::IsMember({"text", "json"}))
      ->type_name("FORMAT");
  cmd->add_flag("--json", o.json, "Shorthand for --format json");
  cmd->add_option("--jobs", o.jobs, "Recordings read at once (default: one per core)")
      ->type_name("N");
  cmd->callback([options, &status] { status = run_dataset(*options); });
}

namespace {

namespace fs = std::filesystem;

// A pattern given on the command line (from the current folder) as the description writes it
// (from its own folder).
std::string relative_pattern(const std::string& pattern, const fs::path& base) {
  const fs::path absolute = fs::absolute(pattern).lexically_normal();
  const std::string rel = absolute.lexically_relative(fs::absolute(base)).generic_string();
  if (rel.empty() || rel.starts_with(".."))
    throw usage_error("--source: '" + pattern + "' is outside the description's folder " +
                      base.string());
  return rel;
}

int write_description(const dataset_options& o) {
  if (o.output.empty()) throw usage_error("dataset --source: name the description to write (-o)");
  if (!o.description.empty())
    throw usage_error("dataset: give either a description to list or --source to write one");
  const fs::path base =
      fs::path(o.output).parent_path().empty() ? fs::path(".") : fs::path(o.output).parent_path();
  dataset_description d;
  for (const std::string& p : o.patterns)
    d.sources.emplace_back().pattern = relative_pattern(p, base);
  const std::string text = dataset_json(d);
  take(read_dataset(text, "--source"));  // a pattern without {id}, or twice, is refused
  atomic_file out(o.output);
  out.write(text);
  out.commit();
  std::size_t found = 0, complete = 0;
  try {
    const opened_dataset opened = open_dataset(o.output, input_options{});
    found = opened.recordings.size();
    for (const recording& r : opened.recordings)
      complete += r.complete();
  } catch (const usage_error&) {  // nothing found yet: the description is still written
  }
  std::fprintf(stderr, "tiers: wrote %s: %zu sources, %zu recordings found (%zu complete)\n",
               o.output.c_str(), d.sources.size(), found, complete);
  return exit_ok;
}

std::string duration_text(const std::optional<document_summary>& s) {
  return s && duration_of(*s) > 0 ? format_clock(duration_of(*s)) : "-";
}

}  // namespace

int run_dataset(const dataset_options& o) {
  if (!o.patterns.empty()) return write_description(o);
  if (o.description.empty())
    throw usage_error("dataset: name a description, or write one with --source PATTERN -o FILE");
  const opened_dataset d = open_dataset(o.description, input_options{});
  const std::vector<std::optional<document_summary>> summaries = summarize_recordings(d, o.jobs);
  std::size_t complete = 0, unreadable = 0;
  for (std::size_t k = 0; k < d.recordings.size(); ++k) {
    complete += d.recordings[k].complete();
    unreadable += !summaries[k];
  }
  const std::vector<dataset_source>& sources = d.description.sources;
  stdout_sink out;
  if (o.json || o.format == "json") {
    write_dataset_listing_json(d.description, d.recordings, summaries, d.file, out);
  } else {
    std::vector<std::string> titles{"recording"};
    for (const dataset_source& s : sources)
      titles.push_back(s.pattern);
    for (const char* t : {">tiers", ">annotations", ">duration"})
      titles.emplace_back(t);
    text_table table(titles);
    for (std::size_t k = 0; k < d.recordings.size(); ++k) {
      const recording& r = d.recordings[k];
      std::vector<std::string> row{r.id};
      for (const std::string& f : r.files)
        row.push_back(f.empty() ? "lacking" : "yes");
      const std::optional<document_summary>& s = summaries[k];
      std::size_t annotations = 0;
      if (s)
        for (const tier_summary& t : s->tiers)
          annotations += t.annotations;
      row.push_back(s ? std::to_string(s->tiers.size()) : "unreadable");
      row.push_back(s ? std::to_string(annotations) : "-");
      row.push_back(duration_text(s));
      table.add_row(row);
    }
    std::string text = table.render() + "\n";
    text += fmt::format("{} recording{}, {} complete, {} unreadable\n", d.recordings.size(),
                        d.recordings.size() == 1 ? "" : "s", complete, unreadable);
    for (std::size_t k = 0; k < sources.size(); ++k) {
      std::size_t have = 0;
      for (const recording& r : d.recordings)
        have += !r.files[k].empty();
      text += fmt::format("  {}: {} of {}\n", sources[k].pattern, have, d.recordings.size());
    }
    out.write(escape_controls(text, true));
  }
  out.flush();
  return complete == d.recordings.size() && unreadable == 0 ? exit_ok : exit_rejected;
}

}  // namespace tiers::cli
