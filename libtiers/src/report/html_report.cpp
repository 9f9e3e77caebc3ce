// The HTML report's page: the parts a reader needs before any script runs (headings, figures,
// the problem tables, the lanes' names) are written here; report.js draws the lanes from the
// data written by report_data.cpp.
#include "tiers/html_report.hpp"

#include <fmt/format.h>

#include <cmath>
#include <optional>

#include "detail/embedded.hpp"
#include "detail/markup.hpp"
#include "detail/script_data.hpp"
#include "report_data.hpp"
#include "tiers/version.hpp"

namespace tiers {
namespace {

using detail::agreement_view;

std::string_view asset(std::string_view name) {
  return detail::embedded_text(detail::report_asset_table(), name);
}

// Text for an element's content.
std::string html(std::string_view text) {
  return detail::escaped(text);
}

// Text for a quoted attribute value.
std::string attr(std::string_view text) {
  std::string out;
  for (char c : text) {
    if (c == '"')
      out += "&quot;";
    else
      detail::append_escaped(out, std::string_view(&c, 1));
  }
  return out;
}

std::string plural(std::size_t n, std::string_view one, std::string_view many) {
  return fmt::format("{} {}", n, n == 1 ? one : many);
}

std::string figure(double v) {
  return std::isnan(v) ? "–" : fmt::format("{:.3f}", v);
}

std::string seconds(time_ns t) {
  return fmt::format("{:.2f} s", static_cast<double>(t) / 1e9);
}

// Patterns that tell the agreement verdicts and the problem severities apart without colour.
constexpr std::string_view patterns =
    R"h(<svg class="defs" width="0" height="0" aria-hidden="true" focusable="false"><defs>
<pattern id="hatch-differ" width="6" height="6" patternUnits="userSpaceOnUse" patternTransform="rotate(45)"><rect width="6" height="6" class="differ-bg"/><line x1="0" y1="0" x2="0" y2="6" class="differ-line"/></pattern>
<pattern id="dots-reference" width="5" height="5" patternUnits="userSpaceOnUse"><rect width="5" height="5" class="only-bg"/><circle cx="2.5" cy="2.5" r="1.3" class="only-dot"/></pattern>
<pattern id="rings-candidate" width="6" height="6" patternUnits="userSpaceOnUse"><rect width="6" height="6" class="extra-bg"/><circle cx="3" cy="3" r="1.6" class="extra-ring"/></pattern>
<pattern id="hatch-warning" width="4" height="4" patternUnits="userSpaceOnUse" patternTransform="rotate(45)"><rect width="4" height="4" class="warning-bg"/><line x1="0" y1="0" x2="0" y2="4" class="warning-line"/></pattern>
</defs></svg>
)h";

constexpr std::string_view toolbar = R"h(<div class="toolbar" role="toolbar" aria-label="Time axis">
<button type="button" data-act="in" title="Zoom in (+)">+ Zoom in</button>
<button type="button" data-act="out" title="Zoom out (−)">− Zoom out</button>
<button type="button" data-act="left" title="Earlier (←)">← Earlier</button>
<button type="button" data-act="right" title="Later (→)">Later →</button>
<button type="button" data-act="fit" title="Whole file (0)">Whole file</button>
<span class="view" aria-live="polite"></span>
</div>
)h";

std::string legend(const report_file& f, bool agreement) {
  bool human = false, machine = false;
  for (const tier& t : f.doc->tiers)
    (t.source && t.source->kind == source_kind::machine ? machine : human) = true;
  std::string out = R"h(<div class="legend">)h";
  if (human)
    out += R"h(<span><i class="swatch human"></i>human tier (or source not stated)</span>)h";
  if (machine)
    out +=
        R"h(<span><i class="swatch machine"></i>machine tier, paler where less confident</span>)h";
  if (!f.check->problems.empty())
    out += R"h(<span><i class="swatch problem-error"></i>error</span>)h"
           R"h(<span><i class="swatch problem-warning"></i>warning</span>)h"
           R"h(<span><i class="swatch problem-note"></i>note</span>)h";
  if (agreement)
    out += R"h(<span><i class="swatch agree"></i>agree</span>)h"
           R"h(<span><i class="swatch differ"></i>different labels</span>)h"
           R"h(<span><i class="swatch only"></i>reference only (missed)</span>)h"
           R"h(<span><i class="swatch extra"></i>candidate only (extra)</span>)h";
  return out + "</div>\n";
}

std::string lane_note(const tier& t) {
  std::string note(to_string(t.kind));
  if (t.source) {
    note += " · ";
    note += to_string(t.source->kind);
    if (t.source->agent) note += " (" + *t.source->agent + ")";
  }
  return note + " · " + std::to_string(t.annotations.size());
}

