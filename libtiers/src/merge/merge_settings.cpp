// A merge as options give it: the plan the options make, at the inputs' frame rate.
#include <algorithm>

#include "tiers/inputs.hpp"
#include "tiers/io.hpp"
#include "tiers/merge.hpp"

namespace tiers {
namespace {

template <class E, std::size_t N>
E named(const std::string& option, const enum_name<E> (&table)[N], const std::string& name) {
  const auto v = value_named(table, name);
  if (!v) throw usage_error(option + ": '" + name + "' is not " + quoted_names(table));
  return *v;
}

std::pair<std::string, std::string> split_pair(const std::string& option, const std::string& text) {
  const std::size_t eq = text.rfind('=');
  if (eq == std::string::npos || eq == 0 || eq + 1 == text.size())
    throw usage_error(option + ": expected TIER=VALUE, got '" + text + "'");
  return {text.substr(0, eq), text.substr(eq + 1)};
}

// Whether a duration setting counts frames, so that the plan depends on the inputs' rate.
bool counts_frames(const merge_settings& o) {
  std::vector<std::string> given{o.max_offset, o.min_duration, o.review_min};
  for (const std::string& s : o.shifts)
    given.push_back(s.substr(s.rfind('=') + 1));
  return std::any_of(given.begin(), given.end(),
                     [](const std::string& d) { return !d.empty() && d.back() == 'f'; });
}

}  // namespace

result<merge_plan> merge_plan_of(const merge_settings& o, const std::optional<rational>* rate) {
  auto duration = [&](const char* option, const std::string& text, duration_kind kind) {
    const duration_arg d = parse_duration_arg(option, text, kind);
    return rate ? d.at(*rate) : d.in_frames() ? 0 : d.at(std::nullopt);
  };
  result<merge_plan> out;
  merge_plan& plan = out.value;
  if (!o.plan.empty()) {
    const std::string text = read_input(o.plan);
    out = read_merge_plan(text, display_name(o.plan));
    if (!out.ok()) return out;
    std::vector<diagnostic> placed = place_plan_inputs(plan, display_name(o.plan));
    out.diagnostics.insert(out.diagnostics.end(), placed.begin(), placed.end());
    if (!out.ok()) return out;
  }
  for (const std::string& p : o.paths)
    plan.inputs.push_back(p);
  if (!o.clash.empty()) plan.clash = named("--clash", clash_rule_names, o.clash);
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
    if (!o.strategy.empty()) c.strategy = named("--strategy", combine_strategy_names, o.strategy);
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
  return out;
}

merge_result merge_with(const merge_settings& o, std::vector<merge_input> inputs,
                        const std::string& rate_setting) {
  std::optional<rational> rate;
  for (const merge_input& in : inputs)
    if (!rate && in.doc.media.frame_rate) rate = in.doc.media.frame_rate;
  if (!rate && !rate_setting.empty()) rate = parse_rate_setting(rate_setting);
  result<merge_plan> plan = merge_plan_of(o, counts_frames(o) ? &rate : nullptr);
  if (!plan.ok()) return {{}, std::move(plan.diagnostics)};
  merge_result merged = merge_documents(std::move(inputs), plan.value);
  merged.diagnostics.insert(merged.diagnostics.begin(), plan.diagnostics.begin(),
                            plan.diagnostics.end());
  return merged;
}

}  // namespace tiers
