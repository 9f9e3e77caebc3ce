// `tiers check IN… [--profile P] [--format text|json|sarif] [-o OUT] [--jobs N]`.
#include "check_command.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <map>
#include <mutex>
#include <optional>

#include "check_inputs.hpp"
#include "html_page.hpp"
#include "text_table.hpp"
#include "tiers/io.hpp"

namespace tiers::cli {

void setup_check(CLI::App& app, int& status) {
  auto options = std::make_shared<check_options>();
  check_options& o = *options;
  CLI::App* cmd = app.add_subcommand(
      "check", "Validate tier files or whole folders: times, structure, text, captions, lag");
  cmd->add_option("inputs", o.paths, "Files or folders (searched recursively), or - for stdin")
      ->type_name("PATH");
  cmd->add_option("--dataset", o.dataset,
                  "A dataset description: check each of its recordings as one document (its "
                  "files joined), and compare the recordings")
      ->type_name("FILE");
  cmd->add_option("--profile", o.profile,
                  "A profile: a built-in name (see --list-profiles) or a JSON file")
      ->type_name("PROFILE");
  cmd->add_option("--captions", o.captions,
                  "The caption tier: caption rules apply, and its lag is measured against --words")
      ->type_name("TIER");
  cmd->add_option("--words", o.words,
                  "The word timings: a tier of each file, or FILE or FILE:TIER for another file")
      ->type_name("TIER|FILE[:TIER]");
  cmd->add_option("--format", o.format, "Report as text (default), json or sarif")
      ->check(CLI::IsMember({"text", "json", "sarif"}))
      ->type_name("FORMAT");
  cmd->add_option("-o,--output", o.output, "Write the report to this file (default: stdout)")
      ->type_name("FILE");
  cmd->add_option("--html", o.html,
                  "Also write the report as an HTML page that draws the files' tiers, problems "
                  "and lag (as `tiers report` does)")
      ->type_name("FILE");
  cmd->add_option("--min-severity", o.min_severity,
                  "Text output: list only problems of this severity or worse (error, warning, "
                  "note); the totals still count all")
      ->check(CLI::IsMember({"error", "warning", "note"}))
      ->type_name("LEVEL");
  cmd->add_option("--limit", o.limit,
                  "Text output: list at most N problems of each rule in each file, then how "
                  "many more; the totals still count all")
      ->check(positive_size())
      ->type_name("N");
  cmd->add_option("--lag-table", o.lag_table,
                  "Write every caption cue's lag behind its words to FILE (.csv or .json): cue "
                  "id, times, first matched word, lag, words in the cue and matched")
      ->type_name("FILE");
  cmd->add_option("--jobs", o.jobs, "Files checked at once (default: one per core)")
      ->type_name("N");
  cmd->add_option("--max-warnings", o.max_warnings,
                  "Fail (exit status 1) when there are more warnings than this")
      ->check(CLI::NonNegativeNumber)
      ->type_name("N");
  cmd->add_option("--shard", o.shard,
                  "Check only part K of N of the (sorted) files, for array jobs; files are "
                  "compared with one another when the reports are combined")
      ->type_name("K/N");
  cmd->add_flag("--combine", o.combine,
                "The inputs are JSON reports (--format json) of runs over parts of a dataset: "
                "join them into one report, comparing all their files");
  cmd->add_flag("--list-rules", o.list_rules,
                "List the rules, one a line: id, severity (with --profile: the profile's), "
                "summary");
  cmd->add_flag("--list-profiles", o.list_profiles, "List the built-in profiles");
  add_input_options(*cmd, o.input);
  cmd->callback([options, &status] { status = run_check(*options); });
}

namespace {

std::string limits_of(const rule_info& r, const profile& p) {
  std::string text;
  for (const rule_parameter& q : rule_parameters(r.id, p.limits))
    text += (text.empty() ? "" : ", ") + q.name + " " + q.text;
  return text;
}

int list_rules(const profile& p) {
  std::string text;
  std::size_t width = 0;
  for (const rule_info& r : rules())
    width = std::max(width, r.id.size());
  for (const rule_info& r : rules()) {
    std::string line =
        fmt::format("{:<{}}  {:<7}  {}", r.id, width, to_string(p.level(r.id)), r.summary);
    if (const std::string l = limits_of(r, p); !l.empty()) line += " [" + l + "]";
    text += line + "\n";
  }
  stdout_sink out;
  out.write(text);
  out.flush();
  return exit_ok;
}

std::string seconds_text(time_ns t) {
  return fmt::format("{:.3f} s", static_cast<double>(t) / 1e9);
}

// The summary for people: totals, problems by rule, the worst files, and the lag; `tallies`
// are the files' problems counted, index for index with `reports`.
std::string summary_text(const std::vector<file_report>& reports,
                         const std::vector<std::vector<rule_tally>>& tallies) {
  const check_summary s = summarize(tallies);
  std::string text = fmt::format("checked {} file{}: ", s.files, s.files == 1 ? "" : "s");
  if (s.errors + s.warnings + s.notes == 0) return text + "no problems\n";
  text +=
      fmt::format("{} error{}, {} warning{}, {} note{}; {} file{} with errors, {} with warnings\n",
                  s.errors, s.errors == 1 ? "" : "s", s.warnings, s.warnings == 1 ? "" : "s",
                  s.notes, s.notes == 1 ? "" : "s", s.files_with_errors,
                  s.files_with_errors == 1 ? "" : "s", s.files_with_warnings);
  text_table by_rule({"rule", "severity", ">problems", ">files"});
  for (const auto& r : s.by_rule)
    by_rule.add_row({r.rule, std::string(to_string(r.level)), std::to_string(r.problems),
                     std::to_string(r.files)});
  text += "\n" + by_rule.render();
  struct file_counts {
    const std::string* path;
    std::size_t of[3] = {0, 0, 0};  // by severity
  };
  std::vector<file_counts> worst;
  for (std::size_t k = 0; k < reports.size() && k < tallies.size(); ++k) {
    file_counts f{&reports[k].path};
    for (const rule_tally& c : tallies[k])
      f.of[static_cast<std::size_t>(c.level)] += c.problems;
    if (f.of[0] + f.of[1] + f.of[2] > 0) worst.push_back(f);
  }
  auto level = [](const file_counts& f, severity l) { return f.of[static_cast<std::size_t>(l)]; };
  std::stable_sort(worst.begin(), worst.end(), [&](const file_counts& a, const file_counts& b) {
    return std::pair(level(a, severity::error), level(a, severity::warning)) >
           std::pair(level(b, severity::error), level(b, severity::warning));
  });
  if (reports.size() > 1) {
    text_table files({"worst files", ">errors", ">warnings", ">notes"});
    for (std::size_t k = 0; k < worst.size() && k < 5; ++k)
      files.add_row({*worst[k].path, std::to_string(level(worst[k], severity::error)),
                     std::to_string(level(worst[k], severity::warning)),
                     std::to_string(level(worst[k], severity::note))});
    text += "\n" + files.render();
  }
  return text;
}

std::string lag_text(const std::vector<file_report>& reports) {
  text_table lag({"lag of captions", "tiers", ">median", ">p90", ">max", ">words found"});
  bool any = false;
  for (const file_report& r : reports) {
    if (!r.lag) continue;
    any = true;
    const lag_statistics& s = r.lag->stats;
    const bool known = s.cues > 0;
    lag.add_row({r.path, r.lag->captions + " / " + r.lag->words,
                 known ? seconds_text(s.median) : "-", known ? seconds_text(s.p90) : "-",
                 known ? seconds_text(s.max) : "-",
                 fmt::format("{:.1f} % of {}", s.coverage * 100, r.lag->tokens)});
  }
  return any ? "\n" + lag.render() : "";
}

std::vector<std::vector<rule_tally>> tallies_of(const std::vector<file_report>& reports) {
  std::vector<std::vector<rule_tally>> out;
  for (const file_report& r : reports)
    out.push_back(tally(r));
  return out;
}

// Where the text report goes: the file of -o, or problems to standard error and the summary
// to standard output.
struct text_report {
  std::string path;  // empty: standard error and output
  std::optional<atomic_file> file;
  explicit text_report(const check_options& o) : path(o.output == "-" ? "" : o.output) {}
  // Opened at the first write, so that the inputs' own errors come first.
  byte_sink* sink() {
    if (path.empty()) return nullptr;
    if (!file) file.emplace(path);
    return &*file;
  }
  void problems(const std::string& text) {
    if (text.empty()) return;
    if (byte_sink* s = sink())
      s->write(text);
    else
      std::fwrite(text.data(), 1, text.size(), stderr);
  }
  void summary(const std::string& text) {
    if (byte_sink* s = sink()) {
      s->write(text);
      file->commit();
      return;
    }
    stdout_sink out;
    out.write(text);
    out.flush();
  }
};

// A text report lists each file's own problems in the order of the files, then those of the
// dataset rules, which need every file: so it can be written while the files are checked.
bool of_dataset(const problem& p) {
  return p.diag.code == "dataset.inconsistent";
}

// Which problems a text report lists: --min-severity and --limit (the totals count all).
struct listing {
  severity least = severity::note;
  std::size_t limit = 0;  // per rule and file; 0: no limit
  explicit listing(const check_options& o)
      : least(o.min_severity == "error"     ? severity::error
              : o.min_severity == "warning" ? severity::warning
                                            : severity::note),
        limit(o.limit) {}
};

std::string problems_text(const file_report& r, bool dataset, const listing& l) {
  std::string text;
  std::map<std::string, std::size_t> listed, more;  // by rule
  for (const problem& p : r.problems) {
    if (of_dataset(p) != dataset || p.diag.level < l.least) continue;
    if (l.limit > 0 && listed[p.diag.code]++ >= l.limit) {
      ++more[p.diag.code];
      continue;
    }
    text += format_problem(p) + "\n";
  }
  for (const auto& [rule, n] : more)
    text += fmt::format("{}: … and {} more {}\n", r.path, n, rule);
  return text;
}

std::string problems_text(const std::vector<file_report>& reports, const listing& l) {
  std::string text;
  for (bool dataset : {false, true})
    for (const file_report& r : reports)
      text += problems_text(r, dataset, l);
  return text;
}

// The lag table, CSV or JSON by the file's extension, written whole or not at all.
void write_lag_table(const std::string& path, const std::vector<lag_rows>& rows) {
  atomic_file out(path);
  if (path.ends_with(".json"))
    write_lag_table_json(rows, out);
  else
    write_lag_table_csv(rows, out);
  out.commit();
}

// A text report written file by file as the files are checked, keeping of each only its
// counts, lag and shape: memory does not grow with the number of files. The dataset rules'
// problems, which need every file, follow the files' own.
check_summary check_streamed(const check_options& o, const profile& p) {
  text_report out(o);
  std::mutex guard;
  std::vector<std::vector<rule_tally>> tallies;
  std::vector<std::optional<lag_rows>> lag_table;
  report_stream stream;
  stream.render = [&](std::size_t k, file_report& r) {
    std::optional<lag_rows> rows;
    if (!o.lag_table.empty() && r.lag) rows = lag_rows{r.path, std::move(r.lag->cues)};
    std::string text = problems_text(r, false, listing(o));
    std::vector<rule_tally> counts = tally(r);
    std::vector<problem>().swap(r.problems);  // its memory too, which `= {}` would keep
    if (r.lag) std::vector<lag_report::cue>().swap(r.lag->cues);  // kept only for a lag table
    const std::lock_guard<std::mutex> lock(guard);
    if (tallies.size() <= k) tallies.resize(k + 1);
    tallies[k] = std::move(counts);
    if (lag_table.size() <= k) lag_table.resize(k + 1);
    lag_table[k] = std::move(rows);
    return text;
  };
  stream.write = [&](const std::string& text) { out.problems(text); };
  const check_run run = run_checks(o, p, 0, &stream);
  tallies.resize(run.reports.size());
  for (std::size_t k = 0; k < run.reports.size(); ++k) {
    out.problems(problems_text(run.reports[k], true, listing(o)));
    add_tally(tallies[k], run.reports[k]);
  }
  if (!o.lag_table.empty()) {
    std::vector<lag_rows> rows;
    for (std::optional<lag_rows>& r : lag_table)
      if (r) rows.push_back(std::move(*r));
    write_lag_table(o.lag_table, rows);
  }
  out.summary(escape_controls(summary_text(run.reports, tallies) + lag_text(run.reports), true));
  return summarize(tallies);
}

void write_report(const check_options& o, const std::vector<file_report>& reports,
                  const profile& used) {
  report_header header;
  if (!o.profile.empty()) header.profile = identify(used);
  if (!o.shard.empty()) header.shard = o.shard;
  auto emit = [&](byte_sink& out, bool with_problems) {
    if (o.format == "json") return write_check_json(reports, out, header);
    if (o.format == "sarif") return write_check_sarif(reports, out, used, header);
    if (with_problems) out.write(problems_text(reports, listing(o)));
    out.write(
        escape_controls(summary_text(reports, tallies_of(reports)) + lag_text(reports), true));
  };
  if (!o.output.empty() && o.output != "-") {
    atomic_file out(o.output);
    emit(out, true);
    out.commit();
    return;
  }
  if (o.format == "text") std::fputs(problems_text(reports, listing(o)).c_str(), stderr);
  stdout_sink out;
  emit(out, false);
  out.flush();
}

}  // namespace

int run_check(const check_options& o) {
  const profile p = load_check_profile(o.profile);
  if (o.list_profiles) {
    std::string text;
    for (std::string_view name : builtin_profiles()) {
      const profile b = load_profile(std::string(name)).value;
      text += fmt::format("{}\n    {}\n", name, b.description);
    }
    stdout_sink out;
    out.write(text);
    out.flush();
    return exit_ok;
  }
  if (o.list_rules) return list_rules(p);
  if (o.paths.empty() && o.dataset.empty())
    throw usage_error("check: name the files or folders to check, or --dataset");
  if (o.format != "text" && (o.min_severity != "note" || o.limit > 0))
    throw usage_error("check: --min-severity and --limit shape the text report; " + o.format +
                      " holds every problem");
  if (!o.lag_table.empty() && !o.lag_table.ends_with(".csv") && !o.lag_table.ends_with(".json"))
    throw usage_error("check: --lag-table writes .csv or .json, not '" + o.lag_table + "'");
  if (!o.lag_table.empty() && o.combine)
    throw usage_error("check: --lag-table needs the cues, which --combine's reports do not hold");
  if (!o.html.empty() && o.combine)
    throw usage_error("check: --html draws the files, which --combine does not read");
  check_summary s;
  if (o.format == "text" && o.html.empty() && !o.combine) {
    s = check_streamed(o, p);
  } else {
    const check_run run = run_checks(o, p, o.html.empty() ? 0 : html_drawn_files);
    write_report(o, run.reports, p);
    if (!o.lag_table.empty()) {
      std::vector<lag_rows> rows;
      for (const file_report& r : run.reports)
        if (r.lag) rows.push_back({r.path, r.lag->cues});
      write_lag_table(o.lag_table, rows);
    }
    if (!o.html.empty()) {
      html_request page;
      page.output = o.html;
      page.title = "tiers check";
      write_html_page(page, run, p);
    }
    s = summarize(run.reports);
  }
  if (s.errors > 0) return exit_rejected;
  if (o.max_warnings >= 0 && s.warnings > static_cast<std::size_t>(o.max_warnings)) {
    std::fprintf(stderr, "tiers: error: %zu warnings, more than --max-warnings %ld allows\n",
                 s.warnings, o.max_warnings);
    return exit_rejected;
  }
  return exit_ok;
}

}  // namespace tiers::cli
