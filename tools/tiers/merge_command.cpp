// `tiers merge IN… -o OUT [--plan PLAN] [--clash R] [--shift T=D] [--align T=REF]
// [--into N --human T --machine T …]`: the options are shorthand for a plan.
#include "merge_command.hpp"

#include <algorithm>

#include "dataset_inputs.hpp"
#include "tiers/io.hpp"
#include "tiers/merge.hpp"

namespace tiers::cli {

void setup_merge(CLI::App& app, int& status) {
  auto options = std::make_shared<merge_options>();
  merge_options& o = *options;
  CLI::App* cmd = app.add_subcommand(
      "merge", "Join the tiers of several files of one recording; combine human and machine tiers");
  cmd->add_option("inputs", o.paths, "Files to merge (after the plan's inputs, if any)")
      ->type_name("FILE");
  add_dataset_options(*cmd, o.dataset, o.output_dir, o.jobs, o.shard, "merged by the plan");
  cmd->add_option("--plan", o.plan, "A merge plan (JSON); the options below add to it")
      ->type_name("PLAN");
  cmd->add_option("--clash", o.clash,
                  "When inputs share a tier name: fail (default), prefix-file (STEM:NAME) or "
                  "prefix-source (AGENT:NAME)")
      ->check(one_of(clash_rule_names))
      ->type_name("RULE");
  cmd->add_option("--shift", o.shifts,
                  "Shift a tier by an offset, e.g. detector=-0.48s (or frames: detector=-12f)")
      ->allow_extra_args(false)
      ->type_name("TIER=OFFSET");
  cmd->add_option("--align", o.aligns,
                  "Shift a tier by the offset estimated against another, e.g. detector=gestures")
      ->allow_extra_args(false)
      ->type_name("TIER=REFERENCE");
  cmd->add_option("--max-offset", o.max_offset, "How far --align looks (default 10s)")
      ->type_name("DURATION");
  cmd->add_option("--into", o.into, "Combine --human and --machine into a new tier of this name")
      ->type_name("NAME");
  cmd->add_option("--human", o.human, "The human tier to combine")->type_name("TIER");
  cmd->add_option("--machine", o.machine, "The machine tier to combine")->type_name("TIER");
  cmd->add_option("--strategy", o.strategy, "human-first (default), union or intersection")
      ->check(one_of(combine_strategy_names))
      ->type_name("S");
  cmd->add_option(
         "--min-confidence", o.min_confidence,
         "Leave out machine annotations below this confidence (0-1), or from-estimate: the "
         "threshold tiers estimate --target-precision wrote into the machine tier")
      ->type_name("X");
  cmd->add_option("--min-duration", o.min_duration,
                  "Drop trimmed machine pieces shorter than this (0.2s, or frames: 5f)")
      ->type_name("DURATION");
  cmd->add_option("--review", o.review,
                  "Also write a tier marking every span where human and machine disagree")
      ->type_name("NAME");
  cmd->add_option("--review-min", o.review_min,
                  "Leave disagreements shorter than this out of the review tier (boundary "
                  "jitter), e.g. 0.2s or 5f")
      ->type_name("DURATION");
  cmd->add_flag("--print-plan", o.print_plan,
                "Print the plan these options and --plan make, and merge nothing");
  add_input_options(*cmd, o.input);
  add_output_options(
      *cmd, o.output, o.to, o.allow_loss,
      "Output file, or - for standard output (with --to); needed unless --print-plan");
  cmd->callback([options, &status] { status = run_merge(*options); });
}

namespace {

// The plan the options make (merge_plan_of), its problems printed.
merge_plan make_plan(const merge_options& o, const std::optional<rational>* rate) {
  return take(merge_plan_of(o, rate));
}

int merge_dataset(const merge_options& o, const merge_plan& plan) {
  if (!plan.inputs.empty())
    throw usage_error(
        "merge --dataset: the recordings' files are the inputs; the plan and the "
        "command line name none");
  const format& to = per_recording_format("merge", !o.paths.empty(), o.output, o.output_dir, o.to);
  const opened_dataset d = open_dataset(o.dataset, o.input, o.shard);
  return for_each_output(
      d, o.output_dir, to, o.jobs, "merging", [&](const recording& r, const std::string& output) {
        recording_parts parts = read_parts(d, r);
        std::vector<diagnostic> problems = lacking_sources(d, r);
        problems.insert(problems.end(), parts.diagnostics.begin(), parts.diagnostics.end());
        report_all(std::move(problems));
        const document merged = take(merge_with(o, std::move(parts.parts), o.input.rate), r.id);
        write_output(merged, to, output, o.allow_loss, r.id);
      });
}

}  // namespace

int run_merge(const merge_options& o) {
  reading_options(o.input, "");  // bad option values are usage errors before any work
  const merge_plan plan = make_plan(o, nullptr);
  if (o.print_plan) {
    const std::optional<rational> rate =
        o.input.rate.empty() ? std::nullopt : std::optional(parse_rate_option(o.input.rate));
    stdout_sink out;
    out.write(plan_json(make_plan(o, &rate)) + "\n");
    out.flush();
    return exit_ok;
  }
  if (!o.dataset.empty()) return merge_dataset(o, plan);
  if (!o.output_dir.empty() || o.jobs || !o.shard.empty())
    throw usage_error("merge: -d, --jobs and --shard go with --dataset");
  if (o.output.empty()) throw usage_error("merge: name the output with -o");
  const format& to = output_format(o.to, o.output);
  if (plan.inputs.empty()) throw usage_error("merge: name the files to merge");

  std::vector<merge_input> inputs;
  bool failed = false;
  for (const std::string& path : plan.inputs) {
    input_options in = o.input;
    in.path = path;
    try {
      inputs.push_back({display_name(path), load_document(in)});
    } catch (const rejected&) {
      failed = true;  // every input's problems are shown before stopping
    } catch (const error& e) {
      report(e.diag());
      failed = true;
    }
  }
  if (failed) return exit_rejected;
  const document merged = take(merge_with(o, std::move(inputs), o.input.rate), "merge");
  write_output(merged, to, o.output, o.allow_loss, "merge");
  return exit_ok;
}

}  // namespace tiers::cli