std::string timeline(const report_file& f, const agreement_view* agreement) {
  std::string out = fmt::format(
      R"h(<div class="timeline" tabindex="0" role="group" aria-label="{}">)h"
      "\n",
      attr("Tiers of " + f.check->path +
           " on a time axis. Plus and minus zoom, the arrow keys scroll, 0 shows the whole file."));
  out +=
      R"h(<div class="lane ruler"><div class="name">time</div><svg height="26" aria-hidden="true"></svg></div>)h"
      "\n";
  for (std::size_t k = 0; k < f.doc->tiers.size(); ++k) {
    const tier& t = f.doc->tiers[k];
    out += fmt::format(
        R"h(<div class="lane" data-tier="{}" data-index="{}"><div class="name" title="{}"><strong>{}</strong><span>{}</span></div>)h"
        R"h(<svg height="30" role="img" aria-label="{}"></svg></div>)h"
        "\n",
        attr(t.name), k, attr(t.name + ": " + lane_note(t)), html(t.name), html(lane_note(t)),
        attr("tier " + t.name + ", " + plural(t.annotations.size(), "annotation", "annotations")));
  }
  if (f.check->lag)
    out += fmt::format(
        R"h(<div class="lane lag"><div class="name" title="caption lag: {} after {}, s"><strong>caption lag</strong><span>{} after {}, s</span></div>)h"
        R"h(<svg height="110" role="img" aria-label="The lag of each cue of {} behind the words of {}, over time"></svg></div>)h"
        "\n",
        attr(f.check->lag->captions), attr(f.check->lag->words), html(f.check->lag->captions),
        html(f.check->lag->words), attr(f.check->lag->captions), attr(f.check->lag->words));
  if (agreement)
    out += fmt::format(
        R"h(<div class="lane agreement"><div class="name" title="{} vs {}"><strong>agreement</strong><span>{} vs {}</span></div>)h"
        R"h(<svg height="22" role="img" aria-label="Where {} and {} agree and differ, over time"></svg></div>)h"
        "\n",
        attr(agreement->figures.reference.tier), attr(agreement->figures.candidate.tier),
        html(agreement->figures.reference.tier), html(agreement->figures.candidate.tier),
        attr(agreement->figures.reference.tier), attr(agreement->figures.candidate.tier));
  return out + "</div>\n";
}

std::string lag_figures(const lag_report& lag, const html_report_options& o) {
  const lag_statistics& s = lag.stats;
  const bool known = s.cues > 0;
  return fmt::format(
      R"h(<h3>Caption lag</h3><div class="figures">)h"
      R"h(<div><b>{}</b>median</div><div><b>{}</b>90th percentile</div><div><b>{}</b>largest</div>)h"
      R"h(<div><b>{:.1f} %</b>of {} caption words found</div>)h"
      R"h(<div><b>{} / {}</b>late / early limit</div></div>)h"
      "\n",
      known ? seconds(s.median) : "–", known ? seconds(s.p90) : "–", known ? seconds(s.max) : "–",
      s.coverage * 100, lag.tokens, seconds(o.max_late), seconds(o.max_early));
}

std::string agreement_figures(const agreement_report& r) {
  const frame_agreement& f = r.frames;
  const segment_agreement& s = r.segments;
  return fmt::format(
      R"h(<h3>Agreement of {} with {}</h3><div class="figures">)h"
      R"h(<div><b>{}</b>kappa (frames of {})</div>)h"
      R"h(<div><b>{} / {} / {}</b>precision / recall / F1, frames</div>)h"
      R"h(<div><b>{} / {} / {}</b>precision / recall / F1, segments</div>)h"
      R"h(<div><b>{} of {}</b>reference segments matched ({} candidate)</div></div>)h"
      "\n",
      html(r.candidate.tier), html(r.reference.tier), figure(f.kappa),
      html(format_seconds(f.grid.step) + " s"), figure(f.precision), figure(f.recall), figure(f.f1),
      figure(s.precision), figure(s.recall), figure(s.f1), s.matches.size(), s.reference,
      s.candidate);
}

std::string problem_time(const problem& p) {
  if (!p.start) return "";
  std::string text = format_clock(*p.start, 3);
  if (p.end && *p.end != *p.start) text += "–" + format_clock(*p.end, 3);
  return text;
}

