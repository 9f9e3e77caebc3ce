// Dataset descriptions: read from the located JSON tree (every mistake shown where it is) and
// written back in the same form.
#include <algorithm>

#include "detail/json_text.hpp"
#include "detail/json_tree.hpp"
#include "detail/report.hpp"
#include "tiers/dataset.hpp"
#include "tiers/sink.hpp"

namespace tiers {
namespace {

using detail::json_fields;
using detail::json_node;
using detail::quote_name;

// Why a pattern cannot be used, or empty.
std::string pattern_fault(std::string_view p) {
  if (p.empty()) return "a pattern must not be empty";
  if (p.front() == '/' || p.find('\\') != std::string_view::npos || (p.size() > 1 && p[1] == ':'))
    return "a pattern is a path relative to the description's folder, with / between folders";
  for (std::size_t from = 0; from <= p.size();) {
    const std::size_t slash = std::min(p.find('/', from), p.size());
    const std::string_view segment = p.substr(from, slash - from);
    if (segment == "..") return "a pattern must stay inside the description's folder: no '..'";
    if (segment.empty() || segment == ".")
      return "a pattern has no empty folder names, '.' or '//'";
    from = slash + 1;
  }
  const std::size_t id = p.find("{id}");
  if (id == std::string_view::npos) return "a pattern names the recording with {id}";
  if (p.find("{id}", id + 1) != std::string_view::npos) return "a pattern has {id} once";
  std::string rest(p);
  rest.erase(id, 4);
  if (rest.find_first_of("{}") != std::string::npos)
    return "a pattern's only braces are those of {id}";
  return {};
}

// A reading option's value: a string, or a number or boolean as written.
std::optional<std::string> option_text(const json_node& n) {
  switch (n.kind) {
    case json_node::type::string:
    case json_node::type::number:
      return n.text;
    case json_node::type::boolean:
      return n.boolean ? "true" : "false";
    default:
      return std::nullopt;
  }
}

void read_reading(const json_node& n, dataset_source& s, std::vector<diagnostic>& problems) {
  for (std::size_t k = 0; k < n.keys.size(); ++k) {
    const std::string& name = n.keys[k];
    const bool known = std::find(std::begin(dataset_reading_names), std::end(dataset_reading_names),
                                 name) != std::end(dataset_reading_names);
    if (!known) {
      std::string names;
      for (std::string_view r : dataset_reading_names)
        names += (names.empty() ? "" : ", ") + std::string(r);
      problems.push_back(detail::make_diagnostic(
          severity::error, "dataset.member", n.key_offsets[k],
          "no reading option is called " + quote_name(name) + " (options: " + names + ")"));
      continue;
    }
    if (auto v = option_text(n.items[k]))
      s.read.emplace_back(name, *v);
    else
      problems.push_back(detail::make_diagnostic(
          severity::error, "dataset.value", n.items[k].offset,
          "the reading option " + quote_name(name) + " is a string, number or true/false"));
  }
}

void read_rename(const json_node& n, dataset_source& s, std::vector<diagnostic>& problems) {
  for (std::size_t k = 0; k < n.keys.size(); ++k) {
    const json_node& v = n.items[k];
    if (v.kind != json_node::type::string || v.text.empty())
      problems.push_back(detail::make_diagnostic(severity::error, "dataset.value", v.offset,
                                                 "a tier's new name is a non-empty string"));
    else
      s.rename.emplace_back(n.keys[k], v.text);
  }
}

std::optional<tier_source> read_tier_source(const json_node& n, std::vector<diagnostic>& problems) {
  json_fields f(n, "a tier source", "dataset", problems);
  tier_source out;
  bool ok = f.require("kind");
  if (auto k = f.string("kind")) {
    if (auto kind = parse_source_kind(*k))
      out.kind = *kind;
    else {
      f.bad(*f.get("kind"), "'kind' is \"human\" or \"machine\"");
      ok = false;
    }
  }
  out.agent = f.string("agent");
  out.version = f.string("version");
  f.finish();
  return ok ? std::optional<tier_source>(out) : std::nullopt;
}

void read_source(const json_node& n, dataset_description& d, std::vector<diagnostic>& problems) {
  if (n.kind != json_node::type::object) {
    problems.push_back(detail::make_diagnostic(severity::error, "dataset.value", n.offset,
                                               "each source must be an object"));
    return;
  }
  json_fields f(n, "a source", "dataset", problems);
  dataset_source s;
  s.offset = n.offset;
  if (f.require("pattern"))
    if (auto p = f.string("pattern")) {
      s.pattern = *p;
      if (std::string why = pattern_fault(s.pattern); !why.empty()) f.bad(*f.get("pattern"), why);
      for (const dataset_source& earlier : d.sources)
        if (earlier.pattern == s.pattern)
          f.bad(*f.get("pattern"), "two sources have the pattern " + quote_name(s.pattern));
    }
  if (const json_node* r = f.object("read")) {
    s.read_offset = r->offset;
    read_reading(*r, s, problems);
  }
  if (const json_node* r = f.object("rename")) read_rename(*r, s, problems);
  if (const json_node* src = f.object("source")) s.source = read_tier_source(*src, problems);
  if (auto k = f.string("kind")) {
    if (auto kind = parse_tier_kind(*k))
      s.kind = *kind;
    else if (*k == "signal")
      s.signal = true;
    else
      f.bad(*f.get("kind"), "'kind' is \"interval\", \"instant\" or \"signal\"");
  }
  f.finish();
  d.sources.push_back(std::move(s));
}

}  // namespace

dataset_result read_dataset(std::string_view text, const std::string& file) {
  dataset_result r;
  std::vector<diagnostic>& problems = r.diagnostics;
  const std::optional<json_node> root =
      detail::parse_json_object(text, problems, 16, "a dataset description", "dataset");
  if (root) {
    json_fields f(*root, "the description", "dataset", problems);
    f.kind_and_version("tiers-dataset", true, ": this is not a dataset description");
    if (f.require("sources"))
      if (const json_node* s = f.array("sources")) {
        for (const json_node& x : s->items)
          read_source(x, r.value, problems);
        if (s->items.empty()) f.bad(*s, "a dataset has one source or more");
      }
    f.finish();
  }
  locate_all(text, problems);
  for (diagnostic& d : problems)
    d.file = file;
  return r;
}

std::string dataset_json(const dataset_description& d) {
  std::string text;
  string_sink out(text);
  detail::json_writer j(out);
  j.begin_object(true);
  j.string("format", "tiers-dataset");
  j.count("version", 1);
  j.key("sources").begin_array(true);
  for (const dataset_source& s : d.sources) {
    j.begin_object();
    j.string("pattern", s.pattern);
    if (!s.read.empty()) j.key("read").string_map(s.read);
    if (!s.rename.empty()) j.key("rename").string_map(s.rename);
    if (s.source) detail::write_json_source(j.key("source"), *s.source);
    if (s.kind) j.string("kind", to_string(*s.kind));
    if (s.signal) j.string("kind", "signal");
    j.end_object();
  }
  j.end_array();
  j.end_object();
  out.write("\n");
  out.flush();
  return text;
}

std::string tier_name_of(std::string_view pattern) {
  const std::size_t slash = pattern.rfind('/');
  std::string name(pattern.substr(slash == std::string_view::npos ? 0 : slash + 1));
  if (const std::size_t dot = name.rfind('.');
      dot != std::string::npos && dot > 0 && name.find("{id}", dot) == std::string::npos)
    name.erase(dot);
  if (const std::size_t id = name.find("{id}"); id != std::string::npos) {
    name.erase(id, 4);
    const auto separator = [](char c) { return c == '.' || c == '-' || c == '_'; };
    while (!name.empty() && separator(name.front()))
      name.erase(0, 1);
    while (!name.empty() && separator(name.back()))
      name.pop_back();
  }
  if (!name.empty() && name.find_first_of("*{}") == std::string::npos) return name;
  if (slash == std::string_view::npos || slash == 0) return {};
  // The folder the files are in; a `**` stands for the folders below the one that names them
  // all (`captions/**/{id}.vtt` → `captions`).
  std::string_view folder = pattern.substr(0, slash);
  for (;;) {
    const std::size_t up = folder.rfind('/');
    const std::string_view last = folder.substr(up == std::string_view::npos ? 0 : up + 1);
    if (last != "**")
      return last.find_first_of("*{}") == std::string_view::npos ? std::string(last)
                                                                 : std::string();
    if (up == std::string_view::npos) return {};
    folder = folder.substr(0, up);
  }
}

std::optional<tier_source> parse_tier_source(std::string_view text) {
  const std::size_t colon = text.find(':');
  const std::optional<source_kind> kind = parse_source_kind(text.substr(0, colon));
  if (!kind) return std::nullopt;
  tier_source out{*kind, std::nullopt, std::nullopt};
  if (colon == std::string_view::npos) return out;
  std::string_view agent = text.substr(colon + 1);
  const std::size_t at = agent.rfind('@');
  if (at != std::string_view::npos) {
    if (at + 1 == agent.size()) return std::nullopt;
    out.version = std::string(agent.substr(at + 1));
    agent = agent.substr(0, at);
  }
  if (agent.empty()) return std::nullopt;
  out.agent = std::string(agent);
  return out;
}

}  // namespace tiers
