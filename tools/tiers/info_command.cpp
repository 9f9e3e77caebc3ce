// `tiers info IN [--json]`: tiers, kinds, sources, counts, time span, annotated time, coverage.
#include "info_command.hpp"

#include <fmt/format.h>

#include "dataset_inputs.hpp"
#include "text_table.hpp"
#include "tiers/info.hpp"
#include "tiers/io.hpp"

namespace tiers::cli {

void setup_info(CLI::App& app, int& status) {
  auto options = std::make_shared<info_options>();
  info_options& o = *options;
  CLI::App* cmd = app.add_subcommand(
      "info", "Show the tiers in a file: kinds, sources, counts, span, coverage");
  cmd->add_option("input", o.input.path, "Input file, or - for standard input")->type_name("FILE");
  cmd->add_option("--dataset", o.dataset,
                  "A dataset description: per tier, how many recordings have it, its "
                  "annotations, total and annotated time, and who made it")
      ->type_name("FILE");
  cmd->add_option("--jobs", o.jobs,
                  "With --dataset: recordings read at once (default: one per core)")
      ->type_name("N");
  cmd->add_flag("--json", o.json, "Print JSON for scripts");
  add_input_options(*cmd, o.input);
  cmd->callback([options, &status] { status = run_info(*options); });
}

namespace {

std::string source_text(const std::optional<tier_source>& s) {
  if (!s) return "-";
  std::string out(to_string(s->kind));
  if (s->agent) out += " (" + *s->agent + (s->version ? " " + *s->version : "") + ")";
  return out;
}

std::string media_line(const media_info& m) {
  if (!m.uri && !m.duration && !m.frame_rate) return "-";
  std::string out = m.uri ? *m.uri : "(no uri)";
  if (m.duration) out += ", " + format_clock(*m.duration);
  if (m.frame_rate) out += ", " + format_rational(*m.frame_rate) + " fps";
  return out;
}

// The inventory of a dataset: each tier name over the recordings that could be read.
int dataset_info(const info_options& o) {
  if (!o.input.path.empty()) throw usage_error("info: give either a file or --dataset, not both");
  const opened_dataset d = open_dataset(o.dataset, o.input);
  const std::vector<std::optional<document_summary>> summaries = summarize_recordings(d, o.jobs);
  dataset_inventory inv;
  std::size_t unreadable = 0;
  for (const std::optional<document_summary>& s : summaries) {
    if (s)
      inv.add(*s);
    else
      ++unreadable;
  }
  stdout_sink out;
  if (o.json) {
    write_inventory_json(inv, d.file, out);
  } else {
    std::string text = fmt::format("{}\n  recordings {} read", d.file, inv.recordings);
    if (unreadable) text += fmt::format(", {} unreadable", unreadable);
    text += "\n  length     " + format_clock(inv.length) + "\n\n";
    text_table table({"tier", ">recordings", ">annotations", ">length", ">annotated", ">human",
                      ">machine", ">unmarked"});
    for (const tier_inventory& t : inv.tiers)
      table.add_row({t.name, std::to_string(t.recordings), std::to_string(t.annotations),
                     format_clock(t.length), format_clock(t.annotated), std::to_string(t.human),
                     std::to_string(t.machine), std::to_string(t.unmarked)});
    out.write(escape_controls(text + table.render(), true));
  }
  out.flush();
  return unreadable ? exit_rejected : exit_ok;
}

}  // namespace

int run_info(const info_options& o) {
  if (!o.dataset.empty()) return dataset_info(o);
  if (o.input.path.empty()) throw usage_error("info: name the file, or --dataset");
  const document doc = load_document(o.input);
  const document_summary s = summarize(doc);
  stdout_sink out;
  if (o.json) {
    write_summary_json(s, display_name(o.input.path), out);
    out.flush();
    return exit_ok;
  }
  std::string text = display_name(o.input.path) + "\n";
  text += "  media     " + media_line(s.media) + "\n";
  if (s.start)
    text += "  span      " + format_clock(*s.start) + " to " + format_clock(*s.end) + "\n";
  text += "  tiers     " + std::to_string(s.tiers.size()) + "\n\n";
  text_table table({"tier", "kind", "source", ">annotations", ">start", ">end", ">annotated",
                    s.reference_is_media ? ">coverage" : ">coverage (of span)"});
  for (const tier_summary& t : s.tiers)
    table.add_row({t.name, std::string(to_string(t.kind)), source_text(t.source),
                   std::to_string(t.annotations), t.start ? format_clock(*t.start) : "-",
                   t.end ? format_clock(*t.end) : "-",
                   t.kind == tier_kind::interval ? format_clock(t.annotated) : "-",
                   t.coverage ? fmt::format("{:.1f} %", *t.coverage * 100) : "-"});
  text += table.render();
  out.write(escape_controls(text, true));  // names from the file reach a terminal
  out.flush();
  return exit_ok;
}

}  // namespace tiers::cli
