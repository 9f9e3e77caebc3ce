// Merge plans: read from the located JSON tree (every mistake shown where it is), and written
// back as the canonical one-line form recorded in a merge's output.
#include <cmath>
#include <filesystem>
#include <system_error>

#include "detail/json_text.hpp"
#include "detail/json_tree.hpp"
#include "detail/report.hpp"
#include "tiers/merge.hpp"
#include "tiers/sink.hpp"

namespace tiers {
namespace {

using detail::json_fields;
using detail::json_node;
using detail::quote_name;

std::optional<time_ns> duration_member(json_fields& f, std::string_view key) {
  const json_node* n = f.get(key);
  if (!n) return std::nullopt;
  std::optional<duration_value> d;
  if (n->kind == json_node::type::string || n->kind == json_node::type::number)
    d = parse_duration(n->text);
  if (!d || d->frames) {
    f.bad(*n, quote_name(key) + " must be a duration: a number of seconds, or \"1.5s\", \"250ms\"");
    return std::nullopt;
  }
  return d->ns;
}

// A signed offset: "-0.5s" as well as "0.5s".
std::optional<time_ns> offset_member(json_fields& f, std::string_view key) {
  const json_node* n = f.get(key);
  if (!n) return std::nullopt;
  std::string text = n->text;
  const bool negative = !text.empty() && text[0] == '-';
  if (negative) text.erase(0, 1);
  std::optional<duration_value> d;
  if (n->kind == json_node::type::string || n->kind == json_node::type::number)
    d = parse_duration(text);
  if (!d || d->frames) {
    f.bad(*n, quote_name(key) + " must be an offset: seconds, or \"-0.5s\", \"250ms\"");
    return std::nullopt;
  }
  return negative ? -d->ns : d->ns;
}

void read_shift(const json_node& n, merge_plan& plan, std::vector<diagnostic>& problems) {
  if (n.kind != json_node::type::object) {
    problems.push_back(detail::make_diagnostic(severity::error, "plan.value", n.offset,
                                               "each shift must be an object"));
    return;
  }
  json_fields f(n, "a shift", "plan", problems);
  shift_step s;
  if (f.require("tier"))
    if (auto t = f.string("tier")) s.tier = *t;
  s.by = offset_member(f, "by");
  s.align_to = f.string("align_to");
  if (auto m = duration_member(f, "max")) s.max_offset = *m;
  if (s.by.has_value() == s.align_to.has_value())
    problems.push_back(detail::make_diagnostic(severity::error, "plan.value", n.offset,
                                               "a shift has either 'by' or 'align_to'"));
  f.finish();
  plan.shifts.push_back(std::move(s));
}

void read_combine(const json_node& n, merge_plan& plan, std::vector<diagnostic>& problems) {
  if (n.kind != json_node::type::object) {
    problems.push_back(detail::make_diagnostic(severity::error, "plan.value", n.offset,
                                               "each combination must be an object"));
    return;
  }
  json_fields f(n, "a combination", "plan", problems);
  combine_step c;
  for (auto [key, into] :
       {std::pair{"into", &c.into}, std::pair{"human", &c.human}, std::pair{"machine", &c.machine}})
    if (f.require(key))
      if (auto v = f.string(key)) *into = *v;
  if (auto s = f.string("strategy")) {
    if (auto strategy = value_named(combine_strategy_names, *s))
      c.strategy = *strategy;
    else
      f.bad(*f.get("strategy"), "'strategy' is " + quoted_names(combine_strategy_names));
  }
  if (const json_node* m = f.get("min_confidence");
      m && m->kind == json_node::type::string && m->text == "from-estimate") {
    c.confidence_from_estimate = true;
  } else if (auto number = f.number("min_confidence")) {
    if (*number >= 0 && *number <= 1)
      c.min_confidence = *number;
    else
      f.bad(*f.get("min_confidence"),
            "'min_confidence' is a number from 0 to 1, or \"from-estimate\"");
  }
  if (auto d = duration_member(f, "min_duration")) c.min_duration = *d;
  c.review = f.string("review");
  if (auto d = duration_member(f, "review_min")) c.review_min = *d;
  f.finish();
  plan.combine.push_back(std::move(c));
}

// A duration as plans write it: `1.5s`, `-0.48s`.
std::string duration_text(time_ns t) {
  return (t < 0 ? "-" + format_seconds(-t) : format_seconds(t)) + "s";
}

}  // namespace

plan_result read_merge_plan(std::string_view text, const std::string& file) {
  plan_result r;
  std::vector<diagnostic>& problems = r.diagnostics;
  const std::optional<json_node> root =
      detail::parse_json_object(text, problems, 32, "a merge plan", "plan");
  if (root) {
    json_fields f(*root, "the plan", "plan", problems);
    f.kind_and_version("tiers-merge-plan", false);
    if (const json_node* in = f.array("inputs"))
      for (const json_node& i : in->items) {
        if (i.kind != json_node::type::string)
          problems.push_back(detail::make_diagnostic(severity::error, "plan.value", i.offset,
                                                     "inputs are file names"));
        else
          r.value.inputs.push_back(i.text);
      }
    if (auto c = f.string("clash")) {
      if (auto rule = value_named(clash_rule_names, *c))
        r.value.clash = *rule;
      else
        f.bad(*f.get("clash"), "'clash' is " + quoted_names(clash_rule_names));
    }
    if (const json_node* s = f.array("shift"))
      for (const json_node& x : s->items)
        read_shift(x, r.value, problems);
    if (const json_node* c = f.array("combine"))
      for (const json_node& x : c->items)
        read_combine(x, r.value, problems);
    f.finish();
  }
  locate_all(text, problems);
  for (diagnostic& d : problems)
    d.file = file;
  return r;
}

std::string plan_json(const merge_plan& plan) {
  std::string text;
  string_sink out(text);
  detail::json_writer j(out);
  j.begin_object();
  j.string("format", "tiers-merge-plan");
  j.count("version", 1);
  if (!plan.inputs.empty()) j.key("inputs").string_array(plan.inputs);
  j.string("clash", name_of(clash_rule_names, plan.clash));
  j.key("shift").begin_array();
  for (const shift_step& s : plan.shifts) {
    j.begin_object();
    j.string("tier", s.tier);
    if (s.by) j.string("by", duration_text(*s.by));
    if (s.align_to) {
      j.string("align_to", *s.align_to);
      j.string("max", duration_text(s.max_offset));
    }
    j.end_object();
  }
  j.end_array();
  j.key("combine").begin_array();
  for (const combine_step& c : plan.combine) {
    j.begin_object();
    j.string("into", c.into);
    j.string("human", c.human);
    j.string("machine", c.machine);
    j.string("strategy", name_of(combine_strategy_names, c.strategy));
    if (c.confidence_from_estimate)
      j.string("min_confidence", "from-estimate");
    else
      j.number("min_confidence", c.min_confidence);
    j.string("min_duration", duration_text(c.min_duration));
    if (c.review) j.string("review", *c.review);
    if (c.review_min > 0) j.string("review_min", duration_text(c.review_min));
    j.end_object();
  }
  j.end_array();
  j.end_object();
  out.flush();
  return text;
}

std::vector<diagnostic> place_plan_inputs(merge_plan& plan, const std::string& plan_file) {
  namespace fs = std::filesystem;
  std::vector<diagnostic> out;
  const fs::path base = fs::path(plan_file).parent_path();
  std::error_code ec;
  const fs::path root = fs::weakly_canonical(base.empty() ? fs::path(".") : base, ec);
  std::vector<std::string> placed;
  for (const std::string& in : plan.inputs) {
    const fs::path rel(in);
    const fs::path at = base / rel;
    // Resolved: the links followed, and what is left of the path made plain.
    const fs::path resolved = fs::weakly_canonical(at, ec);
    const fs::path inside = ec ? fs::path() : resolved.lexically_relative(root);
    const bool escapes =
        !rel.is_relative() || ec || inside.empty() || (!inside.empty() && *inside.begin() == "..");
    if (escapes) {
      diagnostic d;
      d.file = plan_file;
      d.code = "plan.value";
      d.message = "input " + quote_name(in) +
                  " is outside the plan's folder (after following links); name it on the "
                  "command line";
      out.push_back(std::move(d));
      continue;
    }
    placed.push_back(at.string());
  }
  if (out.empty()) plan.inputs = std::move(placed);
  return out;
}

}  // namespace tiers
