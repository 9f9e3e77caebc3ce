// `tiers merge IN… -o OUT [--plan PLAN] [--clash R] [--shift T=D] [--align T=REF]
// [--into N --human T --machine T …]`: the options are shorthand for a plan.
#include "merge_command.hpp"

#include <algorithm>
#include <filesystem>

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

namespace fs = std::filesystem;

std::pair<std::string, std::string> split_pair(const std::string& option, const std::string& text) {
  const std::size_t eq = text.rfind('=');
  if (eq == std::string::npos || eq == 0 || eq + 1 == text.size())
    throw usage_error(option + ": expected TIER=VALUE, got '" + text + "'");
  return {text.substr(0, eq), text.substr(eq + 1)};
}

// The plan the options make. Durations in frames count at `rate` (the inputs' frame rate, else
// --rate's); before the inputs are read, `rate` is null and such durations are only checked.
merge_plan make_plan(const merge_options& o, const std::optional<rational>* rate) {
  auto duration = [&](const char* option, const std::string& text, duration_kind kind) {
    const duration_arg d = parse_duration_arg(option, text, kind);
    return rate ? d.at(*rate) : d.in_frames() ? 0 : d.at(std::nullopt);
  };
  merge_plan plan;
  if (!o.plan.empty()) {
    const std::string text = read_input(o.plan);
    plan = take(read_merge_plan(text, display_name(o.plan)));
    report_all(place_plan_inputs(plan, display_name(o.plan)));
  }
  for (const std::string& p : o.paths)
    plan.inputs.push_back(p);
  if (!o.clash.empty()) plan.clash = named(clash_rule_names, o.clash);
  const time_ns max_offset = o.max_offset.empty()
                                 ? 10 * ns_per_second
                                 : duration("--max-offset", o.max_offset, duration_kind::positive);
  for (const std::string& s : o.shifts) {
    auto [tier_name, offset] = split_pair("--shift", s);
    shift_step step;
    step.tier = tier_name;
    step.by = duration("--shift", offset, duration_kind::offset);
    plan.shifts.push_back(step);
  }
  for (const std::string& s : o.aligns) {
    auto [tier_name, reference] = split_pair("--align", s);
    shift_step step;
    step.tier = tier_name;
    step.align_to = reference;
    step.max_offset = max_offset;
    plan.shifts.push_back(step);
  }
  const bool combining = !o.into.empty() || !o.human.empty() || !o.machine.empty();
  if (combining) {
    if (o.into.empty() || o.human.empty() || o.machine.empty())
      throw usage_error("combining needs --into, --human and --machine together");
    combine_step c;
    c.into = o.into;
    c.human = o.human;
    c.machine = o.machine;
    if (!o.strategy.empty()) c.strategy = named(combine_strategy_names, o.strategy);
    if (o.min_confidence == "from-estimate") {
      c.confidence_from_estimate = true;
    } else if (!o.min_confidence.empty()) {
      char* end = nullptr;
      c.min_confidence = std::strtod(o.min_confidence.c_str(), &end);
      if (*end != '\0' || !(c.min_confidence >= 0 && c.min_confidence <= 1))
        throw usage_error("--min-confidence: '" + o.min_confidence +
                          "' is not a number from 0 to 1, or from-estimate");
    }
    if (!o.min_duration.empty())
      c.min_duration = duration("--min-duration", o.min_duration, duration_kind::length);
    if (!o.review.empty()) c.review = o.review;
    if (!o.review_min.empty()) {
      if (o.review.empty()) throw usage_error("--review-min goes with --review");
      c.review_min = duration("--review-min", o.review_min, duration_kind::length);
    }
    plan.combine.push_back(c);
  } else if (!o.strategy.empty() || !o.min_confidence.empty() || !o.min_duration.empty() ||
             !o.review.empty() || !o.review_min.empty()) {
    throw usage_error(
        "--strategy, --min-confidence, --min-duration, --review and --review-min go with --into");
  }
  return plan;
}

// Each recording of a dataset merged by one plan: its files are the merge's inputs.
// Whether a duration option counts frames, so that the plan depends on the inputs' rate.
bool counts_frames(const merge_options& o) {
  std::vector<std::string> given{o.max_offset, o.min_duration, o.review_min};
  for (const std::string& s : o.shifts)
    given.push_back(s.substr(s.rfind('=') + 1));
  return std::any_of(given.begin(), given.end(),
                     [](const std::string& d) { return !d.empty() && d.back() == 'f'; });
}

// The frame rate of the first input that has one, else --rate's.
std::optional<rational> inputs_rate(const merge_options& o,
                                    const std::vector<merge_input>& inputs) {
  for (const merge_input& in : inputs)
    if (in.doc.media.frame_rate) return in.doc.media.frame_rate;
  return o.input.rate.empty() ? std::nullopt : std::optional(parse_rate_option(o.input.rate));
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
        const std::optional<rational> rate = inputs_rate(o, parts.parts);
        const document merged = take(
            merge_documents(std::move(parts.parts), counts_frames(o) ? make_plan(o, &rate) : plan),
            r.id);
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
  const std::optional<rational> rate = inputs_rate(o, inputs);
  const document merged = take(
      merge_documents(std::move(inputs), counts_frames(o) ? make_plan(o, &rate) : plan), "merge");
  write_output(merged, to, o.output, o.allow_loss, "merge");
  return exit_ok;
}

}  // namespace tiers::cli
