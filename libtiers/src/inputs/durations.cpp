// Durations as options give them: `1.5s`, `250ms`, plain seconds, or `2f` frames.
#include "tiers/inputs.hpp"

namespace tiers {

duration_arg parse_duration_arg(const std::string& option, const std::string& text,
                                duration_kind kind) {
  const bool negative = kind == duration_kind::offset && !text.empty() && text[0] == '-';
  const auto d = parse_duration(negative ? text.substr(1) : text);
  if (!d || (kind == duration_kind::positive && d->ns == 0 && d->frames.value_or(0) == 0))
    throw usage_error(option + ": '" + text + "' is not " +
                      (kind == duration_kind::offset ? "an offset such as -0.5s, 250ms or -2f"
                       : kind == duration_kind::positive
                           ? "a positive duration such as 10ms, 1s or 1f"
                           : "a duration such as 1.5s, 250ms or 2f"));
  duration_arg a;
  a.option = option;
  a.text = text;
  a.value = *d;
  a.negative = negative;
  return a;
}

time_ns duration_arg::at(std::optional<rational> rate) const {
  if (!value.frames) return negative ? -value.ns : value.ns;
  if (!rate)
    throw usage_error(option + ": '" + text +
                      "' counts video frames, and the document gives no frame rate: give --rate");
  const time_ns ns = value.at(*rate);
  return negative ? -ns : ns;
}

time_ns parse_duration_option(const std::string& option, const std::string& text,
                              duration_kind kind, std::optional<rational> rate) {
  return parse_duration_arg(option, text, kind).at(rate);
}

std::optional<rational> frame_rate_of(const document& doc, const std::string& rate_setting) {
  if (doc.media.frame_rate) return doc.media.frame_rate;
  if (!rate_setting.empty()) return parse_rate_setting(rate_setting);
  return std::nullopt;
}

}  // namespace tiers
