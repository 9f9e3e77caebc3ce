// The check report as JSON (docs/cli.md, "check"): every file's problems and lag, and totals.
#include "detail/json_text.hpp"
#include "report_profile.hpp"
#include "tiers/check.hpp"
#include "tiers/version.hpp"

namespace tiers {
namespace {

using detail::write_json_double;
using detail::write_json_seconds;
using detail::write_json_string;

void write_count(byte_sink& out, std::string_view key, std::size_t n, bool comma = true) {
  if (comma) out.write(", ");
  write_json_string(out, key);
  out.write(": ");
  out.write(std::to_string(n));
}

void write_problem(byte_sink& out, const problem& p) {
  out.write("{\"rule\": ");
  write_json_string(out, p.diag.code);
  out.write(", \"severity\": ");
  write_json_string(out, to_string(p.diag.level));
  out.write(", \"message\": ");
  write_json_string(out, p.diag.message);
  if (!p.tier.empty()) {
    out.write(", \"tier\": ");
    write_json_string(out, p.tier);
  }
  if (p.start) {
    out.write(", \"start\": ");
    write_json_seconds(out, *p.start);
  }
  if (p.end) {
    out.write(", \"end\": ");
    write_json_seconds(out, *p.end);
  }
  if (p.diag.line > 0) write_count(out, "line", p.diag.line);
  if (p.diag.column > 0) write_count(out, "column", p.diag.column);
  if (p.diag.offset != no_offset) write_count(out, "offset", p.diag.offset);
  if (p.value) {
    out.write(", \"value\": ");
    write_json_double(out, *p.value);
  }
  if (p.limit) {
    out.write(", \"limit\": ");
    write_json_double(out, *p.limit);
  }
  out.put('}');
}

void write_lag(byte_sink& out, const lag_report& lag) {
  out.write("{\"captions\": ");
  write_json_string(out, lag.captions);
  out.write(", \"words\": ");
  write_json_string(out, lag.words);
  const bool known = lag.stats.cues > 0;
  for (const auto& [key, value] :
       {std::pair{"median", lag.stats.median}, std::pair{"p90", lag.stats.p90},
        std::pair{"max", lag.stats.max}}) {
    out.write(", \"");
    out.write(key);
    out.write("\": ");
    if (known)
      write_json_seconds(out, value);
    else
      out.write("null");
  }
  out.write(", \"coverage\": ");
  write_json_double(out, lag.stats.coverage);
  write_count(out, "cues", lag.stats.cues);
  write_count(out, "tokens", lag.tokens);
  write_count(out, "matched", lag.matched);
  out.put('}');
}

}  // namespace

void write_check_json(std::span<const file_report> reports, byte_sink& out,
                      const report_header& header) {
  out.write(
      "{\"format\": \"tiers-check\", \"version\": 1, \"tool\": {\"name\": \"tiers\", "
      "\"version\": ");
  write_json_string(out, version());
  out.put('}');
  if (header.profile) {
    out.write(",\n \"profile\": ");
    detail::write_profile_identity(out, *header.profile);
  }
  if (header.shard) {
    out.write(", \"shard\": ");
    write_json_string(out, *header.shard);
  }
  out.write(",\n \"files\": [");
  for (std::size_t k = 0; k < reports.size(); ++k) {
    const file_report& r = reports[k];
    out.write(k ? ",\n  {\"path\": " : "\n  {\"path\": ");
    write_json_string(out, r.path);
    if (r.index) write_count(out, "index", *r.index);
    out.write(", \"problems\": [");
    for (std::size_t i = 0; i < r.problems.size(); ++i) {
      out.write(i ? ",\n    " : "\n    ");
      write_problem(out, r.problems[i]);
    }
    out.write(r.problems.empty() ? "]" : "\n  ]");
    if (r.lag) {
      out.write(",\n   \"lag\": ");
      write_lag(out, *r.lag);
    }
    if (r.shape) {
      // What --combine needs to compare files across reports (dataset.inconsistent).
      out.write(",\n   \"tiers\": [");
      for (std::size_t t = 0; t < r.shape->size(); ++t) {
        const tier_shape& s = (*r.shape)[t];
        out.write(t ? ", {\"name\": " : "{\"name\": ");
        write_json_string(out, s.name);
        out.write(", \"kind\": ");
        write_json_string(out, to_string(s.kind));
        if (s.vocabulary) {
          out.write(", \"vocabulary\": [");
          for (std::size_t v = 0; v < s.vocabulary->size(); ++v) {
            if (v) out.write(", ");
            write_json_string(out, (*s.vocabulary)[v]);
          }
          out.put(']');
        }
        if (s.where.line > 0) {
          write_count(out, "line", s.where.line);
          write_count(out, "column", s.where.column);
          if (s.where.offset != no_offset) write_count(out, "offset", s.where.offset);
        }
        out.put('}');
      }
      out.put(']');
    }
    out.put('}');
  }
  const check_summary s = summarize(reports);
  out.write(reports.empty() ? "],\n \"summary\": {" : "\n ],\n \"summary\": {");
  write_count(out, "files", s.files, false);
  write_count(out, "files_with_errors", s.files_with_errors);
  write_count(out, "files_with_warnings", s.files_with_warnings);
  write_count(out, "errors", s.errors);
  write_count(out, "warnings", s.warnings);
  write_count(out, "notes", s.notes);
  out.write(", \"rules\": [");
  for (std::size_t k = 0; k < s.by_rule.size(); ++k) {
    out.write(k ? ",\n   {\"rule\": " : "\n   {\"rule\": ");
    write_json_string(out, s.by_rule[k].rule);
    out.write(", \"severity\": ");
    write_json_string(out, to_string(s.by_rule[k].level));
    write_count(out, "problems", s.by_rule[k].problems);
    write_count(out, "files", s.by_rule[k].files);
    out.put('}');
  }
  out.write("]}}\n");
}

}  // namespace tiers
