// `tiers info IN [--json]`: tiers, kinds, sources, counts, time span, annotated time, coverage.
#include "info_command.hpp"

#include <fmt/format.h>

#include "text_table.hpp"
#include "tiers/info.hpp"
#include "tiers/io.hpp"

namespace tiers::cli {

void setup_info(CLI::App& app, int& status) {
  auto options = std::make_shared<info_options>();
  info_options& o = *options;
  CLI::App* cmd = app.add_subcommand(
      "info", "Show the tiers in a file: kinds, sources, counts, span, coverage");
  cmd->add_option("input", o.input.path, "Input file, or - for standard input")
      ->required()
      ->type_name("FILE");
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

}  // namespace

int run_info(const info_options& o) {
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
