// One edit as options give it: the value read, the operation applied.
#include "tiers/edit.hpp"
#include "tiers/inputs.hpp"
#include "tiers/time.hpp"

namespace tiers {
namespace {

time_ns time_value(const std::string& option, std::string_view text) {
  const bool negative = !text.empty() && text[0] == '-';
  const std::string_view body = negative ? text.substr(1) : text;
  const parsed_time t =
      body.find(':') != std::string_view::npos ? parse_clock(body) : parse_seconds(body);
  if (!t || body.empty())
    throw usage_error(option + ": '" + std::string(text) +
                      "' is not a time (seconds, or clock time such as 00:01:30.5)");
  return negative ? -t.value : t.value;
}

// `value` split at `separator` into two non-empty parts, or a usage_error naming `form`.
std::pair<std::string, std::string> two_parts(const std::string& option, const std::string& value,
                                              std::string_view separator, const char* form) {
  const std::size_t at = value.find(separator);
  if (at == std::string::npos || at == 0 || at + separator.size() == value.size())
    throw usage_error(option + ": expected " + form + ", got '" + value + "'");
  return {value.substr(0, at), value.substr(at + separator.size())};
}

}  // namespace

std::vector<diagnostic> apply_edit(document& doc, const edit_step& step,
                                   const std::string& rate_setting, bool from_zero) {
  const std::string option = "--" + step.operation;
  if (step.operation == "select") return select_tiers(doc, step.values);
  if (step.values.size() != 1) throw usage_error(option + ": expected one value");
  const std::string& v = step.values.front();
  if (step.operation == "shift")
    return shift_times(doc, parse_duration_option(option, v, duration_kind::offset,
                                                  frame_rate_of(doc, rate_setting)));
  if (step.operation == "scale") {
    const auto [from, to] = two_parts(option, v, ":", "FROM:TO");
    return scale_times(doc, parse_rate_setting(from), parse_rate_setting(to));
  }
  if (step.operation == "snap") return snap_times(doc, parse_rate_setting(v));
  if (step.operation == "cut") {
    const auto [start, end] = two_parts(option, v, "..", "START..END");
    return cut_times(doc, time_value(option, start), time_value(option, end), from_zero);
  }
  if (step.operation == "drop") return drop_tier(doc, v);
  if (step.operation == "rename") {
    const auto [from, to] = two_parts(option, v, "=", "OLD=NEW");
    return rename_tier(doc, from, to);
  }
  throw usage_error("no edit '" + step.operation +
                    "' (shift, scale, snap, cut, drop, rename, select)");
}

}  // namespace tiers
