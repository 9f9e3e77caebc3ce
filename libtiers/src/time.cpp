// Exact parsing and formatting of times, frame numbers, timecodes and rationals.
#include "tiers/time.hpp"

#include "detail/exact.hpp"

#include <charconv>
#include <cstdio>
#include <limits>
#include <numeric>
#include <optional>

namespace tiers {
namespace {

using detail::i128;
using detail::round_div;
using detail::time_max;
constexpr std::int64_t rational_limit = std::int64_t{1} << 32;

bool is_digit(char c) {
  return c >= '0' && c <= '9';
}

parsed_time ok(time_ns v) {
  return {v, time_status::ok};
}
parsed_time fail(time_status s) {
  return {0, s};
}

// A decimal number `[-+]digits[.digits][e[-+]digits]` (either digit run may be empty, not both),
// scaled by 10^scale and rounded to an integer. Works digit by digit, so that a number with
// thousands of digits is neither slow to reject nor silently rounded through a double.
// The common case, `[-]digits[.digits]` with at most 9 integer digits and no more fraction
// digits than the scale: exact in 64 bits, without the general path's bookkeeping.
std::optional<parsed_time> parse_plain_decimal(std::string_view s, int scale) {
  std::size_t i = 0;
  const bool negative = !s.empty() && s[0] == '-';
  if (negative) ++i;
  std::int64_t whole = 0;
  const std::size_t int_begin = i;
  while (i < s.size() && is_digit(s[i]) && i - int_begin < 9)
    whole = whole * 10 + (s[i++] - '0');
  const std::size_t int_digits = i - int_begin;
  std::int64_t frac = 0;
  std::size_t frac_digits = 0;
  if (i < s.size() && s[i] == '.') {
    ++i;
    while (i < s.size() && is_digit(s[i]) && frac_digits < static_cast<std::size_t>(scale)) {
      frac = frac * 10 + (s[i++] - '0');
      ++frac_digits;
    }
  }
  if (i != s.size() || int_digits + frac_digits == 0) return std::nullopt;
  static constexpr std::int64_t pow10[] = {1,      10,      100,      1000,      10000,
                                           100000, 1000000, 10000000, 100000000, 1000000000};
  std::int64_t value = whole * pow10[scale] + frac * pow10[scale - static_cast<int>(frac_digits)];
  return ok(negative ? -value : value);
}

parsed_time parse_scaled_decimal(std::string_view s, int scale) {
  if (scale <= 9)
    if (const auto fast = parse_plain_decimal(s, scale)) return *fast;
  std::size_t i = 0;
  bool negative = false;
  if (i < s.size() && (s[i] == '-' || s[i] == '+')) negative = s[i++] == '-';
  const std::size_t int_begin = i;
  while (i < s.size() && is_digit(s[i]))
    ++i;
  const std::string_view int_digits = s.substr(int_begin, i - int_begin);
  std::string_view frac_digits;
  if (i < s.size() && s[i] == '.') {
    const std::size_t frac_begin = ++i;
    while (i < s.size() && is_digit(s[i]))
      ++i;
    frac_digits = s.substr(frac_begin, i - frac_begin);
  }
  if (int_digits.empty() && frac_digits.empty()) return fail(time_status::syntax);
  long long exponent = 0;
  if (i < s.size() && (s[i] == 'e' || s[i] == 'E')) {
    ++i;
    bool exp_negative = false;
    if (i < s.size() && (s[i] == '-' || s[i] == '+')) exp_negative = s[i++] == '-';
    const std::size_t exp_begin = i;
    while (i < s.size() && is_digit(s[i])) {
      // Saturate: beyond a million the value is zero or out of range either way.
      if (exponent < 1'000'000) exponent = exponent * 10 + (s[i] - '0');
      ++i;
    }
    if (i == exp_begin) return fail(time_status::syntax);
    if (exp_negative) exponent = -exponent;
  }
  if (i != s.size()) return fail(time_status::syntax);

  // value = digits × 10^point, with digits = int_digits ++ frac_digits.
  const long long point = exponent + scale - static_cast<long long>(frac_digits.size());
  auto digit_at = [&](std::size_t k) {
    return k < int_digits.size() ? int_digits[k] : frac_digits[k - int_digits.size()];
  };
  const std::size_t total = int_digits.size() + frac_digits.size();
  std::size_t first = 0;
  while (first < total && digit_at(first) == '0')
    ++first;
  if (first == total) return ok(0);
  // Digits [first, keep) form the integer part of the scaled value; the digit at `keep`, if
  // any, decides the rounding.
  const long long significant = static_cast<long long>(total - first);
  const long long kept = significant + point;  // digits left of the scaled decimal point
  if (kept > 19) return fail(time_status::out_of_range);
  i128 value = 0;
  for (long long k = 0; k < kept; ++k) {
    const long long idx = static_cast<long long>(first) + k;
    const char d =
        idx < static_cast<long long>(total) ? digit_at(static_cast<std::size_t>(idx)) : '0';
    value = value * 10 + (d - '0');
  }
  // The first digit dropped decides: five or more rounds the magnitude up (ties away from zero).
  if (kept >= 0 && kept < significant && digit_at(first + static_cast<std::size_t>(kept)) >= '5')
    ++value;
  if (value > time_max) return fail(time_status::out_of_range);
  return ok(static_cast<time_ns>(negative ? -value : value));
}

// Reads exactly `n` digits at s[pos...]; returns -1 when they are not all digits.
int fixed_digits(std::string_view s, std::size_t pos, std::size_t n) {
  if (pos + n > s.size()) return -1;
  int v = 0;
  for (std::size_t k = 0; k < n; ++k) {
    if (!is_digit(s[pos + k])) return -1;
    v = v * 10 + (s[pos + k] - '0');
  }
  return v;
}

std::int64_t nominal_fps(rational r) {
  return (r.num + r.den - 1) / r.den;
}

// |t| without overflow for the most negative value.
std::uint64_t magnitude(time_ns t) {
  return t < 0 ? static_cast<std::uint64_t>(-(t + 1)) + 1 : static_cast<std::uint64_t>(t);
}

// ".25" for 250 ms of nanoseconds: as few digits as exactness needs; empty for zero.
std::string fraction(std::uint64_t ns) {
  if (ns == 0) return {};
  char digits[10] = "000000000";
  for (int k = 8; k >= 0; --k, ns /= 10)
    digits[k] = static_cast<char>('0' + ns % 10);
  int len = 9;
  while (digits[len - 1] == '0')
    --len;
  return "." + std::string(digits, static_cast<std::size_t>(len));
}

// "01:02:03"; hours grow past two digits when needed. Digits by hand, from the right: writers
// format millions of times, and snprintf was a tenth of writing tiers text.
std::string hours_minutes_seconds(std::uint64_t secs) {
  char buf[32];
  char* const end = buf + sizeof buf;
  char* p = end;
  auto two = [&](std::uint64_t v) {
    *--p = static_cast<char>('0' + v % 10);
    *--p = static_cast<char>('0' + v / 10);
  };
  two(secs % 60);
  *--p = ':';
  two(secs / 60 % 60);
  *--p = ':';
  std::uint64_t hours = secs / 3600;
  const char* const minutes = p;
  do {
    *--p = static_cast<char>('0' + hours % 10);
    hours /= 10;
  } while (hours > 0);
  if (minutes - p < 2) *--p = '0';
  return std::string(p, static_cast<std::size_t>(end - p));
}

}  // namespace

std::optional<rational> ntsc_rate_abbreviated(std::string_view text) {
  if (text.find('.') == std::string_view::npos) return std::nullopt;
  const std::optional<rational> r = parse_rational(text);
  if (!r) return std::nullopt;
  for (std::int64_t whole : {24, 30, 48, 60, 120}) {
    // Within a hundredth of a frame a second of whole × 1000/1001, but not the whole rate.
    const detail::i128 diff = static_cast<detail::i128>(r->num) * 1001 * 100 -
                              static_cast<detail::i128>(whole) * 1000 * r->den * 100;
    const detail::i128 bound = static_cast<detail::i128>(r->den) * 1001;
    if ((diff < 0 ? -diff : diff) <= bound && !(r->num == whole && r->den == 1))
      return rational{whole * 1000, 1001};
  }
  return std::nullopt;
}

std::optional<rational> parse_rational(std::string_view text) {
  auto whole = [](std::string_view s) -> std::optional<std::int64_t> {
    std::int64_t v = 0;
    if (s.empty()) return std::nullopt;
    auto [p, ec] = std::from_chars(s.data(), s.data() + s.size(), v);
    if (ec != std::errc{} || p != s.data() + s.size() || v <= 0) return std::nullopt;
    return v;
  };
  std::int64_t num = 0;
  std::int64_t den = 1;
  if (auto slash = text.find('/'); slash != std::string_view::npos) {
    auto n = whole(text.substr(0, slash));
    auto d = whole(text.substr(slash + 1));
    if (!n || !d) return std::nullopt;
    num = *n;
    den = *d;
  } else if (auto dot = text.find('.'); dot != std::string_view::npos) {
    const std::string_view frac = text.substr(dot + 1);
    if (frac.empty() || frac.size() > 9) return std::nullopt;
    for (char c : frac)
      if (!is_digit(c)) return std::nullopt;
    std::string digits{text.substr(0, dot)};
    digits += frac;
    auto n = whole(digits);
    if (!n) return std::nullopt;
    num = *n;
    for (std::size_t k = 0; k < frac.size(); ++k)
      den *= 10;
  } else {
    auto n = whole(text);
    if (!n) return std::nullopt;
    num = *n;
  }
  const std::int64_t g = std::gcd(num, den);
  num /= g;
  den /= g;
  if (num >= rational_limit || den >= rational_limit) return std::nullopt;
  return rational{num, den};
}

std::string format_rational(rational r) {
  std::string s = std::to_string(r.num);
  if (r.den != 1) s += "/" + std::to_string(r.den);
  return s;
}

std::string_view describe(time_status status) {
  switch (status) {
    case time_status::ok:
      return "is valid";
    case time_status::syntax:
      return "is not a time";
    case time_status::out_of_range:
      return "is out of range (about ±292 years)";
    case time_status::bad_field:
      return "has a field out of range";
    case time_status::needs_rate:
      return "needs a frame rate (--rate)";
    case time_status::not_drop_rate:
      return "is drop-frame timecode, which needs a rate of 30000/1001 or 60000/1001";
  }
  return "is not a time";
}

parsed_time parse_seconds(std::string_view text) {
  return parse_scaled_decimal(text, 9);
}

parsed_time parse_milliseconds(std::string_view text) {
  return parse_scaled_decimal(text, 6);
}

parsed_time parse_clock(std::string_view text) {
  // Split at the last two colons: hours are optional and of any length.
  const std::size_t c2 = text.rfind(':');
  if (c2 == std::string_view::npos) return fail(time_status::syntax);
  const std::size_t c1 = c2 == 0 ? std::string_view::npos : text.rfind(':', c2 - 1);
  std::int64_t hours = 0;
  std::size_t mm_pos = 0;
  if (c1 != std::string_view::npos) {
    const std::string_view h = text.substr(0, c1);
    if (h.empty() || h.size() > 12) return fail(time_status::syntax);
    for (char c : h)
      if (!is_digit(c)) return fail(time_status::syntax);
    std::from_chars(h.data(), h.data() + h.size(), hours);
    mm_pos = c1 + 1;
  }
  if (c2 - mm_pos != 2) return fail(time_status::syntax);
  // Without hours, "01:30" could be hours and minutes: the short form needs its fraction.
  if (c1 == std::string_view::npos && text.size() <= c2 + 3) return fail(time_status::syntax);
  const int minutes = fixed_digits(text, mm_pos, 2);
  const int seconds = fixed_digits(text, c2 + 1, 2);
  if (minutes < 0 || seconds < 0) return fail(time_status::syntax);
  std::string_view rest = text.substr(c2 + 3);
  time_ns fraction = 0;
  if (!rest.empty()) {
    if (rest[0] != '.' || rest.size() == 1) return fail(time_status::syntax);
    for (char c : rest.substr(1))
      if (!is_digit(c)) return fail(time_status::syntax);
    std::string with_zero = "0";
    with_zero += rest;
    const parsed_time f = parse_seconds(with_zero);
    if (!f) return f;
    fraction = f.value;  // may round up to a whole second; still exact arithmetic below
  }
  if (minutes > 59 || seconds > 59) return fail(time_status::bad_field);
  const i128 total =
      (static_cast<i128>(hours) * 3600 + minutes * 60 + seconds) * ns_per_second + fraction;
  if (total > time_max) return fail(time_status::out_of_range);
  return ok(static_cast<time_ns>(total));
}

parsed_time frame_time(std::int64_t frame, rational rate) {
  if (rate.num <= 0 || rate.den <= 0) return fail(time_status::needs_rate);
  const i128 t = round_div(static_cast<i128>(frame) * rate.den * ns_per_second, rate.num);
  if (t > time_max || t < -time_max) return fail(time_status::out_of_range);
  return ok(static_cast<time_ns>(t));
}

time_ns duration_value::at(rational rate) const {
  if (!frames) return ns;
  const parsed_time t = frame_time(*frames, rate);
  return t ? t.value : std::numeric_limits<time_ns>::max();
}

std::optional<duration_value> parse_duration(std::string_view text) {
  duration_value d;
  parsed_time t;
  if (text.ends_with("ms")) {
    t = parse_milliseconds(text.substr(0, text.size() - 2));
  } else if (text.ends_with("f")) {
    std::int64_t n = 0;
    const std::string_view digits = text.substr(0, text.size() - 1);
    auto [p, ec] = std::from_chars(digits.data(), digits.data() + digits.size(), n);
    if (digits.empty() || ec != std::errc{} || p != digits.data() + digits.size() || n < 0)
      return std::nullopt;
    d.frames = n;
    return d;
  } else {
    t = parse_seconds(text.ends_with("s") ? text.substr(0, text.size() - 1) : text);
  }
  if (!t || t.value < 0) return std::nullopt;
  d.ns = t.value;
  return d;
}

std::string format_duration(const duration_value& d) {
  if (d.frames) return std::to_string(*d.frames) + "f";
  return format_seconds(d.ns) + "s";
}

parsed_time parse_frames(std::string_view text, std::optional<rational> rate) {
  std::int64_t frame = 0;
  const char* end = text.data() + text.size();
  auto [p, ec] = std::from_chars(text.data(), end, frame);
  if (ec == std::errc::result_out_of_range) return fail(time_status::out_of_range);
  if (ec != std::errc{} || p != end) return fail(time_status::syntax);
  if (!rate) return fail(time_status::needs_rate);
  return frame_time(frame, *rate);
}

parsed_time parse_timecode(std::string_view text, std::optional<rational> rate,
                           std::int64_t* frames_out) {
  // hh:mm:ss:ff or hh:mm:ss;ff — hours two or more digits.
  const std::size_t last = text.find_last_of(":;");
  if (last == std::string_view::npos || last < 8) return fail(time_status::syntax);
  const bool drop = text[last] == ';';
  const std::string_view clock = text.substr(0, last);
  const std::string_view ff = text.substr(last + 1);
  if (ff.empty() || ff.size() > 3) return fail(time_status::syntax);
  for (char c : ff)
    if (!is_digit(c)) return fail(time_status::syntax);
  const std::size_t c2 = clock.rfind(':');
  if (c2 == std::string_view::npos || c2 == 0) return fail(time_status::syntax);
  const std::size_t c1 = clock.rfind(':', c2 - 1);
  if (c1 == std::string_view::npos || c1 < 2 || c2 != c1 + 3 || clock.size() != c2 + 3)
    return fail(time_status::syntax);
  std::int64_t hours = 0;
  for (char c : clock.substr(0, c1)) {
    if (!is_digit(c) || hours > 1'000'000'000) return fail(time_status::syntax);
    hours = hours * 10 + (c - '0');
  }
  const int minutes = fixed_digits(clock, c1 + 1, 2);
  const int seconds = fixed_digits(clock, c2 + 1, 2);
  if (minutes < 0 || seconds < 0) return fail(time_status::syntax);
  if (!rate) return fail(time_status::needs_rate);
  int frame = 0;
  for (char c : ff)
    frame = frame * 10 + (c - '0');
  const std::int64_t fps = nominal_fps(*rate);
  if (minutes > 59 || seconds > 59 || frame >= fps) return fail(time_status::bad_field);
  i128 count = (static_cast<i128>(hours) * 3600 + minutes * 60 + seconds) * fps + frame;
  if (drop) {
    // SMPTE ST 12-1 drop-frame, as worded for ttp:dropMode in TTML2: frame numbers 0 and 1
    // (0–3 at 60000/1001) are left out at the start of every minute not divisible by ten.
    if (!(rate->den == 1001 && (rate->num == 30000 || rate->num == 60000)))
      return fail(time_status::not_drop_rate);
    const int dropped = rate->num == 30000 ? 2 : 4;
    if (seconds == 0 && frame < dropped && minutes % 10 != 0) return fail(time_status::bad_field);
    const i128 total_minutes = static_cast<i128>(hours) * 60 + minutes;
    count -= dropped * (total_minutes - total_minutes / 10);
  }
  if (count > std::numeric_limits<std::int64_t>::max() / 2) return fail(time_status::out_of_range);
  if (frames_out) *frames_out = static_cast<std::int64_t>(count);
  return frame_time(static_cast<std::int64_t>(count), *rate);
}

std::size_t format_seconds_to(time_ns t, char* out) {
  std::uint64_t m = magnitude(t);
  char* p = out;
  if (t < 0) *p++ = '-';
  p = std::to_chars(p, p + 24, m / ns_per_second).ptr;
  std::uint64_t ns = m % ns_per_second;
  if (ns != 0) {
    // Most times are whole milliseconds or microseconds: drop those zeros in one step each.
    int width = 9;
    if (ns % 1'000'000 == 0) {
      ns /= 1'000'000;
      width = 3;
    } else if (ns % 1000 == 0) {
      ns /= 1000;
      width = 6;
    }
    while (ns % 10 == 0) {
      ns /= 10;
      --width;
    }
    *p++ = '.';
    char digits[12];
    const char* end = std::to_chars(digits, digits + sizeof digits, ns).ptr;
    for (auto pad = width - (end - digits); pad > 0; --pad)
      *p++ = '0';
    for (const char* d = digits; d < end; ++d)
      *p++ = *d;
  }
  return static_cast<std::size_t>(p - out);
}

std::string format_seconds(time_ns t) {
  char buf[32];
  return std::string(buf, format_seconds_to(t, buf));
}

std::string format_clock_exact(time_ns t) {
  const std::uint64_t m = magnitude(t);
  return (t < 0 ? "-" : "") + hours_minutes_seconds(m / ns_per_second) +
         fraction(m % ns_per_second);
}

std::string format_clock(time_ns t, int decimals) {
  decimals = decimals < 0 ? 0 : decimals > 9 ? 9 : decimals;
  std::uint64_t unit = 1;
  for (int k = decimals; k < 9; ++k)
    unit *= 10;
  std::uint64_t m = magnitude(t);
  m = (m / unit + (m % unit * 2 >= unit ? 1 : 0)) * unit;  // rounded at the shown precision
  std::string s = (t < 0 ? "-" : "") + hours_minutes_seconds(m / ns_per_second);
  if (decimals > 0) {
    std::uint64_t frac = m % ns_per_second / unit;
    std::string digits(static_cast<std::size_t>(decimals), '0');
    for (int k = decimals - 1; k >= 0; --k, frac /= 10)
      digits[static_cast<std::size_t>(k)] = static_cast<char>('0' + frac % 10);
    s += '.' + digits;
  }
  return s;
}

}  // namespace tiers
