// Reading check reports back (the JSON of write_check_json), for combining the reports of runs
// over parts of a dataset into one.
#include <charconv>
#include <cmath>

#include "detail/json_tree.hpp"
#include "detail/report.hpp"
#include "tiers/check.hpp"

namespace tiers {
namespace {

using detail::json_fields;
using detail::json_node;

class report_reader {
 public:
  explicit report_reader(std::vector<diagnostic>& problems) : problems_(problems) {}

  void file(const json_node& n, std::vector<file_report>& out) {
    if (n.kind != json_node::type::object) return bad(n, "each file is an object");
    json_fields f(n, "a file", "report", problems_);
    file_report r;
    if (f.require("path"))
      if (auto p = f.string("path")) r.path = *p;
    if (f.get("index")) r.index = count(f, "index");
    if (const json_node* ps = f.array("problems"))
      for (const json_node& p : ps->items)
        problem_of(p, r);
    if (const json_node* l = f.object("lag")) r.lag = lag_of(*l);
    if (const json_node* ts = f.array("tiers")) {
      r.shape.emplace();
      for (const json_node& t : ts->items)
        shape_of(t, *r.shape);
    }
    f.finish();
    out.push_back(std::move(r));
  }

 private:
  void bad(const json_node& n, std::string message) {
    problems_.push_back(
        detail::make_diagnostic(severity::error, "report.value", n.offset, std::move(message)));
  }
  std::optional<time_ns> seconds(json_fields& f, std::string_view key) {
    const json_node* n = f.get(key);
    if (!n || n->kind == json_node::type::null) return std::nullopt;
    const parsed_time t =
        n->kind == json_node::type::number ? parse_seconds(n->text) : parsed_time{};
    if (!t) {
      f.bad(*n, detail::quote_name(key) + " must be a number of seconds");
      return std::nullopt;
    }
    return t.value;
  }
  // A count or a line number: a whole number a double holds exactly (up to 2^53).
  std::size_t count(json_fields& f, std::string_view key) {
    const auto v = f.number(key);
    if (!v) return 0;
    if (!(*v >= 0 && *v <= 9007199254740992.0 && std::floor(*v) == *v)) {
      f.bad(*f.get(key), detail::quote_name(key) + " must be a whole number from 0");
      return 0;
    }
    return static_cast<std::size_t>(*v);
  }

  void problem_of(const json_node& n, file_report& r) {
    if (n.kind != json_node::type::object) return bad(n, "each problem is an object");
    json_fields f(n, "a problem", "report", problems_);
    problem p;
    for (const char* key : {"rule", "severity", "message"})
      f.require(key);
    p.diag.code = f.string("rule").value_or("");
    const std::string level = f.string("severity").value_or("error");
    p.diag.level = level == "note"      ? severity::note
                   : level == "warning" ? severity::warning
                                        : severity::error;
    p.diag.message = f.string("message").value_or("");
    p.diag.file = r.path;
    p.tier = f.string("tier").value_or("");
    p.id = f.string("id");
    p.start = seconds(f, "start");
    p.end = seconds(f, "end");
    if (f.get("line")) p.diag.line = count(f, "line");
    if (f.get("column")) p.diag.column = count(f, "column");
    if (f.get("offset")) p.diag.offset = count(f, "offset");
    p.value = f.number("value");
    p.limit = f.number("limit");
    f.finish();
    r.problems.push_back(std::move(p));
  }

  lag_report lag_of(const json_node& n) {
    json_fields f(n, "lag", "report", problems_);
    lag_report l;
    l.captions = f.string("captions").value_or("");
    l.words = f.string("words").value_or("");
    l.stats.median = seconds(f, "median").value_or(0);
    l.stats.p90 = seconds(f, "p90").value_or(0);
    l.stats.max = seconds(f, "max").value_or(0);
    l.stats.coverage = f.number("coverage").value_or(0);
    l.stats.cues = count(f, "cues");
    l.tokens = count(f, "tokens");
    l.matched = count(f, "matched");
    f.finish();
    return l;
  }

  void shape_of(const json_node& n, std::vector<tier_shape>& out) {
    if (n.kind != json_node::type::object) return bad(n, "each tier is an object");
    json_fields f(n, "a tier", "report", problems_);
    tier_shape s;
    s.name = f.string("name").value_or("");
    s.kind = parse_tier_kind(f.string("kind").value_or("interval")).value_or(tier_kind::interval);
    if (const json_node* v = f.array("vocabulary")) {
      s.vocabulary.emplace();
      for (const json_node& label : v->items)
        s.vocabulary->push_back(label.text);
    }
    if (f.get("line")) s.where.line = count(f, "line");
    if (f.get("column")) s.where.column = count(f, "column");
    if (f.get("offset")) s.where.offset = count(f, "offset");
    f.finish();
    out.push_back(std::move(s));
  }

  std::vector<diagnostic>& problems_;
};

}  // namespace

report_result read_check_report(std::string_view text, const std::string& file) {
  report_result r;
  std::optional<json_node> root = detail::parse_json_tree(text, r.diagnostics, 16);
  if (root && root->kind != json_node::type::object) {
    r.diagnostics.push_back(detail::make_diagnostic(severity::error, "report.value", root->offset,
                                                    "a check report is a JSON object"));
    root.reset();
  }
  if (root) {
    json_fields f(*root, "the report", "report", r.diagnostics);
    if (f.string("format") != std::optional<std::string>("tiers-check") || !f.get("version") ||
        f.get("version")->text != "1")
      r.diagnostics.push_back(detail::make_diagnostic(
          severity::error, "report.value", root->offset,
          "not a tiers check report (format \"tiers-check\", version 1): write it with "
          "tiers check --format json"));
    f.get("tool");
    f.get("summary");  // recomputed from the files
    if (const json_node* p = f.object("profile")) {
      json_fields g(*p, "the profile", "report", r.diagnostics);
      g.require("name");
      g.require("digest");
      r.value.header.profile =
          profile_identity{g.string("name").value_or(""), g.string("digest").value_or("")};
      g.finish();
    }
    if (auto shard = f.string("shard")) r.value.header.shard = *shard;
    report_reader reader(r.diagnostics);
    if (const json_node* files = f.array("files"))
      for (const json_node& n : files->items)
        reader.file(n, r.value.files);
    f.finish();
  }
  locate_all(text, r.diagnostics);
  for (diagnostic& d : r.diagnostics)
    d.file = file;
  return r;
}

}  // namespace tiers
