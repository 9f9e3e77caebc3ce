// Deriving tiers as the options say: the settings checked, the signal read and thresholded.
#include <fmt/format.h>

#include <algorithm>

#include "tiers/derive.hpp"
#include "tiers/inputs.hpp"
#include "tiers/io.hpp"

namespace tiers {

derive_request derive_request_of(const derive_settings& o, const std::string& path) {
  derive_request r;
  if (!o.from.empty()) {
    const auto f = value_named(signal_format_names, o.from);
    if (!f)
      throw usage_error("--from: '" + o.from + "' is not " + quoted_names(signal_format_names));
    r.format = *f;
  } else if (path != "-" && !path.empty()) {
    const auto f = signal_format_for_path(path);
    if (!f)
      throw usage_error("cannot tell the signal's format from '" + path +
                        "'; name it with --from csv, tsv or jsonl");
    r.format = *f;
  }
  if (!o.rate.empty()) r.reading.rate = parse_rate_setting(o.rate);
  for (std::size_t from = 0; !o.scores.empty() && from <= o.scores.size();) {
    const std::size_t comma = std::min(o.scores.find(',', from), o.scores.size());
    r.reading.columns.push_back(o.scores.substr(from, comma - from));
    from = comma + 1;
  }
  derive_options& d = r.derive;
  d.on = o.on;
  d.off = o.off;
  // Hysteresis leaves at --off what it entered at --on; above it, an interval would end before
  // the score that started it fell.
  if (o.off && *o.off > o.on)
    throw usage_error(
        fmt::format("--off {} is above --on {}: an interval ends where the score "
                    "falls below --off, which must not exceed --on",
                    *o.off, o.on));
  if (o.smooth % 2 == 0) throw usage_error("--smooth: the median needs an odd number of frames");
  d.smooth = o.smooth;
  parse_duration_arg("--bridge", o.bridge);  // bad values are usage errors before any reading
  parse_duration_arg("--min-duration", o.min_duration);
  r.bridge = o.bridge;
  r.min_duration = o.min_duration;
  d.tier_name = o.tier_name;
  d.label = o.label;
  if (r.reading.columns.size() != 1 && !o.tier_name.empty() &&
      o.tier_name.find("{score}") == std::string::npos)
    throw usage_error("--tier-name " + o.tier_name +
                      " would name every score's tier alike: pick one with --scores, or put "
                      "{score} in the name");
  if (o.confidence != "mean" && o.confidence != "max")
    throw usage_error("--confidence: '" + o.confidence + "' is neither mean nor max");
  d.max_confidence = o.confidence == "max";
  d.source.agent = !o.agent.empty()               ? o.agent
                   : path != "-" && !path.empty() ? name_from_path(path)
                                                  : std::string("detector");
  if (!o.agent_version.empty()) d.source.version = o.agent_version;
  return r;
}

result<document> derive_signal(std::string_view text, const std::string& file,
                               const derive_request& request) {
  signal_result r = read_signal(text, request.format, request.reading);
  locate_all(text, r.diagnostics);
  result<document> out;
  for (diagnostic& d : r.diagnostics) {
    if (d.file.empty()) d.file = file;
    out.diagnostics.push_back(std::move(d));
  }
  if (!out.ok()) return out;
  derive_options d = request.derive;
  // Frames (`--bridge 5f`) count at the signal's rate.
  d.bridge = parse_duration_option("--bridge", request.bridge, duration_kind::length, r.value.rate);
  d.min_duration = parse_duration_option("--min-duration", request.min_duration,
                                         duration_kind::length, r.value.rate);
  out.value = derive_tiers(r.value, d);
  return out;
}

}  // namespace tiers
