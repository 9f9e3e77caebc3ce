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
  cmd->add_flag("--json", o.json, "Print JSON for scripts");
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
  tier c = tier_in(l, name);
  std::erase_if(c.annotations, [&](const annotation& a) {
    return a.confidence && *a.confidence < o.min_confidence;
  });
  return c;
}

// The grid: from zero to the media's end when a document knows it, else to the last end.
time_grid grid_for(const std::vector<const document*>& docs, const std::vector<const tier*>& tiers,
                   const std::string& step) {
  time_grid g;
  g.step = parse_duration_option("--step", step, duration_kind::positive);
  for (const document* d : docs)
    if (d->media.duration) g.end = std::max(g.end, *d->media.duration);
  if (g.end == 0)
    for (const tier* t : tiers)
      for (const annotation& a : t->annotations)
        g.end = std::max({g.end, a.end, a.start + 1});
  return g;
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
  text += fmt::format("frames     {} of {} s, {} to {}\n\n", g.frames(), format_seconds(g.step),
                      format_clock(g.start),
                      format_clock(g.start + static_cast<time_ns>(g.frames()) * g.step));
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

int two_tiers(const agree_options& o) {
  const loaded ref = load(o, o.paths[0]);
  const loaded cand = o.paths.size() > 1 ? load(o, o.paths[1]) : ref;
  const std::string rn = !o.ref_tier.empty() ? o.ref_tier : o.tier;
  const std::string cn = !o.cand_tier.empty() ? o.cand_tier : o.tier;
  if (o.paths.size() == 1 && (rn.empty() || cn.empty() || rn == cn))
    throw usage_error("with one file, name two of its tiers: --ref-tier A --cand-tier B");
  const tier& r = tier_in(ref, rn);
  const std::size_t cand_count = tier_in(cand, cn).annotations.size();
  const tier c = candidate_in(o, cand, cn);
  agreement_report report = compare_tiers(
      r, c, grid_for({&ref.doc, &cand.doc}, {&r, &c}, o.compare.step), segment_matching(o.compare));
  report.reference.file = ref.file;
  report.candidate.file = cand.file;
  stdout_sink out;
  if (o.json)
    write_agreement_json(report, out);
  else
    out.write(escape_controls(text_report(report, r.annotations.size(), cand_count), true));
  out.flush();
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
  annotators_report r = compare_annotators(tiers, grid_for({&file.doc}, tiers, o.compare.step));
  r.file = file.file;
  stdout_sink out;
  if (o.json) {
    write_annotators_json(r, out);
    out.flush();
    return exit_ok;
  }
  std::string names;
  for (const std::string& t : r.tiers)
    names += (names.empty() ? "" : ", ") + t;
  std::string text = fmt::format("annotators {} ({})\n", names, r.file);
  text += fmt::format("frames     {} of {} s, {} with two values or more\n", r.grid.frames(),
                      format_seconds(r.grid.step), r.pairable);
  text += fmt::format("alpha      {} nominal", num(r.alpha));
  if (r.alpha_interval) text += fmt::format(", {} interval", num(*r.alpha_interval));
  text += " (Krippendorff; no annotation counts as a missing value)\n\n";
  text_table kappas({"pair", ">kappa"});
  for (const auto& p : r.pairwise)
    kappas.add_row({p.a + " / " + p.b, num(p.kappa)});
  out.write(escape_controls(text + kappas.render(), true));
  out.flush();
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
  stdout_sink out;
  if (o.json) {
    write_dataset_agreement_json(pooled, each, out);
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
    out.write(escape_controls(text + "\n" + table.render(), true));
  }
  out.flush();
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
  const opened_dataset d = open_dataset(o.dataset, o.input, o.shard);
  std::vector<std::optional<recording_agreement>> found(d.recordings.size());
  const int status = for_each_recording(d, o.jobs, "comparing", [&](const recording& rec) {
    const loaded l{rec.id, load_recording(d, rec)};
    const tier& r = tier_in(l, rn);
    const tier c = candidate_in(o, l, cn);
    agreement_report report = compare_tiers(r, c, grid_for({&l.doc}, {&r, &c}, o.compare.step),
                                            segment_matching(o.compare));
    report.reference.file = report.candidate.file = rec.id;
    const std::size_t k = static_cast<std::size_t>(&rec - d.recordings.data());
    found[k] = recording_agreement{rec.id, std::move(report)};
  });
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
  if (o.combine) return combine_reports(o);
  if (!o.dataset.empty()) return dataset_tiers(o);
  if (!o.shard.empty()) throw usage_error("agree: --shard goes with --dataset");
  if (o.paths.size() > 2) throw usage_error("agree: compare REF CAND, or the tiers of one FILE");
  if (o.paths.empty()) throw usage_error("agree: name REF CAND, one FILE, or --dataset");
  if (!o.tiers.empty()) return many_tiers(o);
  return two_tiers(o);
}

}  // namespace tiers::cli
