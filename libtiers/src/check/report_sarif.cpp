// The check report as one SARIF 2.1.0 log (OASIS): the rule catalogue as the driver's rules,
// one result per problem, located by line and column in code points (§3.14.23 columnKind).
#include <cstdio>

#include "detail/json_text.hpp"
#include "report_profile.hpp"
#include "tiers/check.hpp"
#include "tiers/profile.hpp"
#include "tiers/version.hpp"

namespace tiers {
namespace {

using detail::json_writer;

// A file name as a URI reference (RFC 3986): unreserved characters and '/' as they are,
// everything else percent-encoded, byte by byte of its UTF-8.
std::string uri_of(std::string_view path) {
  std::string out;
  if (!path.empty() && path.front() == '/') out = "file://";
  for (char c : path) {
    const auto u = static_cast<unsigned char>(c);
    if ((u >= 'A' && u <= 'Z') || (u >= 'a' && u <= 'z') || (u >= '0' && u <= '9') || c == '-' ||
        c == '.' || c == '_' || c == '~' || c == '/') {
      out += c;
    } else {
      char hex[4];
      std::snprintf(hex, sizeof hex, "%%%02X", u);
      out += hex;
    }
  }
  return out;
}

// SARIF levels (§3.27.10): error, warning, note, or none for a rule that is off.
std::string_view sarif_level(rule_level l) {
  return l == rule_level::off ? "none" : to_string(l);
}

// A reportingConfiguration (§3.49): level, enabled when off, and the thresholds as parameters.
void write_configuration(json_writer& j, rule_level level,
                         const std::vector<rule_parameter>& parameters) {
  j.begin_object();
  j.string("level", sarif_level(level));
  j.boolean("enabled", level != rule_level::off);
  if (!parameters.empty()) {
    j.key("parameters").begin_object();
    for (const rule_parameter& p : parameters)
      j.key(p.name).raw(p.json);
    j.end_object();
  }
  j.end_object();
}

void write_rules(json_writer& j) {
  const check_limits defaults;
  j.begin_array(true);
  for (const rule_info& r : rules()) {
    j.begin_object();
    j.string("id", r.id);
    j.key("shortDescription").begin_object();
    j.string("text", r.summary);
    j.end_object();
    write_configuration(j.key("defaultConfiguration"), r.level, rule_parameters(r.id, defaults));
    j.key("properties").begin_object();
    j.string("group", r.group);
    bool any = false;
    for (const rule_threshold& t : rule_thresholds()) {
      if (t.rule != r.id) continue;
      if (!any) j.key("thresholds").begin_object();
      any = true;
      j.string(t.key, t.meaning);
    }
    if (any) j.end_object();
    j.end_object();
    j.end_object();
  }
  j.end_array();
}

// The invocation (§3.20): the profile that was used, and every rule whose level or thresholds
// it changed, with the configuration in force (§3.20.5 ruleConfigurationOverrides) — so that a
// rule a profile switched on is not read as off by its default configuration.
void write_invocation(json_writer& j, const profile& p, const report_header& header) {
  j.begin_object();
  j.boolean("executionSuccessful", true);
  const auto all = rules();
  const check_limits defaults;
  bool first = true;
  for (std::size_t k = 0; k < all.size(); ++k) {
    const rule_info& r = all[k];
    const std::vector<rule_parameter> now = rule_parameters(r.id, p.limits);
    const std::vector<rule_parameter> was = rule_parameters(r.id, defaults);
    bool same = p.level(r.id) == r.level && now.size() == was.size();
    for (std::size_t i = 0; same && i < now.size(); ++i)
      same = now[i].json == was[i].json;
    if (same) continue;
    if (first) j.key("ruleConfigurationOverrides").begin_array(true);
    first = false;
    j.begin_object();
    j.key("descriptor").begin_object();
    j.string("id", r.id);
    j.count("index", k);
    j.end_object();
    write_configuration(j.key("configuration"), p.level(r.id), now);
    j.end_object();
  }
  if (!first) j.end_array();
  if (header.profile) {
    j.key("properties").begin_object();
    detail::write_profile_identity(j.key("profile"), *header.profile);
    j.end_object();
  }
  j.end_object();
}

void write_result(json_writer& j, const problem& p) {
  j.begin_object();
  j.string("ruleId", p.diag.code);
  const auto all = rules();
  for (std::size_t k = 0; k < all.size(); ++k)
    if (all[k].id == p.diag.code) j.count("ruleIndex", k);
  j.string("level", to_string(p.diag.level));
  j.key("message").begin_object();
  j.string("text", p.diag.message);
  j.end_object();
  j.key("locations").begin_array();
  j.begin_object();
  j.key("physicalLocation").begin_object();
  j.key("artifactLocation").begin_object();
  j.string("uri", uri_of(p.diag.file));
  j.end_object();
  if (p.diag.line > 0) {
    j.key("region").begin_object();
    j.count("startLine", p.diag.line);
    if (p.diag.column > 0) j.count("startColumn", p.diag.column);
    j.end_object();
  }
  j.end_object();
  if (!p.tier.empty()) {
    j.key("logicalLocations").begin_array();
    j.begin_object();
    j.string("name", p.tier);
    j.string("kind", "element");
    j.end_object();
    j.end_array();
  }
  j.end_object();
  j.end_array();
  if (p.start || p.value || p.id) {
    j.key("properties").begin_object();
    if (p.id) j.string("id", *p.id);
    if (p.start) j.seconds("start", *p.start);
    if (p.end) j.seconds("end", *p.end);
    if (p.value) j.number("value", *p.value);
    if (p.limit) j.number("limit", *p.limit);
    j.end_object();
  }
  j.end_object();
}

}  // namespace

void write_check_sarif(std::span<const file_report> reports, byte_sink& out, const profile& used,
                       const report_header& header) {
  json_writer j(out);
  j.begin_object(true);
  j.string("$schema",
           "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/"
           "sarif-schema-2.1.0.json");
  j.string("version", "2.1.0");
  j.key("runs").begin_array(true);
  j.begin_object(true);
  j.key("tool").begin_object();
  j.key("driver").begin_object();
  j.string("name", "tiers");
  j.string("version", version());
  write_rules(j.key("rules"));
  j.end_object();
  j.end_object();
  j.key("invocations").begin_array();
  write_invocation(j, used, header);
  j.end_array();
  j.string("columnKind", "unicodeCodePoints");
  j.key("results").begin_array(true);
  for (const file_report& r : reports)
    for (const problem& p : r.problems)
      write_result(j, p);
  j.end_array();
  j.end_object();
  j.end_array();
  j.end_object();
  out.put('\n');
}

}  // namespace tiers
