// The check report as JSON (docs/cli.md, "check"): every file's problems and lag, and totals.
#include "detail/problem_json.hpp"
#include "report_profile.hpp"
#include "tiers/check.hpp"
#include "tiers/version.hpp"

namespace tiers {
namespace {

using detail::json_writer;

void write_problem(json_writer& j, const problem& p) {
  j.begin_object();
  detail::write_problem_head(j, p);
  if (p.end) j.seconds("end", *p.end);
  if (p.diag.line > 0) j.count("line", p.diag.line);
  if (p.diag.column > 0) j.count("column", p.diag.column);
  if (p.diag.offset != no_offset) j.count("offset", p.diag.offset);
  if (p.value) j.number("value", *p.value);
  if (p.limit) j.number("limit", *p.limit);
  j.end_object();
}

void write_lag(json_writer& j, const lag_report& lag) {
  j.begin_object();
  j.string("captions", lag.captions);
  j.string("words", lag.words);
  const bool known = lag.stats.cues > 0;
  for (const auto& [key, value] :
       {std::pair{"median", lag.stats.median}, std::pair{"p90", lag.stats.p90},
        std::pair{"max", lag.stats.max}}) {
    if (known)
      j.seconds(key, value);
    else
      j.key(key).null();
  }
  j.number("coverage", lag.stats.coverage);
  j.count("cues", lag.stats.cues);
  j.count("tokens", lag.tokens);
  j.count("matched", lag.matched);
  j.end_object();
}

// What --combine needs to compare files across reports (dataset.inconsistent).
void write_shape(json_writer& j, const std::vector<tier_shape>& shape) {
  j.begin_array();
  for (const tier_shape& s : shape) {
    j.begin_object();
    j.string("name", s.name);
    j.string("kind", to_string(s.kind));
    if (s.vocabulary) j.key("vocabulary").string_array(*s.vocabulary);
    if (s.where.line > 0) {
      j.count("line", s.where.line);
      j.count("column", s.where.column);
      if (s.where.offset != no_offset) j.count("offset", s.where.offset);
    }
    j.end_object();
  }
  j.end_array();
}

void write_summary(json_writer& j, const check_summary& s) {
  j.begin_object(true);
  j.count("files", s.files);
  j.count("files_with_errors", s.files_with_errors);
  j.count("files_with_warnings", s.files_with_warnings);
  j.count("errors", s.errors);
  j.count("warnings", s.warnings);
  j.count("notes", s.notes);
  j.key("rules").begin_array(true);
  for (const check_summary::rule_count& r : s.by_rule) {
    j.begin_object();
    j.string("rule", r.rule);
    j.string("severity", to_string(r.level));
    j.count("problems", r.problems);
    j.count("files", r.files);
    j.end_object();
  }
  j.end_array();
  j.end_object();
}

}  // namespace

void write_check_json(std::span<const file_report> reports, byte_sink& out,
                      const report_header& header) {
  json_writer j(out);
  j.begin_object(true);
  j.string("format", "tiers-check");
  j.count("version", 1);
  j.key("tool").begin_object();
  j.string("name", "tiers");
  j.string("version", version());
  j.end_object();
  if (header.profile) detail::write_profile_identity(j.key("profile"), *header.profile);
  if (header.shard) j.string("shard", *header.shard);
  j.key("files").begin_array(true);
  for (const file_report& r : reports) {
    j.begin_object(true);
    j.string("path", r.path);
    if (r.index) j.count("index", *r.index);
    j.key("problems").begin_array(true);
    for (const problem& p : r.problems)
      write_problem(j, p);
    j.end_array();
    if (r.lag) write_lag(j.key("lag"), *r.lag);
    if (r.shape) write_shape(j.key("tiers"), *r.shape);
    j.end_object();
  }
  j.end_array();
  write_summary(j.key("summary"), summarize(reports));
  j.end_object();
  out.put('\n');
}

}  // namespace tiers
