// Scores to intervals: median smoothing, hysteresis thresholds, bridging short gaps, dropping
// short intervals — never across rows that are missing.
#include <algorithm>
#include <cmath>
#include <cstdio>

#include "detail/exact.hpp"
#include "tiers/derive.hpp"

namespace tiers {
namespace {

std::string number_text(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%g", v);
  return buf;
}

// The median over `width` rows around each row, within runs of rows without missing ones.
std::vector<double> smoothed(const signal& s, const std::vector<double>& v, std::size_t width) {
  if (width <= 1) return v;
  std::vector<double> out(v.size());
  const std::size_t half = width / 2;
  std::size_t run = 0;  // first row of the current run
  for (std::size_t k = 0; k < v.size(); ++k) {
    if (s.after_gap[k]) run = k;
    std::size_t run_end = k + 1;
    while (run_end < v.size() && !s.after_gap[run_end] && run_end <= k + half)
      ++run_end;
    const std::size_t from = std::max(run, k >= half ? k - half : 0);
    std::vector<double> window(v.begin() + static_cast<long>(from),
                               v.begin() + static_cast<long>(run_end));
    const auto mid = window.begin() + static_cast<long>(window.size() / 2);
    std::nth_element(window.begin(), mid, window.end());
    out[k] = *mid;
  }
  return out;
}

struct span {
  std::size_t first, last;  // rows
};

}  // namespace

document derive_tiers(const signal& s, const derive_options& options) {
  document doc;
  if (s.rate) doc.media.frame_rate = *s.rate;
  const double on = options.on, off = options.off.value_or(options.on);
  for (std::size_t c = 0; c < s.names.size(); ++c) {
    const std::vector<double>& raw = s.scores[c];
    const std::vector<double> v = smoothed(s, raw, options.smooth);
    // Hysteresis: enter at >= on, stay while >= off; missing rows end an interval.
    std::vector<span> spans;
    bool inside = false;
    for (std::size_t k = 0; k < v.size(); ++k) {
      if (s.after_gap[k]) inside = false;
      const bool now = inside ? v[k] >= off : v[k] >= on;
      if (now && (!inside || spans.empty()))
        spans.push_back({k, k});
      else if (now)
        spans.back().last = k;
      inside = now;
    }
    // Bridge gaps shorter than `bridge`, unless rows are missing between them.
    std::vector<span> joined;
    for (const span& x : spans) {
      if (!joined.empty()) {
        const span& p = joined.back();
        bool missing = false;
        for (std::size_t k = p.last + 1; k <= x.first; ++k)
          missing = missing || s.after_gap[k];
        if (!missing &&
            detail::saturating_difference(s.times[x.first], s.ends[p.last]) < options.bridge) {
          joined.back().last = x.last;
          continue;
        }
      }
      joined.push_back(x);
    }
    tier& t = doc.tiers.emplace_back();
    t.name = derived_name(options.tier_name, s.names[c]);
    const std::string label = derived_name(options.label, s.names[c]);
    t.source = options.source;
    t.attributes = {{"derive:on", number_text(on)},
                    {"derive:off", number_text(off)},
                    {"derive:smooth", std::to_string(options.smooth)},
                    {"derive:bridge", format_seconds(options.bridge) + "s"},
                    {"derive:min_duration", format_seconds(options.min_duration) + "s"},
                    {"derive:confidence", options.max_confidence ? "max" : "mean"}};
    for (const span& x : joined) {
      annotation a;
      a.start = s.times[x.first];
      a.end = s.ends[x.last];
      if (detail::saturating_difference(a.end, a.start) < options.min_duration) continue;
      double sum = 0, best = 0;
      for (std::size_t k = x.first; k <= x.last; ++k) {
        sum += raw[k];
        best = std::max(best, raw[k]);
      }
      // Six decimals: more would only show the rounding noise of the sum.
      const double conf =
          std::round(
              (options.max_confidence ? best : sum / static_cast<double>(x.last - x.first + 1)) *
              1e6) /
          1e6;
      // A confidence lies in [0, 1]; scores on another scale are kept as they are instead.
      if (conf >= 0 && conf <= 1)
        a.confidence = conf;
      else
        a.attributes["score"] = number_text(conf);
      a.text = label;
      t.annotations.push_back(std::move(a));
    }
  }
  return doc;
}

std::string derived_name(const std::string& pattern, const std::string& score) {
  if (pattern.empty()) return score;
  std::string out;
  for (std::size_t at = 0; at < pattern.size();) {
    const std::size_t hole = pattern.find("{score}", at);
    out.append(pattern, at, hole == std::string::npos ? std::string::npos : hole - at);
    if (hole == std::string::npos) break;
    out += score;
    at = hole + 7;
  }
  return out;
}

}  // namespace tiers
