// `tiers sample IN…|--dataset D --tier T --n N [--strata L|--by B] -o sheet.csv [--page P]`:
// draws the sample over every file or recording and writes the review sheet and page;
// `--plan` prints how many to review instead (docs/review.md).
#include "sample_command.hpp"

#include <fmt/format.h>

#include <filesystem>
#include <mutex>
#include <optional>

#include "batch.hpp"
#include "dataset_inputs.hpp"
#include "text_table.hpp"
#include "tiers/io.hpp"
#include "tiers/review.hpp"

namespace tiers::cli {

void setup_sample(CLI::App& app, int& status) {
  auto options = std::make_shared<sample_options_cli>();
  sample_options_cli& o = *options;
  CLI::App* cmd = app.add_subcommand(
      "sample", "Draw annotations of a machine tier for people to review: a sheet and a page");
  cmd->add_option("inputs", o.paths, "Files or folders (searched recursively)")->type_name("PATH");
  cmd->add_option("--dataset", o.dataset, "A dataset description: sample over its recordings")
      ->type_name("FILE");
  cmd->add_option("--jobs", o.jobs, "Files or recordings read at once (default: one per core)")
      ->type_name("N");
  cmd->add_option("--tier", o.tier, "The tier to sample (e.g. a detector's)")->type_name("NAME");
  cmd->add_option("--n", o.n, "How many annotations to draw, over all strata")
      ->check(CLI::Range(std::uint64_t{1}, std::uint64_t{100'000'000}))
      ->type_name("N");
  cmd->add_option("--seed", o.seed, "The draw's seed (default 1): the same seed, the same sample")
      ->type_name("S");
  cmd->add_option("--strata", o.strata,
                  "Stratify by confidence bands with these limits (0.5,0.7,0.9: four bands)")
      ->type_name("L,L,...");
  cmd->add_option("--by", o.by, "Stratify by confidence (with --strata), label or file")
      ->check(CLI::IsMember({"confidence", "label", "file"}))
      ->type_name("WHAT");
  cmd->add_option("--allocation", o.allocation,
                  "The strata's shares of N: proportional to their sizes (default) or equal")
      ->check(one_of(allocation_names))
      ->type_name("A");
  cmd->add_option("--context", o.context,
                  "Lead and tail added to each clip's link (1s, 500ms, or frames: 12f)")
      ->type_name("DURATION");
  cmd->add_option("--page", o.page, "Also write the review page (self-contained HTML)")
      ->type_name("FILE.html");
  cmd->add_option("--title", o.title, "The review page's title")->type_name("TEXT");
  cmd->add_flag("--plan", o.plan,
                "Print how many to review per stratum for --margin at --level instead (Cochran)");
  cmd->add_option("--margin", o.margin, "With --plan: the margin of error (default 0.05)")
      ->check(CLI::Range(1e-6, 0.5))
      ->type_name("E");
  cmd->add_option("--level", o.level, "With --plan: the confidence level (default 0.95)")
      ->type_name("L");
  cmd->add_option("--review-rate", o.review_rate,
                  "With --plan: clips a reviewer judges an hour (default 250)")
      ->check(CLI::PositiveNumber)
      ->type_name("R");
  add_report_output(*cmd, o.out);
  add_input_options(*cmd, o.input);
  cmd->callback([options, &status] { status = run_sample(*options); });
}

namespace {

namespace fs = std::filesystem;

std::string folder_of(const std::string& output) {
  if (output.empty() || output == "-") return ".";
  const fs::path parent = fs::path(output).parent_path();
  return parent.empty() ? "." : parent.string();
}

std::string hours(double h) {
  return h < 1 ? fmt::format("{:.0f} min", h * 60) : fmt::format("{:.1f} h", h);
}

void print_plan(const sample_options_cli& o, const sample_plan& p) {
  const report_format f = o.out.chosen("sample --plan", "the plan's table");
  if (f == report_format::json) {
    emit(o.out, written([&](byte_sink& out) { write_sample_plan_json(p, out); }));
    return;
  }
  const bool csv = f == report_format::csv;
  text_table t({"stratum", ">annotations", ">sample", csv ? ">hours" : ">review"});
  auto row = [&](const plan_row& r) {
    t.add_row({r.name, std::to_string(r.annotations), std::to_string(r.sample),
               csv ? fmt::format("{}", r.hours) : hours(r.hours)});
  };
  for (const plan_row& r : p.strata)
    row(r);
  if (csv) {
    emit(o.out, t.render_csv());
    return;
  }
  if (p.strata.size() > 1) row(p.total);
  std::string text = fmt::format(
      "Sample sizes for a margin of ±{} at {}% (Cochran: n0 = z² p(1−p)/e² = {:.2f} with "
      "p = 0.5, then the finite-population correction n0 / (1 + (n0 − 1)/N))\n\n",
      p.margin, p.level * 100, p.n0);
  text += t.render();
  text += fmt::format(
      "\n{}one simple random sample of all {} annotations: {} to review, {} at {} clips an "
      "hour\n",
      p.strata.size() > 1 ? "Each stratum above is estimated to its margin; " : "",
      p.simple.annotations, p.simple.sample, hours(p.simple.hours), p.review_rate);
  emit(o.out, escape_controls(text, true));
}

// The strata and what was drawn, on standard error: the sheet may be on standard output.
void print_drawn(const sampler& s, const std::vector<sample_row>& rows, const std::string& tier) {
  text_table t({"stratum", ">annotations", ">drawn", ">weight"});
  for (const stratum_count& c : s.strata())
    t.add_row(
        {c.name, std::to_string(c.size), std::to_string(c.drawn),
         c.drawn ? fmt::format("{:.2f}", static_cast<double>(c.size) / static_cast<double>(c.drawn))
                 : "-"});
  std::string text = fmt::format("drew {} of {} annotations of {}\n", rows.size(), s.population(),
                                 quote_name(tier));
  text += t.render();
  std::fputs(escape_controls(text, true).c_str(), stderr);
}

}  // namespace

int run_sample(const sample_options_cli& o) {
  reading_options(o.input, "");
  check_level("--level", o.level);
  if (o.tier.empty()) throw usage_error("sample: name the tier to sample with --tier");
  if (!o.plan && o.n == 0)
    throw usage_error("sample: say how many to draw with --n, or ask for --plan");
  if (o.plan && !o.page.empty()) throw usage_error("sample --plan prints a plan: no --page");
  if (!o.plan) {
    if (!o.out.format.empty() && o.out.format != "csv")
      throw usage_error("sample writes its sheet as CSV; --format goes with --plan");
    if (o.out.json) throw usage_error("sample writes its sheet as CSV; --json goes with --plan");
  }
  const sample_options l = sample_options_of(o);
  const std::string sheet_folder = folder_of(o.out.output), page_folder = folder_of(o.page);

  sampler all(l);
  std::mutex adding;
  std::size_t without_media = 0;
  auto add = [&](const document& doc, const std::string& file, const std::string& path) {
    sampler part =
        take(sample_document(doc, file, path, o, sheet_folder, page_folder, o.input.rate));
    const std::lock_guard<std::mutex> lock(adding);
    all.add(std::move(part));
    if (doc.media.uri.value_or("").empty()) ++without_media;
  };
  int status = exit_ok;
  if (!o.dataset.empty()) {
    if (!o.paths.empty()) throw usage_error("sample: give either files or --dataset, not both");
    const opened_dataset d = open_dataset(o.dataset, o.input);
    status = for_each_recording(d, o.jobs, "reading", [&](const recording& r) {
      std::vector<std::string> tier_files;
      const document doc = load_recording(d, r, &tier_files);
      std::string file = r.id;
      for (std::size_t k = 0; k < doc.tiers.size() && k < tier_files.size(); ++k)
        if (doc.tiers[k].name == o.tier) file = tier_files[k];
      add(doc, file, file);
    });
  } else {
    if (o.paths.empty()) throw usage_error("sample: name the files or folders, or --dataset");
    const std::vector<input_file> files = expand_inputs(o.paths);
    if (files.empty()) throw usage_error("sample: the inputs hold no file to read");
    status =
        for_each_document(files, o.input, o.jobs, "reading", [&](std::size_t k, document&& doc) {
          add(doc, display_name(files[k].path), files[k].path);
        });
  }
  // A sample of part of the input would misstate every weight: nothing is written.
  if (status != exit_ok) return status;
  if (o.plan) {
    print_plan(o, plan_sample(all.strata(), o.margin, o.level, o.review_rate));
    return exit_ok;
  }
  const std::vector<sample_row> rows = all.draw();
  for (const diagnostic& d : sample_warnings({}, without_media))
    report(d);
  const std::string sheet = written([&](byte_sink& out) { write_review_sheet(rows, out); });
  std::string page;
  if (!o.page.empty()) {
    review_page_options p;
    p.title = o.title.empty() ? "Review of " + o.tier : o.title;
    p.key = fmt::format("{}:{}:{}:{}:{:x}", o.tier, o.seed, rows.size(), all.population(),
                        std::hash<std::string>{}(sheet));
    p.save_as = o.out.output.empty() || o.out.output == "-"
                    ? "review.csv"
                    : fs::path(o.out.output).stem().string() + ".reviewed.csv";
    page = written([&](byte_sink& out) { write_review_page(rows, p, out); });
  }
  // Both written whole, or neither.
  std::optional<atomic_file> page_file;
  if (!o.page.empty()) {
    page_file.emplace(o.page);
    page_file->write(page);
  }
  emit(o.out, sheet);
  if (page_file) page_file->commit();
  print_drawn(all, rows, o.tier);
  for (const diagnostic& d : sample_warnings(all.strata(), 0))
    report(d);
  return exit_ok;
}

}  // namespace tiers::cli
