// The check report as one SARIF 2.1.0 log (OASIS): the rule catalogue as the driver's rules,
// one result per problem, located by line and column in code points (§3.14.23 columnKind).
#include <cstdio>

#include "tiers/check.hpp"
#include "tiers/detail/json_text.hpp"
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

void write_rules(byte_sink& out) {
  const auto all = rules();
  for (std::size_t k = 0; k < all.size(); ++k) {
    const rule_info& r = all[k];
    out.write(k ? ",\n      {\"id\": " : "\n      {\"id\": ");
    write_json_string(out, r.id);
    out.write(", \"shortDescription\": {\"text\": ");
    write_json_string(out, r.summary);
    out.write("}, \"defaultConfiguration\": {\"level\": ");
    write_json_string(out, sarif_level(r.level));
    out.write(r.level == rule_level::off ? ", \"enabled\": false}" : "}");
    out.write(", \"properties\": {\"group\": ");
    write_json_string(out, r.group);
    out.write("}}");
  }
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

void write_check_sarif(std::span<const file_report> reports, byte_sink& out) {
  out.write(
      "{\"$schema\": "
      "\"https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/"
      "sarif-schema-2.1.0.json\",\n \"version\": \"2.1.0\",\n \"runs\": [{\n  \"tool\": "
      "{\"driver\": {\"name\": \"tiers\", \"version\": ");
  write_json_string(out, version());
  out.write(", \"rules\": [");
  write_rules(out);
  out.write("]}},\n  \"columnKind\": \"unicodeCodePoints\",\n  \"results\": [");
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
