// The rule configuration a profile puts in force: each rule's thresholds, and a digest of the
// whole, which reports record so that the parts of a dataset are known to be checked alike.
#include <cstdint>
#include <cstdio>

#include <fmt/format.h>

#include "detail/hash.hpp"
#include "tiers/profile.hpp"

namespace tiers {
namespace {

using enum threshold_kind;
using limits = check_limits;

// Meanings as people read them in --list-rules and the SARIF rule descriptions.
const rule_threshold thresholds[]{
    {"text.all-caps", "share", "least share of upper-case letters", share, &limits::caps_share},
    {"text.all-caps", "min_letters", "letters needed to judge", count, nullptr,
     &limits::caps_min_letters},
    {"caption.cps", "max", "characters (grapheme clusters) per second", number, &limits::max_cps},
    {"caption.wpm", "max", "words per minute", number, &limits::max_wpm},
    {"caption.line-length", "max", "characters (grapheme clusters) per line", count, nullptr,
     &limits::max_line_length},
    {"caption.lines", "max", "lines", count, nullptr, &limits::max_lines},
    {"caption.min-duration", "min", "duration", duration, nullptr, nullptr, &limits::min_duration},
    {"caption.max-duration", "max", "duration", duration, nullptr, nullptr, &limits::max_duration},
    {"caption.gap", "min", "duration (frames with f)", frames, nullptr, nullptr, nullptr,
     &limits::min_gap},
    {"lag.late", "max", "duration", duration, nullptr, nullptr, &limits::max_late},
    {"lag.early", "max", "duration", duration, nullptr, nullptr, &limits::max_early},
    {"lag.coverage", "min", "share of caption words", share, &limits::min_coverage},
};

rule_parameter parameter_of(const rule_threshold& t, const check_limits& l) {
  std::string name(t.key);
  switch (t.kind) {
    case number:
    case share: {
      std::string text = fmt::format("{:g}", l.*t.number);
      return {std::move(name), text, text};
    }
    case count:
      return {std::move(name), std::to_string(l.*t.count), std::to_string(l.*t.count)};
    case duration:
    case frames: {
      const std::string text =
          format_duration(t.kind == frames ? l.*t.frames : duration_value{l.*t.time, std::nullopt});
      return {std::move(name), "\"" + text + "\"", text};
    }
  }
  return {};
}

}  // namespace

std::span<const rule_threshold> rule_thresholds() {
  return thresholds;
}

std::vector<rule_parameter> rule_parameters(std::string_view rule, const check_limits& l) {
  std::vector<rule_parameter> out;
  for (const rule_threshold& t : thresholds)
    if (t.rule == rule) out.push_back(parameter_of(t, l));
  return out;
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
  std::snprintf(hex, sizeof hex, "%016llx", static_cast<unsigned long long>(detail::fnv1a64(text)));
  return {p.name, std::string("fnv1a64:") + hex};
}

}  // namespace tiers
