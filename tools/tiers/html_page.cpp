// Writing the HTML page that `tiers report` and `tiers check --html` share.
#include "html_page.hpp"

#include <cstdio>

#include "tiers/html_report.hpp"
#include "tiers/io.hpp"

namespace tiers::cli {
namespace {

const tier* named_tier(const document& doc, const std::string& name, const std::string& file) {
  if (const tier* t = find_tier(doc, name)) return t;
  diagnostic d;
  d.level = severity::warning;
  d.file = file;
  d.code = "report.tier";
  d.message = "no tier " + tiers::quote_name(name) + " to compare; no agreement is drawn";
  report(d);
  return nullptr;
}

}  // namespace

void write_html_page(const html_request& h, const check_run& run, const profile& p) {
  html_report_options options;
  options.title = h.title;
  options.profile = p.name;
  options.max_late = p.limits.max_late;
  options.max_early = p.limits.max_early;
  const duration_arg step = parse_duration_arg("--step", h.compare.step, duration_kind::positive);
  check_comparison_settings(h.compare);

  std::vector<report_file> files(run.reports.size());
  for (std::size_t k = 0; k < files.size(); ++k) {
    report_file& f = files[k];
    f.check = &run.reports[k];
    if (k >= run.documents.size() || !run.documents[k]) continue;
    f.doc = &*run.documents[k];
    // Frames count at the first drawn document's rate; a page has one grid.
    if (k == 0) {
      const std::optional<rational> rate = frame_rate_of(*f.doc, h.rate);
      options.step = step.at(rate);
      options.step_frames = step.frames();
      options.rate = rate.value_or(rational{});
      options.matching = segment_matching(h.compare, rate);
    }
    if (!h.ref_tier.empty() && !h.cand_tier.empty()) {
      f.reference = named_tier(*f.doc, h.ref_tier, f.check->path);
      f.candidate = named_tier(*f.doc, h.cand_tier, f.check->path);
    }
  }
  if (run.reports.size() > html_drawn_files)
    std::fprintf(stderr,
                 "tiers: note: the page draws the first %zu of %zu files and lists the "
                 "problems of all\n",
                 html_drawn_files, run.reports.size());
  if (h.output == "-") {
    stdout_sink out;
    write_html_report(files, options, out);
    out.flush();
    return;
  }
  atomic_file out(h.output);
  write_html_report(files, options, out);
  out.commit();
}

}  // namespace tiers::cli
