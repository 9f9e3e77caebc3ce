// `tiers estimate SHEET… [--level L] [--target-precision P] [--annotate FILE -o OUT]`: the
// precision of the sampled tier, per stratum, per label and overall (docs/review.md).
#include "estimate_command.hpp"

#include <fmt/format.h>

#include <cmath>
#include <set>

#include "sample_command.hpp"
#include "text_table.hpp"
#include "tiers/io.hpp"
#include "tiers/review.hpp"

namespace tiers::cli {

void setup_estimate(CLI::App& app, int& status) {
  auto options = std::make_shared<estimate_options_cli>();
  estimate_options_cli& o = *options;
  CLI::App* cmd = app.add_subcommand(
      "estimate", "A machine tier's precision from a reviewed sample (tiers sample's sheet)");
  cmd->add_option("sheets", o.sheets,
                  "Reviewed sheets (several: the parts of one sample, reviewed apart)")
      ->type_name("SHEET.csv");
  cmd->add_option("--level", o.level, "The intervals' confidence level (default 0.95)")
      ->type_name("L");
  cmd->add_option("--target-precision", o.target_precision,
                  "Also find the lowest confidence threshold whose annotations reach this "
                  "precision by the interval's lower bound")
      ->check(CLI::Range(0.0, 1.0))
      ->type_name("P");
  cmd->add_option("--annotate", o.annotate,
                  "Write the estimate into the sampled tier's attributes in this file; -o names "
                  "the result, and the report goes to standard output")
      ->type_name("FILE");
  cmd->add_option("--to", o.to, "With --annotate: the result's format (default: from -o)")
      ->type_name("FORMAT");
  cmd->add_flag("--allow-loss", o.allow_loss,
                "With --annotate: write even when the format cannot keep everything");
  add_report_output(*cmd, o.out);
  add_input_options(*cmd, o.input);
  cmd->callback([options, &status] { status = run_estimate(*options); });
}

namespace {

std::string num(double v) {
  return std::isnan(v) ? "-" : fmt::format("{:.3f}", v);
}

std::string exact(double v) {
  return std::isnan(v) ? "" : fmt::format("{}", v);
}

void add_rows(text_table& t, const std::vector<precision_row>& rows, bool csv, bool strata,
              const char* kind) {
  for (const precision_row& r : rows) {
    const bool known = r.reviewed > 0;
    auto v = [&](double x) { return known ? (csv ? exact(x) : num(x)) : (csv ? "" : "-"); };
    std::vector<std::string> cells;
    if (csv) cells.push_back(kind);
    cells.push_back(r.name);
    if (strata || csv) cells.push_back(strata ? std::to_string(r.size) : "");
    cells.insert(cells.end(),
                 {std::to_string(r.reviewed), std::to_string(r.correct), std::to_string(r.unsure),
                  std::to_string(r.unreviewed), v(r.precision), v(r.wilson.low), v(r.wilson.high),
                  v(r.clopper_pearson.low), v(r.clopper_pearson.high)});
    t.add_row(std::move(cells));
  }
}

void print_estimate(const precision_estimate& e, const report_output& where) {
  const report_format f = where.chosen("estimate", "the strata and labels");
  if (f == report_format::json) {
    emit(where, written([&](byte_sink& out) { write_estimate_json(e, out); }));
    return;
  }
  const bool csv = f == report_format::csv;
  std::vector<std::string> titles{"name",         ">size",       ">reviewed",  ">correct",
                                  ">unsure",      ">unreviewed", ">precision", ">wilson low",
                                  ">wilson high", ">cp low",     ">cp high"};
  if (csv) {
    titles.insert(titles.begin(), "group");
    text_table t(titles);
    add_rows(t, e.strata, true, true, "stratum");
    add_rows(t, e.labels, true, false, "label");
    const population_estimate& a = e.overall;
    const bool known = a.reviewed > 0;
    t.add_row({"overall", "", fmt::format("{}", a.annotations), std::to_string(a.reviewed),
               std::to_string(a.correct), "", "", known ? exact(a.precision) : "",
               known ? exact(a.interval.low) : "", known ? exact(a.interval.high) : "", "", ""});
    emit(where, t.render_csv());
    return;
  }
  const int percent = static_cast<int>(std::lround(e.level * 100));
  std::string text;
  const population_estimate& a = e.overall;
  if (a.reviewed == 0) {
    text += "No clip of the sheet has a verdict yes or no yet: nothing to estimate.\n";
  } else {
    text += fmt::format(
        "precision {:.3f}, {}% interval {:.3f}–{:.3f} (standard error {:.4f}), from {} reviewed "
        "clips, {} correct, standing for {:.0f} annotations\n",
        a.precision, percent, a.interval.low, a.interval.high, a.se, a.reviewed, a.correct,
        a.annotations);
  }
  if (!e.unreviewed_strata.empty()) {
    text += "left out, no clip reviewed:";
    for (const std::string& s : e.unreviewed_strata)
      text += " " + quote_name(s);
    text += " — the estimate covers the other strata only\n";
  }
  if (e.threshold) {
    const threshold_choice& t = *e.threshold;
    if (t.confidence)
      text += fmt::format(
          "threshold: confidence ≥ {} reaches precision {} by the interval's lower bound "
          "({:.3f}, {}% interval {:.3f}–{:.3f}; keeps about {:.0f} annotations)\n",
          *t.confidence, t.target, t.kept.precision, percent, t.kept.interval.low,
          t.kept.interval.high, t.kept.annotations);
    else
      text += fmt::format(
          "threshold: no confidence threshold reaches precision {} by the interval's lower "
          "bound\n",
          t.target);
  }
  std::vector<std::string> stratum_titles = titles;
  stratum_titles[0] = "stratum";
  text_table strata(stratum_titles);
  add_rows(strata, e.strata, false, true, "");
  text += fmt::format("\nby stratum ({}% intervals: Wilson, Clopper-Pearson)\n", percent);
  text += strata.render();
  std::vector<std::string> label_titles = titles;
  label_titles.erase(label_titles.begin() + 1);  // a label's size is unknown
  label_titles[0] = "label";
  text_table labels(label_titles);
  add_rows(labels, e.labels, false, false, "");
  text +=
      "\nby label (the sample's own counts: with unequal weights they are not population "
      "estimates)\n";
  text += labels.render();
  text +=
      "\nPrecision says nothing about what the detector missed: recall needs a full "
      "reference tier (tiers agree).\n";
  emit(where, escape_controls(text, true));
}

// The tier the sheet sampled: the one name its rows give.
std::string sampled_tier(const std::vector<sample_row>& rows, const std::string& file) {
  std::set<std::string> names;
  for (const sample_row& r : rows)
    if (!r.tier.empty()) names.insert(r.tier);
  if (names.size() == 1) return *names.begin();
  diagnostic d;
  d.file = file;
  d.code = "review.sheet";
  d.message = names.empty() ? "the sheet names no tier: --annotate needs its tier column"
                            : "the sheet names several tiers: --annotate needs one";
  report(d);
  throw rejected();
}

// The sheets' rows, one sample (join_review_sheets): problems printed, rejected on errors.
std::vector<sample_row> read_sheets(const std::vector<std::string>& paths) {
  std::vector<review_part> parts;
  for (const std::string& path : paths) {
    const std::string file = display_name(path);
    parts.push_back({file, take(read_review_sheet(read_input(path), file))});
  }
  return take(join_review_sheets(std::move(parts)));
}

}  // namespace

int run_estimate(const estimate_options_cli& o) {
  check_level("--level", o.level);
  if (o.sheets.empty()) throw usage_error("estimate: name the reviewed sheet");
  if (o.annotate.empty() && (!o.to.empty() || o.allow_loss))
    throw usage_error("estimate: --to and --allow-loss go with --annotate");
  if (!o.annotate.empty() && o.out.output.empty())
    throw usage_error("estimate --annotate: name the annotated file with -o");
  const std::vector<sample_row> rows = read_sheets(o.sheets);
  estimate_options l;
  l.level = o.level;
  l.target_precision = o.target_precision;
  const precision_estimate e = estimate_precision(rows, l);
  if (o.annotate.empty()) {
    print_estimate(e, o.out);
    return exit_ok;
  }
  input_options in = o.input;
  in.path = o.annotate;
  document doc = load_document(in);
  const std::string name = sampled_tier(rows, display_name(o.sheets[0]));
  tier* t = find_tier(doc, name);
  if (!t) {
    diagnostic d;
    d.file = display_name(o.annotate);
    d.code = "estimate.tier";
    d.message = "no tier " + quote_name(name) +
                ", which the sheet sampled (its tiers: " + tier_names(doc) + ")";
    report(d);
    throw rejected();
  }
  if (e.overall.reviewed == 0) {
    diagnostic d;
    d.file = display_name(o.sheets[0]);
    d.code = "review.sheet";
    d.message = "no clip has a verdict yes or no: nothing to write into the tier";
    report(d);
    throw rejected();
  }
  annotate_precision(*t, e);
  write_output(doc, output_format(o.to, o.out.output), o.out.output, o.allow_loss,
               display_name(o.annotate));
  report_output to_stdout = o.out;
  to_stdout.output.clear();
  print_estimate(e, to_stdout);
  return exit_ok;
}

}  // namespace tiers::cli
