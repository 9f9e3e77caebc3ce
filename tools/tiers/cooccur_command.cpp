// `tiers cooccur IN…|--dataset D --a TIER --b TIER [--relation R] [--window D] …`: counts
// over every file or recording, then the statistics of every pair.
#include "cooccur_command.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <tuple>

#include "batch.hpp"
#include "dataset_inputs.hpp"
#include "text_table.hpp"
#include "tiers/cooccur.hpp"
#include "tiers/io.hpp"

namespace tiers::cli {

void setup_cooccur(CLI::App& app, int& status) {
  auto options = std::make_shared<cooccur_options_cli>();
  cooccur_options_cli& o = *options;
  CLI::App* cmd = app.add_subcommand(
      "cooccur", "Which labels of one tier go with which labels of another, over a corpus");
  cmd->add_option("inputs", o.paths, "Files or folders (searched recursively)")->type_name("PATH");
  cmd->add_option("--dataset", o.dataset,
                  "A dataset description: count over every recording (its files joined)")
      ->type_name("FILE");
  cmd->add_option("--jobs", o.jobs, "Files or recordings read at once (default: one per core)")
      ->type_name("N");
  cmd->add_option("--shard", o.shard,
                  "Count only part K of N of the (sorted) files or recordings, and write the "
                  "counts as JSON for --combine")
      ->type_name("K/N");
  cmd->add_flag("--combine", o.combine,
                "The inputs are the counts of --shard runs: add them up into the table one run "
                "over everything gives");
  cmd->add_option("--a", o.a, "Tier A: each of its annotations is one observation (e.g. words)")
      ->type_name("TIER");
  cmd->add_option("--b", o.b, "Tier B: the labels A's annotations co-occur with (e.g. gestures)")
      ->type_name("TIER");
  cmd->add_option("--relation", o.relation,
                  "When A co-occurs with B: overlap (they share time; default), within (A lies "
                  "inside B) or starts-in (A starts inside B)")
      ->check(one_of(cooccur_relation_names))
      ->type_name("R");
  cmd->add_option("--window", o.window,
                  "Widen every B annotation by this on both sides (0.5s, 250ms, or frames: 12f)")
      ->type_name("DURATION");
  cmd->add_flag("--fold-case", o.fold_case,
                "Compare labels case-folded (Unicode): 'Stroke' and 'STROKE' are one label");
  cmd->add_option("--min-count", o.min_count, "Show pairs that co-occur at least N times (1)")
      ->type_name("N");
  cmd->add_option("--b-labels", o.b_labels, "Count only these labels of B")->type_name("A,B,...");
  cmd->add_option("--sort", o.sort, "Sort by count, g2 (default), fisher, log-odds or pmi")
      ->check(one_of(cooccur_sort_names))
      ->type_name("BY");
  cmd->add_option("--permutations", o.permutations,
                  "Also test each pair against K circular shifts of tier B within each "
                  "recording (a null model that keeps time's structure): perm_p")
      ->check(CLI::Range(1u, 1'000'000u))
      ->type_name("K");
  cmd->add_option("--seed", o.seed, "The shifts' seed (default 1): the same seed, the same p")
      ->type_name("S");
  cmd->add_option("--pairs", o.pairs,
                  "With --shard and --permutations: shift for the pairs of this table (what "
                  "--combine of the plain counts printed with --json)")
      ->type_name("TABLE.json");
  cmd->add_option("--concordance", o.concordance,
                  "Also write every co-occurrence of the pairs shown to FILE.csv: the recording, "
                  "both annotations, A's context and a media fragment link to the moment")
      ->type_name("FILE");
  cmd->add_option("--context", o.context,
                  "The concordance's context: A's annotations before and after (default 3)")
      ->type_name("K");
  add_report_output(*cmd, o.out);
  add_input_options(*cmd, o.input);
  cmd->callback([options, &status] { status = run_cooccur(*options); });
}

namespace {

using tiers::quote_name;

// One document counted (count_document), its problems printed; throws rejected.
counted_document count(const cooccur_options_cli& o, const document& doc, const std::string& name) {
  const bool keep = o.permutations > 0 || !o.concordance.empty();  // a second look at the tiers
  return take(count_document(doc, name, o, o.input.rate, keep));
}

std::string num(double v, int decimals = 3) {
  if (std::isnan(v)) return "-";
  if (std::isinf(v)) return v < 0 ? "-inf" : "inf";
  return fmt::format("{:.{}f}", v, decimals);
}

std::string p_text(double p) {
  return p < 1e-4 ? fmt::format("{:.1e}", p) : fmt::format("{:.4f}", p);
}

void print_table(const cooccur_options_cli& o, const std::vector<pair_statistics>& table,
                 const cooccur_counts& counts, const cooccur_options& l, const std::string& a_tier,
                 const std::string& b_tier, const std::string& what) {
  const report_format f = o.out.chosen("cooccur", "the table of pairs");
  if (f == report_format::json) {
    emit(o.out, written([&](byte_sink& out) {
           write_cooccur_json(table, counts.n(), a_tier, b_tier, l, out);
         }));
    return;
  }
  const bool csv = f == report_format::csv;
  text_table t({"a", "b", ">count", ">a total", ">b total", ">expected", ">ratio", ">g2",
                ">fisher p", ">fisher p greater", ">p adjusted", ">log odds", ">log odds low",
                ">log odds high", ">pmi", ">perm p"});
  auto exact = [&](double v) {
    return csv ? (std::isfinite(v) ? fmt::format("{}", v) : "") : num(v);
  };
  for (const pair_statistics& s : table)
    t.add_row({s.a, s.b, std::to_string(s.count), std::to_string(s.a_total),
               std::to_string(s.b_total), exact(s.expected), exact(s.ratio), exact(s.g2),
               csv ? fmt::format("{}", s.fisher_p) : p_text(s.fisher_p),
               csv ? fmt::format("{}", s.fisher_p_greater) : p_text(s.fisher_p_greater),
               csv ? fmt::format("{}", s.p_adjusted) : p_text(s.p_adjusted), exact(s.log_odds),
               exact(s.log_odds_low), exact(s.log_odds_high), exact(s.pmi),
               s.perm_p ? (csv ? fmt::format("{}", *s.perm_p) : fmt::format("{:.4f}", *s.perm_p))
                        : (csv ? "" : "-")});
  if (csv) {
    emit(o.out, t.render_csv());
    return;
  }
  std::string text =
      fmt::format("{}: {} annotations of {} against the labels of {} ({}{}{})\n\n", what,
                  counts.n(), a_tier, b_tier, name_of(cooccur_relation_names, l.relation),
                  l.window > 0 ? ", window ±" + format_seconds(l.window) + " s" : std::string(),
                  l.fold_case ? ", case folded" : "");
  text += table.empty() ? "no pair co-occurs" +
                              (o.min_count > 1 ? fmt::format(" {} times or more", o.min_count)
                                               : std::string()) +
                              "\n"
                        : t.render();
  text += "\np adjusted: Benjamini-Hochberg over the pairs shown; co-occurrence is not causation\n";
  if (o.permutations > 0)
    text +=
        fmt::format("perm p: against {} circular shifts of {} within each recording (seed {})\n",
                    o.permutations, o.b, o.seed);
  emit(o.out, escape_controls(text, true));
}

diagnostic combine_problem(const std::string& file, std::string message) {
  diagnostic d;
  d.file = file;
  d.code = "cooccur.value";
  d.message = std::move(message);
  return d;
}

// The counts of shards added up, and the table one run over everything prints.
int combine_counts(const cooccur_options_cli& o) {
  if (!o.dataset.empty() || !o.shard.empty() || o.permutations > 0)
    throw usage_error(
        "cooccur --combine adds up counts (the shards' permutation counts too): no --dataset, "
        "--shard or --permutations");
  if (o.paths.empty()) throw usage_error("cooccur --combine: name the counts of the shards");
  std::optional<cooccur_part> all;
  std::map<std::string, std::string> counted_in;  // recording → counts file
  std::vector<diagnostic> problems;
  for (const std::string& path : o.paths) {
    const std::string file = display_name(path);
    cooccur_part part = take(read_cooccur_counts(read_input(path), file));
    const bool first = !all;
    if (first) {
      all = part;
      all->counts = cooccur_counts{};
      all->recordings.clear();
    }
    auto settings = [](const cooccur_part& p) {
      return std::tuple(p.a_tier, p.b_tier, p.options.relation, p.window, p.options.fold_case,
                        p.options.b_labels);
    };
    if (settings(part) != settings(*all))
      problems.push_back(combine_problem(file, "was counted with other tiers or settings than " +
                                                   display_name(o.paths[0]) +
                                                   ": combine the shards of one run"));
    auto shifts = [](const cooccur_part& p) {
      return p.shifted
                 ? std::tuple(true, p.shifted->permutations, p.shifted->seed, p.shifted->pairs)
                 : std::tuple(false, 0u, std::uint64_t{0}, std::vector<label_pair>{});
    };
    if (shifts(part) != shifts(*all))
      problems.push_back(
          combine_problem(file, "holds other permutation counts than " + display_name(o.paths[0]) +
                                    " (shifts, seed or pairs): combine the shards of one run"));
    else if (part.shifted && !first)
      all->shifted->add(*part.shifted);
    for (const std::string& r : part.recordings) {
      const auto [it, fresh] = counted_in.emplace(r, file);
      if (!fresh)
        problems.push_back(combine_problem(file, "counts " + quote_name(r) + ", which " +
                                                     it->second +
                                                     " counts already: combine each shard once"));
    }
    all->counts.add(part.counts);
    all->recordings.insert(all->recordings.end(), part.recordings.begin(), part.recordings.end());
  }
  report_all(std::move(problems));
  std::vector<pair_statistics> table =
      cooccur_table(all->counts, o.min_count, named(cooccur_sort_names, o.sort));
  if (all->shifted) set_permutation_p(table, *all->shifted);
  print_table(o, table, all->counts, all->options, all->a_tier, all->b_tier,
              fmt::format("{} shard{}, {} files or recordings", o.paths.size(),
                          o.paths.size() == 1 ? "" : "s", all->recordings.size()));
  return exit_ok;
}

}  // namespace

int run_cooccur(const cooccur_options_cli& o) {
  reading_options(o.input, "");
  parse_duration_arg("--window", o.window);
  o.out.chosen("cooccur", "the table of pairs");
  if (o.combine) return combine_counts(o);
  if (o.a.empty() || o.b.empty()) throw usage_error("cooccur: name the two tiers: --a A --b B");
  if (!o.shard.empty() && !o.concordance.empty())
    throw usage_error("cooccur: --concordance goes with a whole run, not --shard");
  if (!o.shard.empty() && o.permutations > 0 && o.pairs.empty())
    throw usage_error(
        "cooccur --shard --permutations: name the pairs to shift with --pairs TABLE.json, the "
        "table --combine printed (with --json) from the shards' plain counts");
  if (!o.pairs.empty() && (o.shard.empty() || o.permutations == 0))
    throw usage_error("cooccur: --pairs goes with --shard and --permutations");
  if (!o.shard.empty() && !o.out.format.empty() && o.out.format != "json")
    throw usage_error("cooccur --shard writes counts as JSON, for --combine");
  const cooccur_options l = cooccur_options_of(o);
  std::vector<std::string> names;
  std::vector<std::optional<counted_document>> each;
  int status = exit_ok;
  std::string what;
  if (!o.dataset.empty()) {
    if (!o.paths.empty()) throw usage_error("cooccur: give either files or --dataset, not both");
    const opened_dataset d = open_dataset(o.dataset, o.input, o.shard);
    for (const recording& r : d.recordings)
      names.push_back(r.id);
    each.resize(d.recordings.size());
    status = for_each_recording(d, o.jobs, "counting", [&](const recording& r) {
      each[static_cast<std::size_t>(&r - d.recordings.data())] =
          count(o, load_recording(d, r), r.id);
    });
    what = fmt::format("{}, {} recording{}", d.file, d.recordings.size(),
                       d.recordings.size() == 1 ? "" : "s");
  } else {
    if (o.paths.empty()) throw usage_error("cooccur: name the files or folders, or --dataset");
    std::vector<input_file> files = expand_inputs(o.paths);
    if (!o.shard.empty()) {
      std::vector<std::string> all_paths;
      for (const input_file& f : files)
        all_paths.push_back(f.path);
      const std::vector<std::size_t> places = shard_places(all_paths, o.shard);
      std::vector<input_file> part;
      for (std::size_t k : places)
        part.push_back(files[k]);
      files = std::move(part);
    }
    for (const input_file& f : files)
      names.push_back(display_name(f.path));
    each.resize(files.size());
    status = for_each_document(
        files, o.input, o.jobs, "counting",
        [&](std::size_t k, document&& doc) { each[k] = count(o, doc, names[k]); });
    what = fmt::format("{} file{}", files.size(), files.size() == 1 ? "" : "s");
  }
  if (each.empty()) throw usage_error("cooccur: the inputs hold no file to count");
  // Nothing counted (every input failed, and said why): no table to print.
  if (std::none_of(each.begin(), each.end(), [](const auto& c) { return c.has_value(); }))
    return exit_rejected;
  std::vector<counted_document> counted;
  for (std::optional<counted_document>& c : each)
    if (c) counted.push_back(std::move(*c));
  cooccur_counts all;
  std::vector<cooccur_recording> recordings;
  if (!o.shard.empty()) {
    gather_counts(counted, all, recordings);
    cooccur_part part;
    part.a_tier = o.a;
    part.b_tier = o.b;
    part.window = o.window;
    part.options = l;
    part.shard = o.shard;
    for (std::size_t k = 0; k < each.size(); ++k)
      if (each[k]) part.recordings.push_back(names[k]);
    part.counts = std::move(all);
    if (o.permutations > 0)
      part.shifted = count_permutations(take(read_cooccur_pairs(read_input(o.pairs), o.pairs)),
                                        recordings, o.permutations, o.seed);
    emit(o.out, written([&](byte_sink& out) { write_cooccur_counts_json(part, out); }));
    return status;
  }
  const std::vector<pair_statistics> table = cooccur_run(counted, o, all, recordings);
  if (!o.concordance.empty()) {
    atomic_file out(o.concordance);
    write_concordance_csv(table, recordings, o.context, out);
    out.commit();
  }
  print_table(o, table, all, l, o.a, o.b, what);
  return status;
}

}  // namespace tiers::cli
