// The rule configuration a profile puts in force: each rule's thresholds, and a digest of the
// whole, which reports record so that the parts of a dataset are known to be checked alike.
#include <cstdint>
#include <cstdio>

#include <fmt/format.h>

#include "tiers/profile.hpp"

namespace tiers {
namespace {

rule_parameter number(std::string name, double v) {
  std::string text = fmt::format("{:g}", v);
  return {std::move(name), text, text};
}

rule_parameter count(std::string name, std::size_t v) {
  return {std::move(name), std::to_string(v), std::to_string(v)};
}

rule_parameter duration(std::string name, const duration_value& d) {
  const std::string text = format_duration(d);
  return {std::move(name), "\"" + text + "\"", text};
}

rule_parameter seconds(std::string name, time_ns t) {
  return duration(std::move(name), duration_value{t, std::nullopt});
}

// FNV-1a, 64 bits (Fowler, Noll and Vo's published parameters): a digest to tell settings
// apart, not a cryptographic one.
std::uint64_t fnv1a64(std::string_view text) {
  std::uint64_t h = 0xcbf29ce484222325ULL;
  for (char c : text) {
    h ^= static_cast<unsigned char>(c);
    h *= 0x100000001b3ULL;
  }
  return h;
}

}  // namespace

std::vector<rule_parameter> rule_parameters(std::string_view rule, const check_limits& l) {
  if (rule == "caption.cps") return {number("max", l.max_cps)};
  if (rule == "caption.wpm") return {number("max", l.max_wpm)};
  if (rule == "caption.line-length") return {count("max", l.max_line_length)};
  if (rule == "caption.lines") return {count("max", l.max_lines)};
  if (rule == "caption.min-duration") return {seconds("min", l.min_duration)};
  if (rule == "caption.max-duration") return {seconds("max", l.max_duration)};
  if (rule == "caption.gap") return {duration("min", l.min_gap)};
  if (rule == "lag.late") return {seconds("max", l.max_late)};
  if (rule == "lag.early") return {seconds("max", l.max_early)};
  if (rule == "lag.coverage") return {number("min", l.min_coverage)};
  if (rule == "text.all-caps")
    return {number("share", l.caps_share), count("min_letters", l.caps_min_letters)};
  return {};
}

profile_identity identify(const profile& p) {
  // One line per setting, in a fixed order: the same settings give the same digest, however
  // the profile's file was written or which profiles it extends.
  std::string text;
  for (const rule_info& r : rules()) {
    text += std::string(r.id) + " " + std::string(to_string(p.level(r.id)));
    for (const rule_parameter& q : rule_parameters(r.id, p.limits))
      text += " " + q.name + "=" + q.json;
    text += "\n";
  }
  text += "window " + format_seconds(p.limits.window.before) + " " +
          format_seconds(p.limits.window.after) + "\nframe_rate " +
          format_rational(p.limits.frame_rate) + "\n";
  text += "captions " + p.captions.value_or("-") + "\nwords " + p.words.value_or("-") + "\n";
  for (const tier_spec& t : p.tiers) {
    text += "tier " + t.name + (t.required ? " required" : " optional");
    if (t.kind) text += " kind=" + std::string(to_string(*t.kind));
    if (t.parent) text += " parent=" + t.parent->tier + "/" + std::string(to_string(t.parent->rel));
    if (t.vocabulary) {
      text += " vocabulary=";
      for (const std::string& label : *t.vocabulary)
        text += std::to_string(label.size()) + ":" + label;
    }
    text += std::string(t.overlaps ? " overlaps" : "") + (t.contiguous ? " contiguous" : "") + "\n";
  }
  char hex[17];
  std::snprintf(hex, sizeof hex, "%016llx", static_cast<unsigned long long>(fnv1a64(text)));
  return {p.name, std::string("fnv1a64:") + hex};
}

}  // namespace tiers