std::string problem_table(const report_file& f) {
  const file_report& r = *f.check;
  if (r.problems.empty())
    return R"h(<p class="empty">No problems found.</p>)h"
           "\n";
  std::string out = fmt::format(
      R"h(<h3>Problems ({})</h3>)h"
      "\n"
      R"h(<div class="problems"><table><caption class="hidden">Problems in {}; choose a row to show it on the lanes</caption>)h"
      R"h(<thead><tr><th scope="col">severity</th><th scope="col">rule</th><th scope="col">tier</th><th scope="col">id</th>)h"
      R"h(<th scope="col">time</th><th scope="col">message</th><th scope="col">where</th></tr></thead><tbody>)h"
      "\n",
      r.problems.size(), html(r.path));
  // Errors first, then warnings, then notes; by time within each (about the file first).
  std::vector<const problem*> order;
  for (const problem& p : r.problems)
    order.push_back(&p);
  std::stable_sort(order.begin(), order.end(), [](const problem* a, const problem* b) {
    if (a->diag.level != b->diag.level) return a->diag.level < b->diag.level;
    constexpr time_ns none = std::numeric_limits<time_ns>::min();
    return a->start.value_or(none) < b->start.value_or(none);
  });
  for (const problem* q : order) {
    const problem& p = *q;
    const std::string_view level = to_string(p.diag.level);
    std::string row = "<tr";
    if (p.start && f.doc)
      row += fmt::format(R"h( data-start="{}" data-end="{}" data-tier="{}" tabindex="0")h",
                         format_seconds(*p.start), format_seconds(p.end.value_or(*p.start)),
                         attr(p.tier));
    std::string where;
    if (p.diag.line > 0)
      where = fmt::format("{}:{}:{}", p.diag.file.empty() ? r.path : p.diag.file, p.diag.line,
                          p.diag.column);
    row += fmt::format(
        R"h(><td><span class="sev {}">{}</span></td><td><code>{}</code></td><td>{}</td><td>{}</td>)h"
        R"h(<td class="time">{}</td><td>{}</td><td class="where">{}</td></tr>)h"
        "\n",
        level, level, html(p.diag.code), html(p.tier), html(p.id.value_or("")), problem_time(p),
        html(p.diag.message), html(where));
    out += row;
  }
  return out + "</tbody></table></div>\n";
}

std::string file_meta(const report_file& f) {
  const file_report& r = *f.check;
  std::vector<std::string> parts;
  if (f.doc) {
    if (f.doc->media.duration) parts.push_back("media " + format_clock(*f.doc->media.duration, 3));
    std::size_t annotations = 0;
    for (const tier& t : f.doc->tiers)
      annotations += t.annotations.size();
    parts.push_back(plural(f.doc->tiers.size(), "tier", "tiers"));
    parts.push_back(plural(annotations, "annotation", "annotations"));
  } else if (!r.shape) {
    parts.push_back("could not be read");
  } else {
    parts.push_back("not drawn (the report draws a limited number of files)");
  }
  parts.push_back(fmt::format("{}, {}, {}", plural(r.count(severity::error), "error", "errors"),
                              plural(r.count(severity::warning), "warning", "warnings"),
                              plural(r.count(severity::note), "note", "notes")));
  std::string out;
  for (const std::string& p : parts)
    out += (out.empty() ? "" : " · ") + html(p);
  return R"h(<p class="meta">)h" + out + "</p>\n";
}

std::string overview(std::span<const report_file> files) {
  std::string out =
      R"h(<section class="overview" aria-labelledby="overview-title"><h2 id="overview-title">Files</h2>)h"
      R"h(<table><thead><tr><th scope="col">file</th><th scope="col" class="n">errors</th>)h"
      R"h(<th scope="col" class="n">warnings</th><th scope="col" class="n">notes</th></tr></thead><tbody>)h"
      "\n";
  for (std::size_t k = 0; k < files.size(); ++k) {
    const file_report& r = *files[k].check;
    out += fmt::format(
        R"h(<tr><td><a href="#file-{}">{}</a></td><td class="n">{}</td><td class="n">{}</td><td class="n">{}</td></tr>)h"
        "\n",
        k, html(r.path), r.count(severity::error), r.count(severity::warning),
        r.count(severity::note));
  }
  return out + "</tbody></table></section>\n";
}

// The document up to the page's header: its title, and the style inline.
void write_head(byte_sink& out, const std::string& title) {
  out.write(
      fmt::format("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
                  "<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n"
                  "<meta name=\"generator\" content=\"tiers {}\">\n<title>{}</title>\n<style>\n",
                  html(version()), html(title)));
  out.write(asset("report.css"));
  out.write("</style>\n</head>\n<body>\n<header>\n");
}

}  // namespace

