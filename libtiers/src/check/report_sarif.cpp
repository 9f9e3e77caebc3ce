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

using detail::write_json_double;
using detail::write_json_seconds;
using detail::write_json_string;

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
void write_configuration(byte_sink& out, rule_level level,
                         const std::vector<rule_parameter>& parameters) {
  out.write("{\"level\": ");
  write_json_string(out, sarif_level(level));
  out.write(level == rule_level::off ? ", \"enabled\": false" : ", \"enabled\": true");
  if (!parameters.empty()) {
    out.write(", \"parameters\": {");
    for (std::size_t k = 0; k < parameters.size(); ++k) {
      if (k) out.write(", ");
      write_json_string(out, parameters[k].name);
      out.write(": ");
      out.write(parameters[k].json);
    }
    out.put('}');
  }
  out.put('}');
}

void write_rules(byte_sink& out) {
  const auto all = rules();
  const check_limits defaults;
  for (std::size_t k = 0; k < all.size(); ++k) {
    const rule_info& r = all[k];
    out.write(k ? ",\n      {\"id\": " : "\n      {\"id\": ");
    write_json_string(out, r.id);
    out.write(", \"shortDescription\": {\"text\": ");
    write_json_string(out, r.summary);
    out.write("}, \"defaultConfiguration\": ");
    write_configuration(out, r.level, rule_parameters(r.id, defaults));
    out.write(", \"properties\": {\"group\": ");
    write_json_string(out, r.group);
    out.write("}}");
  }
}

// The invocation (§3.20): the profile that was used, and every rule whose level or thresholds
// it changed, with the configuration in force (§3.20.5 ruleConfigurationOverrides) — so that a
// rule a profile switched on is not read as off by its default configuration.
void write_invocation(byte_sink& out, const profile& p, const report_header& header) {
  out.write(",\n  \"invocations\": [{\"executionSuccessful\": true");
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
    out.write(first ? ", \"ruleConfigurationOverrides\": [\n    " : ",\n    ");
    first = false;
    out.write("{\"descriptor\": {\"id\": ");
    write_json_string(out, r.id);
    out.write(", \"index\": " + std::to_string(k) + "}, \"configuration\": ");
    write_configuration(out, p.level(r.id), now);
    out.put('}');
  }
  if (!first) out.write("]");
  if (header.profile) {
    out.write(", \"properties\": {\"profile\": ");
    detail::write_profile_identity(out, *header.profile);
    out.put('}');
  }
  out.write("}]");
}

void write_result(byte_sink& out, const problem& p) {
  out.write("{\"ruleId\": ");
  write_json_string(out, p.diag.code);
  const auto all = rules();
  for (std::size_t k = 0; k < all.size(); ++k)
    if (all[k].id == p.diag.code) {
      out.write(", \"ruleIndex\": ");
      out.write(std::to_string(k));
    }
  out.write(", \"level\": ");
  write_json_string(out, to_string(p.diag.level));
  out.write(", \"message\": {\"text\": ");
  write_json_string(out, p.diag.message);
  out.write("}, \"locations\": [{\"physicalLocation\": {\"artifactLocation\": {\"uri\": ");
  write_json_string(out, uri_of(p.diag.file));
  out.put('}');
  if (p.diag.line > 0) {
    out.write(", \"region\": {\"startLine\": ");
    out.write(std::to_string(p.diag.line));
    if (p.diag.column > 0) {
      out.write(", \"startColumn\": ");
      out.write(std::to_string(p.diag.column));
    }
    out.put('}');
  }
  out.put('}');
  if (!p.tier.empty()) {
    out.write(", \"logicalLocations\": [{\"name\": ");
    write_json_string(out, p.tier);
    out.write(", \"kind\": \"element\"}]");
  }
  out.write("}]");
  if (p.start || p.value) {
    out.write(", \"properties\": {");
    bool comma = false;
    auto key = [&](std::string_view k) {
      out.write(comma ? ", \"" : "\"");
      out.write(k);
      out.write("\": ");
      comma = true;
    };
    if (p.start) {
      key("start");
      write_json_seconds(out, *p.start);
    }
    if (p.end) {
      key("end");
      write_json_seconds(out, *p.end);
    }
    if (p.value) {
      key("value");
      write_json_double(out, *p.value);
    }
    if (p.limit) {
      key("limit");
      write_json_double(out, *p.limit);
    }
    out.put('}');
  }
  out.put('}');
}

}  // namespace

void write_check_sarif(std::span<const file_report> reports, byte_sink& out, const profile& used,
                       const report_header& header) {
  out.write(
      "{\"$schema\": "
      "\"https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/"
      "sarif-schema-2.1.0.json\",\n \"version\": \"2.1.0\",\n \"runs\": [{\n  \"tool\": "
      "{\"driver\": {\"name\": \"tiers\", \"version\": ");
  write_json_string(out, version());
  out.write(", \"rules\": [");
  write_rules(out);
  out.write("]}}");
  write_invocation(out, used, header);
  out.write(",\n  \"columnKind\": \"unicodeCodePoints\",\n  \"results\": [");
  bool first = true;
  for (const file_report& r : reports)
    for (const problem& p : r.problems) {
      out.write(first ? "\n    " : ",\n    ");
      first = false;
      write_result(out, p);
    }
  out.write(first ? "]\n }]}\n" : "\n  ]\n }]}\n");
}

}  // namespace tiers
