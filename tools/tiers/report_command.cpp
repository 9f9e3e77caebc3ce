// `tiers report FILE… -o OUT.html [--profile P] [--captions T --words W] [--ref-tier A
// --cand-tier B]`: checks the files as `tiers check` does and draws them on one page.
#include "report_command.hpp"

#include <filesystem>

#include "dataset_inputs.hpp"
#include "tiers/html_report.hpp"
#include "tiers/io.hpp"

namespace tiers::cli {

void setup_report(CLI::App& app, int& status) {
  auto options = std::make_shared<report_options>();
  report_options& o = *options;
  CLI::App* cmd = app.add_subcommand(
      "report", "Draw tier files on one HTML page: lanes on a time axis, problems, lag, agreement");
  check_options& c = o.check;
  html_request& h = o.page;
  cmd->add_option("inputs", c.paths, "Files or folders (searched recursively), or - for stdin")
      ->type_name("PATH");
  cmd->add_option("-o,--output", h.output, "The page to write (.html), or - for stdout")
      ->type_name("FILE");
  add_dataset_options(*cmd, c.dataset, o.output_dir, c.jobs, c.shard,
                      "checked and drawn on a page of its own, with an index page,");
  cmd->add_option("--title", h.title, "The page's title (default: tiers report)")
      ->type_name("TEXT");
  cmd->add_option("--profile", c.profile,
                  "Check with this profile: a built-in name (see check --list-profiles) or a "
                  "JSON file")
      ->type_name("PROFILE");
  cmd->add_option("--captions", c.captions,
                  "The caption tier: caption rules apply, and its lag is plotted against --words")
      ->type_name("TIER");
  cmd->add_option("--words", c.words,
                  "The word timings: a tier of each file, or FILE or FILE:TIER for another file")
      ->type_name("TIER|FILE[:TIER]");
  cmd->add_option("--ref-tier", h.ref_tier,
                  "Show where this reference tier and --cand-tier agree: a tier of each file, or "
                  "FILE or FILE:TIER for one of another file")
      ->type_name("TIER|FILE[:TIER]");
  cmd->add_option("--cand-tier", h.cand_tier,
                  "The candidate tier compared with --ref-tier: a tier of each file, or FILE or "
                  "FILE:TIER for one of another file (drawn in every file)")
      ->type_name("TIER|FILE[:TIER]");
  add_comparison_options(*cmd, h.compare);
  add_input_options(*cmd, c.input);
  cmd->callback([options, &status] { status = run_report(*options); });
}

namespace {

// --ref-tier and --cand-tier name a tier of each file, or FILE:TIER (or FILE, when it has one
// tier) a tier of another file: that tier is then added to every drawn file, under its own
// name unless a drawn file has a tier of that name already, and compared there.
std::string resolve_compared(const std::string& spec, const char* option, check_run& run,
                             const input_options& reading) {
  std::optional<std::string> name;
  std::optional<words_file> other = words_file_of(spec, reading, name);
  if (!other) return spec;
  const tier* t = nullptr;
  if (other->tier) {
    t = find_tier(other->doc, *other->tier);
    if (!t)
      throw usage_error(std::string(option) + ": " + display_name(other->path) + " has no tier " +
                        tiers::quote_name(*other->tier));
  } else if (other->doc.tiers.size() == 1) {
    t = &other->doc.tiers.front();
  } else {
    throw usage_error(std::string(option) + ": " + display_name(other->path) + " has " +
                      std::to_string(other->doc.tiers.size()) + " tiers; name one as FILE:TIER");
  }
  tier copy = *t;
  for (const std::optional<document>& d : run.documents)
    if (d && find_tier(*d, copy.name)) {
      copy.name += " (" + std::filesystem::path(other->path).filename().string() + ")";
      break;
    }
  for (std::optional<document>& d : run.documents)
    if (d) d->tiers.push_back(copy);
  return copy.name;
}

// A dataset: checked whole (the dataset rules need every recording), then each recording drawn
// on a page of its own, DIR/recordings/ID.html, and an index page, DIR/index.html, with the
// totals and a row per recording linking its page.
int report_dataset(const report_options& o, const profile& p) {
  namespace fs = std::filesystem;
  const html_request& h = o.page;
  if (o.output_dir.empty() || !h.output.empty() || !o.check.paths.empty())
    throw usage_error(
        "report --dataset writes a page per recording and an index: give -d DIR, "
        "and no files or -o");
  if (h.ref_tier.find(':') != std::string::npos || h.cand_tier.find(':') != std::string::npos)
    throw usage_error("report --dataset compares tiers of each recording: name them, not files");
  const check_run run = run_checks(o.check, p, 0);
  const opened_dataset& d = *run.dataset;
  const fs::path pages = fs::path(o.output_dir) / "recordings";
  std::error_code ec;
  fs::create_directories(pages, ec);
  const int status = for_each_recording(d, o.check.jobs, "drawing", [&](const recording& rec) {
    const std::size_t k = static_cast<std::size_t>(&rec - d.recordings.data());
    check_run one;
    one.reports = {run.reports[k]};
    recording_read r = read_recording(d, rec);
    one.documents.emplace_back();
    if (r.ok) one.documents.back() = std::move(r.doc);
    html_request page = h;
    page.rate = o.check.input.rate;
    page.rate = o.check.input.rate;
    page.output = (pages / (rec.id + ".html")).string();
    page.title = h.title + ": " + rec.id;
    write_html_page(page, one, p);
    if (!run.reports[k].shape) throw rejected();  // unreadable: its page lists why
  });
  std::vector<report_index_entry> entries;
  for (const file_report& r : run.reports)
    entries.push_back({&r, "recordings/" + r.path + ".html"});
  html_report_options index;
  index.title = h.title;
  index.profile = p.name;
  atomic_file out((fs::path(o.output_dir) / "index.html").string());
  write_html_index(entries, index, out);
  out.commit();
  return status;
}

}  // namespace

int run_report(const report_options& o) {
  const html_request& h = o.page;
  if (!o.check.dataset.empty()) {
    if (h.ref_tier.empty() != h.cand_tier.empty())
      throw usage_error("report: name both tiers to compare: --ref-tier A --cand-tier B");
    check_comparison_settings(h.compare);
    return report_dataset(o, load_check_profile(o.check.profile));
  }
  if (o.check.paths.empty()) throw usage_error("report: name the files or folders, or --dataset");
  if (h.output.empty()) throw usage_error("report: name the page to write with -o");
  if (!o.output_dir.empty()) throw usage_error("report: -d goes with --dataset");
  if (h.ref_tier.empty() != h.cand_tier.empty())
    throw usage_error("report: name both tiers to compare: --ref-tier A --cand-tier B");
  // Bad durations are usage errors before any file is read.
  check_comparison_settings(h.compare);
  const profile p = load_check_profile(o.check.profile);
  check_run run = run_checks(o.check, p, html_drawn_files);
  html_request page = h;
  page.rate = o.check.input.rate;
  if (!page.ref_tier.empty()) {
    page.ref_tier = resolve_compared(h.ref_tier, "--ref-tier", run, o.check.input);
    page.cand_tier = resolve_compared(h.cand_tier, "--cand-tier", run, o.check.input);
  }
  // The page shows every problem; standard error needs only what kept a file off the page.
  bool unreadable = false;
  for (const file_report& r : run.reports)
    if (!r.shape) {
      unreadable = true;
      for (const problem& pr : r.problems)
        report(pr.diag);
    }
  write_html_page(page, run, p);
  return unreadable ? exit_rejected : exit_ok;
}

}  // namespace tiers::cli
