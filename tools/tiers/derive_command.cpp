// `tiers derive SIGNAL -o OUT [--rate R] [--on X] [--off Y] [--min-duration D] [--bridge G]`.
#include "derive_command.hpp"

#include <filesystem>

#include <fmt/format.h>

#include "dataset_inputs.hpp"
#include "tiers/derive.hpp"
#include "tiers/io.hpp"

namespace tiers::cli {

void setup_derive(CLI::App& app, int& status) {
  auto options = std::make_shared<derive_options_cli>();
  derive_options_cli& o = *options;
  CLI::App* cmd =
      app.add_subcommand("derive", "Turn per-frame detector scores into interval tiers");
  cmd->add_option("signal", o.path,
                  "A CSV, TSV or JSON Lines file with a 'frame' or 'time' column and score columns")
      ->type_name("FILE");
  cmd->add_option("--from", o.from, "Input format: csv, tsv or jsonl; default: by extension")
      ->check(one_of(signal_format_names))
      ->type_name("FORMAT");
  cmd->add_option("--rate", o.rate, "Frames per second of a 'frame' column: 25, 30000/1001")
      ->type_name("RATE");
  cmd->add_option("--scores", o.scores, "The score columns to use (default: all)")
      ->type_name("A,B...");
  cmd->add_option("--on", o.on, "An interval starts where a score reaches this (default 0.5)")
      ->type_name("X");
  cmd->add_option("--off", o.off, "and ends where it falls below this (default: --on)")
      ->type_name("Y");
  cmd->add_option("--smooth", o.smooth, "Median over this many frames first (odd; default 1)")
      ->check(CLI::PositiveNumber)
      ->type_name("N");
  cmd->add_option("--bridge", o.bridge,
                  "Join intervals separated by a shorter gap (250ms, 1.5s, or frames: 5f)")
      ->type_name("DURATION");
  cmd->add_option("--min-duration", o.min_duration, "Then drop shorter intervals")
      ->type_name("DURATION");
  cmd->add_option("--tier-name", o.tier_name,
                  "Name the derived tier (default: the score column's name); with several "
                  "scores, {score} stands for each one's name: \"{score}-auto\"")
      ->type_name("NAME");
  cmd->add_option("--label", o.label,
                  "The intervals' text (default: the score column's name); {score} as above")
      ->type_name("TEXT");
  cmd->add_option("--confidence", o.confidence,
                  "Each interval's confidence: the mean score inside it (default) or the max")
      ->check(CLI::IsMember({"mean", "max"}))
      ->type_name("HOW");
  cmd->add_option("--agent", o.agent,
                  "The detector's name, for the tiers' source (default: the "
                  "file's stem)")
      ->type_name("NAME");
  cmd->add_option("--agent-version", o.agent_version, "The detector's version")
      ->type_name("VERSION");
  add_output_options(*cmd, o.output, o.to, o.allow_loss,
                     "Output file, or - for standard output (with --to)");
  add_dataset_options(*cmd, o.dataset, o.output_dir, o.jobs, o.shard,
                      "with its signal sources (\"kind\": \"signal\") derived");
  cmd->callback([options, &status] { status = run_derive(*options); });
}

namespace {

// The derived tiers of one signal table, as `request` asks; `agent` names the detector unless
// --agent does.
document derive_file(const derive_options_cli& o, const std::string& path, derive_request request,
                     const std::string& agent) {
  if (o.agent.empty()) request.derive.source.agent = agent;
  return take(derive_signal(read_input(path), display_name(path), request));
}

// Each recording's signal sources derived into one document, DIR/ID.EXT: a source's `rate`
// and `from` apply to its files, its agent (else the name its pattern gives a tier) names the
// detector, and its `rename` names the derived tiers.
int derive_dataset(const derive_options_cli& o, const derive_request& base) {
  const format& to = per_recording_format("derive", !o.path.empty(), o.output, o.output_dir, o.to);
  const opened_dataset ds = open_dataset(o.dataset, input_options{}, o.shard);
  const auto& sources = ds.description.sources;
  if (std::none_of(sources.begin(), sources.end(),
                   [](const dataset_source& s) { return s.signal; }))
    throw usage_error("derive --dataset: " + ds.file +
                      " has no signal source (\"kind\": \"signal\") to derive");
  return for_each_output(
      ds, o.output_dir, to, o.jobs, "deriving", [&](const recording& r, const std::string& output) {
        std::vector<merge_input> parts;
        std::vector<diagnostic> problems;
        for (std::size_t k = 0; k < sources.size(); ++k) {
          const dataset_source& s = sources[k];
          if (!s.signal) continue;
          if (r.files[k].empty()) {
            problems.push_back(lacking_source(ds, r, k));
            continue;
          }
          const std::string path = ds.path_of(r.files[k]);
          derive_request each = base;
          std::optional<signal_format> from = signal_format_for_path(path);
          for (const auto& [name, value] : s.read) {
            if (name == "rate") each.reading.rate = parse_rate_option(value);
            if (name == "from") from = named(signal_format_names, value);
          }
          if (!from)
            throw usage_error("cannot tell the signal format of '" + path +
                              "'; give the source \"read\": {\"from\": …}");
          each.format = *from;
          if (s.source && s.source->version) each.derive.source.version = s.source->version;
          const std::string agent = s.source && s.source->agent        ? *s.source->agent
                                    : !tier_name_of(s.pattern).empty() ? tier_name_of(s.pattern)
                                                                       : "detector";
          document doc = derive_file(o, path, each, agent);
          dataset_source names;
          names.rename = s.rename;
          for (diagnostic& p : apply_source(doc, names, display_name(path)))
            problems.push_back(std::move(p));
          parts.push_back({display_name(path), std::move(doc)});
        }
        report_all(std::move(problems));
        const document joined = take(join_recording(std::move(parts)), r.id);
        write_output(joined, to, output, o.allow_loss, r.id);
      });
}

}  // namespace

int run_derive(const derive_options_cli& o) {
  if (!o.rate.empty()) parse_rate_option(o.rate);  // for its warning about a likely slip
  // A dataset's sources say each file's format; the checks of the other settings hold alike.
  const derive_request request = derive_request_of(o, o.dataset.empty() ? o.path : "");
  if (!o.dataset.empty()) return derive_dataset(o, request);
  if (o.path.empty()) throw usage_error("derive: name the signal file, or --dataset");
  if (o.output.empty()) throw usage_error("derive: name the output with -o");
  if (!o.output_dir.empty() || o.jobs || !o.shard.empty())
    throw usage_error("derive: -d, --jobs and --shard go with --dataset");
  const format& to = output_format(o.to, o.output);
  write_output(derive_file(o, o.path, request, request.derive.source.agent.value_or("detector")),
               to, o.output, o.allow_loss, display_name(o.path));
  return exit_ok;
}

}  // namespace tiers::cli
