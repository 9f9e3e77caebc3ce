// Exact TTML2 time expressions: every value is a rational number of seconds, rounded once to
// the nearest nanosecond.
#include "ttml_time.hpp"

#include <charconv>
#include <numeric>
#include <utility>

namespace tiers::detail::ttml {
namespace {

__extension__ typedef __int128 wide;

bool is_digit(char c) {
  return c >= '0' && c <= '9';
}

// A rational with 128-bit parts, enough for digits × rates without overflow checks on the
// inputs tiers accepts (at most 18 digits per field, rates below 2^32).
struct exact {
  wide num = 0;
  wide den = 1;
};

exact add(exact a, exact b) {
  return {a.num * b.den + b.num * a.den, a.den * b.den};
}

std::optional<time_ns> to_ns(exact v) {
  if (v.den <= 0) return std::nullopt;
  const wide n = v.num * ns_per_second;
  const wide r = n >= 0 ? (n + v.den / 2) / v.den : -((-n + v.den / 2) / v.den);
  if (r > std::numeric_limits<time_ns>::max() || r < -std::numeric_limits<time_ns>::max())
    return std::nullopt;
  return static_cast<time_ns>(r);
}

// "123" or "123.456" as an exact value; nothing when malformed or absurdly long.
std::optional<exact> decimal(std::string_view s) {
  const std::size_t dot = s.find('.');
  const std::string_view whole = s.substr(0, dot);
  const std::string_view frac = dot == std::string_view::npos ? "" : s.substr(dot + 1);
  if (whole.empty() || whole.size() > 18 || frac.size() > 18 ||
      (dot != std::string_view::npos && frac.empty()))
    return std::nullopt;
  exact v{0, 1};
  for (char c : whole) {
    if (!is_digit(c)) return std::nullopt;
    v.num = v.num * 10 + (c - '0');
  }
  for (char c : frac) {
    if (!is_digit(c)) return std::nullopt;
    v.num = v.num * 10 + (c - '0');
    v.den *= 10;
  }
  return v;
}

std::optional<std::int64_t> whole_number(std::string_view s) {
  std::int64_t v = 0;
  auto [p, ec] = std::from_chars(s.data(), s.data() + s.size(), v);
  if (s.empty() || ec != std::errc{} || p != s.data() + s.size() || v <= 0) return std::nullopt;
  return v;
}

}  // namespace

std::optional<std::string_view> read_parameters(std::string_view frame_rate,
                                                std::string_view multiplier,
                                                std::string_view sub_frame_rate,
                                                std::string_view tick_rate,
                                                timing_parameters& out) {
  // The effective rate must be one the model holds (both parts below 2^32, as every frame
  // rate tiers reads): then the writer's ttp:frameRate (below 2^32) and multiplier (each part
  // below 2^33) are read back here to the same rate. The parts are bounded so that their
  // product fits 128 bits.
  constexpr std::int64_t part_limit = std::int64_t{1} << 40;
  constexpr wide rate_limit = wide{1} << 32;
  std::int64_t rate = 30;
  if (!frame_rate.empty()) {
    auto r = whole_number(frame_rate);
    if (!r || *r >= part_limit) return "ttp:frameRate must be a positive whole number";
    rate = *r;
    out.frame_rate_given = true;
  }
  std::int64_t mul_num = 1, mul_den = 1;
  if (!multiplier.empty()) {
    const std::size_t space = multiplier.find(' ');
    auto n = whole_number(multiplier.substr(0, space));
    auto d =
        space == std::string_view::npos ? std::nullopt : whole_number(multiplier.substr(space + 1));
    if (!n || !d || *n >= part_limit || *d >= part_limit)
      return "ttp:frameRateMultiplier must be two positive whole numbers, e.g. \"1000 1001\"";
    mul_num = *n;
    mul_den = *d;
  }
  wide num = static_cast<wide>(rate) * mul_num, den = mul_den;
  wide g = num, rest = den;  // their greatest common divisor (std::gcd takes no __int128)
  while (rest != 0)
    g = std::exchange(rest, g % rest);
  num /= g;
  den /= g;
  if (num >= rate_limit || den >= rate_limit)
    return "ttp:frameRate × ttp:frameRateMultiplier is a rate tiers cannot hold: in lowest "
           "terms, both its parts must be below 2^32";
  out.frame_rate = {static_cast<std::int64_t>(num), static_cast<std::int64_t>(den)};
  if (!sub_frame_rate.empty()) {
    auto s = whole_number(sub_frame_rate);
    if (!s || *s >= (std::int64_t{1} << 31))
      return "ttp:subFrameRate must be a positive whole number";
    out.sub_frame_rate = *s;
  }
  if (!tick_rate.empty()) {
    auto t = whole_number(tick_rate);
    if (!t || *t >= (std::int64_t{1} << 40)) return "ttp:tickRate must be a positive whole number";
    out.tick_rate = {*t, 1};
  } else if (out.frame_rate_given) {
    out.tick_rate = {out.frame_rate.num * out.sub_frame_rate, out.frame_rate.den};
  }
  return std::nullopt;
}

std::optional<time_ns> parse_time_expression(std::string_view s, const timing_parameters& p) {
  if (s.empty()) return std::nullopt;
  if (s.find(':') != std::string_view::npos) {
    // clock-time: hours ":" minutes ":" seconds ( fraction | ":" frames ( "." sub-frames )? )?
    const std::size_t c1 = s.find(':');
    const std::size_t c2 = s.find(':', c1 + 1);
    if (c1 < 2 || c2 != c1 + 3 || s.size() < c2 + 3) return std::nullopt;
    auto hours = decimal(s.substr(0, c1));
    auto minutes = decimal(s.substr(c1 + 1, 2));
    const std::string_view rest = s.substr(c2 + 1);
    if (!hours || hours->den != 1 || !minutes || minutes->den != 1 || minutes->num > 59)
      return std::nullopt;
    exact total{(hours->num * 60 + minutes->num) * 60, 1};
    const std::size_t c3 = rest.find(':');
    if (c3 == std::string_view::npos) {
      auto seconds = decimal(rest);
      if (!seconds || rest.substr(0, 2).find('.') != std::string_view::npos || rest.size() < 2 ||
          (rest.size() > 2 && rest[2] != '.') || seconds->num / seconds->den > 60)
        return std::nullopt;
      return to_ns(add(total, *seconds));
    }
    auto seconds = decimal(rest.substr(0, c3));
    if (c3 != 2 || !seconds || seconds->den != 1 || seconds->num > 60) return std::nullopt;
    const std::string_view frame_part = rest.substr(c3 + 1);
    const std::size_t dot = frame_part.find('.');
    auto frames = decimal(frame_part.substr(0, dot));
    auto sub = dot == std::string_view::npos ? std::optional<exact>(exact{0, 1})
                                             : decimal(frame_part.substr(dot + 1));
    if (!frames || frames->den != 1 || !sub || sub->den != 1 || frame_part.size() < 2)
      return std::nullopt;
    // (frames + sub / subFrameRate) / (num / den)
    const exact frame_time{(frames->num * p.sub_frame_rate + sub->num) * p.frame_rate.den,
                           static_cast<wide>(p.sub_frame_rate) * p.frame_rate.num};
    return to_ns(add(add(total, *seconds), frame_time));
  }
  // offset-time: count ( "." fraction )? metric
  std::size_t unit = s.size();
  while (unit > 0 && !is_digit(s[unit - 1]))
    --unit;
  const std::string_view metric = s.substr(unit);
  auto count = decimal(s.substr(0, unit));
  if (!count) return std::nullopt;
  if (metric == "h") return to_ns({count->num * 3600, count->den});
  if (metric == "m") return to_ns({count->num * 60, count->den});
  if (metric == "s") return to_ns(*count);
  if (metric == "ms") return to_ns({count->num, count->den * 1000});
  if (metric == "f") return to_ns({count->num * p.frame_rate.den, count->den * p.frame_rate.num});
  if (metric == "t") return to_ns({count->num * p.tick_rate.den, count->den * p.tick_rate.num});
  return std::nullopt;
}

}  // namespace tiers::detail::ttml
