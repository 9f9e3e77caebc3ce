// `tiers info IN [--json]`: tiers, kinds, sources, counts, time span, annotated time, coverage.
#include "info_command.hpp"

#include <fmt/format.h>

#include "batch.hpp"
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
  cmd->add_option("input", o.paths,
                  "Input file, or - for standard input; with --labels, files and folders")
      ->type_name("FILE");
  cmd->add_flag("--labels", o.labels,
                "Per tier and label: count, total, mean and median duration, share of the "
                "tier's time, mean confidence");
  cmd->add_option("--dataset", o.dataset,
                  "A dataset description: per tier, how many recordings have it, its "
                  "annotations, total and annotated time, and who made it")
      ->type_name("FILE");
  cmd->add_option("--jobs", o.jobs,
                  "With --dataset: recordings read at once (default: one per core)")
      ->type_name("N");
  add_report_output(*cmd, o.out);
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
  if (o.out.chosen("info") == report_format::json) {
    emit(o.out, written([&](byte_sink& out) { write_inventory_json(inv, d.file, out); }));
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
    emit(o.out, escape_controls(text + table.render(), true));
  }
  return unreadable ? exit_rejected : exit_ok;
}

std::string seconds_text(double s) {
  return fmt::format("{:.3f}", s);
}

// The label table as text, CSV or JSON; `what` says what it was gathered over.
void print_labels(const info_options& o, const label_tally& tally, const std::string& what) {
  const report_format f = o.out.chosen("info", "the label table");
  const std::vector<label_statistics> table = tally.table();
  if (f == report_format::json) {
    emit(o.out, written([&](byte_sink& out) { write_labels_json(table, tally.documents(), out); }));
    return;
  }
  const bool csv = f == report_format::csv;
  text_table t({"tier", "source", "label", ">count", ">total", ">mean", ">median", ">share",
                ">mean confidence"});
  auto maybe = [&](const std::optional<double>& v, bool percent) {
    if (!v) return std::string(csv ? "" : "-");
    if (csv) return fmt::format("{}", *v);
    return percent ? fmt::format("{:.1f} %", *v * 100) : fmt::format("{:.3f}", *v);
  };
  for (const label_statistics& s : table)
    t.add_row({s.tier, s.source.empty() ? (csv ? "" : "-") : s.source, s.label,
               std::to_string(s.count), csv ? format_seconds(s.total) : format_clock(s.total),
               csv ? fmt::format("{}", s.mean) : seconds_text(s.mean),
               csv ? fmt::format("{}", s.median) : seconds_text(s.median), maybe(s.share, true),
               maybe(s.mean_confidence, false)});
  if (csv) {
    emit(o.out, t.render_csv());
    return;
  }
  emit(o.out, escape_controls(what + "\n\n" + t.render() +
                                  "\nmean and median durations in seconds; share: of the "
                                  "tier's summed durations\n",
                              true));
}

// Label statistics over files and folders, read on --jobs threads; a file that cannot be read
// is reported and the others still count.
int file_labels(const info_options& o) {
  const std::vector<input_file> files = expand_inputs(o.paths);
  std::vector<std::optional<label_tally>> each(files.size());
  const int status =
      for_each_document(files, o.input, o.jobs, "reading", [&](std::size_t k, document&& doc) {
        label_tally t;
        t.add(doc);
        each[k] = std::move(t);
      });
  label_tally all;
  for (const std::optional<label_tally>& t : each)
    if (t) all.add(*t);
  print_labels(o, all, fmt::format("{} file{}", all.documents(), all.documents() == 1 ? "" : "s"));
  return status;
}

int dataset_labels(const info_options& o) {
  if (!o.paths.empty()) throw usage_error("info: give either files or --dataset, not both");
  const opened_dataset d = open_dataset(o.dataset, o.input);
  std::vector<std::optional<label_tally>> each(d.recordings.size());
  const int status = for_each_recording(d, o.jobs, "reading", [&](const recording& r) {
    label_tally t;
    t.add(load_recording(d, r));
    each[static_cast<std::size_t>(&r - d.recordings.data())] = std::move(t);
  });
  label_tally all;
  for (const std::optional<label_tally>& t : each)
    if (t) all.add(*t);
  print_labels(
      o, all,
      fmt::format("{}: {} recording{}", d.file, all.documents(), all.documents() == 1 ? "" : "s"));
  return status;
}

}  // namespace

int run_info(const info_options& o) {
  reading_options(o.input, "");
  if (o.labels) {
    if (!o.dataset.empty()) return dataset_labels(o);
    if (o.paths.empty()) throw usage_error("info --labels: name files or folders, or --dataset");
    return file_labels(o);
  }
  if (!o.dataset.empty()) return dataset_info(o);
  if (o.paths.empty()) throw usage_error("info: name the file, or --dataset");
  if (o.paths.size() > 1)
    throw usage_error("info describes one file (--labels gathers over many, or use --dataset)");
  input_options in = o.input;
  in.path = o.paths.front();
  const document doc = load_document(in);
  const document_summary s = summarize(doc);
  if (o.out.chosen("info") == report_format::json) {
    emit(o.out,
         written([&](byte_sink& out) { write_summary_json(s, display_name(in.path), out); }));
    return exit_ok;
  }
  std::string text = display_name(in.path) + "\n";
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
  emit(o.out, escape_controls(text, true));  // names from the file reach a terminal
  return exit_ok;
}

}  // namespace tiers::cli