void write_html_report(std::span<const report_file> files, const html_report_options& o,
                       byte_sink& out) {
  std::vector<std::optional<agreement_view>> agreements(files.size());
  for (std::size_t k = 0; k < files.size(); ++k)
    if (files[k].doc && files[k].reference && files[k].candidate) {
      agreements[k] =
          detail::compare_for_report(*files[k].doc, *files[k].reference, *files[k].candidate, o);
      agreements[k]->figures.reference = {files[k].check->path, files[k].reference->name};
      agreements[k]->figures.candidate = {files[k].check->path, files[k].candidate->name};
    }

  write_head(out, o.title);
  out.write(fmt::format("<h1>{}</h1>\n<p class=\"meta\">{} · checked with {} · tiers {}</p>\n",
                        html(o.title), plural(files.size(), "file", "files"),
                        o.profile.empty() ? std::string("the rules' default settings")
                                          : "the profile " + html(o.profile),
                        html(version())));
  out.write(
      "<p class=\"help\">Zoom with the buttons, the mouse wheel or + and −; scroll by dragging, "
      "with the arrow keys or shift and the wheel. Choose a problem to show it on the "
      "lanes.</p>\n</header>\n");
  out.write(patterns);
  out.write("<main>\n");
  if (files.size() > 1) out.write(overview(files));
  for (std::size_t k = 0; k < files.size(); ++k) {
    const report_file& f = files[k];
    const agreement_view* agreement = agreements[k] ? &*agreements[k] : nullptr;
    out.write(fmt::format(
        R"h(<section class="file" data-file="{}" id="file-{}" aria-labelledby="file-{}-title">)h"
        "\n<h2 id=\"file-{}-title\">{}</h2>\n",
        k, k, k, k, html(f.check->path)));
    out.write(file_meta(f));
    if (f.doc) {
      out.write(toolbar);
      out.write(legend(f, agreement != nullptr));
      out.write(timeline(f, agreement));
      if (f.check->lag) out.write(lag_figures(*f.check->lag, o));
      if (agreement) out.write(agreement_figures(agreement->figures));
    }
    out.write(problem_table(f));
    out.write("</section>\n");
  }
  out.write("</main>\n<script type=\"application/json\" id=\"tiers-data\">\n");
  std::string data;
  {
    string_sink sink(data);
    detail::write_report_data(files, agreements, o, sink);
  }
  detail::write_script_data(out, data);
  out.write("\n</script>\n<script>\n");
  out.write(asset("report.js"));
  out.write("</script>\n</body>\n</html>\n");
}

namespace {

// A relative link to a file: every byte but unreserved ones (RFC 3986 §2.3) and `/` written as
// %XX, so that a recording's id with `#`, `?` or `%` in it still names its page.
std::string link(std::string_view path) {
  std::string out;
  for (const char c : path) {
    const auto u = static_cast<unsigned char>(c);
    if ((u >= 'a' && u <= 'z') || (u >= 'A' && u <= 'Z') || (u >= '0' && u <= '9') || c == '-' ||
        c == '.' || c == '_' || c == '~' || c == '/')
      out += c;
    else
      out += fmt::format("%{:02X}", u);
  }
  return out;
}

}  // namespace

void write_html_index(std::span<const report_index_entry> entries, const html_report_options& o,
                      byte_sink& out) {
  std::size_t counts[3] = {0, 0, 0}, with_errors = 0, with_warnings = 0;
  std::string rows;
  for (const report_index_entry& e : entries) {
    const file_report& r = *e.check;
    const std::size_t errors = r.count(severity::error), warnings = r.count(severity::warning),
                      notes = r.count(severity::note);
    counts[0] += errors;
    counts[1] += warnings;
    counts[2] += notes;
    with_errors += errors > 0;
    with_warnings += warnings > 0;
    const bool lag = r.lag && r.lag->stats.cues > 0;
    rows += fmt::format(
        R"h(<tr><td><a href="{}">{}</a></td><td class="n">{}</td><td class="n">{}</td><td class="n">{}</td><td class="n">{}</td></tr>)h"
        "\n",
        attr(link(e.page)), html(r.path), errors, warnings, notes,
        lag ? seconds(r.lag->stats.median) : std::string("-"));
  }
  write_head(out, o.title);
  out.write(fmt::format(
      "<h1>{}</h1>\n<p class=\"meta\">{} · checked with {} · tiers {}</p>\n"
      "<p class=\"meta\">{} with errors, {} with warnings · {}, {}, {}</p>\n</header>\n",
      html(o.title), plural(entries.size(), "recording", "recordings"),
      o.profile.empty() ? std::string("the rules' default settings")
                        : "the profile " + html(o.profile),
      html(version()), with_errors, with_warnings, plural(counts[0], "error", "errors"),
      plural(counts[1], "warning", "warnings"), plural(counts[2], "note", "notes")));
  out.write(
      R"h(<main>
<section class="overview" aria-labelledby="overview-title"><h2 id="overview-title">Recordings</h2>
<table><thead><tr><th scope="col">recording</th><th scope="col" class="n">errors</th><th scope="col" class="n">warnings</th><th scope="col" class="n">notes</th><th scope="col" class="n">lag (median)</th></tr></thead><tbody>
)h");
  out.write(rows);
  out.write("</tbody></table></section>\n</main>\n</body>\n</html>\n");
}

}  // namespace tiers
