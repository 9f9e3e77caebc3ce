// `tiers agree REF CAND [--tier T | --ref-tier A --cand-tier B] [--step D] [--json]` and
// `tiers agree FILE --tiers A,B,C… [--step D] [--json]`: loads, calls libtiers, prints.
#include "agree_command.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>

#include "dataset_inputs.hpp"
#include "text_table.hpp"
#include "tiers/agree.hpp"
#include "tiers/io.hpp"

namespace tiers::cli {

void setup_agree(CLI::App& app, int& status) {
  auto options = std::make_shared<agree_options>();
  agree_options& o = *options;
  CLI::App* cmd = app.add_subcommand(
      "agree", "How far a candidate tier agrees with a reference, or annotators with each other");
  cmd->add_option("files", o.paths, "REF CAND, or one FILE with both tiers (or with --tiers)")
      ->expected(1, -1)
      ->type_name("FILE");
  cmd->add_option("--dataset", o.dataset,
                  "A dataset description: compare the tiers in each recording, and pooled over "
                  "all of them")
      ->type_name("FILE");
  cmd->add_option("--jobs", o.jobs,
                  "With --dataset: recordings read at once (default: one per core)")
      ->type_name("N");
  cmd->add_option("--shard", o.shard,
                  "With --dataset: only part K of N of the recordings (pool the parts' --json "
                  "reports with --combine)")
      ->type_name("K/N");
  cmd->add_flag("--combine", o.combine,
                "The files are --json reports of agree --dataset --shard: pool their recordings "
                "as one run would");
  cmd->add_option("--tier", o.tier, "The tier compared, when both files call it the same")
      ->type_name("NAME");
  cmd->add_option("--ref-tier", o.ref_tier, "The reference tier")->type_name("NAME");
  cmd->add_option("--cand-tier", o.cand_tier, "The candidate tier")->type_name("NAME");
  cmd->add_option("--tiers", o.tiers, "Several annotators' tiers of one file: Krippendorff's alpha")
      ->type_name("A,B,C...");
  add_comparison_options(*cmd, o.compare);
  cmd->add_option("--min-confidence", o.min_confidence,
                  "Leave out candidate annotations below this confidence (0-1): a higher "
                  "threshold trades recall for precision")
      ->check(CLI::Range(0.0, 1.0))
      ->type_name("X");
  cmd->add_option("--empty", o.empty,
                  "With --tiers: a frame nobody annotated is a missing value to alpha "
                  "(missing, the default) or a label of its own (label)")
      ->check(one_of(empty_frames_names))
      ->type_name("HOW");
  cmd->add_option("--sweep", o.sweep,
                  "Scores at every distinct confidence of the candidate (or every STEP from 0 "
                  "to 1): choose a --min-confidence for merge")
      ->expected(0, 1)
      ->type_name("[STEP]");
  cmd->add_option("--target-precision", o.target_precision,
                  "With --sweep: name the lowest threshold whose precision reaches P")
      ->check(CLI::Range(0.0, 1.0))
      ->type_name("P");
  add_report_output(*cmd, o.out);
  add_input_options(*cmd, o.input);
  cmd->callback([options, &status] { status = run_agree(*options); });
}

namespace {

using tiers::quote_name;

struct loaded {
  std::string file;
  document doc;
};

loaded load(const agree_options& o, const std::string& path) {
  input_options in = o.input;
  in.path = path;
  return {display_name(path), load_document(in)};
}

const tier& tier_in(const loaded& l, const std::string& name) {
  if (name.empty()) {
    if (l.doc.tiers.size() == 1) return l.doc.tiers.front();
    throw usage_error(l.file + " has " + std::to_string(l.doc.tiers.size()) +
                      " tiers; name one with --tier, --ref-tier or --cand-tier (" +
                      tier_names(l.doc) + ")");
  }
  if (const tier* t = find_tier(l.doc, name)) return *t;
  diagnostic d;
  d.file = l.file;
  d.code = "agree.tier";
  d.message = "no tier " + quote_name(name);
  report(d);
  throw rejected();
}

// The candidate tier of `l`, without the annotations below --min-confidence.
tier candidate_in(const agree_options& o, const loaded& l, const std::string& name) {
  return at_least_confident(tier_in(l, name), o.min_confidence);
}

// The grid over the whole tiers (before --min-confidence), from the media's duration when a
// document knows it; a step or collar in frames counts at the first document's rate.
comparison_frame grid_for(const agree_options& o, const std::vector<const document*>& docs,
                          const std::vector<const tier*>& tiers) {
  return comparison_for(o.compare, docs, tiers, o.input.rate);
}

std::string step_text(const time_grid& g) {
  if (g.step_frames > 0)
    return fmt::format("{} frame{} at {} fps", g.step_frames, g.step_frames == 1 ? "" : "s",
                       format_rational(g.rate));
  return format_seconds(g.step) + " s";
}

std::string num(double v) {
  return std::isnan(v) ? "-" : fmt::format("{:.3f}", v);
}

std::string text_report(const agreement_report& r, std::size_t ref_count, std::size_t cand_count) {
  const frame_agreement& f = r.frames;
  const segment_agreement& s = r.segments;
  const time_grid& g = f.grid;
  std::string text;
  text += fmt::format("reference  {}: {} ({} annotations)\n", r.reference.file, r.reference.tier,
                      ref_count);
  text += fmt::format("candidate  {}: {} ({} annotations)\n", r.candidate.file, r.candidate.tier,
                      cand_count);
  text +=
      fmt::format("frames     {} of {}, {} to {} ({})\n\n", g.frames(), step_text(g),
                  format_clock(g.start), format_clock(g.frame_start(g.frames())),
                  g.spans == time_grid::basis::media ? "the media's duration" : "the tiers' spans");
  text += fmt::format("frames     kappa {}  (observed {}, by chance {})\n", num(f.kappa),
                      num(f.observed), num(f.expected));
  text += fmt::format("           precision {}  recall {}  f1 {}  (frames with a label)\n\n",
                      num(f.precision), num(f.recall), num(f.f1));
  text_table labels(
      {"label", ">reference", ">candidate", ">agreed", ">precision", ">recall", ">f1"});
  for (const label_scores& l : f.scores)
    labels.add_row({l.label, std::to_string(l.reference), std::to_string(l.candidate),
                    std::to_string(l.agreed), num(l.precision), num(l.recall), num(l.f1)});
  text += labels.render() + "\n";
  std::vector<std::string> titles{"reference \\ candidate"};
  for (const std::string& l : f.labels)
    titles.push_back(">" + l);
  text_table confusion(titles);
  for (std::size_t i = 0; i < f.labels.size(); ++i) {
    std::vector<std::string> row{f.labels[i]};
    for (std::uint64_t n : f.confusion[i])
      row.push_back(std::to_string(n));
    confusion.add_row(row);
  }
  text += confusion.render() + "\n";
  const segment_options& m = r.matching;
  const std::string how = m.by == segment_options::criterion::boundaries
                              ? "onset and offset within " + format_seconds(m.collar) + " s"
                              : fmt::format("overlap at least {:g} of the union", m.min_overlap);
  text += fmt::format("segments   {} matched one to one ({}{}) of {} reference, {} candidate\n",
                      s.matches.size(), how, m.same_label ? ", same label" : "", s.reference,
                      s.candidate);
  text += fmt::format("           precision {}  recall {}  f1 {}\n", num(s.precision),
                      num(s.recall), num(s.f1));
  if (!s.matches.empty())
    text +=
        fmt::format("           |onset| median {} s, p90 {} s; |offset| median {} s, p90 {} s\n",
                    format_seconds(s.onset_median), format_seconds(s.onset_p90),
                    format_seconds(s.offset_median), format_seconds(s.offset_p90));
  return text;
}

// --sweep's step: nothing for every distinct confidence.
std::optional<double> sweep_step(const agree_options& o) {
  if (!o.sweep || o.sweep->empty()) return std::nullopt;
  char* end = nullptr;
  const double step = std::strtod(o.sweep->c_str(), &end);
  if (*end != '\0' || !(step > 0 && step <= 1))
    throw usage_error("--sweep: '" + *o.sweep + "' is not a step from 0 to 1 such as 0.05");
  return step;
}

// The sweep's table: text (with the thresholds that reach the target) or CSV, or its JSON.
std::string sweep_output(const agree_options& o, const threshold_sweep& sw,
                         const tier_origin& reference, const tier_origin& candidate) {
  const report_format f = o.out.chosen("agree", "the sweep's table");
  if (f == report_format::json) {
    return written([&](byte_sink& out) { write_sweep_json(sw, reference, candidate, out); });
  }
  text_table table({">threshold", ">kept", ">kept share", ">precision", ">recall", ">f1", ">kappa",
                    ">segment precision", ">segment recall", ">segment f1"});
  auto cell = [&](double v) {
    return f == report_format::csv ? (std::isnan(v) ? "" : fmt::format("{}", v)) : num(v);
  };
  for (const sweep_point& p : sw.points)
    table.add_row({fmt::format("{}", p.threshold), std::to_string(p.kept), cell(p.kept_share),
                   cell(p.precision), cell(p.recall), cell(p.f1), cell(p.kappa),
                   cell(p.segment_precision), cell(p.segment_recall), cell(p.segment_f1)});
  if (f == report_format::csv) return table.render_csv();
  std::string text = fmt::format(
      "sweep      {} of {} against {} of {}: {} candidate annotations{}\n\n", candidate.tier,
      candidate.file, reference.tier, reference.file, sw.candidates,
      sw.unscored ? fmt::format(" ({} without a confidence, kept at every threshold)", sw.unscored)
                  : "");
  if (sw.points.empty())
    text += "no annotation of the candidate has a confidence: there is no threshold to sweep\n";
  else
    text += table.render();
  if (sw.target) {
    auto says = [&](const char* what, std::optional<double> t) {
      return t ? fmt::format(
                     "\n{} precision reaches {} from threshold {} (merge "
                     "--min-confidence {})",
                     what, *sw.target, *t, *t)
               : fmt::format("\n{} precision reaches {} at no threshold", what, *sw.target);
    };
    text += says("frame", sw.frames_threshold) + says("segment", sw.segments_threshold) + "\n";
  }
  return escape_controls(text, true);
}

int two_tiers(const agree_options& o) {
  const loaded ref = load(o, o.paths[0]);
  const loaded cand = o.paths.size() > 1 ? load(o, o.paths[1]) : ref;
  const std::string rn = !o.ref_tier.empty() ? o.ref_tier : o.tier;
  const std::string cn = !o.cand_tier.empty() ? o.cand_tier : o.tier;
  if (o.paths.size() == 1 && (rn.empty() || cn.empty() || rn == cn))
    throw usage_error("with one file, name two of its tiers: --ref-tier A --cand-tier B");
  const tier& r = tier_in(ref, rn);
  const tier& whole = tier_in(cand, cn);
  const comparison_frame g = grid_for(o, {&ref.doc, &cand.doc}, {&r, &whole});
  if (o.sweep) {
    const tier_origin ro{ref.file, r.name}, co{cand.file, whole.name};
    emit(o.out, sweep_output(o,
                             sweep_thresholds({{&r, &whole, g.grid}}, g.matching, sweep_step(o),
                                              o.target_precision),
                             ro, co));
    return exit_ok;
  }
  const tier c = candidate_in(o, cand, cn);
  agreement_report report = compare_tiers(r, c, g.grid, g.matching);
  report.reference.file = ref.file;
  report.candidate.file = cand.file;
  if (o.out.chosen("agree") == report_format::json) {
    emit(o.out, written([&](byte_sink& out) { write_agreement_json(report, out); }));
  } else {
    emit(o.out, escape_controls(text_report(report, r.annotations.size(), whole.annotations.size()),
                                true));
  }
  return exit_ok;
}

int many_tiers(const agree_options& o) {
  if (o.paths.size() != 1) throw usage_error("--tiers compares the tiers of one file");
  const loaded file = load(o, o.paths[0]);
  std::vector<const tier*> tiers;
  for (std::size_t from = 0; from <= o.tiers.size();) {
    const std::size_t comma = std::min(o.tiers.find(',', from), o.tiers.size());
    tiers.push_back(&tier_in(file, o.tiers.substr(from, comma - from)));
    from = comma + 1;
  }
  if (tiers.size() < 2) throw usage_error("--tiers needs two tiers or more, e.g. --tiers A,B,C");
  const empty_frames empty = named(empty_frames_names, o.empty);
  annotators_report r = compare_annotators(tiers, grid_for(o, {&file.doc}, tiers).grid, empty);
  r.file = file.file;
  if (o.out.chosen("agree") == report_format::json) {
    emit(o.out, written([&](byte_sink& out) { write_annotators_json(r, out); }));
    return exit_ok;
  }
  std::string names;
  for (const std::string& t : r.tiers)
    names += (names.empty() ? "" : ", ") + t;
  std::string text = fmt::format("annotators {} ({})\n", names, r.file);
  text += fmt::format("frames     {} of {}, {} with two values or more\n", r.grid.frames(),
                      step_text(r.grid), r.pairable);
  text += fmt::format("alpha      {} nominal", num(r.alpha));
  if (r.alpha_interval) text += fmt::format(", {} interval", num(*r.alpha_interval));
  text += empty == empty_frames::missing
              ? " (Krippendorff; no annotation counts as a missing value: --empty label to "
                "count it as a label)\n\n"
              : " (Krippendorff; no annotation counts as a label of its own)\n\n";
  text_table kappas({"pair", ">kappa"});
  for (const auto& p : r.pairwise)
    kappas.add_row({p.a + " / " + p.b, num(p.kappa)});
  emit(o.out, escape_controls(text + kappas.render(), true));
  return exit_ok;
}

diagnostic agree_problem(const std::string& file, std::string message) {
  diagnostic d;
  d.file = file;
  d.code = "report.value";
  d.message = std::move(message);
  return d;
}

// The pooled report and each recording's, as text or JSON; `reference` and `candidate` name
// the dataset and the tiers.
void print_pooled(const agree_options& o, const tier_origin& reference,
                  const tier_origin& candidate, const std::vector<recording_agreement>& each) {
  std::vector<agreement_report> reports;
  for (const recording_agreement& r : each)
    reports.push_back(r.report);
  agreement_report pooled = pool_agreements(reports);
  pooled.reference = reference;
  pooled.candidate = candidate;
  if (o.out.chosen("agree") == report_format::json) {
    emit(o.out, written([&](byte_sink& out) { write_dataset_agreement_json(pooled, each, out); }));
  } else {
    std::string text = fmt::format("pooled over {} recording{} of {}\n", each.size(),
                                   each.size() == 1 ? "" : "s", reference.file);
    text += text_report(pooled, pooled.segments.reference, pooled.segments.candidate);
    text_table table(
        {"recording", ">frames", ">kappa", ">precision", ">recall", ">f1", ">segment f1"});
    for (const recording_agreement& r : each)
      table.add_row({r.id, std::to_string(r.report.frames.grid.frames()),
                     num(r.report.frames.kappa), num(r.report.frames.precision),
                     num(r.report.frames.recall), num(r.report.frames.f1),
                     num(r.report.segments.f1)});
    emit(o.out, escape_controls(text + "\n" + table.render(), true));
  }
}

// Each recording of a dataset compared, then all of them pooled: the confusion matrices summed
// and every measure taken from the sum, as if the recordings' frames were one long grid.
int dataset_tiers(const agree_options& o) {
  const std::string rn = !o.ref_tier.empty() ? o.ref_tier : o.tier;
  const std::string cn = !o.cand_tier.empty() ? o.cand_tier : o.tier;
  if (rn.empty() || cn.empty() || rn == cn)
    throw usage_error(
        "agree --dataset: name two tiers of each recording: --ref-tier A --cand-tier B");
  if (!o.paths.empty()) throw usage_error("agree: give either files or --dataset, not both");
  if (!o.tiers.empty())
    throw usage_error("agree --dataset compares two tiers (--ref-tier, --cand-tier)");
  if (o.sweep && !o.shard.empty())
    throw usage_error("agree --sweep pools every recording in one run: no --shard");
  const opened_dataset d = open_dataset(o.dataset, o.input, o.shard);
  std::vector<std::optional<recording_agreement>> found(d.recordings.size());
  // For a sweep, each recording's two tiers and grid, compared at every threshold at the end.
  struct kept_tiers {
    tier reference, candidate;
    comparison_frame g;
  };
  std::vector<std::optional<kept_tiers>> kept(d.recordings.size());
  const int status = for_each_recording(d, o.jobs, "comparing", [&](const recording& rec) {
    const loaded l{rec.id, load_recording(d, rec)};
    const tier& r = tier_in(l, rn);
    const std::size_t k = static_cast<std::size_t>(&rec - d.recordings.data());
    const comparison_frame g = grid_for(o, {&l.doc}, {&r, &tier_in(l, cn)});
    if (o.sweep) {
      kept[k] = kept_tiers{r, tier_in(l, cn), g};
      return;
    }
    agreement_report report = compare_tiers(r, candidate_in(o, l, cn), g.grid, g.matching);
    report.reference.file = report.candidate.file = rec.id;
    found[k] = recording_agreement{rec.id, std::move(report)};
  });
  if (o.sweep) {
    std::vector<sweep_part> parts;
    segment_options matching = segment_matching(o.compare);  // a collar in frames: the files'
    for (const std::optional<kept_tiers>& t : kept)
      if (t) {
        if (parts.empty()) matching = t->g.matching;
        parts.push_back({&t->reference, &t->candidate, t->g.grid});
      }
    emit(o.out,
         sweep_output(o, sweep_thresholds(parts, matching, sweep_step(o), o.target_precision),
                      {d.file, rn}, {d.file, cn}));
    return status;
  }
  std::vector<recording_agreement> each;
  for (std::optional<recording_agreement>& f : found)
    if (f) each.push_back(std::move(*f));
  print_pooled(o, {d.file, rn}, {d.file, cn}, each);
  return status;
}

// The reports of shards (agree --dataset --shard K/N --json) pooled as one run pools them.
int combine_reports(const agree_options& o) {
  if (!o.dataset.empty() || !o.tiers.empty() || !o.shard.empty())
    throw usage_error("agree --combine pools reports: no --dataset, --tiers or --shard");
  std::optional<dataset_agreement> all;
  std::map<std::string, std::string> reported_in;  // recording → report
  bool failed = false;
  for (const std::string& path : o.paths) {
    const std::string file = display_name(path);
    dataset_agreement part = take(read_dataset_agreement(read_input(path), file));
    if (!all) all = dataset_agreement{part.reference, part.candidate, {}};
    if (part.reference.tier != all->reference.tier || part.candidate.tier != all->candidate.tier) {
      report_all({agree_problem(file, "compares " + quote_name(part.reference.tier) + " with " +
                                          quote_name(part.candidate.tier) + ", not " +
                                          quote_name(all->reference.tier) + " with " +
                                          quote_name(all->candidate.tier))});
    }
    for (recording_agreement& r : part.recordings) {
      const auto [it, fresh] = reported_in.emplace(r.id, file);
      if (!fresh) {
        report(agree_problem(file, "reports the recording " + quote_name(r.id) + " that " +
                                       it->second + " reports already: combine each shard once"));
        failed = true;
      }
      all->recordings.push_back(std::move(r));
    }
  }
  if (failed) throw rejected();
  std::stable_sort(
      all->recordings.begin(), all->recordings.end(),
      [](const recording_agreement& a, const recording_agreement& b) { return a.id < b.id; });
  print_pooled(o, all->reference, all->candidate, all->recordings);
  return exit_ok;
}

}  // namespace

int run_agree(const agree_options& o) {
  reading_options(o.input, "");
  check_comparison_settings(o.compare);
  if (!o.sweep && o.target_precision)
    throw usage_error("agree: --target-precision goes with --sweep");
  if (o.sweep && (o.combine || !o.tiers.empty()))
    throw usage_error(
        "agree: --sweep compares a candidate with a reference (no --tiers or --combine)");
  if (o.sweep) sweep_step(o);
  if (o.combine) return combine_reports(o);
  if (!o.dataset.empty()) return dataset_tiers(o);
  if (!o.shard.empty()) throw usage_error("agree: --shard goes with --dataset");
  if (o.paths.size() > 2) throw usage_error("agree: compare REF CAND, or the tiers of one FILE");
  if (o.paths.empty()) throw usage_error("agree: name REF CAND, one FILE, or --dataset");
  if (!o.tiers.empty()) return many_tiers(o);
  return two_tiers(o);
}

}  // namespace tiers::cli
