// `tiers derive SIGNAL -o OUT [--rate R] [--on X] [--off Y] [--min-duration D] [--bridge G]`.
#include "derive_command.hpp"

#include <filesystem>

#include <fmt/format.h>

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
      ->required()
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
  cmd->add_option("--bridge", o.bridge, "Join intervals separated by a shorter gap")
      ->type_name("DURATION");
  cmd->add_option("--min-duration", o.min_duration, "Then drop shorter intervals")
      ->type_name("DURATION");
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
  add_output_options(*cmd, o.output, o.to, o.allow_loss);
  cmd->callback([options, &status] { status = run_derive(*options); });
}

int run_derive(const derive_options_cli& o) {
  const format& to = output_format(o.to, o.output);
  signal_options so;
  if (!o.rate.empty()) so.rate = parse_rate_option(o.rate);
  for (std::size_t from = 0; !o.scores.empty() && from <= o.scores.size();) {
    const std::size_t comma = std::min(o.scores.find(',', from), o.scores.size());
    so.columns.push_back(o.scores.substr(from, comma - from));
    from = comma + 1;
  }
  derive_options d;
  d.on = o.on;
  d.off = o.off;
  // Hysteresis leaves at --off what it entered at --on; above it, an interval would end before
  // the score that started it fell.
  if (o.off && *o.off > o.on)
    throw usage_error(
        fmt::format("--off {} is above --on {}: an interval ends where the score "
                    "falls below --off, which must not exceed --on",
                    *o.off, o.on));
  if (o.smooth % 2 == 0) throw usage_error("--smooth: the median needs an odd number of frames");
  d.smooth = o.smooth;
  d.bridge = parse_duration_option("--bridge", o.bridge);
  d.min_duration = parse_duration_option("--min-duration", o.min_duration);
  d.max_confidence = o.confidence == "max";
  d.source.agent = o.agent.empty() && o.path != "-"
                       ? name_from_path(o.path)
                       : (o.agent.empty() ? std::string("detector") : o.agent);
  if (!o.agent_version.empty()) d.source.version = o.agent_version;

  std::optional<signal_format> from = !o.from.empty() ? named(signal_format_names, o.from)
                                      : o.path == "-" ? signal_format::csv
                                                      : signal_format_for_path(o.path);
  if (!from)
    throw usage_error("cannot tell the signal's format from '" + o.path +
                      "'; name it with --from csv, tsv or jsonl");
  const std::string text = read_input(o.path);
  signal_result r = read_signal(text, *from, so);
  locate_all(text, r.diagnostics);
  const signal table = take(std::move(r), display_name(o.path));
  write_output(derive_tiers(table, d), to, o.output, o.allow_loss, display_name(o.path));
  return exit_ok;
}

}  // namespace tiers::cli
