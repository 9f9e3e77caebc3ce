// Reading check profiles (schemas/profile.schema.json) from the located JSON tree, with
// `extends` resolved against the built-in profiles or files beside the profile.
#include "tiers/profile.hpp"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <filesystem>

#include "detail/embedded.hpp"
#include "detail/json_tree.hpp"
#include "detail/report.hpp"
#include "tiers/io.hpp"

namespace tiers {
namespace {

using detail::json_fields;
using detail::json_node;
using detail::make_diagnostic;
using detail::quote_name;

constexpr int max_extends = 8;

class profile_reader {
 public:
  profile_reader(std::string_view text, const std::string& file, int depth, profile& out,
                 std::vector<diagnostic>& problems)
      : text_(text), file_(file), depth_(depth), out_(out), problems_(problems) {}

  void run();

 private:
  void error_at(std::size_t offset, std::string message, std::string code = "profile.value") {
    local_.push_back(make_diagnostic(severity::error, std::move(code), offset, std::move(message)));
  }
  std::optional<duration_value> duration(json_fields& f, std::string_view key);
  void read_tier(const json_node& n);
  void read_rule(const std::string& id, const json_node& n);
  void read_extends(const json_node& n, const std::string& name);

  std::string_view text_;
  const std::string& file_;
  int depth_;
  profile& out_;
  std::vector<diagnostic>& problems_;
  std::vector<diagnostic> local_;  // this file's problems, located at the end
};

std::optional<duration_value> profile_reader::duration(json_fields& f, std::string_view key) {
  const json_node* n = f.get(key);
  if (!n) return std::nullopt;
  std::optional<duration_value> d;
  if (n->kind == json_node::type::string || n->kind == json_node::type::number)
    d = parse_duration(n->text);
  if (!d)
    f.bad(*n, quote_name(key) +
                  " must be a duration: a number of seconds or a text such as \"1.5s\", "
                  "\"250ms\" or \"2f\"");
  return d;
}

void profile_reader::run() {
  const std::optional<json_node> root =
      detail::parse_json_object(text_, local_, 32, "a profile", "profile");
  if (root) {
    json_fields f(*root, "the profile", "profile", local_);
    f.kind_and_version("tiers-profile", true, ": this is not a tiers profile");
    if (const json_node* e = f.get("extends")) {
      if (e->kind == json_node::type::string)
        read_extends(*e, e->text);
      else
        f.bad(*e, "'extends' must be a string");
    }
    if (auto d = f.string("description")) out_.description = *d;
    if (auto c = f.string("captions")) out_.captions = *c;
    if (auto w = f.string("words")) out_.words = *w;
    if (const json_node* r = f.get("frame_rate")) {
      std::optional<rational> rate;
      if (r->kind == json_node::type::string || r->kind == json_node::type::number)
        rate = parse_rational(r->text);
      if (rate)
        out_.limits.frame_rate = *rate;
      else
        f.bad(*r, "'frame_rate' must be a positive rational such as \"25\" or \"30000/1001\"");
    }
    if (const json_node* w = f.object("lag_window")) {
      json_fields wf(*w, "lag_window", "profile", local_);
      if (auto d = duration(wf, "before"))
        out_.limits.window.before = d->at(out_.limits.frame_rate);
      if (auto d = duration(wf, "after")) out_.limits.window.after = d->at(out_.limits.frame_rate);
      wf.finish();
    }
    if (const json_node* tiers = f.array("tiers"))
      for (const json_node& t : tiers->items)
        read_tier(t);
    if (const json_node* rules = f.object("rules"))
      for (std::size_t k = 0; k < rules->keys.size(); ++k) {
        if (!find_rule(rules->keys[k])) {
          error_at(rules->key_offsets[k], "unknown rule " + quote_name(rules->keys[k]) +
                                              " (tiers check --list-rules lists them)");
          continue;
        }
        read_rule(rules->keys[k], rules->items[k]);
      }
    f.finish();
  }
  locate_all(text_, local_);
  for (diagnostic& d : local_) {
    d.file = file_;
    problems_.push_back(std::move(d));
  }
}

void profile_reader::read_extends(const json_node& n, const std::string& name) {
  if (depth_ >= max_extends) {
    error_at(n.offset,
             "'extends' goes " + std::to_string(max_extends) + " profiles deep: is there a loop?");
    return;
  }
  for (const detail::embedded_file& b : detail::builtin_profile_table())
    if (b.name == name) {
      profile_reader(b.text, "builtin:" + std::string(b.name), depth_ + 1, out_, problems_).run();
      return;
    }
  const std::filesystem::path rel(name);
  const bool inside = rel.is_relative() &&
                      std::none_of(rel.begin(), rel.end(), [](const auto& p) { return p == ".."; });
  if (!inside) {
    error_at(n.offset,
             "'extends' names a built-in profile or a file in this profile's folder "
             "or below, not " +
                 quote_name(name));
    return;
  }
  const std::string path = (std::filesystem::path(file_).parent_path() / rel).string();
  std::string text;
  try {
    text = read_input(path);
  } catch (const error& e) {
    error_at(n.offset, "'extends': " + e.diag().message);
    return;
  }
  profile_reader(text, path, depth_ + 1, out_, problems_).run();
}

void profile_reader::read_tier(const json_node& n) {
  if (n.kind != json_node::type::object) return error_at(n.offset, "each tier must be an object");
  json_fields f(n, "a tier", "profile", local_);
  tier_spec spec;
  if (!f.require("name")) return;
  if (auto name = f.string("name")) spec.name = *name;
  if (auto r = f.boolean("required")) spec.required = *r;
  if (auto k = f.string("kind")) {
    spec.kind = parse_tier_kind(*k);
    if (!spec.kind) f.bad(*f.get("kind"), "'kind' must be \"interval\" or \"instant\"");
  }
  if (const json_node* p = f.object("parent")) {
    json_fields pf(*p, "parent", "profile", local_);
    parent_link link;
    if (pf.require("tier"))
      if (auto t = pf.string("tier")) link.tier = *t;
    if (auto r = pf.string("relation")) {
      auto rel = parse_relation(*r);
      if (!rel)
        pf.bad(*pf.get("relation"), "'relation' must be \"within\", \"partition\" or \"refers\"");
      else
        link.rel = *rel;
    }
    pf.finish();
    spec.parent = link;
  }
  if (const json_node* v = f.array("vocabulary")) {
    spec.vocabulary.emplace();
    for (const json_node& label : v->items) {
      if (label.kind != json_node::type::string)
        error_at(label.offset, "vocabulary labels must be strings");
      else
        spec.vocabulary->push_back(label.text);
    }
  }
  if (auto o = f.boolean("overlaps")) spec.overlaps = *o;
  if (auto c = f.boolean("contiguous")) spec.contiguous = *c;
  f.finish();
  // A later declaration of a tier (this file over the one it extends) replaces the earlier one.
  std::erase_if(out_.tiers, [&](const tier_spec& t) { return t.name == spec.name; });
  out_.tiers.push_back(std::move(spec));
}

void profile_reader::read_rule(const std::string& id, const json_node& n) {
  if (n.kind == json_node::type::string) {
    if (auto level = parse_rule_level(n.text))
      out_.levels[id] = *level;
    else
      error_at(n.offset, "a rule's severity is \"off\", \"note\", \"warning\" or \"error\"");
    return;
  }
  if (n.kind != json_node::type::object)
    return error_at(n.offset, "a rule is a severity such as \"warning\", or an object");
  json_fields f(n, quote_name(id), "profile", local_);
  if (auto s = f.string("severity")) {
    if (auto level = parse_rule_level(*s))
      out_.levels[id] = *level;
    else
      f.bad(*f.get("severity"), "'severity' is \"off\", \"note\", \"warning\" or \"error\"");
  }
  if (auto s = f.string("source")) out_.sources[id] = *s;
  check_limits& l = out_.limits;
  for (const rule_threshold& t : rule_thresholds()) {
    if (t.rule != id) continue;
    if (t.kind == threshold_kind::duration || t.kind == threshold_kind::frames) {
      if (auto d = duration(f, t.key)) {
        if (t.kind == threshold_kind::frames)
          l.*t.frames = *d;
        else
          l.*t.time = d->at(l.frame_rate);
      }
      continue;
    }
    const std::optional<double> v = f.number(t.key);
    if (!v) continue;
    const std::string key = quote_name(t.key);
    if (t.kind == threshold_kind::count) {
      if (*v >= 1 && *v <= 1e9 && std::floor(*v) == *v)
        l.*t.count = static_cast<std::size_t>(*v);
      else
        f.bad(*f.get(t.key), key + " must be a whole number, 1 or more");
    } else if (*v > 0 && (t.kind == threshold_kind::number || *v <= 1)) {
      l.*t.number = *v;
    } else {
      f.bad(*f.get(t.key),
            key + " must be above 0" + (t.kind == threshold_kind::share ? " and at most 1" : ""));
    }
  }
  f.finish();
}

}  // namespace

rule_level profile::level(std::string_view rule) const {
  if (auto it = levels.find(rule); it != levels.end()) return it->second;
  const rule_info* r = find_rule(rule);
  return r ? r->level : rule_level::off;
}

const tier_spec* profile::find_tier(std::string_view tier_name) const {
  for (const tier_spec& t : tiers)
    if (t.name == tier_name) return &t;
  return nullptr;
}

std::vector<std::string_view> builtin_profiles() {
  std::vector<std::string_view> out;
  for (const detail::embedded_file& b : detail::builtin_profile_table())
    out.push_back(b.name);
  return out;
}

profile_result read_profile(std::string_view text, const std::string& file) {
  profile_result r;
  profile_reader(text, file, 0, r.value, r.diagnostics).run();
  r.value.name = file;
  return r;
}

profile_result load_profile(const std::string& name_or_path) {
  for (const detail::embedded_file& b : detail::builtin_profile_table())
    if (b.name == name_or_path) {
      profile_result r = read_profile(b.text, "builtin:" + name_or_path);
      r.value.name = name_or_path;
      return r;
    }
  profile_result r;
  std::string text;
  try {
    text = read_input(name_or_path);
  } catch (const error& e) {
    diagnostic d = e.diag();
    std::string names;
    for (std::string_view n : builtin_profiles())
      names += (names.empty() ? "" : ", ") + std::string(n);
    d.message += " (built-in profiles: " + names + ")";
    r.diagnostics.push_back(std::move(d));
    return r;
  }
  return read_profile(text, name_or_path);
}

}  // namespace tiers
